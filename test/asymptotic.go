package test

import (
	"fmt"
	"math"

	"github.com/kofnlab/kofn/internal/enum"

	"github.com/kofnlab/kofn/internal/argerr"
)

// TwoSampleMethod selects the asymptotic test of TwoSample.
//
// The zero value, ZPooled, is the default: the pooled (score) z keeps its
// size much better than the unpooled (Wald) z at small and unbalanced
// samples, and equals the signed root of Pearson's chi-square.
type TwoSampleMethod int

// Asymptotic tests of p1 = p2, with p = (k1 + k2)/(n1 + n2) the pooled
// estimate and a = k1, b = n1 - k1, c = k2, d = n2 - k2 the cells.
const (
	// ZPooled: z = (p1 - p2) / sqrt(p (1-p) (1/n1 + 1/n2)).
	ZPooled TwoSampleMethod = iota
	// ZUnpooled: z = (p1 - p2) / sqrt(p1 (1-p1)/n1 + p2 (1-p2)/n2) (Wald).
	ZUnpooled
	// ChiSquare: Pearson's X2 = N (ad - bc)^2 / (n1 n2 (a+c) (b+d)),
	// 1 degree of freedom (the square of the pooled z).
	ChiSquare
	// ChiSquareYates: Pearson's X2 with Yates's continuity correction,
	// |ad - bc| reduced by min(N/2, |ad - bc|).
	ChiSquareYates
)

var twoSampleNames = enum.New[TwoSampleMethod]("test.TwoSampleMethod", []string{"z pooled", "z unpooled", "Pearson chi-square", "Pearson chi-square Yates"}, nil)

// String returns the method's published name.
func (m TwoSampleMethod) String() string { return twoSampleNames.String(m) }

// MarshalText encodes the method by its String form.
func (m TwoSampleMethod) MarshalText() ([]byte, error) { return twoSampleNames.MarshalText(m) }

// UnmarshalText decodes any spelling ParseTwoSampleMethod accepts.
func (m *TwoSampleMethod) UnmarshalText(b []byte) error { return twoSampleNames.UnmarshalText(m, b) }

// ParseTwoSampleMethod returns the method whose String() is s, ignoring case.
func ParseTwoSampleMethod(s string) (TwoSampleMethod, error) {
	return twoSampleNames.Parse("test.ParseTwoSampleMethod", s)
}

// TwoSampleMethodValues lists the methods in order.
func TwoSampleMethodValues() []TwoSampleMethod { return twoSampleNames.Values() }

// TwoSampleOptions are the options of TwoSample; the zero value is the
// two-sided pooled z test.
type TwoSampleOptions struct {
	Method      TwoSampleMethod
	Alternative Alternative // Lower: p1 < p2; Higher: p1 > p2
}

// TwoSample performs an asymptotic test of H0: p1 = p2 for k1 successes
// of n1 and k2 of n2, by opt.Method, against the standard normal (z) or
// chi-square with 1 degree of freedom (X2). One-sided chi-square p-values
// use the signed root sign(ad - bc) sqrt(X2).
//
// Result: Statistic is z or X2 ("z", "chi-square"), Estimate p1 - p2,
// Null 0. Warnings report expected cell counts below 5 (Cochran's rule,
// common practice) and degenerate tables: when every observation is a
// success or every one a failure the pooled statistic is 0/0 and taken as
// 0 (p-value 1); when both samples are all successes or failures but
// differ, the unpooled variance is 0 and z infinite (p-value 0).
//
// Errors: invalid counts, an empty sample, an unknown method or alternative.
//
// Sources: Pearson K (1900); Yates F (1934), Contingency tables involving
// small numbers and the chi-square test, JRSS Suppl. 1:217-235; Agresti A
// (2002), Categorical Data Analysis, 2nd ed., sections 3.2 and 3.1.
func TwoSample(k1, n1, k2, n2 int64, opt TwoSampleOptions) (Result, error) {
	const fn = "test.TwoSample"
	if err := checkTwo(fn, k1, n1, k2, n2); err != nil {
		return Result{}, err
	}
	if n1 == 0 {
		return Result{}, argerr.Invalid(fn, "n1", n1, "is 0; each sample needs at least one trial")
	}
	if n2 == 0 {
		return Result{}, argerr.Invalid(fn, "n2", n2, "is 0; each sample needs at least one trial")
	}
	if err := twoSampleNames.Check(fn, "Method", opt.Method); err != nil {
		return Result{}, err
	}
	if err := checkAlt(fn, opt.Alternative); err != nil {
		return Result{}, err
	}
	f1, f2 := float64(n1), float64(n2)
	p1, p2 := float64(k1)/f1, float64(k2)/f2
	s, nn := float64(k1+k2), f1+f2
	var warn []string
	var z float64
	switch opt.Method {
	case ZUnpooled:
		v := p1*(1-p1)/f1 + p2*(1-p2)/f2
		switch {
		case p1 == p2:
			z = 0
		case v == 0:
			z = math.Copysign(math.Inf(1), p1-p2)
			warn = append(warn, "the unpooled variance is 0 (each sample all successes or all failures): z is infinite; use an exact test")
		default:
			z = (p1 - p2) / math.Sqrt(v)
		}
	default:
		// ad - bc = k1 n2 - k2 n1, exact in integers while the products fit.
		num := float64(k1)*f2 - float64(k2)*f1
		if n1 <= 1<<31 && n2 <= 1<<31 {
			num = float64(k1*n2 - k2*n1)
		}
		if opt.Method == ChiSquareYates {
			num = math.Copysign(math.Max(0, math.Abs(num)-nn/2), num)
		}
		if num != 0 {
			z = num * math.Sqrt(nn) / (math.Sqrt(f1*f2) * math.Sqrt(s*(nn-s)))
		}
		if s == 0 || s == nn {
			warn = append(warn, "every observation is a success or every one a failure: the statistic is 0/0, taken as 0")
		}
	}
	if e := math.Min(f1, f2) * math.Min(s, nn-s) / nn; e < 5 && s > 0 && s < nn {
		warn = append(warn, fmt.Sprintf("smallest expected cell count %.3g is below 5 (common practice): prefer Fisher, Barnard or Boschloo", e))
	}
	r := newResult(opt.Method.String(), opt.Alternative, logZP(z, opt.Alternative))
	r.Statistic = Statistic{Name: "z", Value: z}
	if opt.Method == ChiSquare || opt.Method == ChiSquareYates {
		r.Statistic = Statistic{Name: "chi-square", Value: z * z}
	}
	r.Estimate = p1 - p2
	r.Warnings = warn
	return r, nil
}

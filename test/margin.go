package test

import (
	"fmt"
	"math"

	"github.com/kofnlab/kofn/internal/enum"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/score"
)

// MarginMethod selects the variance of the score statistic in the margin
// tests.
//
// The zero value, MiettinenNurminen, is the default: its variance factor
// N/(N-1) removes the bias of the restricted variance, and its size stays
// closer to the nominal level at small samples (Fagerland MW, Lydersen S,
// Laake P (2017), Statistical Analysis of Contingency Tables, chapter 4,
// recalled).
type MarginMethod int

// Margin test statistics, for a difference p1 - p2 = delta or a ratio
// p1/p2 = rho:
//
//	Z = (p1^ - p2^ - delta) / sqrt(f (p1~(1-p1~)/n1 + p2~(1-p2~)/n2))
//	Z = (p1^ - rho p2^) / sqrt(f (p1~(1-p1~)/n1 + rho^2 p2~(1-p2~)/n2))
//
// with (p1~, p2~) the maximum-likelihood estimates restricted to the null
// value and f the variance factor.
const (
	// MiettinenNurminen: f = N/(N-1), N = n1 + n2 (Miettinen O, Nurminen
	// M (1985), Comparative analysis of two rates, Statistics in Medicine
	// 4:213-226).
	MiettinenNurminen MarginMethod = iota
	// FarringtonManning: f = 1 (Farrington CP, Manning G (1990), Test
	// statistics and sample size formulae for comparative binomial trials
	// with null hypothesis of non-zero risk difference or non-unity
	// relative risk, Statistics in Medicine 9:1447-1454).
	FarringtonManning
)

var marginNames = enum.New[MarginMethod]("test.MarginMethod", []string{"Miettinen-Nurminen", "Farrington-Manning"}, nil)

// String returns the method's published name.
func (m MarginMethod) String() string { return marginNames.String(m) }

// MarshalText encodes the method by its String form.
func (m MarginMethod) MarshalText() ([]byte, error) { return marginNames.MarshalText(m) }

// UnmarshalText decodes any spelling ParseMarginMethod accepts.
func (m *MarginMethod) UnmarshalText(b []byte) error { return marginNames.UnmarshalText(m, b) }

// ParseMarginMethod returns the method whose String() is s, ignoring case.
func ParseMarginMethod(s string) (MarginMethod, error) {
	return marginNames.Parse("test.ParseMarginMethod", s)
}

// MarginMethodValues lists the methods in order.
func MarginMethodValues() []MarginMethod { return marginNames.Values() }

func (m MarginMethod) variance() score.Variance {
	if m == FarringtonManning {
		return score.FarringtonManning
	}
	return score.MiettinenNurminen
}

// MarginOptions are the options of the margin tests; the zero value is
// the two-sided Miettinen-Nurminen test. Equivalence tests ignore
// Alternative.
type MarginOptions struct {
	Method      MarginMethod
	Alternative Alternative
}

// checkMargin validates the common arguments of the margin tests.
func checkMargin(fn string, k1, n1, k2, n2 int64, m MarginMethod, a Alternative) error {
	if err := checkTwo(fn, k1, n1, k2, n2); err != nil {
		return err
	}
	if n1 == 0 {
		return argerr.Invalid(fn, "n1", n1, "is 0; each sample needs at least one trial")
	}
	if n2 == 0 {
		return argerr.Invalid(fn, "n2", n2, "is 0; each sample needs at least one trial")
	}
	if err := marginNames.Check(fn, "Method", m); err != nil {
		return err
	}
	return checkAlt(fn, a)
}

func checkDelta(fn, arg string, d float64) error {
	if !(d > -1 && d < 1) {
		return argerr.Invalid(fn, arg, d, "must lie strictly between -1 and 1 (a difference of proportions)")
	}
	return nil
}

func checkRho(fn, arg string, r float64) error {
	if !(r > 0 && !math.IsInf(r, 1)) {
		return argerr.Invalid(fn, arg, r, "must be a positive finite ratio")
	}
	return nil
}

// marginWarnings flags small samples for the normal approximation.
func marginWarnings(k1, n1, k2, n2 int64) []string {
	if m := min(k1, n1-k1, k2, n2-k2); m < 5 {
		return []string{fmt.Sprintf("a cell count of %d is below 5 (common practice): the normal approximation of the score statistic may be poor", m)}
	}
	return nil
}

// DifferenceMargin tests H0: p1 - p2 = delta with the score statistic of
// opt.Method for k1 successes of n1 and k2 of n2. One-sided versions are
// the margin tests of clinical and product comparisons: with higher
// proportions better, non-inferiority of sample 1 within a margin m > 0 is
// Higher with delta = -m (H0: p1 - p2 <= -m), superiority by m is Higher
// with delta = m; with lower proportions better use Lower and the mirrored
// delta.
//
// Result: Statistic is the score z ("z"), Estimate p1 - p2, Null delta.
//
// Errors: invalid counts, an empty sample, delta outside (-1, 1) or NaN,
// an unknown method or alternative.
//
// Such tests steer regulatory and clinical decisions: the margin, the
// method and the analysis set must be fixed in advance with qualified
// statisticians and the applicable guidance, not chosen from this output.
func DifferenceMargin(k1, n1, k2, n2 int64, delta float64, opt MarginOptions) (Result, error) {
	const fn = "test.DifferenceMargin"
	if err := checkMargin(fn, k1, n1, k2, n2, opt.Method, opt.Alternative); err != nil {
		return Result{}, err
	}
	if err := checkDelta(fn, "delta", delta); err != nil {
		return Result{}, err
	}
	z := score.DiffZ(k1, n1, k2, n2, delta, opt.Method.variance())
	r := newResult(opt.Method.String()+" difference", opt.Alternative, logZP(z, opt.Alternative))
	r.Statistic = Statistic{Name: "z", Value: z}
	r.Estimate, r.Null = diffEstimate(k1, n1, k2, n2), delta
	r.Warnings = marginWarnings(k1, n1, k2, n2)
	return r, nil
}

// RatioMargin tests H0: p1/p2 = rho (rho > 0) with the score statistic of
// opt.Method, as DifferenceMargin does for the difference: non-inferiority
// of sample 1 with margin rho < 1 is Higher (H0: p1/p2 <= rho).
//
// Result: Statistic is the score z, Estimate p1/p2 (+Inf when only k2 is
// 0, NaN when both are), Null rho.
//
// Errors: as DifferenceMargin, with rho not positive and finite.
func RatioMargin(k1, n1, k2, n2 int64, rho float64, opt MarginOptions) (Result, error) {
	const fn = "test.RatioMargin"
	if err := checkMargin(fn, k1, n1, k2, n2, opt.Method, opt.Alternative); err != nil {
		return Result{}, err
	}
	if err := checkRho(fn, "rho", rho); err != nil {
		return Result{}, err
	}
	z := score.RatioZ(k1, n1, k2, n2, rho, opt.Method.variance())
	r := newResult(opt.Method.String()+" ratio", opt.Alternative, logZP(z, opt.Alternative))
	r.Statistic = Statistic{Name: "z", Value: z}
	r.Estimate, r.Null = ratioEstimate(k1, n1, k2, n2), rho
	r.Warnings = marginWarnings(k1, n1, k2, n2)
	return r, nil
}

func ratioEstimate(k1, n1, k2, n2 int64) float64 {
	if k1 == 0 && k2 == 0 {
		return math.NaN()
	}
	return (float64(k1) / float64(n1)) / (float64(k2) / float64(n2))
}

// DifferenceEquivalence tests equivalence, H1: lower < p1 - p2 < upper
// against H0: p1 - p2 <= lower or >= upper, by two one-sided tests
// (Schuirmann 1987): the p-value is the larger of the Higher p-value at
// lower and the Lower p-value at upper, and equivalence is shown at level
// alpha when it is below alpha (equivalently, when the 1 - 2 alpha
// two-sided score interval lies inside (lower, upper)).
//
// Result: Statistic and Null are the z and the bound of the one-sided test
// with the larger p-value; Alternative is TwoSided; Estimate p1 - p2.
//
// Errors: as DifferenceMargin, with lower >= upper.
func DifferenceEquivalence(k1, n1, k2, n2 int64, lower, upper float64, opt MarginOptions) (Result, error) {
	const fn = "test.DifferenceEquivalence"
	if err := checkMargin(fn, k1, n1, k2, n2, opt.Method, TwoSided); err != nil {
		return Result{}, err
	}
	if err := checkDelta(fn, "lower", lower); err != nil {
		return Result{}, err
	}
	if err := checkDelta(fn, "upper", upper); err != nil {
		return Result{}, err
	}
	if !(lower < upper) {
		return Result{}, argerr.Invalid(fn, "lower", lower, "must be below upper = "+argerr.Format(upper))
	}
	v := opt.Method.variance()
	zl := score.DiffZ(k1, n1, k2, n2, lower, v)
	zu := score.DiffZ(k1, n1, k2, n2, upper, v)
	r := tost(opt.Method.String()+" difference equivalence", zl, zu, lower, upper)
	r.Estimate = diffEstimate(k1, n1, k2, n2)
	r.Warnings = marginWarnings(k1, n1, k2, n2)
	return r, nil
}

// RatioEquivalence tests equivalence of the ratio, H1: lower < p1/p2 <
// upper, by two one-sided score tests, as DifferenceEquivalence does.
//
// Errors: as RatioMargin, with lower >= upper.
func RatioEquivalence(k1, n1, k2, n2 int64, lower, upper float64, opt MarginOptions) (Result, error) {
	const fn = "test.RatioEquivalence"
	if err := checkMargin(fn, k1, n1, k2, n2, opt.Method, TwoSided); err != nil {
		return Result{}, err
	}
	if err := checkRho(fn, "lower", lower); err != nil {
		return Result{}, err
	}
	if err := checkRho(fn, "upper", upper); err != nil {
		return Result{}, err
	}
	if !(lower < upper) {
		return Result{}, argerr.Invalid(fn, "lower", lower, "must be below upper = "+argerr.Format(upper))
	}
	v := opt.Method.variance()
	zl := score.RatioZ(k1, n1, k2, n2, lower, v)
	zu := score.RatioZ(k1, n1, k2, n2, upper, v)
	r := tost(opt.Method.String()+" ratio equivalence", zl, zu, lower, upper)
	r.Estimate = ratioEstimate(k1, n1, k2, n2)
	r.Warnings = marginWarnings(k1, n1, k2, n2)
	return r, nil
}

// tost combines the two one-sided tests: Higher at the lower bound, Lower
// at the upper; the p-value is the larger.
func tost(method string, zl, zu, lower, upper float64) Result {
	pl, pu := logZP(zl, Higher), logZP(zu, Lower)
	r := newResult(method, TwoSided, math.Max(pl, pu))
	r.Statistic.Name = "z"
	if pl >= pu {
		r.Statistic.Value, r.Null = zl, lower
	} else {
		r.Statistic.Value, r.Null = zu, upper
	}
	return r
}

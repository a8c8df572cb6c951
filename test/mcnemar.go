package test

import (
	"fmt"
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/onesample"
)

// McNemarMethod selects the version of McNemar's test.
//
// The zero value, McNemarMidP, is the default because Fagerland, Lydersen
// and Laake (2013) found it closest to the nominal size without the exact
// test's conservatism, rarely exceeding it; where the size must never
// exceed alpha use McNemarExact.
type McNemarMethod int

// McNemar methods, for n12 and n21 the discordant pair counts and
// nd = n12 + n21. Under H0 (p12 = p21), n12 given nd is Binomial(nd, 1/2).
const (
	// McNemarMidP: the exact conditional p-value minus the probability of
	// the observed count (two-sided: 2 P(X < min) + P(X = min), capped).
	McNemarMidP McNemarMethod = iota
	// McNemarExact: the exact conditional binomial test,
	// two-sided min(1, 2 P(X <= min(n12, n21))).
	McNemarExact
	// McNemarAsymptotic: chi-square (n12 - n21)^2 / nd, 1 degree of freedom.
	McNemarAsymptotic
	// McNemarAsymptoticCC: (|n12 - n21| - 1)^2 / nd with the continuity
	// correction (Edwards 1948), the magnitude floored at 0.
	McNemarAsymptoticCC
)

var mcnemarNames = [...]string{"McNemar mid-p", "McNemar exact", "McNemar asymptotic", "McNemar asymptotic-cc"}

// String returns "McNemar mid-p", "McNemar exact", "McNemar asymptotic"
// or "McNemar asymptotic-cc".
func (m McNemarMethod) String() string { return enumName(int(m), mcnemarNames[:], "McNemarMethod") }

// MarshalText encodes the method by its name.
func (m McNemarMethod) MarshalText() ([]byte, error) { return []byte(m.String()), nil }

// ParseMcNemarMethod returns the method whose String() is s, ignoring case;
// the leading "McNemar " may be left out ("mid-p", "exact", ...).
func ParseMcNemarMethod(s string) (McNemarMethod, error) {
	i, err := parseEnum("test.ParseMcNemarMethod", s, mcnemarNames[:], "McNemar ", "a McNemar method")
	return McNemarMethod(i), err
}

// McNemarOptions are the options of McNemar; the zero value is the
// two-sided mid-p test.
type McNemarOptions struct {
	Method      McNemarMethod
	Alternative Alternative // Less: p12 < p21; Greater: p12 > p21
}

// McNemar tests H0: p12 = p21 for paired binary data (marginal
// homogeneity of a 2x2 table of pairs) from the discordant counts: n12
// pairs with the first outcome a success and the second a failure, n21
// the reverse. The concordant cells do not enter the test.
//
// Result: Statistic is n12 for the exact and mid-p tests ("x12") and the
// chi-square for the asymptotic ones (one-sided asymptotic p-values use
// its signed root); Estimate is (n12 - n21)/(n12 + n21), NaN without
// discordant pairs (the p-value is then 1, with a warning); Null is 0.
//
// Errors: a negative count, an unknown method or alternative.
//
// Source: McNemar Q (1947), Psychometrika 12:153-157; Fagerland MW,
// Lydersen S, Laake P (2013), BMC Medical Research Methodology 13:91.
func McNemar(n12, n21 int64, opt McNemarOptions) (Result, error) {
	const fn = "test.McNemar"
	if err := argerr.Count(fn, "n12", n12); err != nil {
		return Result{}, err
	}
	if err := argerr.Count(fn, "n21", n21); err != nil {
		return Result{}, err
	}
	if n12 > binom.MaxN-n21 {
		return Result{}, argerr.TooLarge(fn, "n12", n12, "plus n21 exceeds 2^53, the largest count held exactly in float64")
	}
	if opt.Method < 0 || int(opt.Method) >= len(mcnemarNames) {
		return Result{}, argerr.Invalid(fn, "method", int(opt.Method), "is not a McNemar method")
	}
	if err := checkAlt(fn, opt.Alternative); err != nil {
		return Result{}, err
	}
	nd := n12 + n21
	alt := opt.Alternative
	var r Result
	switch opt.Method {
	case McNemarExact, McNemarMidP:
		t := onesample.Test{P0: 0.5, Method: onesample.Central, Mid: opt.Method == McNemarMidP, Alternative: onesample.Alternative(alt)}
		lp, err := onesample.LogPValue(n12, nd, t)
		if err != nil { // unreachable: the counts were checked above
			return Result{}, err
		}
		r = newResult(opt.Method.String(), alt, lp)
		r.Statistic, r.StatisticName = float64(n12), "x12"
	default:
		d := float64(n12) - float64(n21)
		if opt.Method == McNemarAsymptoticCC {
			d = math.Copysign(math.Max(0, math.Abs(d)-1), d)
		}
		z := 0.0
		if d != 0 {
			z = d / math.Sqrt(float64(nd))
		}
		r = newResult(opt.Method.String(), alt, logZP(z, alt))
		r.Statistic, r.StatisticName = z*z, "chi-square"
		if nd < 10 {
			r.Warnings = append(r.Warnings, fmt.Sprintf("normal approximation with only %d discordant pairs (common practice asks for 10 or more); prefer the mid-p or exact test", nd))
		}
	}
	r.Estimate = (float64(n12) - float64(n21)) / float64(nd)
	if nd == 0 {
		r.Estimate = math.NaN()
		r = setP(r, 0)
		r.Warnings = append(r.Warnings, "no discordant pairs: the data carry no information on p12 - p21")
	}
	if opt.Method == McNemarMidP {
		r.Warnings = append(r.Warnings, "mid-p value: not guaranteed to keep the size at or below alpha")
	}
	return r, nil
}

// setP replaces the p-value of r by e^logP.
func setP(r Result, logP float64) Result {
	r.LogPValue, r.PValue = logP, math.Exp(logP)
	return r
}

package test

import (
	"fmt"
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/enum"
	"github.com/kofnlab/kofn/internal/onesample"
)

// McNemarMethod selects the version of McNemar's test.
//
// The zero value, McNemarExact, is the default because its size never
// exceeds alpha, and it is the test power.PairedOptions plans by default.
// Fagerland, Lydersen and Laake (2013) found its mid-p version
// (McNemarOptions.MidP) closest to the nominal size without the exact
// test's conservatism, rarely exceeding it; choose it where the size need
// not be guaranteed.
type McNemarMethod int

// McNemar methods, for n12 and n21 the discordant pair counts and
// nd = n12 + n21. Under H0 (p12 = p21), n12 given nd is Binomial(nd, 1/2);
// that distribution is symmetric, so every two-sided rule gives the same
// exact p-value and McNemar takes no Rule.
const (
	// McNemarExact: the exact conditional binomial test,
	// two-sided min(1, 2 P(X <= min(n12, n21))); with MidP, the mid-p
	// version 2 P(X < min) + P(X = min), capped at 1.
	McNemarExact McNemarMethod = iota
	// McNemarAsymptotic: chi-square (n12 - n21)^2 / nd, 1 degree of freedom.
	McNemarAsymptotic
	// McNemarAsymptoticCC: (|n12 - n21| - 1)^2 / nd with the continuity
	// correction (Edwards 1948), the magnitude floored at 0.
	McNemarAsymptoticCC
)

var mcnemarNames = enum.New[McNemarMethod]("test.McNemarMethod",
	[]string{"McNemar exact", "McNemar asymptotic", "McNemar asymptotic-cc"},
	map[string]McNemarMethod{"exact": McNemarExact, "asymptotic": McNemarAsymptotic, "asymptotic-cc": McNemarAsymptoticCC})

// String returns "McNemar exact", "McNemar asymptotic" or
// "McNemar asymptotic-cc".
func (m McNemarMethod) String() string { return mcnemarNames.String(m) }

// MarshalText encodes the method by its String form.
func (m McNemarMethod) MarshalText() ([]byte, error) { return mcnemarNames.MarshalText(m) }

// UnmarshalText decodes any spelling ParseMcNemarMethod accepts.
func (m *McNemarMethod) UnmarshalText(b []byte) error { return mcnemarNames.UnmarshalText(m, b) }

// ParseMcNemarMethod returns the method whose String() is s, ignoring case;
// the leading "McNemar " may be left out ("exact", "asymptotic", ...).
func ParseMcNemarMethod(s string) (McNemarMethod, error) {
	return mcnemarNames.Parse("test.ParseMcNemarMethod", s)
}

// McNemarMethodValues lists the McNemar methods in order.
func McNemarMethodValues() []McNemarMethod { return mcnemarNames.Values() }

// McNemarOptions are the options of McNemar; the zero value is the
// two-sided exact conditional test.
type McNemarOptions struct {
	Method      McNemarMethod
	MidP        bool        // mid-p version of the exact test (ignored by the asymptotic ones)
	Alternative Alternative // Lower: p12 < p21; Higher: p12 > p21
}

// McNemar tests H0: p12 = p21 for paired binary data (marginal
// homogeneity of a 2x2 table of pairs) from the discordant counts: n12
// pairs with the first outcome a success and the second a failure, n21
// the reverse. The concordant cells do not enter the test.
//
// Result: Statistic is n12 for the exact and mid-p tests ("n12") and the
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
	if err := mcnemarNames.Check(fn, "Method", opt.Method); err != nil {
		return Result{}, err
	}
	if err := checkAlt(fn, opt.Alternative); err != nil {
		return Result{}, err
	}
	nd := n12 + n21
	alt := opt.Alternative
	var r Result
	switch opt.Method {
	case McNemarExact:
		t := onesample.Test{P0: 0.5, Rule: onesample.Central, MidP: opt.MidP, Alternative: alt}
		lp, err := onesample.LogPValue(n12, nd, t)
		if err != nil { // unreachable: the counts were checked above
			return Result{}, err
		}
		name := opt.Method.String()
		if opt.MidP {
			name = "McNemar mid-p"
		}
		r = newResult(name, alt, lp)
		r.Statistic = Statistic{Name: "n12", Value: float64(n12)}
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
		r.Statistic = Statistic{Name: "chi-square", Value: z * z}
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
	if opt.MidP && opt.Method == McNemarExact {
		r.Warnings = append(r.Warnings, "mid-p value: not guaranteed to keep the size at or below alpha")
	}
	return r, nil
}

// setP replaces the p-value of r by e^logP.
func setP(r Result, logP float64) Result {
	r.LogPValue, r.PValue = logP, math.Exp(logP)
	return r
}

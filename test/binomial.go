package test

import (
	"fmt"
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/enum"
	"github.com/kofnlab/kofn/internal/onesample"
	"github.com/kofnlab/kofn/internal/xmath"
)

// BinomialMethod selects the one-sample test of Binomial.
//
// The zero value, Exact, is the default: its size never exceeds alpha,
// and with the default two-sided rule (PointProbability: the outcomes no
// more likely than the observed one) it is the usual exact binomial test,
// less conservative than doubling the smaller tail.
type BinomialMethod int

// One-sample methods.
const (
	// Exact refers k to the binomial distribution under p0. One-sided
	// p-values are the tails P(X <= k) and P(X >= k); the two-sided
	// p-value follows the options' Rule (defined in detail in the package
	// comment of internal/onesample), and MidP counts half the probability
	// of the outcomes exactly as extreme. It inverts to Sterne's interval
	// (PointProbability), the Clopper-Pearson interval (Central), Blaker's
	// interval (Blaker), or their mid-p versions.
	Exact BinomialMethod = iota
	// Score: z = (k - n p0) / sqrt(n p0 (1-p0)) against the standard
	// normal; inverts to the Wilson interval.
	Score
	// ScoreCC: the score z with the continuity correction, |k - n p0|
	// reduced by min(1/2, |k - n p0|); inverts to the Wilson interval with
	// continuity correction.
	ScoreCC
	// LikelihoodRatio: G2 = 2 [k ln(k/(n p0)) + (n-k) ln((n-k)/(n(1-p0)))]
	// against chi-square with 1 degree of freedom (one-sided: its signed
	// root against the normal); inverts to the likelihood-ratio interval.
	LikelihoodRatio
)

var binomialNames = enum.New[BinomialMethod]("test.BinomialMethod",
	[]string{"exact", "score", "score-cc", "likelihood-ratio"},
	map[string]BinomialMethod{"lr": LikelihoodRatio, "wilson": Score})

// String returns "exact", "score", "score-cc" or "likelihood-ratio".
func (m BinomialMethod) String() string { return binomialNames.String(m) }

// MarshalText encodes the method by its String form.
func (m BinomialMethod) MarshalText() ([]byte, error) { return binomialNames.MarshalText(m) }

// UnmarshalText decodes any spelling ParseBinomialMethod accepts.
func (m *BinomialMethod) UnmarshalText(b []byte) error { return binomialNames.UnmarshalText(m, b) }

// ParseBinomialMethod returns the method whose String() is s, ignoring case.
func ParseBinomialMethod(s string) (BinomialMethod, error) {
	return binomialNames.Parse("test.ParseBinomialMethod", s)
}

// BinomialMethodValues lists the one-sample methods in order.
func BinomialMethodValues() []BinomialMethod { return binomialNames.Values() }

// BinomialOptions are the options of Binomial. The zero value is the
// two-sided exact point-probability test with a 95% interval.
type BinomialOptions struct {
	Method      BinomialMethod // test; default Exact
	Rule        TwoSidedRule   // two-sided rule of the exact test; default PointProbability
	MidP        bool           // mid-p version of the exact test
	Alternative Alternative    // default TwoSided
	// Level is the confidence level of the interval that inverts the test;
	// 0 means 0.95.
	Level float64
	// SkipInterval leaves Result.Interval nil. The p-value alone costs a
	// few PMF and tail evaluations; the interval costs about a hundred
	// p-value evaluations (more for Blaker's rule and for the
	// point-probability rule, whose exact search visits the jumps of the
	// p-value near the ends).
	SkipInterval bool
}

// spec is the one-sample exact test the options select, with the name of
// the test and of the interval that inverts it.
func (o BinomialOptions) spec() (test, ivl string) {
	if o.Method != Exact {
		return o.Method.String(), map[BinomialMethod]string{Score: "Wilson", ScoreCC: "Wilson with continuity correction", LikelihoodRatio: "likelihood ratio"}[o.Method]
	}
	rule := o.Rule
	if o.Alternative != TwoSided {
		rule = Central // the one-sided exact tests are the tails, whatever the rule
	}
	test = "exact " + o.Rule.String()
	if o.Alternative != TwoSided {
		test = "exact"
	}
	ivl = map[TwoSidedRule]string{PointProbability: "Sterne", Central: "Clopper-Pearson", Blaker: "Blaker"}[rule]
	if o.MidP {
		test += " mid-p"
		ivl += " mid-p"
	}
	return test, ivl
}

// Binomial tests H0: P = p0 given k successes in n independent trials, by
// the method and against the alternative in opt, and attaches the
// confidence interval for P that inverts the same test: the set of p0 not
// rejected at level 1 - Level (two-sided, or the one-sided bound for a
// one-sided alternative). A test at level alpha = 1 - Level rejects when
// PValue < alpha, exactly when Interval excludes p0 (for the
// point-probability and Blaker tests the accepted set of p0 can have
// gaps; the interval is then its hull, exact for the point-probability
// test (Sterne's interval, see sterneEnd) and found on a 100-point grid
// refined by bisection for the others, and a warning says so when a
// 100-point grid inside it sees a gap).
//
// Result: Statistic is k for the exact methods, z for the score methods
// and G2 for the likelihood ratio; Estimate is k/n; Null is p0.
//
// Errors: k or n negative, k > n, n above 2^53, p0 not strictly between 0
// and 1 or NaN, an unknown method or alternative, Level outside (0, 1).
//
// Accuracy: exact p-values within 1e-12 relative to max(1, |ln p|) of the
// log p-value, from the log-space binomial tails; interval ends to 1e-12
// relative. Cost: O(log n) PMF and tail evaluations for the p-value.
func Binomial(k, n int64, p0 float64, opt BinomialOptions) (Result, error) {
	const fn = "test.Binomial"
	if err := argerr.KN(fn, "k", "n", k, n); err != nil {
		return Result{}, err
	}
	if n > binom.MaxN {
		return Result{}, argerr.TooLarge(fn, "n", n, "exceeds 2^53, the largest count held exactly in float64")
	}
	if err := argerr.OpenProb(fn, "p0", p0); err != nil {
		return Result{}, err
	}
	if err := binomialNames.Check(fn, "Method", opt.Method); err != nil {
		return Result{}, err
	}
	if err := opt.Rule.Check(fn, "Rule"); err != nil {
		return Result{}, err
	}
	if err := checkAlt(fn, opt.Alternative); err != nil {
		return Result{}, err
	}
	lvl, err := level(fn, opt.Level)
	if err != nil {
		return Result{}, err
	}
	m, alt := opt.Method, opt.Alternative
	name, ivlName := opt.spec()
	r := newResult(name, alt, binomialLogP(opt, k, n, p0))
	r.Estimate = float64(k) / float64(n)
	r.Null = p0
	switch m {
	case Score, ScoreCC:
		r.Statistic = Statistic{Name: "z", Value: scoreZ(k, n, p0, m == ScoreCC)}
	case LikelihoodRatio:
		r.Statistic = Statistic{Name: "G2", Value: lrG2(k, n, p0)}
	default:
		r.Statistic = Statistic{Name: "k", Value: float64(k)}
	}
	if m != Exact {
		if e := math.Min(float64(n)*p0, float64(n)*(1-p0)); e < 5 {
			r.Warnings = append(r.Warnings, fmt.Sprintf("normal approximation with min(n p0, n (1-p0)) = %.3g below 5 (common practice asks for 5 or more); prefer an exact method", e))
		}
	} else if opt.MidP {
		r.Warnings = append(r.Warnings, "mid-p value: not guaranteed to keep the size at or below alpha")
	}
	if n == 0 {
		r.Estimate = math.NaN()
		r.Warnings = append(r.Warnings, "no trials: the data carry no information (p-value 1, interval [0, 1])")
		if !opt.SkipInterval {
			r.Interval = invertedInterval(0, 1, r.Estimate, lvl, alt, ivlName, "p")
		}
		return r, nil
	}
	if !opt.SkipInterval {
		lp := func(p float64) float64 { return binomialLogP(opt, k, n, p) }
		scan := m == Exact && opt.Rule != Central && alt == TwoSided
		var lo, hi float64
		var gaps, ok bool
		if m == Exact && opt.Rule == PointProbability && !opt.MidP && alt == TwoSided {
			lo, hi, gaps, ok = sterne(k, n, math.Log1p(-lvl))
		} else {
			lo, hi, gaps, ok = invert(lp, math.Log1p(-lvl), r.Estimate, alt, scan)
		}
		if !ok {
			r.Warnings = append(r.Warnings, "no null value is accepted at this level: the interval is empty")
		} else if gaps {
			r.Warnings = append(r.Warnings, "the set of p0 this test accepts has gaps; the interval is its hull, and some p0 inside it are rejected")
		}
		r.Interval = invertedInterval(lo, hi, r.Estimate, lvl, alt, ivlName, "p")
		if gaps {
			r.Interval.Warnings = append(r.Interval.Warnings, "hull of an accepted set with gaps")
		}
	}
	return r, nil
}

// binomialLogP returns the log p-value of method m for k of n at p0 in
// [0, 1] (the interval search evaluates the ends 0 and 1).
func binomialLogP(opt BinomialOptions, k, n int64, p0 float64) float64 {
	m, alt := opt.Method, opt.Alternative
	if m == Exact {
		lp, err := onesample.LogPValue(k, n, onesample.Test{P0: p0, Rule: opt.Rule, MidP: opt.MidP, Alternative: alt})
		if err != nil {
			return math.NaN()
		}
		return lp
	}
	var z float64
	switch m {
	case Score, ScoreCC:
		z = scoreZ(k, n, p0, m == ScoreCC)
	default:
		z = math.Sqrt(lrG2(k, n, p0))
		if float64(k) < float64(n)*p0 {
			z = -z
		}
	}
	return logZP(z, alt)
}

// scoreZ returns the score statistic (k - n p0)/sqrt(n p0 (1-p0)), with cc
// the numerator's magnitude reduced by min(1/2, |k - n p0|); 0 when the
// numerator is 0, +-Inf when only the variance is.
func scoreZ(k, n int64, p0 float64, cc bool) float64 {
	d := float64(k) - float64(n)*p0
	if cc {
		c := math.Min(0.5, math.Abs(d))
		d = math.Copysign(math.Abs(d)-c, d)
	}
	if d == 0 {
		return 0
	}
	return d / math.Sqrt(float64(n)*p0*(1-p0))
}

// lrG2 returns the likelihood-ratio statistic
// G2 = 2 [dev(k, n p0) + dev(n-k, n (1-p0))], dev(x, m) = x ln(x/m) + m - x
// (xmath.Deviance, which sums a series near x = m so nothing cancels).
func lrG2(k, n int64, p0 float64) float64 {
	return 2 * (xmath.Deviance(float64(k), float64(n)*p0) + xmath.Deviance(float64(n-k), float64(n)*(1-p0)))
}

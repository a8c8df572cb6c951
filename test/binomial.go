package test

import (
	"fmt"
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/onesample"
	"github.com/kofnlab/kofn/internal/xmath"
)

// BinomialMethod selects the one-sample test of Binomial.
//
// The zero value, ExactPoint, is the default: it is exact (its size never
// exceeds alpha), it is the two-sided definition most software and
// textbooks use ("outcomes no more likely than the observed one"), and it
// is usually less conservative than the central test.
type BinomialMethod int

// One-sample methods. The exact ones are defined in detail in the package
// comment of internal/onesample; the one-sided p-values of the six exact
// methods are the binomial tails (mid-p tails for the mid-p ones).
const (
	// ExactPoint: two-sided p-value P(f(X) <= f(k)), f the binomial PMF
	// under p0, with "<=" up to the relative tolerance 1e-7; inverts to
	// Sterne's interval.
	ExactPoint BinomialMethod = iota
	// ExactPointMidP: P(f(X) < f(k)) + P(f(X) = f(k))/2.
	ExactPointMidP
	// ExactCentral: twice the smaller tail, capped at 1; inverts to the
	// Clopper-Pearson interval.
	ExactCentral
	// ExactCentralMidP: twice the smaller mid-p tail P(X < k) + f(k)/2,
	// capped at 1; inverts to the mid-p interval.
	ExactCentralMidP
	// ExactBlaker: Blaker's (2000) acceptability P(t(X) <= t(k)),
	// t(j) = min(P(X <= j), P(X >= j)); inverts to Blaker's interval.
	ExactBlaker
	// ExactBlakerMidP: P(t(X) < t(k)) + P(t(X) = t(k))/2.
	ExactBlakerMidP
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

var binomialNames = [...]string{
	"point-probability", "point-probability mid-p", "central", "central mid-p",
	"Blaker", "Blaker mid-p", "score", "score-cc", "likelihood-ratio",
}

// String returns the method's name: "point-probability",
// "point-probability mid-p", "central", "central mid-p", "Blaker",
// "Blaker mid-p", "score", "score-cc" or "likelihood-ratio".
func (m BinomialMethod) String() string { return enumName(int(m), binomialNames[:], "BinomialMethod") }

// MarshalText encodes the method by its name.
func (m BinomialMethod) MarshalText() ([]byte, error) { return []byte(m.String()), nil }

// ParseBinomialMethod returns the method whose String() is s, ignoring case.
func ParseBinomialMethod(s string) (BinomialMethod, error) {
	i, err := parseEnum("test.ParseBinomialMethod", s, binomialNames[:], "", "a one-sample method")
	return BinomialMethod(i), err
}

// exact reports whether m is one of the exact methods, and its definition.
func (m BinomialMethod) exact() (onesample.Method, bool, bool) {
	switch m {
	case ExactPoint, ExactPointMidP:
		return onesample.PointProbability, m == ExactPointMidP, true
	case ExactCentral, ExactCentralMidP:
		return onesample.Central, m == ExactCentralMidP, true
	case ExactBlaker, ExactBlakerMidP:
		return onesample.Blaker, m == ExactBlakerMidP, true
	}
	return 0, false, false
}

// BinomialOptions are the options of Binomial. The zero value is the
// two-sided exact point-probability test with a 95% interval.
type BinomialOptions struct {
	Method      BinomialMethod // test; default ExactPoint
	Alternative Alternative    // default TwoSided
	// Level is the confidence level of the interval that inverts the test;
	// 0 means 0.95.
	Level float64
	// SkipInterval leaves Result.Interval nil. The p-value alone costs
	// microseconds; the interval, found by bisection, costs about a
	// hundred p-value evaluations (a few hundred for Blaker's test, and
	// for the point-probability test, whose exact search visits every jump
	// of the p-value near the ends, of order sqrt(n) evaluations: about
	// 10 ms at n = 1e6).
	SkipInterval bool
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
// relative. Cost: O(log n) PMF and tail evaluations for the p-value, about
// 3 microseconds at n = 1e6.
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
	if opt.Method < 0 || int(opt.Method) >= len(binomialNames) {
		return Result{}, argerr.Invalid(fn, "method", int(opt.Method), "is not a one-sample method")
	}
	if err := checkAlt(fn, opt.Alternative); err != nil {
		return Result{}, err
	}
	lvl, err := level(fn, opt.Level)
	if err != nil {
		return Result{}, err
	}
	m, alt := opt.Method, opt.Alternative
	r := newResult(m.String(), alt, binomialLogP(m, k, n, p0, alt))
	r.Estimate = float64(k) / float64(n)
	r.Null = p0
	switch m {
	case Score, ScoreCC:
		r.Statistic, r.StatisticName = scoreZ(k, n, p0, m == ScoreCC), "z"
	case LikelihoodRatio:
		r.Statistic, r.StatisticName = lrG2(k, n, p0), "G2"
	default:
		r.Statistic, r.StatisticName = float64(k), "k"
	}
	if _, mid, ex := m.exact(); !ex {
		if e := math.Min(float64(n)*p0, float64(n)*(1-p0)); e < 5 {
			r.Warnings = append(r.Warnings, fmt.Sprintf("normal approximation with min(n p0, n (1-p0)) = %.3g below 5 (common practice asks for 5 or more); prefer an exact method", e))
		}
	} else if mid {
		r.Warnings = append(r.Warnings, "mid-p value: not guaranteed to keep the size at or below alpha")
	}
	if n == 0 {
		r.Estimate = math.NaN()
		r.Warnings = append(r.Warnings, "no trials: the data carry no information (p-value 1, interval [0, 1])")
		if !opt.SkipInterval {
			r.Interval = &Interval{Lower: 0, Upper: 1, Level: lvl}
		}
		return r, nil
	}
	if !opt.SkipInterval {
		lp := func(p float64) float64 { return binomialLogP(m, k, n, p, alt) }
		om, _, ex := m.exact()
		scan := ex && om != onesample.Central && alt == TwoSided
		var lo, hi float64
		var gaps, ok bool
		if m == ExactPoint && alt == TwoSided {
			lo, hi, gaps, ok = sterne(k, n, math.Log1p(-lvl))
		} else {
			lo, hi, gaps, ok = invert(lp, math.Log1p(-lvl), r.Estimate, alt, scan)
		}
		if !ok {
			r.Warnings = append(r.Warnings, "no null value is accepted at this level: the interval is empty")
		} else if gaps {
			r.Warnings = append(r.Warnings, "the set of p0 this test accepts has gaps; the interval is its hull, and some p0 inside it are rejected")
		}
		r.Interval = &Interval{Lower: lo, Upper: hi, Level: lvl}
	}
	return r, nil
}

// binomialLogP returns the log p-value of method m for k of n at p0 in
// [0, 1] (the interval search evaluates the ends 0 and 1).
func binomialLogP(m BinomialMethod, k, n int64, p0 float64, alt Alternative) float64 {
	if om, mid, ok := m.exact(); ok {
		lp, err := onesample.LogPValue(k, n, onesample.Test{P0: p0, Method: om, Mid: mid, Alternative: onesample.Alternative(alt)})
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

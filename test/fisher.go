package test

import (
	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/onesample"
)

// FisherOptions are the options of Fisher; the zero value is the two-sided
// point-probability test without mid-p.
type FisherOptions struct {
	// Rule is the two-sided rule on the conditional (hypergeometric)
	// distribution f of x1 given the margins: PointProbability (the zero
	// value, Fisher's own definition: P(f(X1) <= f(x1)), "<=" within the
	// relative tolerance 1e-7, so tables of equal probability in exact
	// arithmetic are counted together) or Central (twice the smaller
	// conditional tail, capped at 1). Blaker is not offered for Fisher's
	// test.
	Rule        TwoSidedRule
	MidP        bool        // mid-p: half the probability of the tables exactly as extreme
	Alternative Alternative // Lower: p1 < p2; Higher: p1 > p2
}

// Fisher performs Fisher's exact test of H0: p1 = p2 for k1 successes of
// n1 and k2 of n2, conditional on both margins: given s = k1 + k2, the
// count X1 is hypergeometric,
//
//	P(X1 = x) = C(n1, x) C(n2, s-x) / C(n1+n2, s).
//
// One-sided p-values are the tails P(X1 <= k1) (Lower) and P(X1 >= k1)
// (Higher); two-sided as opt.Rule says. The mid-p value replaces the
// probability of the tables exactly as extreme as the observed one by half
// of it (Lancaster 1961; for one-sided tests P(X1 < k1) + P(X1 = k1)/2).
//
// Result: Statistic is k1 ("x1"), Estimate p1 - p2 (NaN with an empty
// sample), Null 0. No interval is attached.
//
// Errors: a count negative or above its sample size, n1 + n2 > 2^53, an
// unknown method or alternative; ErrTooLarge when the conditional
// distribution's standard deviation exceeds binom.MaxHyperStdDev (tables of
// more than about 1.7e10 with both margins balanced), where the p-value
// would sum that many terms and TwoSample's asymptotic tests answer.
//
// Accuracy and cost: the log p-value to about 1e-12 relative to
// max(1, |ln p|); the tables of equal probability on the other side are
// located by bisection on the PMF, then two tail evaluations, so the cost
// is O(log n) plus the tails.
//
// Source: Fisher RA (1935), The Design of Experiments; Agresti A (2002),
// Categorical Data Analysis, 2nd ed., section 3.5.
func Fisher(k1, n1, k2, n2 int64, opt FisherOptions) (Result, error) {
	const fn = "test.Fisher"
	if err := checkTwo(fn, k1, n1, k2, n2); err != nil {
		return Result{}, err
	}
	if opt.Rule != PointProbability && opt.Rule != Central {
		return Result{}, argerr.Invalid(fn, "Rule", int(opt.Rule), "is not a two-sided rule of Fisher's test; use PointProbability or Central")
	}
	if err := checkAlt(fn, opt.Alternative); err != nil {
		return Result{}, err
	}
	if _, err := binom.NewHyper(n1+n2, n1, k1+k2); err != nil {
		return Result{}, argerr.TooLarge(fn, "n1 + n2", n1+n2, "makes the conditional distribution too wide for an exact sum ("+err.Error()+"); at this size use TwoSample (the asymptotic tests agree with Fisher's there)")
	}
	name := "Fisher " + opt.Rule.String()
	if opt.Alternative != TwoSided {
		name = "Fisher"
	}
	if opt.MidP {
		name += " mid-p"
	}
	r := newResult(name, opt.Alternative, fisherLogP(k1, n1, k2, n2, opt))
	r.Statistic = Statistic{Name: "x1", Value: float64(k1)}
	r.Estimate = diffEstimate(k1, n1, k2, n2)
	if opt.MidP {
		r.Warnings = append(r.Warnings, "mid-p value: not guaranteed to keep the size at or below alpha")
	}
	if s := k1 + k2; s == 0 || s == n1+n2 || n1 == 0 || n2 == 0 {
		r.Warnings = append(r.Warnings, "a margin is 0: only one table is possible and the p-value is 1")
	}
	return r, nil
}

// fisherLogP returns the log p-value of Fisher's test for valid counts.
func fisherLogP(k1, n1, k2, n2 int64, opt FisherOptions) float64 {
	h := binom.Hyper{Total: n1 + n2, Successes: n1, Draws: k1 + k2}
	lo, hi := h.Support()
	if lo == hi {
		return 0
	}
	return onesample.LogPValueOf(h, lo, hi, k1, opt.Rule, opt.MidP, opt.Alternative)
}

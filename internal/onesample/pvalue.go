package onesample

import (
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/hyp"
	"github.com/kofnlab/kofn/internal/root"
	"github.com/kofnlab/kofn/internal/xmath"
)

// RelTol is the relative tolerance with which two probabilities count as
// equal when outcomes are ordered by them ("as or more extreme"): a is no
// larger than b when a <= b (1 + RelTol). 1e-7 is common practice; it is far
// above the rounding of the log-space probabilities (1e-13) and far below
// any real difference between the probabilities of distinct outcomes of a
// binomial with n up to 1e12, except outcomes whose probabilities are equal
// in exact arithmetic, which it keeps together.
const RelTol = 1e-7

// logRel is ln(1 + RelTol), the tolerance in log space.
var logRel = math.Log1p(RelTol)

// Rule is the two-sided rule (the one type, internal/hyp.TwoSidedRule).
type Rule = hyp.TwoSidedRule

// Alternative is the alternative hypothesis (internal/hyp.Alternative).
type Alternative = hyp.Alternative

// The rules and alternatives, re-exported for brevity inside the module.
const (
	PointProbability = hyp.PointProbability
	Central          = hyp.Central
	Blaker           = hyp.Blaker
	TwoSided         = hyp.TwoSided
	Lower            = hyp.Lower
	Higher           = hyp.Higher
)

// Test is a one-sample exact test: the null proportion, the two-sided
// definition, the mid-p switch and the alternative. Its zero value is the
// two-sided point-probability test of p0 = 0.
type Test struct {
	P0          float64     // null proportion, in [0, 1]
	Rule        Rule        // two-sided rule (ignored for one-sided alternatives)
	MidP        bool        // mid-p variant
	Alternative Alternative // alternative hypothesis
}

// check validates t and n for function fn.
func (t Test) check(fn string, n int64) error {
	if err := argerr.Count(fn, "n", n); err != nil {
		return err
	}
	if n > binom.MaxN {
		return argerr.TooLarge(fn, "n", n, "exceeds 2^53, the largest count held exactly in float64")
	}
	if err := argerr.Prob(fn, "p0", t.P0); err != nil {
		return err
	}
	if err := t.Rule.Check(fn, "rule"); err != nil {
		return err
	}
	if err := t.Alternative.Check(fn, "alternative"); err != nil {
		return err
	}
	return nil
}

// LogPValue returns ln p for k successes in n trials under test t: the
// natural log of the p-value defined in the package comment, in [-Inf, 0]
// (-Inf only where the p-value is exactly 0, at p0 = 0 or 1).
//
// Errors: k or n negative, k > n, n > 2^53, p0 outside [0, 1] or NaN, an
// unknown method or alternative.
//
// Cost: O(log n) evaluations of the binomial PMF and tails for the
// point-probability and central tests; O(log n) tail evaluations for
// Blaker's.
func LogPValue(k, n int64, t Test) (float64, error) {
	const fn = "onesample.LogPValue"
	if err := t.check(fn, n); err != nil {
		return math.NaN(), err
	}
	if err := argerr.KN(fn, "k", "n", k, n); err != nil {
		return math.NaN(), err
	}
	return t.logP(binom.Dist{N: n, P: t.P0}, k), nil
}

// LogAcceptability returns ln of Blaker's acceptability of p0 given k of n,
// the two-sided Blaker p-value, with mid selecting the mid-p variant. The
// Blaker confidence set at level 1-alpha is {p0 : acceptability >= alpha}.
func LogAcceptability(k, n int64, p0 float64, mid bool) (float64, error) {
	t := Test{P0: p0, Rule: Blaker, MidP: mid}
	if err := t.check("onesample.LogAcceptability", n); err != nil {
		return math.NaN(), err
	}
	if err := argerr.KN("onesample.LogAcceptability", "k", "n", k, n); err != nil {
		return math.NaN(), err
	}
	return t.logP(binom.Dist{N: n, P: p0}, k), nil
}

// logP is LogPValue without the argument checks.
func (t Test) logP(d binom.Dist, k int64) float64 {
	return LogPValueOf(d, 0, d.N, k, t.Rule, t.MidP, t.Alternative)
}

// Discrete is a distribution on the integers lo..hi whose PMF increases up
// to Mode() and decreases after it, with log-space tails; binom.Dist and
// binom.Hyper are Discrete.
type Discrete interface {
	LogProb(k int64) float64     // ln P(X = k)
	LogCDF(k int64) float64      // ln P(X <= k)
	LogSurvival(k int64) float64 // ln P(X > k)
	Mode() int64                 // a most probable value
}

// LogPValueOf returns the log p-value of the observed value x of d, whose
// support is lo..hi, under the definition (m, mid, alt) of the package
// comment: the one-sided tails for Lower and Higher, the point-probability,
// central or Blaker two-sided p-value otherwise. Fisher's exact test is
// this applied to the hypergeometric distribution. It does not validate
// its arguments: x must lie in lo..hi.
func LogPValueOf(d Discrete, lo, hi, x int64, m Rule, mid bool, alt Alternative) float64 {
	switch alt {
	case Lower:
		return lowerTail(d, x, mid)
	case Higher:
		return upperTail(d, x, mid)
	}
	switch m {
	case Central:
		return math.Min(0, math.Ln2+math.Min(lowerTail(d, x, mid), upperTail(d, x, mid)))
	case Blaker:
		return orderedP(d, lo, hi, x, blakerOrder(d, lo, hi), mid)
	}
	return orderedP(d, lo, hi, x, pointOrder(d), mid)
}

// lowerTail returns ln P(X <= k), or with mid ln(P(X < k) + P(X = k)/2).
func lowerTail(d Discrete, k int64, mid bool) float64 {
	if !mid {
		return d.LogCDF(k)
	}
	return LogAddExp(d.LogCDF(k-1), d.LogProb(k)-math.Ln2)
}

// upperTail returns ln P(X >= k), or with mid ln(P(X > k) + P(X = k)/2).
func upperTail(d Discrete, k int64, mid bool) float64 {
	if !mid {
		return d.LogSurvival(k - 1)
	}
	return LogAddExp(d.LogSurvival(k), d.LogProb(k)-math.Ln2)
}

// order is an ordering of the outcomes lo..hi by a log-scale value e
// (smaller is more extreme) that increases on [lo, peak-1] and decreases on
// [peak, hi].
type order struct {
	e    func(int64) float64
	peak int64
}

// pointOrder orders outcomes by their probability: the PMF increases up to
// the mode and decreases after it.
func pointOrder(d Discrete) order {
	return order{e: d.LogProb, peak: d.Mode()}
}

// blakerOrder orders outcomes by their smaller tail t(j) = min(P(X <= j),
// P(X >= j)). The lower tail rules below peak, the smallest j with
// P(X <= j) >= P(X >= j); from peak on t(j) = P(X >= j), decreasing.
func blakerOrder(d Discrete, lo, hi int64) order {
	peak := root.SmallestInt(func(j int64) bool { return d.LogCDF(j) >= d.LogSurvival(j-1) }, lo, hi)
	e := func(j int64) float64 { return math.Min(d.LogCDF(j), d.LogSurvival(j-1)) }
	return order{e: e, peak: peak}
}

// above returns [a, b], the set of outcomes j with o.e(j) > thr (a > b when
// it is empty). On k's side of the peak it searches only between k and the
// peak or between k and the end, whichever holds the boundary.
func (o order) above(lo, hi, k int64, thr float64) (a, b int64) {
	gt := func(j int64) bool { return o.e(j) > thr }
	le := func(j int64) bool { return o.e(j) <= thr }
	kin := gt(k)
	switch {
	case k >= o.peak:
		a = root.SmallestInt(gt, lo, o.peak-1)
	case kin:
		a = root.SmallestInt(gt, lo, k)
	case k+1 < o.peak && gt(k+1):
		a = k + 1
	default:
		a = root.SmallestInt(gt, k+1, o.peak-1)
	}
	switch {
	case k < o.peak:
		b = root.SmallestInt(le, o.peak, hi) - 1
	case kin:
		b = root.SmallestInt(le, k, hi) - 1
	case k-1 >= o.peak && gt(k-1):
		b = k - 1
	default:
		b = root.SmallestInt(le, o.peak, k) - 1
	}
	return a, b
}

// orderedP returns ln P(e(X) <= e(k)) within the tolerance, or its mid-p
// variant ln(P(e(X) < e(k)) + P(e(X) = e(k))/2).
func orderedP(d Discrete, lo, hi, k int64, o order, mid bool) float64 {
	ek := o.e(k)
	a1, b1 := o.above(lo, hi, k, ek+logRel)
	if !mid {
		return outside(d, a1, b1)
	}
	a0, b0 := o.above(lo, hi, k, ek-logRel)
	if a0 > b0 { // cannot happen: k itself is above ek - logRel
		a0, b0 = k, k
	}
	lt := outside(d, a0, b0)
	var tie float64
	if a1 > b1 {
		tie = logRange(d, a0, b0)
	} else {
		tie = LogAddExp(logRange(d, a0, a1-1), logRange(d, b1+1, b0))
	}
	return LogAddExp(lt, tie-math.Ln2)
}

// outside returns ln P(X < a or X > b); 0 when a > b (every outcome).
func outside(d Discrete, a, b int64) float64 {
	if a > b {
		return 0
	}
	return math.Min(0, LogAddExp(d.LogCDF(a-1), d.LogSurvival(b)))
}

// logRange returns ln P(lo <= X <= hi), summing the PMF for short ranges.
func logRange(d Discrete, lo, hi int64) float64 {
	if lo > hi {
		return math.Inf(-1)
	}
	if r, ok := d.(interface{ LogProbRange(lo, hi int64) float64 }); ok && hi-lo > 32 {
		return r.LogProbRange(lo, hi)
	}
	s := math.Inf(-1)
	for j := lo; j <= hi; j++ {
		s = LogAddExp(s, d.LogProb(j))
	}
	return s
}

// LogAddExp returns ln(e^a + e^b) without overflow or underflow; -Inf when
// both are -Inf. It is xmath.LogAddExp, kept for existing callers.
func LogAddExp(a, b float64) float64 { return xmath.LogAddExp(a, b) }

package onesample

import (
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/root"
)

// Acceptance returns the acceptance region of test t at level alpha with n
// trials: the outcomes k in [lo, hi] have p(k) >= alpha and are not
// rejected; every other outcome (k < lo or k > hi) has p(k) < alpha and is
// rejected. The region is always an interval, because every p-value here
// increases in k up to the centre of the distribution and decreases after
// it. When no outcome is accepted (only possible for mid-p tests with alpha
// above their largest p-value) it returns lo = 0, hi = -1.
//
// The exact size of the test at the true proportion p is then
// P(X < lo) + P(X > hi) under Binomial(n, p).
//
// Errors: as LogPValue, and alpha outside (0, 1).
//
// Cost: O(log n) p-value evaluations, each O(log n) PMF or tail
// evaluations.
func Acceptance(n int64, alpha float64, t Test) (lo, hi int64, err error) {
	const fn = "onesample.Acceptance"
	if err := t.check(fn, n); err != nil {
		return 0, -1, err
	}
	if err := argerr.OpenProb(fn, "alpha", alpha); err != nil {
		return 0, -1, err
	}
	d := binom.Dist{N: n, P: t.P0}
	la := math.Log(alpha)
	ok := func(k int64) bool { return t.logP(d, k) >= la }
	switch t.Alternative {
	case Lower: // p(k) = P(X <= k) increases in k
		lo, hi = root.SmallestInt(ok, 0, n), n
	case Higher: // p(k) = P(X >= k) decreases in k
		lo, hi = 0, root.SmallestInt(func(k int64) bool { return !ok(k) }, 0, n)-1
	}
	if t.Alternative != TwoSided {
		if lo > hi {
			return 0, -1, nil
		}
		return lo, hi, nil
	}
	// The p-value is unimodal in k with its maximum at the mode (point
	// probability) or at one of the two outcomes around the median split.
	var m int64
	if t.Rule == PointProbability {
		m = d.Mode()
	} else {
		m = blakerOrder(d, 0, n).peak
	}
	if m > 0 && t.logP(d, m-1) > t.logP(d, m) {
		m--
	}
	if !ok(m) {
		return 0, -1, nil
	}
	lo = root.SmallestInt(ok, 0, m)
	hi = root.SmallestInt(func(k int64) bool { return !ok(k) }, m, n) - 1
	return lo, hi, nil
}

package test

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/onesample"
)

// fisherCut returns the cut of Boschloo's region (see cutFunc) for the
// tables whose Fisher p-value under alt (two-sided by m) is at most
// e^thr, and the function giving ln of that p-value for a table of margin
// s. The p-values are test.Fisher's own (onesample.LogPValueOf on the
// hypergeometric law of X1 given s). In a margin the lower tail
// P(X1 <= x1) rises with x1 and the upper tail falls, and the two-sided
// point-probability p-value is a non-decreasing function of the table's
// probability, which is unimodal in x1; so each tail of the region is
// found by a monotone search (on either side of the mode for the
// point-probability definition), seeded by the margin before.
func fisherCut(n1, n2 int, alt Alternative, m TwoSidedRule) (logP func(s, x1 int) float64, cutAt func(thr float64) cutFunc) {
	N := int64(n1 + n2)
	hyp := func(s int) binom.Hyper { return binom.Hyper{Total: N, Successes: int64(n1), Draws: int64(s)} }
	oalt := alt
	logP = func(s, x1 int) float64 {
		h := hyp(s)
		lo, hi := h.Support()
		if lo == hi {
			return 0
		}
		return onesample.LogPValueOf(h, lo, hi, int64(x1), m, false, oalt)
	}
	cutAt = func(thr float64) cutFunc {
		ga, gb := 0, 0
		switch {
		case alt == Lower:
			return func(s, lo, hi int) (int, int) {
				ga = lastTrue(func(x int) bool { return logP(s, x) <= thr }, lo, hi, ga)
				return ga, hi + 1
			}
		case alt == Higher:
			return func(s, lo, hi int) (int, int) {
				gb = firstTrue(func(x int) bool { return logP(s, x) <= thr }, lo, hi, gb)
				return lo - 1, gb
			}
		case m == Central:
			// min(0, ln 2 + min(L, U)) <= thr exactly when one of the two
			// capped doubled tails is: L rises with x1, U falls.
			return func(s, lo, hi int) (int, int) {
				if lo == hi {
					if thr >= 0 {
						return hi, lo
					}
					return lo - 1, hi + 1
				}
				h := hyp(s)
				ga = lastTrue(func(x int) bool { return math.Min(0, math.Ln2+h.LogCDF(int64(x))) <= thr }, lo, hi, ga)
				gb = firstTrue(func(x int) bool { return math.Min(0, math.Ln2+h.LogSurvival(int64(x-1))) <= thr }, lo, hi, gb)
				return ga, gb
			}
		}
		return func(s, lo, hi int) (int, int) {
			if thr >= 0 {
				return hi, lo // every p-value is at most 1
			}
			if lo == hi {
				return lo - 1, hi + 1 // the one table has p = 1
			}
			h := hyp(s)
			mode := int(h.Mode())
			a, b, ok := certifyTails(func(x int) bool { return logP(s, x) <= thr },
				func(x int) float64 { return h.LogProb(int64(x)) }, lo, hi, mode,
				min(max(ga, lo-1), mode-1), max(min(gb, hi+1), mode+1))
			if !ok {
				in := func(x int) bool { return logP(s, x) <= thr }
				if in(mode) {
					return hi, lo
				}
				a, b = lastTrue(in, lo, mode-1, ga), firstTrue(in, mode+1, hi, gb)
			}
			ga, gb = a, b
			return a, b
		}
	}
	return logP, cutAt
}

// certifyTails returns the region [lo, a] and [b, hi] of the margin whose
// outcomes x are in the region when in(x), for a region that is the set
// of the outcomes no more likely than some cutoff (in(x) depends on x only
// through a non-decreasing function of the probability f(x), which is
// unimodal with its peak at mode), starting from the guess (a, b) with
// a < mode < b. Two decisions certify a guess: the more likely of its two
// end members (a, b) is in the region, so every less likely outcome is;
// the less likely of the two outcomes just inside (a+1, b-1) is not, so
// no more likely one is. A failed decision moves that end by one and the
// check repeats, with decisions cached; a region reaching the mode is the
// whole margin (hi, lo). ok is false after 8 moves (the caller then
// searches).
func certifyTails(in func(int) bool, f func(int) float64, lo, hi, mode, a, b int) (int, int, bool) {
	var cache [12]struct {
		x  int
		in bool
	}
	nc := 0
	dec := func(x int) bool {
		for i := range nc {
			if cache[i].x == x {
				return cache[i].in
			}
		}
		v := in(x)
		if nc < len(cache) {
			cache[nc].x, cache[nc].in = x, v
			nc++
		}
		return v
	}
	for range 8 {
		// The least extreme member.
		z := -1
		switch {
		case a >= lo && b <= hi:
			z = a
			if f(b) > f(a) {
				z = b
			}
		case a >= lo:
			z = a
		case b <= hi:
			z = b
		}
		if z >= 0 && !dec(z) {
			if z == a {
				a--
			} else {
				b++
			}
			continue
		}
		// The most extreme non-member.
		u := a + 1
		if b-1 != u && f(b-1) < f(a+1) {
			u = b - 1
		}
		if dec(u) {
			if u == mode {
				return hi, lo, true
			}
			if u == a+1 {
				a++
			} else {
				b--
			}
			continue
		}
		return a, b, true
	}
	return 0, 0, false
}

// logRelTol is ln(1 + 1e-7), the tolerance with which p-values and
// probabilities count as equal when tables are ordered by them.
var logRelTol = math.Log1p(1e-7)

// Boschloo performs Boschloo's unconditional exact test of H0: p1 = p2 for
// k1 successes of n1 and k2 of n2: the tables are ordered by their Fisher
// exact p-value (one-sided for Lower and Higher; two-sided by opt.Rule),
// smaller being more extreme, with ties within the relative tolerance 1e-7,
// and the p-value is the supremum over the common proportion pi of the
// probability of the tables whose Fisher p-value is at most the observed
// one. The supremum is found as for Barnard (grid and golden-section
// refinement, to better than 1e-6 in pi; optional Berger-Boos restriction).
// Boschloo's test is uniformly more powerful than Fisher's one-sided test
// at the same nominal level.
//
// Two-sided definition. The two-sided p-value here is a test in its own
// right: the tables are ordered by Fisher's two-sided p-value (by default
// the point-probability one, PointProbability; Central for
// twice the smaller conditional tail) and the supremum is taken of that
// two-sided region. Other software commonly defines the two-sided
// Boschloo p-value instead as twice the smaller one-sided Boschloo
// p-value, capped at 1 (SciPy's Boschloo function does so, as reported; not
// recomputed by this package's tests). The two can differ a lot at small
// n: for 1/1 vs 0/1 this function gives 1 (every table's two-sided Fisher
// p-value is 1), twice the one-sided value gives 2 x 0.25 = 0.5. A user
// comparing with such software should expect that definition there and
// can reproduce it here as min(1, 2 min(p_Less, p_Greater)) from two
// one-sided calls; neither Central nor the default gives it.
// Checked against an exact math/big enumeration with the same ordering in
// uncond_brute_test.go.
//
// Result: Statistic is the observed Fisher p-value ("Fisher p"), Estimate
// p1 - p2, Null 0, Nuisance the pi of the supremum.
//
// Special cases and errors: as Barnard (p = 1 exactly for an empty sample,
// where every Fisher p-value is 1).
//
// The region is held by margin as for Barnard: in each margin the
// ordering is monotone in x1 on each side of the hypergeometric mode (see
// fisherCut), so the region's tables there are two tails. Across margins
// the two-sided point-probability region is not Barnard-convex (some rows
// of x2 values have interior runs); the margin form does not need it.
//
// Cost: memory O(n1 + n2). Time: O(n1 + n2) margins, each two to three
// Fisher p-values (test.Fisher's, O(log) PMF evaluations plus two tails)
// and two tails, plus the supremum as for Barnard. Measured times are in
// the README.
//
// Source: Boschloo RD (1970), Raised conditional level of significance for
// the 2 x 2-table when testing the equality of two probabilities,
// Statistica Neerlandica 24:1-35.
func Boschloo(ctx context.Context, k1, n1, k2, n2 int64, opt UnconditionalOptions) (Result, error) {
	const fn = "test.Boschloo"
	name := "Boschloo"
	if opt.Alternative == TwoSided && opt.Rule == Central {
		name += " central"
	}
	return unconditional(ctx, fn, name, k1, n1, k2, n2, opt, "Fisher p", 1, func(ctx context.Context) (*region, float64, error) {
		logP, cutAt := fisherCut(int(n1), int(n2), opt.Alternative, opt.Rule)
		obs := logP(int(k1+k2), int(k1))
		reg, err := newRegion(ctx, fn, int(n1), int(n2), cutAt(obs+logRelTol))
		return reg, math.Exp(obs), err
	})
}

package test

import (
	"context"
	"math"
	"math/bits"
)

// zkey represents the pooled score statistic of a table exactly:
//
//	Z = (x1 n2 - x2 n1) sqrt(N) / sqrt(n1 n2 s (N - s)),  s = x1 + x2, N = n1 + n2,
//
// by the sign and absolute value of the integer numerator and the integer
// s(N-s), so tables whose statistics are equal in exact arithmetic compare
// equal (a floating-point comparison without tolerance drops such ties;
// see Mehta and Senchaudhuri 2003 in the tests). Z = 0 when the numerator
// is 0, which covers the tables with s = 0 or s = N. Both integers are at
// most N^2/4 (N <= MaxUnconditionalTotal, so below 2^40), and the
// comparisons multiply num^2 by den in 128 bits (below 2^120), exactly.
type zkey struct {
	sign     int
	num, den uint64
}

func newZKey(x1, x2, n1, n2 int) zkey {
	num := int64(x1)*int64(n2) - int64(x2)*int64(n1)
	s := int64(x1 + x2)
	den := uint64(s * (int64(n1+n2) - s))
	switch {
	case num > 0:
		return zkey{1, uint64(num), den}
	case num < 0:
		return zkey{-1, uint64(-num), den}
	}
	return zkey{}
}

// sqTimes returns num^2 d as a 128-bit integer (hi, lo), for num^2 d <
// 2^128.
func sqTimes(num, d uint64) (hi, lo uint64) {
	h, l := bits.Mul64(num, num)
	h1, lo := bits.Mul64(l, d)
	return h*d + h1, lo
}

// cmpAbs compares |Z_a| with |Z_b|: -1, 0 or +1, exactly (128-bit products).
func cmpAbs(a, b zkey) int {
	switch {
	case a.sign == 0 && b.sign == 0:
		return 0
	case a.sign == 0:
		return -1
	case b.sign == 0:
		return 1
	}
	h1, l1 := sqTimes(a.num, b.den)
	h2, l2 := sqTimes(b.num, a.den)
	switch {
	case h1 != h2:
		return cmp3(h1 > h2)
	case l1 != l2:
		return cmp3(l1 > l2)
	}
	return 0
}

func cmp3(gt bool) int {
	if gt {
		return 1
	}
	return -1
}

// le reports Z_a <= Z_b exactly.
func (a zkey) le(b zkey) bool {
	if a.sign != b.sign {
		return a.sign < b.sign
	}
	c := cmpAbs(a, b)
	if a.sign >= 0 {
		return c <= 0
	}
	return c >= 0
}

// value returns Z as a float64.
func (a zkey) value(n1, n2 int) float64 {
	if a.sign == 0 {
		return 0
	}
	z := float64(a.num) * math.Sqrt(float64(n1+n2)) / math.Sqrt(float64(n1)*float64(n2)*float64(a.den))
	return float64(a.sign) * z
}

// Barnard performs Barnard's unconditional exact test of H0: p1 = p2 for
// k1 successes of n1 and k2 of n2, ordering the tables by the pooled score
// statistic Z above (positive when p1 - p2 is estimated positive). The
// p-value is
//
//	sup over pi of P(T(X) as or more extreme than T(x) | p1 = p2 = pi),
//
// with "more extreme" meaning Z <= z (Lower), Z >= z (Higher) or
// |Z| >= |z| (two-sided), decided exactly in integer arithmetic. The
// supremum is found by the grid and golden-section refinement described on
// supremum, so it is located to better than 1e-6 in pi; opt.BergerBoos
// restricts it to a confidence interval (Berger and Boos 1994).
//
// The region is held by margin (see region): given the total s = x1 + x2,
// Z is increasing in x1, so the region's tables of each margin are two
// tails of x1, found by monotone searches of exact comparisons seeded by
// the margin before, and weighted by their hypergeometric probability.
// (The pooled score statistic also satisfies Barnard's convexity
// condition, tested in barnard_test.go for n1, n2 up to 25; the margin
// form does not need it.)
//
// Result: Statistic is z ("z"), Estimate p1 - p2, Null 0, Nuisance the pi
// of the supremum.
//
// Special cases, exact without a search (derived on unconditional): an
// empty sample (n1 = 0 or n2 = 0) gives p = 1 with a warning, since every
// table then has Z = 0; a region holding the table (0, 0) (or (n1, n2))
// gives p = 1 attained at pi = 0 (or 1), which covers no successes (or no
// failures) in both samples (also warned) and a one-sided test whose
// observed z points the other way.
//
// Errors: invalid counts, an unknown alternative, BergerBoos outside
// {0} and (0, 0.5), n1 + n2 > MaxUnconditionalTotal (ErrTooLarge), a
// cancelled ctx (wrapping ctx.Err(); checked every 16 margins, every 16
// grid points and inside the full sums, so a call returns within 10 ms of
// cancellation at any size up to the limit).
//
// Cost: memory O(n1 + n2). Time: for the region, O(n1 + n2) margins, each
// a few exact comparisons and two hypergeometric tails of
// O(sqrt(n1 n2 / (n1 + n2))) terms; for the supremum, O(sqrt(n1 + n2))
// grid points of O(sqrt(n1 + n2)) each (the windowed sums of
// logProbBound), plus the refinement. Measured times are in the README.
//
// Sources: Barnard GA (1947), Significance tests for 2x2 tables,
// Biometrika 34:123-138; Suissa S, Shuster JJ (1985), Exact unconditional
// sample sizes for the 2x2 binomial trial, JRSS A 148:317-327 (the pooled
// Z ordering); Mehta CR, Senchaudhuri P (2003).
func Barnard(ctx context.Context, k1, n1, k2, n2 int64, opt UnconditionalOptions) (Result, error) {
	const fn = "test.Barnard"
	return unconditional(ctx, fn, "Barnard", k1, n1, k2, n2, opt, "z", 0, func(ctx context.Context) (*region, float64, error) {
		obs := newZKey(int(k1), int(k2), int(n1), int(n2))
		reg, err := newRegion(ctx, fn, int(n1), int(n2), barnardCut(int(n1), int(n2), obs, opt.Alternative))
		return reg, obs.value(int(n1), int(n2)), err
	})
}

// barnardCut returns the cut (see cutFunc) of Barnard's region for the
// observed statistic obs under alt. In the margin s, z is increasing in x1
// (its numerator is x1 (n1 + n2) - s n1, its denominator fixed), so each
// tail of the region is found by a monotone search of exact comparisons,
// seeded by the margin before.
func barnardCut(n1, n2 int, obs zkey, alt Alternative) cutFunc {
	key := func(s int) func(x1 int) zkey { return func(x1 int) zkey { return newZKey(x1, s-x1, n1, n2) } }
	ga, gb := 0, 0
	switch {
	case alt == Lower:
		return func(s, lo, hi int) (int, int) {
			k := key(s)
			ga = lastTrue(func(x int) bool { return k(x).le(obs) }, lo, hi, ga)
			return ga, hi + 1
		}
	case alt == Higher:
		return func(s, lo, hi int) (int, int) {
			k := key(s)
			gb = firstTrue(func(x int) bool { return obs.le(k(x)) }, lo, hi, gb)
			return lo - 1, gb
		}
	case obs.sign == 0:
		return func(s, lo, hi int) (int, int) { return hi, lo } // |z| >= 0: every table
	}
	neg, pos := zkey{-1, obs.num, obs.den}, zkey{1, obs.num, obs.den}
	return func(s, lo, hi int) (int, int) {
		k := key(s)
		ga = lastTrue(func(x int) bool { return k(x).le(neg) }, lo, hi, ga)
		gb = firstTrue(func(x int) bool { return pos.le(k(x)) }, lo, hi, gb)
		return ga, gb
	}
}

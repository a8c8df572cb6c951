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
// by the sign and square of the integer numerator and the integer s(N-s),
// so tables whose statistics are equal in exact arithmetic compare equal
// (a floating-point comparison without tolerance drops such ties; see
// Mehta and Senchaudhuri 2003 in the tests). Z = 0 when the numerator is
// 0, which covers the tables with s = 0 or s = N.
type zkey struct {
	sign    int
	sq, den uint64
}

func newZKey(x1, x2, n1, n2 int) zkey {
	num := int64(x1)*int64(n2) - int64(x2)*int64(n1)
	s := int64(x1 + x2)
	den := uint64(s * (int64(n1+n2) - s))
	switch {
	case num > 0:
		return zkey{1, uint64(num * num), den}
	case num < 0:
		return zkey{-1, uint64(num * num), den}
	}
	return zkey{}
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
	h1, l1 := bits.Mul64(a.sq, b.den)
	h2, l2 := bits.Mul64(b.sq, a.den)
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
	z := math.Sqrt(float64(a.sq)) * math.Sqrt(float64(n1+n2)) / math.Sqrt(float64(n1)*float64(n2)*float64(a.den))
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
// The pooled score statistic satisfies Barnard's convexity condition (if a
// table is in the rejection region, so is every table with a smaller x1 or
// a larger x2, for Lower; tested in barnard_test.go for n1, n2 up to 25),
// so each row of the rejection region is a prefix and/or suffix of x2
// values and each nuisance value costs O(n1 + n2); the region itself costs
// O(n1 n2) exact comparisons, once. (Rows that broke the condition would
// still be summed correctly, as interior runs, only more slowly.)
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
// {0} and (0, 0.5), (n1+1)(n2+1) > MaxUnconditionalTables (ErrTooLarge),
// a cancelled ctx (wrapping ctx.Err()).
//
// Cost: O(n1 n2) for the region plus O(n1 + n2) for the supremum (each of
// its O(sqrt(n1 + n2)) grid points costs O(sqrt(n1) + sqrt(n2)) by the
// windowed sums of logProbBound), so the size limit bounds the time: about
// 0.4 ms at n1 = n2 = 100, 30 ms at 2000 x 2000, 0.35 s at 1e6 x 1
// (benchmarks, two loaded cores).
//
// Sources: Barnard GA (1947), Significance tests for 2x2 tables,
// Biometrika 34:123-138; Suissa S, Shuster JJ (1985), Exact unconditional
// sample sizes for the 2x2 binomial trial, JRSS A 148:317-327 (the pooled
// Z ordering); Mehta CR, Senchaudhuri P (2003).
func Barnard(ctx context.Context, k1, n1, k2, n2 int64, opt UnconditionalOptions) (Result, error) {
	const fn = "test.Barnard"
	return unconditional(ctx, fn, "Barnard", k1, n1, k2, n2, opt, "z", 0, func(ctx context.Context) (*region, float64, error) {
		a, b := int(n1), int(n2)
		obs := newZKey(int(k1), int(k2), a, b)
		var in func(x1, x2 int) bool
		switch opt.Alternative {
		case Lower:
			in = func(x1, x2 int) bool { return newZKey(x1, x2, a, b).le(obs) }
		case Higher:
			in = func(x1, x2 int) bool { return obs.le(newZKey(x1, x2, a, b)) }
		default:
			in = func(x1, x2 int) bool { return cmpAbs(newZKey(x1, x2, a, b), obs) >= 0 }
		}
		reg, err := newRegion(ctx, fn, a, b, in)
		return reg, obs.value(a, b), err
	})
}

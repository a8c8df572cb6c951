package test

import (
	"context"
	"math"
	"testing"
)

// TestTrapezoidDiscretisationBound checks the discretisation bound the rule
// rests on, |T_h - I| <= 2 sec(a/2)^N / (e^(2 pi a/h) - 1) I (Trefethen and
// Weideman 2014, SIAM Review 56(3), Theorem 5.1, recalled, with the
// strip bound sec(a/2)^N derived in bayes_trapezoid.go), independently of
// that derivation: at steps far coarser than the rule's own, where the
// discretisation error is large enough to see, against exact values from
// the closed-form sums of integer shapes (bnbSum, itself checked against
// mpmath in TestCompareGolden), taking for each h the best a in (0, pi).
// Steps whose bound is 1/2 or more (where it says nothing) are skipped. It
// also checks that the bound is not vacuous: the largest ratio of actual
// error to bound is above 0.1 (0.46 when written: the bound is within a
// factor of a few of the truth for shapes near t = 0, looser for mass far
// out, as for 1 of 30 against 2 of 40).
func TestTrapezoidDiscretisationBound(t *testing.T) {
	t.Parallel()
	worst := 0.0
	for _, c := range [][4]float64{{3, 5, 4, 2}, {1, 1, 1, 1}, {2, 7, 5, 3}, {10, 20, 15, 12}, {1, 30, 2, 40}} {
		a1, b1, a2, b2 := c[0], c[1], c[2], c[3]
		n := a1 + b1 + a2 + b2
		exact := []float64{bnbSum(a1, b1, a2, b2), bnbSum(a2, b2, a1, b1)}
		for _, h0 := range []float64{2, 1.5, 1, 0.75, 0.5} {
			// The best a for this step, on a grid.
			best, bestA := math.Inf(1), 0.0
			for a := 0.01; a < math.Pi; a += 0.01 {
				if e := discBound(n, a, h0); e < best {
					best, bestA = e, a
				}
			}
			if best >= 0.5 {
				continue
			}
			rule := ruleWith(n, bestA, h0)
			if rule.h != h0 {
				t.Fatalf("step %v not kept exactly: %v", h0, rule.h)
			}
			lp, rel, _, err := ruleSums(context.Background(), "test", []float64{a1, a2}, []float64{b1, b2}, rule, 0)
			if err != nil {
				t.Fatal(err)
			}
			for i := range lp {
				got, want := math.Exp(lp[i]), math.Exp(exact[i])
				actual := math.Abs(got-want) / want
				if !(actual <= rel[i]) || !(rel[i] >= rule.eps) {
					t.Errorf("%v h = %v arm %d: relative error %.3g exceeds the bound %.3g (discretisation %.3g)", c, h0, i, actual, rel[i], rule.eps)
				}
				worst = math.Max(worst, actual/rel[i])
				t.Logf("%v h = %v arm %d: error %.3g, bound %.3g (ratio %.2g)", c, h0, i, actual, rel[i], actual/rel[i])
			}
		}
	}
	if !(worst > 0.1) {
		t.Errorf("largest ratio of error to bound %.3g: the bound looks vacuous", worst)
	}
}

// TestTrapezoidRule: the rule picked for a total shape has its
// discretisation bound below 2^-53 and a step that is exact on its grid.
func TestTrapezoidRule(t *testing.T) {
	t.Parallel()
	for _, n := range []float64{0.4, 1, 3, 10, 100, 1e3, 1e4, 1e5, 6.4e6, 1e9} {
		r := newLogOddsRule(n)
		if !(r.eps <= discTarget) || !(r.h > 0) || math.Mod(r.h, r.grid) != 0 || r.h/r.grid < 8 || r.h/r.grid >= 16 {
			t.Errorf("N = %v: rule %+v", n, r)
		}
	}
}

package test

import (
	"math"
	"testing"
)

// TestBNBSumIdentity sums both P(X > Y) and P(Y > X) directly, each from
// its own integer shape, and checks that they add to 1 (continuous
// posteriors: P(X = Y) = 0), and that the p -> 1-p mirror gives the same
// value from the other shape.
func TestBNBSumIdentity(t *testing.T) {
	t.Parallel()
	for _, c := range [][4]float64{{4, 8, 8, 6}, {51, 51, 41, 61}, {1, 1001, 6, 996}, {9001, 1001, 8901, 1101}, {4, 999998, 31, 999971}, {4999001, 5001001, 5001001, 4999001}, {1001, 1, 1000, 2}} {
		a1, b1, a2, b2 := c[0], c[1], c[2], c[3]
		l12 := bnbSum(a1, b1, a2, b2)
		l21 := bnbSum(a2, b2, a1, b1)
		if s := math.Exp(l12) + math.Exp(l21); math.Abs(s-1) > 2e-14 {
			t.Errorf("%v: P12 + P21 = 1 + %.3g", c, s-1)
		}
		if m := bnbSum(b2, a2, b1, a1); math.Abs(m-l12) > 1e-13*math.Max(1, math.Abs(l12)) {
			t.Errorf("%v: mirror gives %v, direct %v", c, m, l12)
		}
	}
}

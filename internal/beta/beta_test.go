package beta

import (
	"math"
	"testing"
)

// TestLogBeta compares LogBeta with lgamma differences where those are
// exact enough (small arguments; math.Lgamma, Go's port of the Cephes /
// FreeBSD routine), and checks B(1, b) = 1/b and B(1/2, 1/2) = pi exactly.
func TestLogBeta(t *testing.T) {
	t.Parallel()
	for _, c := range [][2]float64{{0.5, 0.5}, {1, 7}, {2.5, 3.25}, {0.01, 40}, {37.5, 963.5}} {
		la, _ := math.Lgamma(c[0])
		lb, _ := math.Lgamma(c[1])
		lab, _ := math.Lgamma(c[0] + c[1])
		want := la + lb - lab
		if got := LogBeta(c[0], c[1]); math.Abs(got-want) > 1e-13*math.Max(1, math.Abs(want)) {
			t.Errorf("LogBeta(%v, %v) = %v, want %v", c[0], c[1], got, want)
		}
	}
	if got := LogBeta(0.5, 0.5); math.Abs(got-math.Log(math.Pi)) > 1e-15 {
		t.Errorf("ln B(1/2, 1/2) = %v, want ln pi", got)
	}
	if got := LogBeta(1, 9); math.Abs(got+math.Log(9)) > 1e-15 {
		t.Errorf("ln B(1, 9) = %v, want -ln 9", got)
	}
}

// TestTailsAndQuantiles: both tails sum to 1, the closed form of the
// Beta(1, b) distribution function 1 - (1-x)^b, and Quantile inverts
// each tail (on the log-odds scale) over a sweep.
func TestTailsAndQuantiles(t *testing.T) {
	t.Parallel()
	for _, c := range [][2]float64{{0.5, 0.5}, {1, 7}, {30, 2}, {5, 27}, {1000, 2}, {500001, 500001}, {2.5, 99998.5}} {
		a, b := c[0], c[1]
		for _, lp := range []float64{-1e-9, -0.1, -math.Ln2, -3, -40, -700} {
			for _, up := range []bool{false, true} {
				tq := Quantile(a, b, lp, up)
				if math.Abs(tq) >= tMax-1e-3 {
					continue // the quantile lies beyond the doubles (documented clamp)
				}
				x, y := XY(tq)
				var got float64
				if up {
					got = LogUpper(a, b, x, y)
				} else {
					got = LogCDF(a, b, x, y)
				}
				// The tail moves by its log-derivative times the rounding of x.
				slope := math.Exp(LogDensityXY(a, b, x, y) - got)
				if e := math.Abs(got - lp); e > 1e-12*math.Max(1, -lp)+4e-16*slope*math.Max(1, math.Abs(math.Log(x/y))) {
					t.Errorf("Beta(%v, %v) %v tail at its quantile for %v: %v", a, b, up, lp, got)
				}
				if s := math.Exp(LogCDF(a, b, x, y)) + math.Exp(LogUpper(a, b, x, y)); math.Abs(s-1) > 1e-13 {
					t.Errorf("Beta(%v, %v) at %v: tails sum to %v", a, b, x, s)
				}
			}
		}
	}
	for _, x := range []float64{1e-300, 1e-6, 0.3, 0.9} {
		want := -math.Expm1(7 * math.Log1p(-x))
		if got := math.Exp(LogCDF(1, 7, x, 1-x)); math.Abs(got-want) > 1e-14*want {
			t.Errorf("Beta(1, 7) CDF at %v = %v, want %v", x, got, want)
		}
	}
}

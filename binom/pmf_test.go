package binom

import (
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

// TestLogProbSpecialCases pins values that follow from the definition.
func TestLogProbSpecialCases(t *testing.T) {
	t.Parallel()
	inf := math.Inf(-1)
	tests := []struct {
		d    Dist
		k    int64
		want float64
	}{
		{Dist{10, 0.3}, -1, inf},
		{Dist{10, 0.3}, 11, inf},
		{Dist{10, 0}, 0, 0},
		{Dist{10, 0}, 1, inf},
		{Dist{10, 1}, 10, 0},
		{Dist{10, 1}, 9, inf},
		{Dist{0, 0.7}, 0, 0},
		{Dist{1e12, 1e-12}, 0, 1e12 * math.Log1p(-1e-12)},
		{Dist{1e12, 0.5}, 1e12, 1e12 * math.Log(0.5)},
		// C(4, 2) / 16 = 3/8 (common arithmetic).
		{Dist{4, 0.5}, 2, math.Log(3.0 / 8)},
		// C(20, 3) 0.1^3 0.9^17 = 1140 * 0.001 * 0.9^17.
		{Dist{20, 0.1}, 3, math.Log(1140*0.001) + 17*math.Log(0.9)},
	}
	for _, tc := range tests {
		got := tc.d.LogProb(tc.k)
		if diff := cmp.Diff(tc.want, got, cmpopts.EquateApprox(1e-14, 0)); diff != "" {
			t.Errorf("%v.LogProb(%d) (-want +got):\n%s", tc.d, tc.k, diff)
		}
	}
	for _, d := range []Dist{{-1, 0.5}, {3, 1.5}, {3, math.NaN()}} {
		if v := d.LogProb(1); !math.IsNaN(v) {
			t.Errorf("%v.LogProb(1) = %v, want NaN", d, v)
		}
	}
}

// TestStirlerr checks the table against the series where they meet and
// the series against lgamma where lgamma is still accurate (n <= 1000 the
// difference lgamma(n+1) - (n+1/2) ln n + n - ln sqrt(2 pi) loses only a
// few digits of a value near 1/(12 n)).
func TestStirlerr(t *testing.T) {
	t.Parallel()
	for _, n := range []float64{1, 2, 5, 10, 15, 16, 20, 35, 36, 80, 81, 500, 501, 1000} {
		lg, _ := math.Lgamma(n + 1)
		want := lg - (n+0.5)*math.Log(n) + n - 0.5*ln2pi
		if got := stirlerr(n); math.Abs(got-want) > 2e-13*math.Max(1, n/100) {
			t.Errorf("stirlerr(%v) = %v, lgamma gives %v", n, got, want)
		}
	}
}

// TestBd0 checks the deviance term against its closed form where that is
// well conditioned, and against the first term (x-m)^2/(2m) where x and m
// agree to far below the rounding unit of m (carried by the low part).
func TestBd0(t *testing.T) {
	t.Parallel()
	for _, c := range [][2]float64{{3, 10}, {10, 3}, {1e6, 2e6}, {0.5, 20}} {
		x, m := c[0], c[1]
		want := x*math.Log(x/m) + m - x
		if got := bd0(x, m, 0); math.Abs(got-want) > 1e-14*want {
			t.Errorf("bd0(%v, %v) = %v, want %v", x, m, got, want)
		}
	}
	// m = 6e11 + 2.2e-5 held as hi + lo; x = 6e11.
	x, hi, lo := 6e11, 6e11, 2.2e-5
	want := lo * lo / (2 * x)
	if got := bd0(x, hi, lo); math.Abs(got-want) > 1e-10*want {
		t.Errorf("bd0 with low part: %v, want %v", got, want)
	}
}

package root

import (
	"errors"
	"math"
	"testing"
)

func TestBrent(t *testing.T) {
	t.Parallel()
	// Roots known in closed form (common practice test functions).
	tests := []struct {
		name   string
		f      func(float64) float64
		lo, hi float64
		want   float64
	}{
		{"cubic", func(x float64) float64 { return x*x*x - 2 }, 0, 2, math.Cbrt(2)},
		{"cos", math.Cos, 0, 3, math.Pi / 2},
		{"steep", func(x float64) float64 { return math.Expm1(50 * (x - 0.3)) }, 0, 1, 0.3},
		{"tiny", func(x float64) float64 { return x*1e300 - 0.5 }, 1e-320, 1, 5e-301},
	}
	for _, tc := range tests {
		got, err := Brent(tc.f, tc.lo, tc.hi, 1e-15, 0)
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		if math.Abs(got-tc.want) > 4e-15*math.Abs(tc.want) {
			t.Errorf("%s: got %.17g, want %.17g", tc.name, got, tc.want)
		}
	}
	if _, err := Brent(func(x float64) float64 { return x*x + 1 }, -1, 1, 1e-12, 0); !errors.Is(err, ErrNoBracket) {
		t.Errorf("unbracketed: err = %v", err)
	}
	if _, err := Brent(func(x float64) float64 { return math.NaN() }, -1, 1, 1e-12, 0); err == nil {
		t.Error("NaN function: no error")
	}
}

func TestBisectAndSmallestInt(t *testing.T) {
	t.Parallel()
	got := Bisect(func(x float64) bool { return x >= 0.123456789 }, 0, 1, 1e-15, 0)
	if math.Abs(got-0.123456789) > 1e-15 {
		t.Errorf("Bisect = %.17g", got)
	}
	for _, c := range []struct{ thr, lo, hi, want int64 }{{17, 0, 100, 17}, {0, 0, 100, 0}, {101, 0, 100, 101}, {-5, -10, 10, -5}} {
		if g := SmallestInt(func(x int64) bool { return x >= c.thr }, c.lo, c.hi); g != c.want {
			t.Errorf("SmallestInt(>= %d on [%d,%d]) = %d, want %d", c.thr, c.lo, c.hi, g, c.want)
		}
	}
}

package power

import (
	"errors"
	"testing"
)

// Effects too small for any feasible study must be refused, not rounded to
// a meaningless n (a review found 3.9e24 reported as n = 1). The real sizes
// follow from the formulas: (z_a sqrt(pq) + z_b sqrt(pq))^2 / d^2 with
// d = 1e-12 is about 2e24 (common-practice normal formula).
func TestNormalSizeTooLarge(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name string
		err  error
		want error
	}{
		{"two-sample, d = 1e-12", errOf(TwoSampleNormalN(0.5, 0.5+1e-12, TwoSampleOptions{})), ErrTooLarge},
		{"paired, d = 1e-12", errOf(PairedNormalN(0.1, 0.1+1e-12, PairedOptions{})), ErrTooLarge},
		{"one-sample, d = 1e-9", errOf(OneSampleNormalN(0.5, 0.5+1e-9, OneSampleOptions{})), ErrTooLarge},
		{"one-sample, p0 = 1e-200, p1 = 0", errOf(OneSampleNormalN(1e-200, 0, OneSampleOptions{})), ErrTooLarge},
	}
	for _, tc := range cases {
		if !errors.Is(tc.err, tc.want) {
			t.Errorf("%s: error %v, want %v", tc.name, tc.err, tc.want)
		}
	}
	// Subnormal effect: the formula is 0/0 or overflows; either way an error.
	if _, err := OneSampleNormalN(5e-324, 0, OneSampleOptions{}); err == nil {
		t.Error("OneSampleNormalN(5e-324, 0): no error")
	}
	// Still fine just below the limit: d = 1e-6 needs about 2e12 per group.
	if r, err := TwoSampleNormalN(0.5, 0.5+1e-6, TwoSampleOptions{}); err != nil || r.N < 1e12 {
		t.Errorf("TwoSampleNormalN(0.5, 0.500001) = %d, %v", r.N, err)
	}
}

func TestCeilN(t *testing.T) {
	t.Parallel()
	// Snapping only absorbs rounding error, never a real fraction.
	for _, c := range []struct {
		x    float64
		want int64
	}{
		{299.0000000001, 299}, {298.2, 299}, {1e10 + 0.3, 1e10 + 1}, {0.2, 1}, {4, 4},
	} {
		if got := ceilN(c.x); got != c.want {
			t.Errorf("ceilN(%v) = %d, want %d", c.x, got, c.want)
		}
	}
}

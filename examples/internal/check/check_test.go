package check

import (
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

// TestWilson checks the closed form against Newcombe RG (1998), Two-sided
// confidence intervals for the single proportion, Statistics in Medicine
// 17:857-872, Table II, method 3 (recalled, recomputed).
func TestWilson(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		k, n   float64
		lo, hi float64
	}{{81, 263, 0.2553, 0.3662}, {0, 20, 0, 0.1611}} {
		lo, hi := Wilson(c.k, c.n)
		if diff := cmp.Diff([]float64{c.lo, c.hi}, []float64{lo, hi}, cmpopts.EquateApprox(0, 5e-5)); diff != "" {
			t.Errorf("%g/%g (-want +got):\n%s", c.k, c.n, diff)
		}
	}
}

// TestBinomCDF checks the term sum against Montgomery's OC values for the
// plan n = 89, c = 2 (Introduction to Statistical Quality Control).
func TestBinomCDF(t *testing.T) {
	t.Parallel()
	got := []float64{BinomCDF(2, 89, 0.01), BinomCDF(2, 89, 0.02), BinomCDF(2, 89, 0.05), BinomCDF(2, 89, 0)}
	want := []float64{0.93969, 0.736578, 0.172077, 1}
	if diff := cmp.Diff(want, got, cmpopts.EquateApprox(0, 5e-6)); diff != "" {
		t.Errorf("(-want +got):\n%s", diff)
	}
}

// TestRows checks that numbers are read after the label only, with signs and
// exponents.
func TestRows(t *testing.T) {
	t.Parallel()
	out := "  n = 30  11  0.0256\n  other 1\n  n = 30  -2.5e-3 +4\n"
	want := [][]float64{{11, 0.0256}, {-2.5e-3, 4}}
	if diff := cmp.Diff(want, Rows(t, out, "n = 30")); diff != "" {
		t.Errorf("(-want +got):\n%s", diff)
	}
}

package xmath

import (
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

func TestLog(t *testing.T) {
	t.Parallel()
	// Reference: mpmath 1.2.1 at 30 digits, mpmath.log(mpmath.mpf(x)) of
	// the double x converted exactly.
	xs := []float64{5e-324, 1e-310, 4e-311, 2e-308, 2.2250738585072014e-308, 0.5}
	want := []float64{-744.44007192138126231, -713.8013788281541651, -714.71766956002836957,
		-708.50306146160612546, -708.39641853226410622, -0.69314718055994530942}
	got := make([]float64, len(xs))
	for i, x := range xs {
		got[i] = Log(x)
	}
	if diff := cmp.Diff(want, got, cmpopts.EquateApprox(4e-16, 0)); diff != "" {
		t.Errorf("Log (-want +got):\n%s", diff)
	}
	if !math.IsInf(Log(0), -1) || !math.IsNaN(Log(-1)) || !math.IsInf(Log(math.Inf(1)), 1) {
		t.Error("special cases differ from math.Log")
	}
}

package xmath

import (
	"fmt"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/golden"
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

// Reference values for the tests below: mpmath 1.2.1 at 40 digits (the
// definitions evaluated directly), computed for this test.

func TestDeviance(t *testing.T) {
	t.Parallel()
	tests := []struct{ x, m, want float64 }{
		{10, 10.5, 0.012098358305679969346},
		{1000000.0, 1000001.0, 4.9999966666691666647e-7},
		{3, 100, 86.48032630804005497},
		{100, 3, 253.65578973199816766},
		{1000000000000.0, 999999999000.0, 5.0000000033333333358e-7},
		{0.5, 0.7, 0.031763881689393522059},
		{0, 2.5, 2.5},
		// x/m overflows: closed form 1 ln(1/m) + m - 1 with m = 10 2^-1074
		// (exact), that is 1074 ln 2 - ln 10 - 1 (m itself is negligible).
		{1, 10 * 0x1p-1074, 1074*math.Ln2 - math.Ln10 - 1},
		{2, 1e-310, 1426.98905201742822082}, // mpmath 1.3.0: 2 ln(2/m) + m - 2
	}
	for _, tc := range tests {
		if diff := cmp.Diff(tc.want, Deviance(tc.x, tc.m), cmpopts.EquateApprox(1e-14, 0)); diff != "" {
			t.Errorf("Deviance(%g, %g) (-want +got):\n%s", tc.x, tc.m, diff)
		}
	}
	if !math.IsInf(Deviance(1, 0), 1) {
		t.Error("Deviance(1, 0) is not +Inf")
	}
}

func TestStirlingError(t *testing.T) {
	t.Parallel()
	tests := []struct{ x, want float64 }{
		{0.5, 0.15342640972002734529},
		{0.01, 1.4340079537031842008},
		{2.25, 0.036805303309148515599},
		{1.0, 0.08106146679532725822},
		{7.5, 0.011104559758206917327},
		{15.0, 0.005554733551962801371},
		{15.5, 0.0053755990329268344936},
		{100.0, 0.00083333055563491468338},
		{1000000.0, 8.3333333333330555556e-8},
	}
	for _, tc := range tests {
		if diff := cmp.Diff(tc.want, StirlingError(tc.x), cmpopts.EquateApprox(1e-14, 0)); diff != "" {
			t.Errorf("StirlingError(%g) (-want +got):\n%s", tc.x, diff)
		}
	}
}

func TestLogSums(t *testing.T) {
	t.Parallel()
	tests := []struct{ a, b, sum, diff float64 }{
		{-1000, -1001, -999.68673831248177717, -1000.4586751453870819},
		{0, -1e-20, 0.69314718055994530941, -46.051701859880913735},
		{-745, -745.5, -744.52592301581989332, -745.93275212956718857},
	}
	opt := cmpopts.EquateApprox(1e-15, 0)
	for _, tc := range tests {
		got := []float64{LogAddExp(tc.a, tc.b), LogAddExp(tc.b, tc.a), LogDiffExp(tc.a, tc.b)}
		if diff := cmp.Diff([]float64{tc.sum, tc.sum, tc.diff}, got, opt); diff != "" {
			t.Errorf("a = %g, b = %g (-want +got):\n%s", tc.a, tc.b, diff)
		}
	}
	inf := math.Inf(-1)
	if LogAddExp(inf, -3) != -3 || !math.IsInf(LogAddExp(inf, inf), -1) || LogDiffExp(-3, inf) != -3 || !math.IsInf(LogDiffExp(-3, -3), -1) {
		t.Error("special cases of LogAddExp / LogDiffExp")
	}
	for _, tc := range []struct{ x, want float64 }{
		{-1e-20, -46.051701859880913735}, {-0.5, -0.93275212956718857189},
		{-1, -0.45867514538708189102}, {-50, -1.928749847963917783e-22},
	} {
		if diff := cmp.Diff(tc.want, Log1mExp(tc.x), opt); diff != "" {
			t.Errorf("Log1mExp(%g) (-want +got):\n%s", tc.x, diff)
		}
	}
	if !math.IsInf(Log1mExp(0), -1) || !math.IsNaN(Log1mExp(1)) {
		t.Error("special cases of Log1mExp")
	}
	// Subnormal argument: ln(1 - e^x) ~ ln(-x) = ln 1e-310.
	if diff := cmp.Diff(-713.8013788281541651, Log1mExp(-1e-310), opt); diff != "" {
		t.Errorf("Log1mExp(-1e-310) (-want +got):\n%s", diff)
	}
}

// TestStirlingErrorGolden: 669 points from 0.01 to 1e12, dense on [0.01,
// 40] where the method changes (Lgamma, recurrence, series), against
// 60-digit mpmath values (testdata/gen/stirling_error.py).
func TestStirlingErrorGolden(t *testing.T) {
	t.Parallel()
	worst := 0.0
	for _, r := range golden.Read(t, "../../testdata/stirling_error.tsv") {
		x, want := r.Float(0), r.Float(1)
		got := StirlingError(x)
		rel := math.Abs(got-want) / want
		worst = max(worst, rel)
		if rel > 1e-14 {
			t.Errorf("%s: StirlingError(%v) = %.17g, want %.17g (relative error %.2g)", r.Pos(), x, got, want, rel)
		}
	}
	t.Logf("worst relative error %.2g", worst)
}

func BenchmarkStirlingError(b *testing.B) {
	for _, x := range []float64{0.5, 1.5, 3.25, 9.5, 15.5, 29.5, 1e4} {
		b.Run(fmt.Sprint(x), func(b *testing.B) {
			var s float64
			for b.Loop() {
				s += StirlingError(x)
			}
			_ = s
		})
	}
}

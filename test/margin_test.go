package test

import (
	"strings"
	"testing"

	"github.com/kofnlab/kofn/internal/golden"
)

// TestGoldenMargin compares the margin tests with testdata/test_margin.tsv,
// written by testdata/gen/test_margin.py: restricted maximum-likelihood
// estimates found by 40-digit golden-section maximization of the
// likelihood along the null (mpmath 1.2.1), independent of the closed
// forms in internal/score, and normal tails from SciPy 1.10.1.
func TestGoldenMargin(t *testing.T) {
	t.Parallel()
	for _, r := range golden.Read(t, "../testdata/test_margin.tsv") {
		what := strings.Join(r.Fields, " ")
		k1, n1, k2, n2 := r.Int(1), r.Int(2), r.Int(3), r.Int(4)
		null := r.Float(5)
		m := MiettinenNurminen
		if r.Fields[6] == "FM" {
			m = FarringtonManning
		}
		opt := MarginOptions{Method: m, Alternative: alt(t, r.Str(7))}
		var got Result
		var err error
		if r.Fields[0] == "diff" {
			got, err = DifferenceMargin(k1, n1, k2, n2, null, opt)
		} else {
			got, err = RatioMargin(k1, n1, k2, n2, null, opt)
		}
		z, p := r.Float(8), r.Float(9)
		if err != nil || !relClose(got.Statistic.Value, z, 1e-9) && abs(got.Statistic.Value-z) > 1e-12 || !relClose(got.PValue, p, 1e-8) {
			t.Errorf("%s: z = %v, p = %v (%v)", what, got.Statistic.Value, got.PValue, err)
		}
	}
}

func abs(x float64) float64 {
	if x < 0 {
		return -x
	}
	return x
}

// TestEquivalence: the TOST p-value is the larger one-sided p-value, and
// equivalence at alpha holds exactly when both one-sided tests reject.
func TestEquivalence(t *testing.T) {
	t.Parallel()
	for _, c := range [][4]int64{{56, 70, 48, 80}, {95, 100, 93, 100}, {140, 200, 150, 210}} {
		e, err := DifferenceEquivalence(c[0], c[1], c[2], c[3], -0.1, 0.1, MarginOptions{})
		if err != nil {
			t.Fatal(err)
		}
		lo, _ := DifferenceMargin(c[0], c[1], c[2], c[3], -0.1, MarginOptions{Alternative: Higher})
		hi, _ := DifferenceMargin(c[0], c[1], c[2], c[3], 0.1, MarginOptions{Alternative: Lower})
		if want := max(lo.PValue, hi.PValue); e.PValue != want {
			t.Errorf("%v: TOST p = %v, want %v", c, e.PValue, want)
		}
		re, _ := RatioEquivalence(c[0], c[1], c[2], c[3], 0.8, 1.25, MarginOptions{})
		rl, _ := RatioMargin(c[0], c[1], c[2], c[3], 0.8, MarginOptions{Alternative: Higher})
		rh, _ := RatioMargin(c[0], c[1], c[2], c[3], 1.25, MarginOptions{Alternative: Lower})
		if want := max(rl.PValue, rh.PValue); re.PValue != want {
			t.Errorf("%v: ratio TOST p = %v, want %v", c, re.PValue, want)
		}
	}
	if _, err := DifferenceEquivalence(1, 2, 1, 2, 0.1, -0.1, MarginOptions{}); err == nil || err.Error() != "test.DifferenceEquivalence: lower = 0.1 must be below upper = -0.1" {
		t.Errorf("reversed bounds: %v", err)
	}
	if _, err := RatioMargin(1, 2, 1, 2, 0, MarginOptions{}); err == nil || err.Error() != "test.RatioMargin: rho = 0 must be a positive finite ratio" {
		t.Errorf("rho = 0: %v", err)
	}
}

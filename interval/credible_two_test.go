package interval_test

import (
	"errors"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/interval"
)

// TestCredibleTwoArm checks the two-arm credible intervals by properties
// that do not depend on the quadrature: equal arms give an interval for
// p1 - p2 symmetric about 0 and for p1 / p2 symmetric about 1 on the log
// scale; exchanging the arms negates (inverts) the interval; and the
// intervals nest across levels. Their distribution functions at 0 (at 1
// for the ratio) are P(p2 >= p1), checked against the exact sums of
// test.Compare in package test (TestCredibleTwoArmAtZero).
func TestCredibleTwoArm(t *testing.T) {
	t.Parallel()
	o := interval.CredibleOptions{Prior: interval.UniformPrior()}
	d, err := interval.CredibleDifference(30, 100, 30, 100, o)
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(-d.Lower, d.Upper, cmpopts.EquateApprox(1e-9, 0)); diff != "" {
		t.Errorf("equal arms: difference interval %v to %v not symmetric", d.Lower, d.Upper)
	}
	r, err := interval.CredibleRatio(30, 100, 30, 100, o)
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(-math.Log(r.Lower), math.Log(r.Upper), cmpopts.EquateApprox(1e-9, 0)); diff != "" {
		t.Errorf("equal arms: ratio interval %v to %v not symmetric on the log scale", r.Lower, r.Upper)
	}
	a, _ := interval.CredibleDifference(12, 80, 25, 90, o)
	b, _ := interval.CredibleDifference(25, 90, 12, 80, o)
	if diff := cmp.Diff([]float64{a.Lower, a.Upper}, []float64{-b.Upper, -b.Lower}, cmpopts.EquateApprox(1e-9, 0)); diff != "" {
		t.Errorf("swap (-want +got):\n%s", diff)
	}
	ra, _ := interval.CredibleRatio(12, 80, 25, 90, o)
	rb, _ := interval.CredibleRatio(25, 90, 12, 80, o)
	if diff := cmp.Diff([]float64{ra.Lower, ra.Upper}, []float64{1 / rb.Upper, 1 / rb.Lower}, cmpopts.EquateApprox(1e-9, 0)); diff != "" {
		t.Errorf("ratio swap (-want +got):\n%s", diff)
	}
	o.Level = 0.99
	w, _ := interval.CredibleDifference(12, 80, 25, 90, o)
	if !(w.Lower < a.Lower && w.Upper > a.Upper) || a.Prior == nil || a.Parameter != "p1 - p2" {
		t.Errorf("99%% %v..%v does not contain 95%% %v..%v, or prior/parameter missing", w.Lower, w.Upper, a.Lower, a.Upper)
	}
	_, err = interval.CredibleDifference(1, 2, 1, 2, interval.CredibleOptions{Kind: interval.HighestDensity})
	var e *interval.Error
	if !errors.As(err, &e) || e.Arg != "Kind" {
		t.Errorf("HPD for two arms: %v", err)
	}
	_, err = interval.CredibleRatio(1, 2, 1, 200000, interval.CredibleOptions{})
	if !errors.Is(err, interval.ErrTooLarge) {
		t.Errorf("too large: %v", err)
	}
}

func BenchmarkCredibleDifference(b *testing.B) {
	for b.Loop() {
		interval.CredibleDifference(12, 80, 25, 90, interval.CredibleOptions{})
	}
}

package test

import (
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

// TestFisherTeaTasting: Fisher RA (1935), The Design of Experiments, the
// tea-tasting design as analysed in Agresti A (2002), Categorical Data
// Analysis, 2nd ed., section 3.5 (recalled, recomputed): table [[3, 1],
// [1, 3]], one-sided P = 17/70, one-sided mid-P = 9/70 = 0.128571,
// P(4 correct) = 1/70.
func TestFisherTeaTasting(t *testing.T) {
	t.Parallel()
	tests := []struct {
		k1, k2 int64
		opt    FisherOptions
		want   float64
	}{
		{3, 1, FisherOptions{Alternative: Higher}, 17.0 / 70},
		{3, 1, FisherOptions{Alternative: Higher, MidP: true}, 9.0 / 70},
		{4, 0, FisherOptions{Alternative: Higher}, 1.0 / 70},
		{3, 1, FisherOptions{}, 34.0 / 70},                   // symmetric margins: twice the tail
		{3, 1, FisherOptions{Rule: Central}, 34.0 / 70},      // same here
		{1, 3, FisherOptions{Alternative: Lower}, 17.0 / 70}, // mirror table
		{2, 2, FisherOptions{}, 1},                           // the most probable table
		{2, 2, FisherOptions{MidP: true}, 1 - 0.5*36.0/70},   // ties: only itself
		{4, 0, FisherOptions{MidP: true}, 1.0 / 70},          // 2 * (1/70) / 2: its mirror ties
		{3, 1, FisherOptions{MidP: true}, (2.0+16.0)/70 - 0}, // 1/70+1/70 + (16+16)/70/2
	}
	for _, tc := range tests {
		r, err := Fisher(tc.k1, 4, tc.k2, 4, tc.opt)
		if err != nil {
			t.Fatal(err)
		}
		if diff := cmp.Diff(tc.want, r.PValue, cmpopts.EquateApprox(1e-12, 0)); diff != "" {
			t.Errorf("Fisher(%d/4, %d/4, %+v) (-want +got):\n%s", tc.k1, tc.k2, tc.opt, diff)
		}
	}
}

// TestFisherMehtaSenchaudhuri: Mehta CR, Senchaudhuri P (2003), Conditional
// versus unconditional exact tests for comparing two binomials, Table 1
// (read): vaccine 7/15 infected, placebo 12/15, one-sided Fisher P = 0.0641.
func TestFisherMehtaSenchaudhuri(t *testing.T) {
	t.Parallel()
	r, err := Fisher(7, 15, 12, 15, FisherOptions{Alternative: Lower})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(r.PValue-0.0641) > 0.00005 {
		t.Errorf("p = %v, want 0.0641", r.PValue)
	}
}

func BenchmarkFisher1e6(b *testing.B) {
	for b.Loop() {
		_, _ = Fisher(250600, 500000, 249400, 500000, FisherOptions{})
	}
}

func BenchmarkFisher1e4(b *testing.B) {
	for b.Loop() {
		_, _ = Fisher(2560, 5000, 2440, 5000, FisherOptions{})
	}
}

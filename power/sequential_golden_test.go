package power

import (
	"context"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/golden"
	"github.com/kofnlab/kofn/test"
)

// Source of every table here: testdata/sequential_golden.tsv, written by
// testdata/gen/sequential_golden.py (dense LAPACK solves of the CUSUM
// Markov chain through NumPy 1.24.2, and a recursion over the full range
// of k for the truncated SPRT), independent of the code under test.

func goldenChart(t *testing.T, r golden.Row) CUSUM {
	t.Helper()
	shift, err := ParseShift(r.Str(3))
	if err != nil {
		t.Fatal(err)
	}
	c, err := newChart("test", r.Float(1), r.Float(2), CUSUMOptions{Shift: shift, Unit: r.Int(4)})
	if err != nil {
		t.Fatalf("%s: %v", r.Pos(), err)
	}
	if c.Ref != r.Int(5) {
		t.Fatalf("%s: Ref = %d, want %d", r.Pos(), c.Ref, r.Int(5))
	}
	return c
}

func TestCUSUMRunLengthGolden(t *testing.T) {
	t.Parallel()
	n := 0
	for _, r := range golden.Read(t, "../testdata/sequential_golden.tsv") {
		switch r.Str(0) {
		case "cusum":
			c := goldenChart(t, r)
			c.Threshold = r.Int(6)
			got, err := CUSUMRunLength(context.Background(), c, r.Float(7))
			if err != nil {
				t.Fatalf("%s: %v", r.Pos(), err)
			}
			want := []float64{r.Float(8), r.Float(9)}
			if diff := cmp.Diff(want, []float64{got.ARL, got.SDRL}, cmpopts.EquateApprox(1e-10, 0)); diff != "" {
				t.Errorf("%s: ARL, SDRL (-want +got)\n%s", r.Pos(), diff)
			}
			n++
		case "cusummp":
			// 60-digit mpmath solves: the subtraction-free elimination keeps
			// its relative accuracy at large run lengths
			shift, err := ParseShift(r.Str(1))
			if err != nil {
				t.Fatal(err)
			}
			c, err := newChart("test", 0.1, 0.2, CUSUMOptions{Unit: 20})
			if shift == Decrease {
				c, err = newChart("test", 0.05, 0.01, CUSUMOptions{Shift: Decrease, Unit: 40})
			}
			if err != nil || c.Unit != r.Int(2) || c.Ref != r.Int(3) {
				t.Fatalf("%s: chart %+v, %v", r.Pos(), c, err)
			}
			c.Threshold = r.Int(4)
			got, err := CUSUMRunLength(context.Background(), c, r.Float(5))
			if err != nil {
				t.Fatal(err)
			}
			if diff := cmp.Diff(r.Float(6), got.ARL, cmpopts.EquateApprox(1e-13, 0)); diff != "" {
				t.Errorf("%s: ARL (-want +got)\n%s", r.Pos(), diff)
			}
			n++
		case "cusumh":
			shift, _ := ParseShift(r.Str(3))
			c, rl, err := CUSUMForARL(context.Background(), r.Float(1), r.Float(2), r.Float(6), CUSUMOptions{Shift: shift, Unit: r.Int(4)})
			if err != nil {
				t.Fatalf("%s: %v", r.Pos(), err)
			}
			if c.Threshold != r.Int(7) {
				t.Errorf("%s: Threshold = %d, want %d", r.Pos(), c.Threshold, r.Int(7))
			}
			if diff := cmp.Diff(r.Float(8), rl.ARL, cmpopts.EquateApprox(1e-10, 0)); diff != "" {
				t.Errorf("%s: ARL0 (-want +got)\n%s", r.Pos(), diff)
			}
			n++
		}
	}
	if n < 30 {
		t.Fatalf("only %d CUSUM rows", n)
	}
}

func TestSPRTOperatingGolden(t *testing.T) {
	t.Parallel()
	n := 0
	for _, r := range golden.Read(t, "../testdata/sequential_golden.tsv") {
		if r.Str(0) != "sprt" {
			continue
		}
		s, err := test.NewSPRT(r.Float(1), r.Float(2), r.Float(3), r.Float(4), test.SPRTOptions{MaxN: r.Int(5)})
		if err != nil {
			t.Fatal(err)
		}
		got, err := SPRTOperating(context.Background(), s, r.Float(6))
		if err != nil {
			t.Fatalf("%s: %v", r.Pos(), err)
		}
		want := []float64{r.Float(7), r.Float(8), r.Float(9)}
		if diff := cmp.Diff(want, []float64{got.Accept, got.Reject, got.ASN}, cmpopts.EquateApprox(1e-11, 0)); diff != "" {
			t.Errorf("%s: accept, reject, ASN (-want +got)\n%s", r.Pos(), diff)
		}
		n++
	}
	if n < 10 {
		t.Fatalf("only %d SPRT rows", n)
	}
}

// The asymptotic two-sample sequence: its tuned mixing variance and its
// exact time-uniform error against an independent full-grid recursion.
// Several rows exceed alpha = 0.05 (0.119 at p1 = p2 = 1/2 with Tau2 tuned
// for 20 per group): the guarantee of the normal mixture holds only as the
// counts grow, as its documentation says.
func TestDifferenceNormalGolden(t *testing.T) {
	t.Parallel()
	n := 0
	for _, r := range golden.Read(t, "../testdata/sequential_golden.tsv") {
		switch r.Str(0) {
		case "tau":
			got, err := test.TunedTau2(r.Float(1), r.Int(2))
			if err != nil {
				t.Fatal(err)
			}
			// 1e-6: at a smooth minimum the argmin is fixed only to about
			// the square root of the rounding of the function values
			if diff := cmp.Diff(r.Float(3), got, cmpopts.EquateApprox(1e-6, 0)); diff != "" {
				t.Errorf("%s: Tau2 (-want +got)\n%s", r.Pos(), diff)
			}
			n++
		case "diffnorm":
			s, err := test.NewDifferenceSequence(0, r.Float(1), test.DifferenceSequenceOptions{Method: test.NormalMixtureSequence, Tau2: r.Float(2)})
			if err != nil {
				t.Fatal(err)
			}
			got, err := DifferenceSequenceErrorProb(context.Background(), s, r.Float(3), r.Float(4), r.Int(5))
			if err != nil {
				t.Fatal(err)
			}
			if diff := cmp.Diff(r.Float(6), got, cmpopts.EquateApprox(1e-10, 0)); diff != "" {
				t.Errorf("%s: error probability (-want +got)\n%s", r.Pos(), diff)
			}
			n++
		}
	}
	if n < 6 {
		t.Fatalf("only %d rows", n)
	}
}

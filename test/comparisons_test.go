package test

import (
	"context"
	"errors"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/golden"
)

// TestPairwiseGoldenR compares with the "pairs" rows of
// testdata/test_karms_r.tsv (R 4.2.2 stats: pairwise two-sample proportion
// tests without continuity correction, adjusted by Holm, Hommel and
// Benjamini-Hochberg).
func TestPairwiseGoldenR(t *testing.T) {
	t.Parallel()
	names := map[string]Adjustment{"holm": Holm, "hommel": Hommel, "BH": BenjaminiHochberg}
	n := 0
	for _, r := range golden.Read(t, "../testdata/test_karms_r.tsv") {
		if r.Str(0) != "pairs" {
			continue
		}
		n++
		got, err := Pairwise(context.Background(), ints(t, r.Str(1)), ints(t, r.Str(2)), ComparisonOptions{Asymptotic: true, Adjustment: names[r.Str(3)]})
		if err != nil {
			t.Fatalf("%s: %v", r.Pos(), err)
		}
		var adj []float64
		for _, c := range got.Comparisons {
			adj = append(adj, c.AdjustedPValue)
		}
		if d := cmp.Diff(floatList(t, r.Str(4)), adj, cmpopts.EquateApprox(1e-12, 0)); d != "" {
			t.Errorf("%s (-want +got):\n%s", r.Pos(), d)
		}
	}
	if n < 12 {
		t.Errorf("only %d rows", n)
	}
}

// TestVersusControl: many-to-one comparisons are Fisher's tests of each
// arm against the control, Bonferroni-adjusted by k - 1 (the definition).
func TestVersusControl(t *testing.T) {
	t.Parallel()
	x, n := []int64{30, 41, 25, 52}, []int64{100, 110, 95, 120}
	r, err := VersusControl(context.Background(), x, n, 2, ComparisonOptions{Adjustment: Bonferroni})
	if err != nil || len(r.Comparisons) != 3 || r.Test != "Fisher point-probability" {
		t.Fatalf("%+v %v", r, err)
	}
	for _, c := range r.Comparisons {
		f, _ := Fisher(x[c.First], n[c.First], x[2], n[2], FisherOptions{})
		if c.Second != 2 || !relClose(c.PValue, f.PValue, 1e-15) || !relClose(c.AdjustedPValue, min(1, 3*f.PValue), 1e-15) {
			t.Errorf("%+v: Fisher %v", c, f.PValue)
		}
		if !relClose(c.Difference, float64(x[c.First])/float64(n[c.First])-25.0/95, 1e-15) {
			t.Errorf("difference %v", c.Difference)
		}
	}
	if _, err := VersusControl(context.Background(), x, n, 4, ComparisonOptions{}); !errors.Is(err, ErrInvalidArgument) || !strings.Contains(err.Error(), "control = 4") {
		t.Errorf("bad control: %v", err)
	}
	if _, err := Pairwise(context.Background(), x, n, ComparisonOptions{Asymptotic: true, MidP: true}); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("mid-p with asymptotic: %v", err)
	}
}

package power

import (
	"context"
	"errors"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/golden"
	"github.com/kofnlab/kofn/interval"
)

// Precision planning against testdata/gen/power_precision.py (SciPy
// enumeration with exact fractions for the boundaries): the sawtooth makes
// the first and the stable n differ in every case (p = 0.3, eps = 0.1 at
// 95%: 70 and 83).
func TestPrecisionGolden(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	cases, rows := golden.ReadCases(t, "../testdata/power_precision.tsv")
	curves := map[string][]float64{}
	for _, r := range rows {
		switch r.Fields[0] {
		case "within":
			curves[r.Fields[1]] = append(curves[r.Fields[1]], r.Float(3))
		case "worst":
			eps, n := r.Float(1), r.Int(2)
			w, err := worstWithin(ctx, "test", n, eps, -1)
			if err != nil {
				t.Fatal(err)
			}
			if diff := cmp.Diff(r.Float(3), w.Prob, cmpopts.EquateApprox(1e-6, 0)); diff != "" {
				t.Errorf("worst case eps %v n %d (-want +got):\n%s", eps, n, diff)
			}
		case "ehw":
			m := map[string]interval.Method{"wilson": interval.Wilson, "clopper-pearson": interval.ClopperPearson}[r.Fields[1]]
			got, err := halfWidthSum(context.Background(), "test", r.Int(3), r.Float(2), interval.Options{Method: m}, func(h float64) float64 { return h })
			if err != nil {
				t.Fatal(err)
			}
			if diff := cmp.Diff(r.Float(4), got, cmpopts.EquateApprox(1e-9, 0)); diff != "" {
				t.Errorf("expected half-width %v (-want +got):\n%s", r.Fields[1:4], diff)
			}
		}
	}
	for name, c := range cases {
		p, eps := c.Float("p"), c.Float("eps")
		o := PrecisionOptions{Level: c.Float("target"), MaxN: c.Int("nmax")}
		r, err := PrecisionN(ctx, p, eps, o)
		if err != nil {
			t.Fatal(err)
		}
		if r.First != c.Int("first") || r.Stable != c.Int("stable") {
			t.Errorf("%s: first, stable = %d, %d; want %s, %s", name, r.First, r.Stable, c.Values["first"], c.Values["stable"])
		}
		var got []float64
		for _, pt := range r.Curve {
			got = append(got, pt.Power)
		}
		want := curves[name][:len(got)]
		if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-10, 0)); diff != "" {
			t.Errorf("%s curve (-want +got):\n%s", name, diff)
		}
	}
}

// The worst-case n: at the first n the worst case reaches the target, and
// the n before fails (checked against the golden worst-case values above
// through the same function).
func TestWorstPrecisionN(t *testing.T) {
	t.Parallel()
	r, err := WorstPrecisionN(context.Background(), 0.1, PrecisionOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r.FirstPower < 0.95 {
		t.Errorf("first n %d has worst case %v", r.First, r.FirstPower)
	}
	if r.Stable < r.First || r.Stable > r.Horizon {
		t.Errorf("stable %d outside [%d, %d]", r.Stable, r.First, r.Horizon)
	}
	w, err := worstWithin(context.Background(), "test", r.First-1, 0.1, -1)
	if err != nil {
		t.Fatal(err)
	}
	if w.Prob >= 0.95 {
		t.Errorf("n = %d already reaches %v", r.First-1, w.Prob)
	}
}

// Expected half-width and assurance: the planned n meets its target and
// (for these smooth cases) n - 1 does not.
func TestWidthPlans(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	for _, m := range []interval.Method{interval.Wilson, interval.ClopperPearson} {
		o := WidthOptions{Interval: interval.Options{Method: m}}
		r, err := ExpectedWidthN(ctx, 0.3, 0.05, o)
		if err != nil {
			t.Fatal(err)
		}
		if r.Value > 0.05 || !(r.Previous > 0.05) {
			t.Errorf("%v: n %d expected half-width %v (previous %v)", m, r.N, r.Value, r.Previous)
		}
		a, err := AssuranceN(ctx, 0.3, 0.05, o)
		if err != nil {
			t.Fatal(err)
		}
		if a.Value < 0.80 || a.N < r.N {
			t.Errorf("%v: assurance n %d value %v (expected-width n %d)", m, a.N, a.Value, r.N)
		}
	}
	if _, err := ExpectedWidthN(ctx, 0.3, 0, WidthOptions{}); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("d = 0: %v", err)
	}
}

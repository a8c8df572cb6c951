package power

import (
	"context"
	"errors"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/golden"
	"github.com/kofnlab/kofn/test"
)

// Exact power of McNemar's exact conditional, mid-p and asymptotic tests
// against an independent enumeration of every (n10, n01) with multinomial
// probabilities (SciPy): testdata/gen/power_paired.py.
func TestPairedGolden(t *testing.T) {
	t.Parallel()
	cases, rows := golden.ReadCases(t, "../testdata/power_paired.tsv")
	byCase := map[string][]golden.Row{}
	for _, r := range rows {
		byCase[r.Fields[0]] = append(byCase[r.Fields[0]], r)
	}
	for name, c := range cases {
		p12, p21 := c.Float("p10"), c.Float("p01")
		o := PairedOptions{Alpha: c.Float("alpha"), Power: c.Float("target"), MaxN: c.Int("nmax")}
		var err error
		if o.Alternative, err = goldenAlt(c.Values["3"]); err != nil {
			t.Fatal(err)
		}
		switch c.Values["mid"] {
		case "1":
			o.Method, o.MidP = test.McNemarExact, true
		case "2":
			o.Method, o.Enumerate = test.McNemarAsymptotic, true
		}
		var want, got []float64
		for _, r := range byCase[name] {
			want = append(want, r.Float(2))
			ep, err := PairedPower(context.Background(), r.Int(1), p12, p21, o)
			if err != nil {
				t.Fatal(err)
			}
			got = append(got, ep.Power)
		}
		if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-9, 1e-300)); diff != "" {
			t.Errorf("%s power (-want +got):\n%s", name, diff)
		}
		ss, err := PairedN(context.Background(), p12, p21, o)
		if err != nil {
			t.Fatal(err)
		}
		if ss.First != c.Int("first") || ss.Stable != c.Int("stable") {
			t.Errorf("%s: first, stable = %d, %d; want %s, %s", name, ss.First, ss.Stable, c.Values["first"], c.Values["stable"])
		}
		for i, p := range ss.Curve {
			if d := p.Power - got[i]; d > 1e-12 || d < -1e-12 {
				t.Errorf("%s n = %d: curve %v, PairedPower %v", name, p.N, p.Power, got[i])
				break
			}
		}
	}
}

// Connor RJ (1987), Biometrics 43:207-211: the normal formula, checked
// here for its algebra (n from the formula gives the target power back)
// and against the exact search (the exact n is close for n in the
// hundreds: the property "normal n close to exact n for large samples").
func TestPairedNormalAgreesWithExact(t *testing.T) {
	t.Parallel()
	for _, tc := range []struct{ p12, p21 float64 }{{0.25, 0.10}, {0.12, 0.08}, {0.3, 0.25}} {
		ns, err := PairedNormalN(tc.p12, tc.p21, PairedOptions{})
		if err != nil {
			t.Fatal(err)
		}
		pw := pairedNormalPower(ns.Real, tc.p12, tc.p21, 0.05, test.TwoSided)
		if diff := cmp.Diff(0.80, pw, cmpopts.EquateApprox(2e-3, 0)); diff != "" {
			t.Errorf("%+v: power at the formula n (-want +got):\n%s", tc, diff)
		}
		if testing.Short() && ns.N > 1000 {
			continue
		}
		ex, err := PairedN(context.Background(), tc.p12, tc.p21, PairedOptions{Method: test.McNemarExact, MidP: true})
		if err != nil {
			t.Fatal(err)
		}
		if r := float64(ex.Stable) / float64(ns.N); r < 0.9 || r > 1.1 {
			t.Errorf("%+v: mid-p exact n %d vs normal n %d", tc, ex.Stable, ns.N)
		}
	}
}

func TestPairedErrors(t *testing.T) {
	t.Parallel()
	if _, err := PairedNormalN(0.1, 0.1, PairedOptions{}); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("equal discordant probabilities: %v", err)
	}
	if _, err := PairedNormalN(0.7, 0.4, PairedOptions{}); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("sum above 1: %v", err)
	}
	if _, err := PairedN(context.Background(), 0.1, 0.2, PairedOptions{Alternative: test.Higher}); !errors.Is(err, ErrNoSolution) {
		t.Errorf("wrong side: %v", err)
	}
	if _, err := PairedPower(context.Background(), 0, 0.1, 0.2, PairedOptions{}); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("n = 0: %v", err)
	}
}

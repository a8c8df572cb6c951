package power

import (
	"context"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/golden"
	"github.com/kofnlab/kofn/internal/onesample"
	"github.com/kofnlab/kofn/test"
)

// oneCaseOptions builds the options of a case in testdata/power_exact_one.tsv.
func oneCaseOptions(t *testing.T, c golden.Case) (p0, p1 float64, o OneSampleOptions) {
	t.Helper()
	var err error
	p0, p1 = c.Float("p0"), c.Float("p1")
	o.Alpha, o.Power = c.Float("alpha"), c.Float("target")
	if o.Alternative, err = goldenAlt(c.Values["3"]); err != nil {
		t.Fatal(err)
	}
	if o.Rule, err = test.ParseTwoSidedRule(c.Values["4"]); err != nil {
		t.Fatal(err)
	}
	o.MidP = c.Values["mid"] == "1"
	return
}

// Exact power against an independent enumeration (SciPy, every outcome's
// p-value recomputed per n): testdata/gen/power_exact_one.py. Every case
// there has a sawtooth: the first n reaching the target differs from the
// stable n (for example p0 = 0.5, p1 = 0.75 two-sided: 30 and 35).
func TestOneSampleGolden(t *testing.T) {
	t.Parallel()
	cases, rows := golden.ReadCases(t, "../testdata/power_exact_one.tsv")
	byCase := map[string][]golden.Row{}
	for _, r := range rows {
		byCase[r.Fields[0]] = append(byCase[r.Fields[0]], r)
	}
	for name, c := range cases {
		p0, p1, o := oneCaseOptions(t, c)
		nmax := c.Int("nmax")
		curve, err := OneSampleCurve(context.Background(), p0, p1, nmax, o)
		if err != nil {
			t.Fatal(err)
		}
		var want, got, wantSize, gotSize []float64
		for i, r := range byCase[name] {
			want = append(want, r.Float(2))
			got = append(got, curve[i].Power)
			wantSize = append(wantSize, r.Float(3))
			ep, err := OneSamplePower(r.Int(1), p0, p1, o)
			if err != nil {
				t.Fatal(err)
			}
			gotSize = append(gotSize, ep.Size)
			if d := ep.Power - curve[i].Power; d > 1e-10*ep.Power || -d > 1e-10*ep.Power {
				t.Errorf("%s n = %s: OneSamplePower %v != curve %v", name, r.Fields[1], ep.Power, curve[i].Power)
			}
		}
		opt := cmpopts.EquateApprox(1e-9, 0)
		if diff := cmp.Diff(want, got, opt); diff != "" {
			t.Errorf("%s power (-want +got):\n%s", name, diff)
		}
		if diff := cmp.Diff(wantSize, gotSize, opt); diff != "" {
			t.Errorf("%s size (-want +got):\n%s", name, diff)
		}
		o.MaxN = nmax
		ss, err := OneSampleN(context.Background(), p0, p1, o)
		if err != nil {
			t.Fatal(err)
		}
		if ss.First != c.Int("first") || ss.Stable != c.Int("stable") {
			t.Errorf("%s: first, stable = %d, %d; want %s, %s", name, ss.First, ss.Stable, c.Values["first"], c.Values["stable"])
		}
		if ss.First == ss.Stable {
			t.Errorf("%s: expected a sawtooth case", name)
		}
	}
}

// The carried acceptance region equals onesample.Acceptance at every n,
// for all tests, several p0 and alpha (a property sweep).
func TestRegionMatchesAcceptance(t *testing.T) {
	t.Parallel()
	nmax := int64(300)
	if testing.Short() {
		nmax = 120
	}
	for _, p0 := range []float64{0.01, 0.3, 0.5, 0.77} {
		for _, alpha := range []float64{0.01, 0.05, 0.2} {
			for _, alt := range []test.Alternative{test.TwoSided, test.Higher, test.Lower} {
				for _, m := range test.TwoSidedRuleValues() {
					for _, mid := range []bool{false, true} {
						tt := oneTest(p0, alt, m, mid)
						r := newRegion(tt, alpha)
						for n := int64(1); n <= nmax; n++ {
							lo, hi := r.at(n)
							wlo, whi, err := onesample.Acceptance(n, alpha, tt)
							if err != nil {
								t.Fatal(err)
							}
							if wlo > whi && lo > hi {
								continue
							}
							if lo != wlo || hi != whi {
								t.Fatalf("p0 %v alpha %v %v %v mid %v n %d: region [%d, %d], want [%d, %d]", p0, alpha, alt, m, mid, n, lo, hi, wlo, whi)
							}
						}
					}
				}
			}
		}
	}
}

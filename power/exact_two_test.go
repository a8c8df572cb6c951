package power

import (
	"context"
	"errors"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/golden"
	"github.com/kofnlab/kofn/test"
)

// Exact two-sample power against an independent enumeration in which
// SciPy 1.10's Fisher and Barnard (pooled) tests and the pooled z
// decide every table: testdata/gen/power_two.py.
func TestTwoSampleGolden(t *testing.T) {
	t.Parallel()
	cases, rows := golden.ReadCases(t, "../testdata/power_two.tsv")
	var want, got []float64
	for _, r := range rows {
		tst, err := ParseExactTest(map[string]string{"fisher": "fisher", "barnard": "barnard", "z": "z"}[r.Fields[1]])
		if err != nil {
			t.Fatal(err)
		}
		alt, err := goldenAlt(r.Fields[7])
		if err != nil {
			t.Fatal(err)
		}
		n1, n2 := r.Int(2), r.Int(3)
		o := TwoSampleOptions{Test: tst, Alternative: alt, Alpha: r.Float(6)}
		ep, err := TwoSamplePower(context.Background(), n1, n2, r.Float(4), r.Float(5), o)
		if err != nil {
			t.Fatal(err)
		}
		want = append(want, r.Float(8))
		got = append(got, ep.Power)
	}
	if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-9, 0)); diff != "" {
		t.Errorf("exact two-sample power (-want +got):\n%s", diff)
	}
	c := cases["scan"]
	ss, err := TwoSampleN(context.Background(), c.Float("p1"), c.Float("p2"), TwoSampleOptions{Alpha: c.Float("alpha"), Power: c.Float("target")})
	if err != nil {
		t.Fatal(err)
	}
	if ss.First != c.Int("first") || ss.Stable != c.Int("stable") {
		t.Errorf("Fisher scan: first, stable = %d, %d; want %s, %s", ss.First, ss.Stable, c.Values["first"], c.Values["stable"])
	}
}

// Properties: exact power increases with the effect and with alpha; the
// Fisher exact size stays at or below alpha; Barnard is at least as
// powerful as Fisher here (Mehta and Senchaudhuri 2003 discuss why).
func TestTwoSampleProperties(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	prev := 0.0
	for _, p2 := range []float64{0.35, 0.45, 0.55, 0.65} {
		ep, err := TwoSamplePower(ctx, 40, 40, 0.3, p2, TwoSampleOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if ep.Power < prev {
			t.Errorf("power fell to %v at p2 = %v", ep.Power, p2)
		}
		if ep.Size > 0.05 {
			t.Errorf("Fisher size %v > 0.05", ep.Size)
		}
		prev = ep.Power
	}
	prev = 0
	for _, a := range []float64{0.01, 0.05, 0.1, 0.2} {
		ep, err := TwoSamplePower(ctx, 30, 30, 0.3, 0.6, TwoSampleOptions{Alpha: a})
		if err != nil {
			t.Fatal(err)
		}
		if ep.Power < prev {
			t.Errorf("power fell to %v at alpha = %v", ep.Power, a)
		}
		prev = ep.Power
	}
	f, err := TwoSamplePower(ctx, 25, 25, 0.2, 0.55, TwoSampleOptions{})
	if err != nil {
		t.Fatal(err)
	}
	b, err := TwoSamplePower(ctx, 25, 25, 0.2, 0.55, TwoSampleOptions{Test: BarnardExactTest})
	if err != nil {
		t.Fatal(err)
	}
	if b.Power < f.Power {
		t.Errorf("Barnard %v below Fisher %v", b.Power, f.Power)
	}
}

// The normal n with the CPS correction is close to the exact Fisher n for
// samples in the hundreds (Casagrande, Pike, Smith 1978 built the
// correction to approximate Fisher's test): Fleiss' p1 = 0.10, p2 = 0.20.
func TestNormalCloseToExactFisher(t *testing.T) {
	t.Parallel()
	if testing.Short() {
		t.Skip("exact search over n in the hundreds")
	}
	ss, err := TwoSampleN(context.Background(), 0.10, 0.20, TwoSampleOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r := float64(ss.Stable) / float64(ss.Normal.N); r < 0.95 || r > 1.05 {
		t.Errorf("exact Fisher n %d (first %d) vs CPS normal n %d", ss.Stable, ss.First, ss.Normal.N)
	}
}

func TestTwoSampleErrors(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	if _, err := TwoSamplePower(ctx, 0, 10, 0.2, 0.3, TwoSampleOptions{}); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("n1 = 0: %v", err)
	}
	if _, err := TwoSamplePower(ctx, MaxTwoSampleTotal/2+1, MaxTwoSampleTotal/2, 0.2, 0.3, TwoSampleOptions{}); !errors.Is(err, ErrTooLarge) {
		t.Errorf("n1 + n2 = MaxTwoSampleTotal + 1: %v", err)
	}
	if _, err := TwoSampleN(ctx, 0.2, 0.2, TwoSampleOptions{}); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("equal proportions: %v", err)
	}
	if _, err := TwoSampleN(ctx, 0.3, 0.2, TwoSampleOptions{Alternative: test.Lower}); !errors.Is(err, ErrNoSolution) {
		t.Errorf("wrong side: %v", err)
	}
	cctx, cancel := context.WithCancel(ctx)
	cancel()
	if _, err := TwoSamplePower(cctx, 100, 100, 0.2, 0.3, TwoSampleOptions{}); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: %v", err)
	}
}

// The rejection regions agree, table by table, with the test package's
// own decisions (test.Fisher, test.TwoSample, test.Barnard: reject when
// ln p < ln alpha) for several group sizes, alternatives and levels.
func TestTwoRegionsMatchTests(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	sizes := [][2]int64{{1, 1}, {3, 7}, {12, 12}, {20, 9}, {30, 45}}
	if testing.Short() {
		sizes = sizes[:3]
	}
	for _, nn := range sizes {
		n1, n2 := nn[0], nn[1]
		for _, alt := range []test.Alternative{test.TwoSided, test.Higher, test.Lower} {
			for _, alpha := range []float64{0.01, 0.05, 0.3} {
				for _, tst := range []ExactTest{FisherExactTest, ZPooledTest, BarnardExactTest} {
					if tst == BarnardExactTest && n1*n2 > 300 {
						continue
					}
					o := TwoSampleOptions{Test: tst, Alternative: alt}
					reg, err := buildRegion(ctx, "test", n1, n2, alpha, o, nil)
					if err != nil {
						t.Fatal(err)
					}
					for x1 := int64(0); x1 <= n1; x1++ {
						for x2 := int64(0); x2 <= n2; x2++ {
							want := decide(t, tst, x1, n1, x2, n2, alt) < math.Log(alpha)
							if got := reg.rejects(x1, x2); got != want {
								t.Fatalf("%v %v alpha %v, %d/%d vs %d/%d: region %v, test %v", tst, alt, alpha, x1, n1, x2, n2, got, want)
							}
						}
					}
				}
			}
		}
	}
}

func decide(t *testing.T, tst ExactTest, x1, n1, x2, n2 int64, alt test.Alternative) float64 {
	t.Helper()
	var r test.Result
	var err error
	switch tst {
	case FisherExactTest:
		r, err = test.Fisher(x1, n1, x2, n2, test.FisherOptions{Alternative: alt})
	case ZPooledTest:
		r, err = test.TwoSample(x1, n1, x2, n2, test.TwoSampleOptions{Alternative: alt})
	default:
		r, err = test.Barnard(context.Background(), x1, n1, x2, n2, test.UnconditionalOptions{Alternative: alt})
	}
	if err != nil {
		t.Fatal(err)
	}
	return r.LogPValue
}

// Margin regions agree table by table with test.DifferenceMargin and
// test.DifferenceEquivalence (Miettinen-Nurminen), and the exact power of
// the non-inferiority test is close to the normal approximation's at a
// normal-size n.
func TestMarginRegionsMatchTests(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	for _, nn := range [][2]int64{{5, 8}, {20, 20}, {30, 17}} {
		n1, n2 := nn[0], nn[1]
		for _, m := range []float64{0.05, 0.2} {
			for _, hyp := range []Hypothesis{NonInferiority, Equivalence} {
				reg, err := buildRegion(ctx, "test", n1, n2, 0.05, TwoSampleOptions{Hypothesis: hyp, Margin: m}, nil)
				if err != nil {
					t.Fatal(err)
				}
				for x1 := int64(0); x1 <= n1; x1++ {
					for x2 := int64(0); x2 <= n2; x2++ {
						var r test.Result
						if hyp == NonInferiority {
							r, err = test.DifferenceMargin(x1, n1, x2, n2, -m, test.MarginOptions{Alternative: test.Higher})
						} else {
							r, err = test.DifferenceEquivalence(x1, n1, x2, n2, -m, m, test.MarginOptions{})
						}
						if err != nil {
							t.Fatal(err)
						}
						if want := r.LogPValue < math.Log(0.05); reg.rejects(x1, x2) != want {
							t.Fatalf("%v m %v %d/%d vs %d/%d: region %v, test %v", hyp, m, x1, n1, x2, n2, !want, want)
						}
					}
				}
			}
		}
	}
	o := TwoSampleOptions{Hypothesis: NonInferiority, Margin: 0.1, Alpha: 0.025}
	ns, err := TwoSampleNormalN(0.8, 0.8, o)
	if err != nil {
		t.Fatal(err)
	}
	ep, err := TwoSamplePower(ctx, ns.N, ns.N2, 0.8, 0.8, o)
	if err != nil {
		t.Fatal(err)
	}
	if ep.Power < 0.75 || ep.Power > 0.85 || ep.Size > 0.03 {
		t.Errorf("exact NI power %v (size %v) at the normal n %d", ep.Power, ep.Size, ns.N)
	}
}

// TestMarginSizeOffSquare checks the attained size when the planned p2 is
// below the margin, so the null boundary point p1 = p2 - m leaves [0, 1]:
// it is taken at the boundary's nearest point (0, m), a probability (it
// was NaN).
func TestMarginSizeOffSquare(t *testing.T) {
	t.Parallel()
	for _, h := range []Hypothesis{NonInferiority, Equivalence} {
		r, err := TwoSampleN(context.Background(), 0.025, 0.005, TwoSampleOptions{Hypothesis: h, Margin: 0.05, MaxN: 400})
		if err != nil {
			t.Fatalf("%v: %v", h, err)
		}
		if !(r.Size >= 0 && r.Size <= 1) {
			t.Errorf("%v: Size = %g, want a probability", h, r.Size)
		}
	}
}

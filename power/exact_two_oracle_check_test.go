package power

import (
	"context"
	"errors"
	"fmt"
	"math"
	"os"
	"testing"
	"time"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/test"
)

// The rejection regions built for the exact two-sample power and size
// against the oracle of exact_two_oracle_test.go (the code before the
// incremental decisions), table by table: every accepted interval of every
// margin (Fisher) or row (z test, Barnard) must be the same. The oracle's
// decisions are the test package's own p-values (test.Fisher's conditional
// p-value, test.TwoSample, test.Barnard), so this is a check against the
// test package, the independent implementation of each test.
func TestRegionsMatchOracle(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	type tc struct {
		n1, n2 int64
		alpha  float64
		alt    test.Alternative
		tst    ExactTest
		pts    [][2]float64
	}
	var cases []tc
	alts := []test.Alternative{test.TwoSided, test.Higher, test.Lower}
	for _, tst := range []ExactTest{FisherExactTest, ZPooledTest} {
		for _, n := range [][2]int64{{1, 1}, {1, 7}, {2, 3}, {5, 5}, {7, 3}, {12, 12}, {20, 31}, {40, 40}, {33, 66}, {80, 41}, {150, 150}} {
			for _, alpha := range []float64{0.2, 0.05, 0.01, 0.001} {
				for _, alt := range alts {
					cases = append(cases, tc{n[0], n[1], alpha, alt, tst, nil})
				}
			}
		}
		// Moderate sizes, built only on the span the power needs.
		for _, n := range [][2]int64{{400, 400}, {600, 900}, {1500, 1500}, {2500, 1250}} {
			for _, pp := range [][2]float64{{0.1, 0.12}, {0.45, 0.5}, {0.02, 0.05}} {
				for _, alt := range alts {
					pbar := (float64(n[0])*pp[0] + float64(n[1])*pp[1]) / float64(n[0]+n[1])
					cases = append(cases, tc{n[0], n[1], 0.05, alt, tst, [][2]float64{pp, {pbar, pbar}}})
				}
			}
		}
	}
	if testing.Short() {
		cases = cases[:len(cases)/4]
	}
	for _, c := range cases {
		o := TwoSampleOptions{Test: c.tst, Alternative: c.alt}
		name := fmt.Sprintf("%v %dx%d alpha=%v %v pts=%v", c.tst, c.n1, c.n2, c.alpha, c.alt, c.pts)
		want, err := oracleBuildRegion(ctx, "t", c.n1, c.n2, c.alpha, o, c.pts)
		if err != nil {
			t.Fatalf("%s: oracle: %v", name, err)
		}
		got, err := buildRegion(ctx, "t", c.n1, c.n2, c.alpha, o, c.pts)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		// The ends of every margin (Fisher) or row, the stored ones and
		// those outside the span (which reject nothing).
		m := c.n1
		if want.bySum {
			m = c.n1 + c.n2
		}
		var wa, wb, ga, gb []int64
		for i := int64(0); i <= m; i++ {
			a, b := want.ends(i)
			wa, wb = append(wa, a), append(wb, b)
			a, b = got.ends(i)
			ga, gb = append(ga, a), append(gb, b)
		}
		if diff := cmp.Diff(wa, ga); diff != "" {
			t.Errorf("%s: lower ends (-want +got):\n%s", name, diff)
		}
		if diff := cmp.Diff(wb, gb); diff != "" {
			t.Errorf("%s: upper ends (-want +got):\n%s", name, diff)
		}
		pts := c.pts
		if pts == nil {
			pts = [][2]float64{{0.3, 0.6}, {0.5, 0.5}}
		}
		for _, p := range pts {
			if diff := cmp.Diff(oracleProb(want, p[0], p[1]), got.prob(p[0], p[1]), cmpopts.EquateApprox(0, 1e-14)); diff != "" {
				t.Errorf("%s: probability at %v (-want +got):\n%s", name, p, diff)
			}
		}
	}
}

// oracleSizeCase is one exact two-sample sample-size search compared
// with the oracle.
type oracleSizeCase struct {
	p1, p2 float64
	o      TwoSampleOptions
}

// oracleSizeCases returns the grid of searches compared with the oracle:
// every test, alternative, allocation ratio, alpha and power over effects
// whose sizes run from a handful to some hundreds per group (Barnard's,
// whose oracle costs some 30 test.Barnard calls per group size, up to
// about a hundred), and the margin hypotheses.
func oracleSizeCases(short bool) []oracleSizeCase {
	var cs []oracleSizeCase
	// (lower, higher) proportion pairs; the search runs at both orders for
	// the two-sided test, at (lower, higher) for test.Lower (p1 < p2) and
	// at (higher, lower) for test.Higher.
	pairs := map[ExactTest][][2]float64{
		FisherExactTest:  {{0.3, 0.55}, {0.1, 0.3}, {0.05, 0.2}, {0.4, 0.55}, {0.01, 0.12}, {0.8, 0.95}},
		ZPooledTest:      {{0.3, 0.55}, {0.1, 0.3}, {0.05, 0.2}, {0.4, 0.55}, {0.01, 0.12}, {0.8, 0.95}},
		BarnardExactTest: {{0.2, 0.6}, {0.3, 0.7}, {0.05, 0.4}},
	}
	ratios := []float64{1, 0.5, 2, 1.37}
	i := 0
	for _, tst := range []ExactTest{FisherExactTest, ZPooledTest, BarnardExactTest} {
		for _, pp := range pairs[tst] {
			for _, alt := range []test.Alternative{test.TwoSided, test.Higher, test.Lower} {
				for _, ratio := range ratios {
					for _, ap := range [][2]float64{{0.05, 0.8}, {0.01, 0.9}, {0.1, 0.8}} {
						i++
						if short && i%5 != 0 {
							continue
						}
						if tst == BarnardExactTest && i%3 != 0 {
							continue // a third of Barnard's grid: its oracle is slow
						}
						p1, p2 := pp[0], pp[1]
						if alt == test.Higher || (alt == test.TwoSided && i%2 == 0) {
							p1, p2 = p2, p1
						}
						o := TwoSampleOptions{Test: tst, Alternative: alt, Ratio: ratio, Alpha: ap[0], Power: ap[1], MaxN: 2000}
						cs = append(cs, oracleSizeCase{p1, p2, o})
					}
				}
			}
		}
	}
	// Searches that fail (MaxN too small) or end at MaxN, and the margins.
	cs = append(cs,
		oracleSizeCase{0.1, 0.3, TwoSampleOptions{MaxN: 40}},
		oracleSizeCase{0.1, 0.3, TwoSampleOptions{MaxN: 70}},
		oracleSizeCase{0.1, 0.3, TwoSampleOptions{Test: ZPooledTest, MaxN: 70}},
		oracleSizeCase{0.3, 0.3, TwoSampleOptions{Hypothesis: NonInferiority, Margin: 0.15}},
		oracleSizeCase{0.3, 0.3, TwoSampleOptions{Hypothesis: Equivalence, Margin: 0.2}},
	)
	return cs
}

// Every search of the grid against the oracle: the same sizes, curve,
// powers and size. The regions are the same (TestRegionsMatchOracle); the
// powers are summed in another order (by row from running tail sums, not
// table by table), so they agree to rounding, 1e-12 relative.
func TestTwoSampleNMatchesOracle(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	cases := oracleSizeCases(testing.Short())
	for _, c := range cases {
		name := fmt.Sprintf("p1=%v p2=%v %+v", c.p1, c.p2, c.o)
		want, werr := oracleTwoSampleN(ctx, c.p1, c.p2, c.o)
		got, gerr := TwoSampleN(ctx, c.p1, c.p2, c.o)
		if (werr == nil) != (gerr == nil) || (werr != nil && werr.Error() != gerr.Error()) {
			t.Errorf("%s: error %v, want %v", name, gerr, werr)
			continue
		}
		if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-12, 0)); diff != "" {
			t.Errorf("%s (-want +got):\n%s", name, diff)
		}
	}
	t.Logf("%d searches compared", len(cases))
}

// Large searches against the oracle, run on demand (minutes of CPU):
//
//	KOFN_TWOSIZE_LARGE=1 go test -run TestTwoSampleLargeMatchesOracle -v ./power
//
// Whole searches for 10% against 12% (Fisher and the z test, about 2,900
// group sizes from 1,900 to 4,800) and for 10% against 10.9% with the z
// test (about 13,500 sizes from 9,200 to 22,700); Fisher's regions and
// powers at 10% against 10.9% for a run of group sizes around the first
// one reaching 80% power (about 18,100) and at 20,000, allocation ratios
// 1 and 2 and both one-sided tests; Barnard's regions at 1,000 to 1,004
// per group started from the previous size's critical key.
func TestTwoSampleLargeMatchesOracle(t *testing.T) {
	if os.Getenv("KOFN_TWOSIZE_LARGE") == "" {
		t.Skip("set KOFN_TWOSIZE_LARGE=1 to compare large searches with the oracle")
	}
	ctx := context.Background()
	for _, c := range []oracleSizeCase{
		{0.10, 0.12, TwoSampleOptions{MaxN: 20000}},
		{0.10, 0.12, TwoSampleOptions{Test: ZPooledTest, MaxN: 20000}},
		{0.10, 0.109, TwoSampleOptions{Test: ZPooledTest, MaxN: 40000}},
	} {
		t0 := time.Now()
		want, werr := oracleTwoSampleN(ctx, c.p1, c.p2, c.o)
		t1 := time.Now()
		got, gerr := TwoSampleN(ctx, c.p1, c.p2, c.o)
		t2 := time.Now()
		if werr != nil || gerr != nil {
			t.Fatalf("errors %v, %v", werr, gerr)
		}
		if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-12, 0)); diff != "" {
			t.Errorf("p1=%v p2=%v %+v (-want +got):\n%s", c.p1, c.p2, c.o, diff)
		}
		maxRel := 0.0
		for i := range want.Curve {
			maxRel = math.Max(maxRel, math.Abs(got.Curve[i].Power-want.Curve[i].Power)/want.Curve[i].Power)
		}
		t.Logf("%v %v %v: first %d stable %d horizon %d, %d sizes, powers within %.2g relative; oracle %v, new %v",
			c.p1, c.p2, c.o.Test, got.First, got.Stable, got.Horizon, len(got.Curve), maxRel, t1.Sub(t0).Round(time.Millisecond), t2.Sub(t1).Round(time.Millisecond))
	}
	type regionCase struct {
		n1     int64
		ratio  float64
		alt    test.Alternative
		p1, p2 float64
	}
	var rcs []regionCase
	for n := int64(18100); n < 18140; n++ {
		rcs = append(rcs, regionCase{n, 1, test.TwoSided, 0.10, 0.109})
	}
	rcs = append(rcs, regionCase{20000, 1, test.TwoSided, 0.10, 0.109}, regionCase{20000, 2, test.TwoSided, 0.10, 0.109},
		regionCase{20000, 1, test.Higher, 0.109, 0.10}, regionCase{20000, 1, test.Lower, 0.10, 0.109}, regionCase{9000, 0.5, test.TwoSided, 0.3, 0.33})
	for _, c := range rcs {
		n2 := ceilN(c.ratio * float64(c.n1))
		pbar := (float64(c.n1)*c.p1 + float64(n2)*c.p2) / float64(c.n1+n2)
		pts := [][2]float64{{c.p1, c.p2}, {pbar, pbar}}
		o := TwoSampleOptions{Alternative: c.alt}
		want, err := oracleBuildRegion(ctx, "t", c.n1, n2, 0.05, o, pts)
		if err != nil {
			t.Fatal(err)
		}
		got, err := buildRegion(ctx, "t", c.n1, n2, 0.05, o, pts)
		if err != nil {
			t.Fatal(err)
		}
		bad := 0
		for s := int64(0); s <= c.n1+n2; s++ {
			wa, wb := want.ends(s)
			ga, gb := got.ends(s)
			if wa != ga || wb != gb {
				bad++
			}
		}
		if bad > 0 {
			t.Errorf("Fisher %d x %d %v: %d margins differ", c.n1, n2, c.alt, bad)
		}
		for _, p := range pts {
			if diff := cmp.Diff(oracleProb(want, p[0], p[1]), got.prob(p[0], p[1]), cmpopts.EquateApprox(1e-12, 0)); diff != "" {
				t.Errorf("Fisher %d x %d %v at %v (-want +got):\n%s", c.n1, n2, c.alt, p, diff)
			}
		}
	}
	t.Logf("Fisher: %d regions of 18,100 to 20,000 per group compared", len(rcs))
	hint := &barnardHint{}
	if _, err := barnardRegionFrom(ctx, "t", 999, 999, 0.05, test.TwoSided, hint); err != nil {
		t.Fatal(err)
	}
	for n := int64(1000); n < 1005; n++ {
		want, err := oracleBarnardRegion(ctx, "t", n, n, 0.05, test.TwoSided)
		if err != nil {
			t.Fatal(err)
		}
		got, err := barnardRegionFrom(ctx, "t", n, n, 0.05, test.TwoSided, hint)
		if err != nil {
			t.Fatal(err)
		}
		if diff := cmp.Diff(want.a, got.a); diff != "" {
			t.Errorf("Barnard %d x %d lower ends (-want +got):\n%s", n, n, diff)
		}
		if diff := cmp.Diff(want.b, got.b); diff != "" {
			t.Errorf("Barnard %d x %d upper ends (-want +got):\n%s", n, n, diff)
		}
	}
}

// FuzzTwoSampleNOracle compares the search with the oracle on arbitrary
// proportions, levels, targets, alternatives and allocation ratios
// (Fisher and the z test; small MaxN so that each input is quick): the
// same result, or the same error.
//
//	go test ./power -run '^$' -fuzz '^FuzzTwoSampleNOracle$' -fuzztime 5m -parallel 1
func FuzzTwoSampleNOracle(f *testing.F) {
	f.Add(0.2, 0.4, 0.05, 0.8, 0, 0, 1.0)
	f.Add(0.5, 0.9, 1e-6, 0.99, 1, 2, 0.3)
	f.Add(0.001, 0.2, 0.3, 0.5, 2, 1, 7.0)
	f.Add(0.97, 0.6, 0.0013, 0.9, 1, 0, 0.05)
	f.Fuzz(func(t *testing.T, p1, p2, alpha, pw float64, alt, tst int, ratio float64) {
		ctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
		defer cancel()
		o := TwoSampleOptions{Alpha: alpha, Power: pw, Alternative: test.Alternative(((alt % 3) + 3) % 3),
			Test: ExactTest(((tst % 2) + 2) % 2 * 2), Ratio: ratio, MaxN: 150}
		want, werr := oracleTwoSampleN(ctx, p1, p2, o)
		got, gerr := TwoSampleN(ctx, p1, p2, o)
		if errors.Is(werr, context.DeadlineExceeded) || errors.Is(gerr, context.DeadlineExceeded) {
			t.Skip("deadline")
		}
		if (werr == nil) != (gerr == nil) || (werr != nil && werr.Error() != gerr.Error()) {
			t.Fatalf("p1=%v p2=%v %+v: error %v, want %v", p1, p2, o, gerr, werr)
		}
		if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-12, 0), cmpopts.EquateNaNs()); diff != "" {
			t.Fatalf("p1=%v p2=%v %+v (-want +got):\n%s", p1, p2, o, diff)
		}
	})
}

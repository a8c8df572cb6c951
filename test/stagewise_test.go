package test_test

import (
	"context"
	"errors"
	"fmt"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

// simonLooks returns the looks of a Simon design r1/n1, r/n.
func simonLooks(r1, n1, r, n int64) []interval.Look {
	return []interval.Look{{N: n1, Futility: r1, Efficacy: n1 + 1}, {N: n, Futility: r, Efficacy: r + 1}}
}

func TestStageWiseSimonFormula(t *testing.T) {
	t.Parallel()
	// Koyama T, Chen H (2008), Proper inference from Simon's two-stage
	// designs, Statistics in Medicine 27:3145-3154 (formula recalled): a
	// stop at stage one with x1 responses has p-value P(X1 >= x1); a total
	// of x after stage two has
	//   p = sum_{x1 = r1+1}^{n1} b(x1; n1, p0) P(X2 >= x - x1).
	// Both computed here directly from binom.Dist. Designs from Simon
	// (1989), Table 1 (recalled).
	ctx := context.Background()
	for _, d := range [][4]int64{{0, 9, 2, 17}, {3, 13, 12, 43}, {5, 15, 18, 46}} {
		r1, n1, r, n := d[0], d[1], d[2], d[3]
		looks := simonLooks(r1, n1, r, n)
		for _, p0 := range []float64{0.05, 0.2, 0.3} {
			b1 := binom.Dist{N: n1, P: p0}
			b2 := binom.Dist{N: n - n1, P: p0}
			check := func(look int, k int64, want float64) {
				t.Helper()
				res, err := test.StageWise(ctx, looks, look, k, p0, test.StageWiseOptions{Alternative: test.Higher, SkipInterval: true})
				if err != nil {
					t.Fatal(err)
				}
				if d := cmp.Diff(want, res.PValue, cmpopts.EquateApprox(1e-11, 0)); d != "" {
					t.Errorf("design %v p0 %v look %d k %d (-formula +StageWise):\n%s", d, p0, look, k, d)
				}
			}
			for x1 := int64(0); x1 <= r1; x1++ {
				check(1, x1, b1.Survival(x1-1))
			}
			for x := r1 + 1; x <= n; x++ {
				var p float64
				for x1 := r1 + 1; x1 <= n1; x1++ {
					p += b1.Prob(x1) * b2.Survival(x-x1-1)
				}
				check(2, x, p)
			}
		}
	}
}

func TestStageWiseDuality(t *testing.T) {
	t.Parallel()
	// The attached interval excludes p0 exactly when the p-value is below
	// 1 - Level, for every alternative (checked at p0 on both sides of
	// each limit).
	ctx := context.Background()
	looks := simonLooks(3, 13, 12, 43)
	for _, alt := range []test.Alternative{test.TwoSided, test.Higher, test.Lower} {
		for _, c := range []struct {
			look int
			k    int64
		}{{1, 2}, {2, 8}, {2, 13}, {2, 20}} {
			res, err := test.StageWise(ctx, looks, c.look, c.k, 0.3, test.StageWiseOptions{Alternative: alt, Level: 0.9})
			if err != nil {
				t.Fatal(err)
			}
			for _, lim := range []float64{res.Interval.Lower, res.Interval.Upper} {
				if lim <= 0 || lim >= 1 {
					continue
				}
				for _, p0 := range []float64{lim * (1 - 1e-6), lim * (1 + 1e-6)} {
					r, err := test.StageWise(ctx, looks, c.look, c.k, p0, test.StageWiseOptions{Alternative: alt, Level: 0.9})
					if err != nil {
						t.Fatal(err)
					}
					if rej, out := r.PValue < 0.1, !r.Interval.Contains(p0); rej != out {
						t.Errorf("%v look %d k %d p0 %v: p = %v but interval [%v, %v]", alt, c.look, c.k, p0, r.PValue, r.Interval.Lower, r.Interval.Upper)
					}
				}
			}
		}
	}
}

func TestStageWiseTinyPValue(t *testing.T) {
	t.Parallel()
	// 60 of 60 after a two-look design at p0 = 1e-6: the p-value
	// P(all 60 succeed) = 1e-360 underflows, its logarithm does not.
	looks := []interval.Look{{N: 30, Futility: 0, Efficacy: 31}, {N: 60, Futility: 59, Efficacy: 60}}
	res, err := test.StageWise(context.Background(), looks, 2, 60, 1e-6, test.StageWiseOptions{Alternative: test.Higher, SkipInterval: true})
	if err != nil {
		t.Fatal(err)
	}
	if d := cmp.Diff(60*math.Log(1e-6), res.LogPValue, cmpopts.EquateApprox(1e-12, 0)); d != "" {
		t.Errorf("log p-value (-want +got):\n%s", d)
	}
}

func TestStageWiseTestErrors(t *testing.T) {
	t.Parallel()
	looks := simonLooks(0, 9, 2, 17)
	ctx := context.Background()
	for _, c := range []struct {
		look int
		k    int64
		p0   float64
	}{{1, 1, 0.1}, {2, 2, 0}, {2, 2, math.NaN()}, {3, 1, 0.1}} {
		if _, err := test.StageWise(ctx, looks, c.look, c.k, c.p0, test.StageWiseOptions{}); !errors.Is(err, test.ErrInvalidArgument) {
			t.Errorf("StageWise(%d, %d, %v) = %v, want ErrInvalidArgument", c.look, c.k, c.p0, err)
		}
	}
}

func ExampleStageWise() {
	// Invented: a pilot run with Simon's optimal design for p0 = 0.05,
	// p1 = 0.25 (Simon 1989): 1 success in the first 9, 4 in all 17.
	looks := []interval.Look{{N: 9, Futility: 0, Efficacy: 10}, {N: 17, Futility: 2, Efficacy: 3}}
	r, err := test.StageWise(context.Background(), looks, 2, 4, 0.05, test.StageWiseOptions{Alternative: test.Higher})
	if err != nil {
		panic(err)
	}
	fmt.Printf("p = %.4f, 95%% lower bound %.4f\n", r.PValue, r.Interval.Lower)
	// Output:
	// p = 0.0086, 95% lower bound 0.0853
}

func BenchmarkStageWise(b *testing.B) {
	// Simon's optimal design for p0 = 0.2, p1 = 0.4 (3/13, 12/43) and one
	// for p0 = 0.5, p1 = 0.6 (32/61, 105/190): p-value and interval.
	for _, c := range []struct {
		name  string
		looks []interval.Look
		k     int64
		p0    float64
	}{{"n=43", simonLooks(3, 13, 12, 43), 14, 0.2}, {"n=190", simonLooks(32, 61, 105, 190), 110, 0.5}} {
		b.Run(c.name, func(b *testing.B) {
			for b.Loop() {
				if _, err := test.StageWise(context.Background(), c.looks, 2, c.k, c.p0, test.StageWiseOptions{Alternative: test.Higher}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

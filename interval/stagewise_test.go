package interval_test

import (
	"context"
	"errors"
	"fmt"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/interval"
)

// simon0917 is Simon's optimal design for p0 = 0.05, p1 = 0.25 (Simon R
// (1989), Controlled Clinical Trials 10:1-10, Table 1; recalled): stop
// after 9 with no response, reject when more than 2 of 17 respond.
var simon0917 = []interval.Look{{N: 9, Futility: 0, Efficacy: 10}, {N: 17, Futility: 2, Efficacy: 3}}

func TestStageWiseSingleLookIsClopperPearson(t *testing.T) {
	t.Parallel()
	// With one look the stage-wise ordering is the ordering by count, and
	// the interval is Clopper and Pearson's (1934).
	for _, c := range []struct{ k, n int64 }{{0, 20}, {4, 20}, {13, 20}, {20, 20}, {81, 263}} {
		looks := []interval.Look{{N: c.n, Futility: c.k, Efficacy: c.k + 1}}
		for _, side := range []interval.Side{interval.TwoSided, interval.LowerBound, interval.UpperBound} {
			got, err := interval.StageWise(context.Background(), looks, 1, c.k, interval.StageWiseOptions{Level: 0.9, Side: side})
			if err != nil {
				t.Fatal(err)
			}
			want, err := interval.Proportion(c.k, c.n, interval.Options{Level: 0.9, Method: interval.ClopperPearson, Side: side})
			if err != nil {
				t.Fatal(err)
			}
			if d := cmp.Diff([]float64{want.Lower, want.Upper}, []float64{got.Lower, got.Upper}, cmpopts.EquateApprox(1e-9, 0)); d != "" {
				t.Errorf("%d/%d %v (-Clopper-Pearson +StageWise):\n%s", c.k, c.n, side, d)
			}
		}
	}
}

func TestStageWiseStageOneStop(t *testing.T) {
	t.Parallel()
	// A study that stops at stage one with x1 responses: the upper tail is
	// P(X1 >= x1) and the lower tail P(X1 <= x1) (Koyama T, Chen H (2008),
	// Statistics in Medicine 27:3145-3154), so the limits are
	// Clopper-Pearson's for x1 of n1.
	looks := []interval.Look{{N: 13, Futility: 3, Efficacy: 14}, {N: 43, Futility: 12, Efficacy: 13}}
	for x1 := int64(0); x1 <= 3; x1++ {
		got, err := interval.StageWise(context.Background(), looks, 1, x1, interval.StageWiseOptions{})
		if err != nil {
			t.Fatal(err)
		}
		want, _ := interval.Proportion(x1, 13, interval.Options{Method: interval.ClopperPearson})
		if d := cmp.Diff([]float64{want.Lower, want.Upper}, []float64{got.Lower, got.Upper}, cmpopts.EquateApprox(1e-9, 0)); d != "" {
			t.Errorf("stop at stage one with %d/13 (-Clopper-Pearson +StageWise):\n%s", x1, d)
		}
	}
}

// outcomes lists every stopping outcome (look, count) of a two-look design
// with its probability at p, from binom's densities.
func outcomes(looks []interval.Look, p float64) (look []int, k []int64, prob []float64) {
	l1, l2 := looks[0], looks[1]
	b1 := binom.Dist{N: l1.N, P: p}
	b2 := binom.Dist{N: l2.N - l1.N, P: p}
	for x := int64(0); x <= l1.Futility; x++ {
		look, k, prob = append(look, 1), append(k, x), append(prob, b1.Prob(x))
	}
	for s := l1.Futility + 1; s <= l2.N; s++ {
		var pr float64
		for x1 := l1.Futility + 1; x1 <= l1.N && x1 <= s; x1++ {
			pr += b1.Prob(x1) * b2.Prob(s-x1)
		}
		look, k, prob = append(look, 2), append(k, s), append(prob, pr)
	}
	return look, k, prob
}

func TestStageWiseCoverage(t *testing.T) {
	t.Parallel()
	// Exact coverage of the 90% interval after Simon's design, summed over
	// every outcome: at least the level at every p (the interval inverts
	// two exact one-sided tests), and each one-sided 95% bound too.
	designs := [][]interval.Look{simon0917, {{N: 13, Futility: 3, Efficacy: 14}, {N: 43, Futility: 12, Efficacy: 13}}}
	for di, looks := range designs {
		var lower, upper []float64
		lk, kk, _ := outcomes(looks, 0.5)
		for i := range lk {
			iv, err := interval.StageWise(context.Background(), looks, lk[i], kk[i], interval.StageWiseOptions{Level: 0.9})
			if err != nil {
				t.Fatal(err)
			}
			if iv.Lower > iv.Upper {
				t.Fatalf("design %d outcome %d/%d: empty interval %+v", di, lk[i], kk[i], iv)
			}
			lower, upper = append(lower, iv.Lower), append(upper, iv.Upper)
		}
		for p := 0.01; p < 1; p += 0.0137 {
			_, _, prob := outcomes(looks, p)
			var cov, covLo, covHi float64
			for i, pr := range prob {
				if lower[i] <= p && p <= upper[i] {
					cov += pr
				}
				if lower[i] <= p {
					covLo += pr
				}
				if p <= upper[i] {
					covHi += pr
				}
			}
			if cov < 0.9-1e-9 || covLo < 0.95-1e-9 || covHi < 0.95-1e-9 {
				t.Errorf("design %d p = %.4f: coverage %v, lower %v, upper %v", di, p, cov, covLo, covHi)
			}
		}
	}
}

func TestStageWiseErrors(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	for _, c := range []struct {
		look int
		k    int64
		opt  interval.StageWiseOptions
	}{
		{0, 0, interval.StageWiseOptions{}},
		{3, 0, interval.StageWiseOptions{}},
		{1, 1, interval.StageWiseOptions{}}, // 1 of 9 continues
		{2, 18, interval.StageWiseOptions{}},
		{2, 5, interval.StageWiseOptions{Level: 1.5}},
	} {
		if _, err := interval.StageWise(ctx, simon0917, c.look, c.k, c.opt); !errors.Is(err, interval.ErrInvalidArgument) {
			t.Errorf("StageWise(look %d, k %d, %+v) = %v, want ErrInvalidArgument", c.look, c.k, c.opt, err)
		}
	}
}

func ExampleStageWise() {
	// Invented: a pilot run with Simon's optimal design for p0 = 0.05,
	// p1 = 0.25 (9 units, then 8 more when one succeeds) saw 1 of 9 and
	// then 4 of 17 in all.
	iv, err := interval.StageWise(context.Background(), simon0917, 2, 4, interval.StageWiseOptions{})
	if err != nil {
		panic(err)
	}
	fmt.Printf("%s: %.4f to %.4f\n", iv.Method, iv.Lower, iv.Upper)
	// Output:
	// stage-wise ordering (exact): 0.0686 to 0.5005
}

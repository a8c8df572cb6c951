package binom_test

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/kofnlab/kofn/binom"
)

// TestFloatDistAgreesWithGonum: FloatDist gives gonum's distuv.Binomial
// values (gonum 0.17, a general-purpose reference library) wherever
// gonum is accurate: moderate n, probabilities above 1e-10, real and
// whole arguments, inside and outside the support. Relative tolerance 1e-9
// (gonum's regularized incomplete beta and Lgamma differences, not kofn's,
// bound the agreement).
func TestFloatDistAgreesWithGonum(t *testing.T) {
	t.Parallel()
	for _, c := range []struct{ n, p float64 }{{1, 0.5}, {10, 0.3}, {20, 0.05}, {100, 0.5}, {400, 0.9}} {
		d, err := binom.New(int64(c.n), c.p)
		if err != nil {
			t.Fatal(err)
		}
		f := d.Float(nil)
		g := distuv.Binomial{N: c.n, P: c.p}
		for x := -2.0; x <= c.n+2; x += 0.5 {
			want := []float64{g.Prob(x), g.CDF(x)}
			got := []float64{f.Prob(x), f.CDF(x)}
			if s := g.Survival(x); s > 1e-5 && s < 1 { // gonum forms 1 - CDF, which loses digits in a small tail
				want, got = append(want, g.Survival(x)), append(got, f.Survival(x))
			}
			if want[0] < 1e-10 {
				want, got = want[1:], got[1:]
			}
			if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-9, 0)); diff != "" {
				t.Errorf("n %v p %v x %v (-gonum +kofn):\n%s", c.n, c.p, x, diff)
			}
			if lw, lg := g.LogProb(x), f.LogProb(x); math.IsInf(lw, -1) != math.IsInf(lg, -1) {
				t.Errorf("n %v p %v x %v: LogProb %v, gonum %v", c.n, c.p, x, lg, lw)
			}
		}
		if diff := cmp.Diff([]float64{g.Mean(), g.Variance(), g.StdDev(), g.Skewness(), g.ExKurtosis()},
			[]float64{f.Mean(), f.Variance(), f.StdDev(), f.Skewness(), f.ExKurtosis()}, cmpopts.EquateApprox(1e-12, 0)); diff != "" {
			t.Errorf("moments n %v p %v (-gonum +kofn):\n%s", c.n, c.p, diff)
		}
	}
}

// TestFloatDistQuantileAndSpecials: Quantile inverts CDF at whole numbers,
// and the cases where distuv would panic give NaN.
func TestFloatDistQuantileAndSpecials(t *testing.T) {
	t.Parallel()
	d, _ := binom.New(30, 0.2)
	f := d.Float(rand.NewPCG(1, 2))
	for x := 0.0; x < 30; x++ {
		if q := f.Quantile(f.CDF(x)); q != x && f.CDF(x) < 1 {
			t.Errorf("Quantile(CDF(%v)) = %v", x, q)
		}
	}
	for _, v := range []float64{f.Quantile(-0.1), f.Quantile(1.1), f.Quantile(math.NaN()), f.Prob(math.NaN()), f.CDF(math.NaN()), f.Survival(math.NaN())} {
		if !math.IsNaN(v) {
			t.Errorf("special case gave %v, want NaN", v)
		}
	}
	if v := f.Rand(); v != math.Trunc(v) || v < 0 || v > 30 {
		t.Errorf("Rand() = %v", v)
	}
	var bad binom.FloatDist // N = 0, P = 0 is valid: the point mass at 0
	if bad.Quantile(0.5) != 0 || bad.Prob(0) != 1 {
		t.Errorf("zero FloatDist: Quantile %v Prob(0) %v", bad.Quantile(0.5), bad.Prob(0))
	}
}

// A binom distribution handed to code written against gonum's interfaces.
func ExampleDist_Float() {
	d, _ := binom.New(20, 0.1) // invented: 20 inspected parts, 10% defect rate
	var q distuv.Quantiler = d.Float(nil)
	fmt.Printf("%v %.6f\n", q.Quantile(0.95), d.Float(nil).Survival(4))
	// Output: 4 0.043174
}

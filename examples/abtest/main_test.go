package main

import (
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"gonum.org/v1/gonum/mathext"

	"github.com/kofnlab/kofn/examples/internal/check"
)

// printed is the absolute tolerance of a value printed with 4 decimals.
var printed = cmpopts.EquateApprox(0, 5.01e-5)

// TestRun checks the program's key numbers against independent
// computations with gonum's regularized incomplete beta (mathext.RegIncBeta,
// a separate implementation from the library's): credible limits by
// bisection on it, and P(B better) = integral f_A(x) (1 - I_x(aB, bB)) dx by
// the midpoint rule on 100000 points over +-12 posterior standard
// deviations, with the Beta density from math.Lgamma.
func TestRun(t *testing.T) {
	t.Parallel()
	out := check.Output(t, run)
	check.Invented(t, out)
	aA, bA := 1.0+buyA, 1.0+seenA-buyA
	aB, bB := 1.0+buyB, 1.0+seenB-buyB
	quantile := func(a, b, q float64) float64 {
		lo, hi := 0.0, 1.0
		for i := 0; i < 200; i++ {
			mid := (lo + hi) / 2
			if mathext.RegIncBeta(a, b, mid) < q {
				lo = mid
			} else {
				hi = mid
			}
		}
		return (lo + hi) / 2
	}
	for _, c := range []struct {
		label string
		a, b  float64
	}{{"page A", aA, bA}, {"page B", aB, bB}} {
		want := []float64{c.a / (c.a + c.b), quantile(c.a, c.b, 0.025), quantile(c.a, c.b, 0.975)}
		if diff := cmp.Diff(want, check.Values(t, out, c.label), printed); diff != "" {
			t.Errorf("%s (-want +got):\n%s", c.label, diff)
		}
	}
	la, _ := math.Lgamma(aA + bA)
	lx, _ := math.Lgamma(aA)
	ly, _ := math.Lgamma(bA)
	norm := la - lx - ly
	lo, hi := 0.0826-12*0.0039, 0.0938+12*0.0042
	const m = 100000
	h := (hi - lo) / m
	var p float64
	for i := 0; i < m; i++ {
		x := lo + (float64(i)+0.5)*h
		f := math.Exp(norm + (aA-1)*math.Log(x) + (bA-1)*math.Log1p(-x))
		p += f * (1 - mathext.RegIncBeta(aB, bB, x)) * h
	}
	if diff := cmp.Diff([]float64{p}, check.Values(t, out, "P(B better)"), printed); diff != "" {
		t.Errorf("P(B better) (-want +got):\n%s", diff)
	}
	if diff := cmp.Diff([]float64{1 - p}, check.Values(t, out, "P(A better)"), printed); diff != "" {
		t.Errorf("P(A better) (-want +got):\n%s", diff)
	}
}

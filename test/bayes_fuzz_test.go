package test_test

import (
	"errors"
	"math"
	"testing"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

// FuzzCompare: Compare either fails with a typed error naming an argument
// or returns probabilities in [0, 1] summing to 1 within its error bound
// (twice the bound for the trapezoidal rule, whose bound must be below
// 1e-9) and finite losses.
func FuzzCompare(f *testing.F) {
	f.Add(int64(1000), int64(1000), int64(999), int64(1000), 1.0, 1.0)
	f.Add(int64(3), int64(10), int64(0), int64(0), 0.5, 0.5)
	f.Add(int64(5e6), int64(1e7), int64(4e6), int64(1e7), 2.0, 3.0)
	f.Add(int64(0), int64(20000), int64(3), int64(20000), 0.5, 0.5)
	f.Add(int64(0), int64(40000), int64(40000), int64(40000), 0.1, 0.1)
	f.Fuzz(func(t *testing.T, k1, n1, k2, n2 int64, a, b float64) {
		if n1 > 1e7 || n2 > 1e7 {
			return // the exact sums cost grows like sqrt(n); keep the fuzzer fast
		}
		p := interval.BetaPrior(a, b)
		r, err := test.Compare(k1, n1, k2, n2, test.CompareOptions{Prior1: p, Prior2: p})
		if err != nil {
			var e *test.Error
			if !errors.As(err, &e) || e.Arg == "" {
				t.Fatalf("untyped or unnamed error %v", err)
			}
			return
		}
		s := r.ProbFirstBetter + r.ProbSecondBetter
		tol := 1e-9 + r.ErrorBound
		if r.Method != "closed-form sum" {
			// Both probabilities computed on their own, each within the
			// certified bound, which must itself be small.
			tol = 2*r.ErrorBound + 0x1p-52
			if !(r.ErrorBound < 1e-9) {
				t.Fatalf("Compare(%d, %d, %d, %d, Beta(%g, %g)): error bound %v", k1, n1, k2, n2, a, b, r.ErrorBound)
			}
		}
		if !(r.ProbFirstBetter >= 0 && r.ProbSecondBetter >= 0 && math.Abs(s-1) <= tol) || math.IsNaN(r.LossFirst) || math.IsNaN(r.LossSecond) {
			t.Fatalf("Compare(%d, %d, %d, %d, Beta(%g, %g)) = %+v", k1, n1, k2, n2, a, b, r)
		}
	})
}

package test

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"
)

// checkKErr verifies the error contract: typed, naming the function, one
// of the sentinels.
func checkKErr(t *testing.T, fn string, err error) {
	t.Helper()
	var e *Error
	if !errors.As(err, &e) || !strings.HasPrefix(err.Error(), fn+": ") ||
		!(errors.Is(err, ErrInvalidArgument) || errors.Is(err, ErrTooLarge)) {
		t.Fatalf("%s: untyped or unnamed error %v", fn, err)
	}
}

func okP(p, lp float64) bool { return p >= 0 && p <= 1 && !math.IsNaN(lp) && lp <= 0 }

// FuzzEqualProportions: three arms of small counts (the exact test stays
// quick), every method; an answer has a p-value in [0, 1], an error is typed.
func FuzzEqualProportions(f *testing.F) {
	f.Add(int64(3), int64(10), int64(0), int64(9), int64(5), int64(12), 0, false)
	f.Add(int64(0), int64(0), int64(1), int64(1), int64(2), int64(2), 2, true)
	f.Add(int64(-1), int64(5), int64(7), int64(3), int64(0), int64(1), 1, false)
	f.Fuzz(func(t *testing.T, x1, n1, x2, n2, x3, n3 int64, m int, mid bool) {
		for _, v := range []int64{n1, n2, n3} {
			if v > 300 {
				return
			}
		}
		r, err := EqualProportions(context.Background(), []int64{x1, x2, x3}, []int64{n1, n2, n3}, KSampleOptions{Method: KSampleMethod(m), MidP: mid})
		if err != nil {
			checkKErr(t, "test.EqualProportions", err)
			return
		}
		if !okP(r.PValue, r.LogPValue) || math.IsNaN(r.Statistic.Value) {
			t.Fatalf("%+v", r)
		}
	})
}

// FuzzAdjust: any five values and method; adjusted values lie in [p, 1].
func FuzzAdjust(f *testing.F) {
	f.Add(0.01, 0.5, 0.0, 1.0, 0.01, 4)
	f.Add(math.NaN(), 0.5, 0.2, 0.3, 0.4, 0)
	f.Add(0.3, -0.1, 2.0, 0.1, 0.9, 9)
	f.Fuzz(func(t *testing.T, a, b, c, d, e float64, m int) {
		p := []float64{a, b, c, d, e}
		adj, err := AdjustPValues(context.Background(), p, Adjustment(m))
		if err != nil {
			checkKErr(t, "test.AdjustPValues", err)
			return
		}
		for i := range p {
			if !(adj[i] >= p[i]*(1-1e-15) && adj[i] <= 1) {
				t.Fatalf("%v: %v", p, adj)
			}
		}
	})
}

// FuzzSampleRatio: three arms with any weights and method.
func FuzzSampleRatio(f *testing.F) {
	f.Add(int64(50), int64(40), int64(10), 1.0, 1.0, 0.5, 0)
	f.Add(int64(0), int64(0), int64(0), 1.0, 0.0, 1.0, 2)
	f.Add(int64(7), int64(3), int64(10), math.Inf(1), 1.0, 2.0, 1)
	f.Fuzz(func(t *testing.T, a, b, c int64, wa, wb, wc float64, m int) {
		if m == int(FitExact) && a+b+c > 200 {
			return
		}
		r, err := SampleRatio(context.Background(), []int64{a, b, c}, []float64{wa, wb, wc}, SampleRatioOptions{Method: FitMethod(m)})
		if err != nil {
			checkKErr(t, "test.SampleRatio", err)
			return
		}
		if !okP(r.PValue, r.LogPValue) {
			t.Fatalf("%+v", r)
		}
	})
}

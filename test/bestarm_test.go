package test_test

import (
	"context"
	"errors"
	"math"
	"testing"
	"time"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

// TestProbBestAgrees: with two arms ProbBest is Compare's P(p1 > p2) (an
// exact sum under uniform priors) within the bounds; identical arms are
// each best with probability 1/k by symmetry; the probabilities sum to 1
// within k times the bound.
func TestProbBestAgrees(t *testing.T) {
	t.Parallel()
	u := []interval.Prior{interval.UniformPrior()}
	for _, c := range [][4]int64{{3, 10, 7, 12}, {50, 100, 40, 100}, {0, 1000, 5, 1000}, {1000, 1000, 999, 1000}} {
		b, err := test.ProbBest(context.Background(), []int64{c[0], c[2]}, []int64{c[1], c[3]}, u)
		if err != nil {
			t.Fatal(err)
		}
		cmpr, _ := test.Compare(c[0], c[1], c[2], c[3], test.CompareOptions{Prior1: u[0], Prior2: u[0]})
		want := []float64{cmpr.ProbFirstBetter, cmpr.ProbSecondBetter}
		for i := range want {
			if d := math.Abs(b.ProbBest[i] - want[i]); !(d <= b.ErrorBound+cmpr.ErrorBound) {
				t.Errorf("%v: ProbBest[%d] = %v, Compare %v: beyond the bound %.3g", c, i, b.ProbBest[i], want[i], b.ErrorBound)
			}
		}
		if !(b.ErrorBound < 1e-12) || b.Method != "trapezoidal rule in the log-odds" {
			t.Errorf("%v: error bound %v, method %q", c, b.ErrorBound, b.Method)
		}
	}
	b, err := test.ProbBest(context.Background(), []int64{30, 30, 30}, []int64{100, 100, 100}, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range b.ProbBest {
		if !(math.Abs(p-1.0/3) <= b.ErrorBound) {
			t.Errorf("identical arms: %v, bound %.3g", b.ProbBest, b.ErrorBound)
		}
	}
	b, _ = test.ProbBest(context.Background(), []int64{12, 30, 25, 2}, []int64{100, 100, 120, 10}, nil)
	s := 0.0
	for _, p := range b.ProbBest {
		s += p
	}
	if !(math.Abs(s-1) <= 4*b.ErrorBound+0x1p-52) || b.Priors[3].Kind != interval.PriorJeffreys {
		t.Errorf("four arms: sum 1 + %.3g, bound %.3g, priors %v", s-1, b.ErrorBound, b.Priors)
	}
}

func TestProbBestErrors(t *testing.T) {
	t.Parallel()
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	for _, c := range []struct {
		ctx  context.Context
		k, n []int64
		arg  string
		want error
	}{
		{context.Background(), []int64{1}, []int64{2}, "k", test.ErrInvalidArgument},
		{context.Background(), []int64{1, 2}, []int64{2}, "n", test.ErrInvalidArgument},
		{context.Background(), []int64{1, 5}, []int64{2, 4}, "k[1]", test.ErrInvalidArgument},
		{ctx, []int64{1, 2}, []int64{2, 4}, "", context.Canceled},
	} {
		_, err := test.ProbBest(c.ctx, c.k, c.n, nil)
		var e *test.Error
		if !errors.Is(err, c.want) || !errors.As(err, &e) || e.Arg != c.arg {
			t.Errorf("ProbBest(%v, %v) = %v, want %v naming %q", c.k, c.n, err, c.want, c.arg)
		}
	}
}

func BenchmarkProbBest4(b *testing.B) {
	k, n := []int64{12, 30, 25, 20}, []int64{100, 100, 120, 100}
	for b.Loop() {
		test.ProbBest(context.Background(), k, n, nil)
	}
}

// TestProbBestCancel: a long walk (64 arms at 99,999 trials each, about
// 0.2 s) returns the context's error soon after cancellation; only a call
// that finished before the cancellation may succeed.
func TestProbBestCancel(t *testing.T) {
	t.Parallel()
	k, n := make([]int64, test.MaxArms), make([]int64, test.MaxArms)
	for i := range k {
		k[i], n[i] = int64(i), 99999
	}
	ctx, cancel := context.WithCancel(context.Background())
	type result struct {
		err error
		at  time.Time
	}
	done := make(chan result, 1)
	go func() {
		_, err := test.ProbBest(ctx, k, n, nil)
		done <- result{err, time.Now()}
	}()
	time.Sleep(20 * time.Millisecond)
	cancelled := time.Now()
	cancel()
	select {
	case r := <-done:
		if r.err == nil && r.at.After(cancelled) || r.err != nil && !errors.Is(r.err, context.Canceled) {
			t.Errorf("cancelled ProbBest: %v, %v after the cancellation", r.err, r.at.Sub(cancelled))
		}
	case <-time.After(5 * time.Second):
		t.Fatal("ProbBest did not return after cancellation")
	}
}

package test_test

import (
	"context"
	"errors"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

// TestProbBestAgrees: with two arms ProbBest is Compare's P(p1 > p2) (an
// exact sum under uniform priors); identical arms are each best with
// probability 1/k by symmetry; the probabilities sum to 1.
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
		if diff := cmp.Diff(want, b.ProbBest, cmpopts.EquateApprox(1e-11, 0)); diff != "" {
			t.Errorf("%v: ProbBest vs Compare (-want +got):\n%s", c, diff)
		}
		if b.ErrorBound > 1e-10 {
			t.Errorf("%v: error bound %v", c, b.ErrorBound)
		}
	}
	b, err := test.ProbBest(context.Background(), []int64{30, 30, 30}, []int64{100, 100, 100}, nil)
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff([]float64{1.0 / 3, 1.0 / 3, 1.0 / 3}, b.ProbBest, cmpopts.EquateApprox(1e-12, 0)); diff != "" {
		t.Errorf("identical arms (-want +got):\n%s", diff)
	}
	b, _ = test.ProbBest(context.Background(), []int64{12, 30, 25, 2}, []int64{100, 100, 120, 10}, nil)
	s := 0.0
	for _, p := range b.ProbBest {
		s += p
	}
	if diff := cmp.Diff(1.0, s, cmpopts.EquateApprox(1e-12, 0)); diff != "" || b.Priors[3].Kind != interval.PriorJeffreys {
		t.Errorf("four arms: sum (-want +got):\n%s, priors %v", diff, b.Priors)
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

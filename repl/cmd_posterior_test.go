package repl

import (
	"context"
	"testing"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

// TestPosteriorAndBeatsMatchPackages pins the numbers of posterior and
// beats to interval and test, and checks that the prior is in the JSON.
func TestPosteriorAndBeatsMatchPackages(t *testing.T) {
	t.Parallel()
	iv, _ := interval.Credible(7, 30, interval.CredibleOptions{Kind: interval.HighestDensity, Prior: interval.UniformPrior()})
	obj := runJSON(t, "posterior 7/30 prior=uniform shape=hpd above=0.15")
	if got := num(t, obj, "interval.lower"); got != iv.Lower {
		t.Errorf("hpd lower %v, package %v", got, iv.Lower)
	}
	if got := num(t, obj, "posterior.prior.a"); got != 1 {
		t.Errorf("prior a %v, want 1", got)
	}
	post, _ := interval.NewPosterior(7, 30, interval.UniformPrior())
	pa, _, _ := post.ProbAbove(0.15)
	if got := num(t, obj, "above.prob_above"); got != pa {
		t.Errorf("P(p > 0.15) %v, package %v", got, pa)
	}
	obj = runJSON(t, "posterior 0/40 prior=1,9 level=0.9")
	if got := num(t, obj, "posterior.a"); got != 1 {
		t.Errorf("posterior a %v, want 1", got)
	}
	u := interval.UniformPrior()
	c, _ := test.Compare(1000, 1000, 999, 1000, test.CompareOptions{Prior1: u, Prior2: u})
	if got := num(t, runJSON(t, "beats 1000/1000 999/1000 prior=uniform"), "prob_first_better"); got != c.ProbFirstBetter {
		t.Errorf("P(arm 1 better) %v, package %v", got, c.ProbFirstBetter)
	}
	b, _ := test.ProbBest(context.Background(), []int64{12, 30, 25}, []int64{100, 100, 120}, nil)
	if got := num(t, runJSON(t, "beats 12/100 30/100 25/120"), "prob_best.1"); got != b.ProbBest[1] {
		t.Errorf("P(arm 2 best) %v, package %v", got, b.ProbBest[1])
	}
}

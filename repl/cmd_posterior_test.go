package repl

import (
	"context"
	"testing"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/power"
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

// TestPredictAndMonitorMatchPower pins predict and monitor to power.
func TestPredictAndMonitorMatchPower(t *testing.T) {
	t.Parallel()
	prior := interval.BetaPrior(0.6, 0.4)
	p, _ := power.PredictiveSuccess(7, 20, 40, 0.2, 0.9, prior)
	if got := num(t, runJSON(t, "predict 7/20 final=40 p0=0.2 threshold=0.9 prior=0.6,0.4"), "prob"); got != p.Prob {
		t.Errorf("predictive probability %v, package %v", got, p.Prob)
	}
	looks := make([]int64, 0, 30)
	for n := int64(10); n < 40; n++ {
		looks = append(looks, n)
	}
	d := power.PredictiveDesign{Final: 40, Looks: looks, P0: 0.2, ThetaT: 0.9, ThetaL: 0.05, ThetaU: 1, Prior: prior}
	r, _ := d.OC(context.Background(), []float64{0.2, 0.4})
	obj := runJSON(t, "monitor final=40 p0=0.2 p1=0.4 prior=0.6,0.4")
	if got := num(t, obj, "oc.1.reject"); got != r.OC[1].Reject {
		t.Errorf("power %v, package %v", got, r.OC[1].Reject)
	}
	if got := num(t, obj, "prior.a"); got != 0.6 {
		t.Errorf("prior a %v", got)
	}
}

package repl

import (
	"strings"

	"github.com/kofnlab/kofn/power"
)

func predictCommand() *command {
	return &command{
		Name:    "predict",
		Group:   "planning",
		Summary: "Bayesian: the chance, from the data so far, that a study ends with enough successes",
		Usage:   "predict X/N final=F (need=R | p0=P0 [threshold=T]) [prior=jeffreys|uniform|A,B]",
		Options: []opt{optPrior, {Name: "final", Doc: "the planned final number of trials"},
			{Name: "need", Doc: "the number of successes needed at the end, in all"},
			{Name: "p0", Doc: "the rate of no interest: success at the end means P(p > p0 | data) > threshold"},
			{Name: "threshold", Doc: "the posterior probability required at the end (default 0.9)"}},
		Help: helpText{
			Computes: "From X successes in the first N trials, the posterior predictive probability that the " +
				"study ends (at final= trials) with at least need= successes, or, with p0=, that its final " +
				"posterior probability of p > p0 exceeds threshold= (the predictive probability of Lee and Liu " +
				"2008). The prior is printed with the result.",
			Methods: "The remaining trials' successes follow the beta-binomial distribution with the posterior's " +
				"shapes; its tail is summed exactly in log space.",
			Assumptions: "Independent trials with one success probability, the prior fixed in advance. A " +
				"predictive probability used to stop a study changes its error rates: check them with monitor.",
			Examples: []string{"predict 7/20 final=40 need=14 prior=0.6,0.4", "predict 7/20 final=40 p0=0.2 threshold=0.9 prior=0.6,0.4"},
			Sources: "Lee JJ, Liu DD (2008), A predictive probability design for phase II cancer clinical trials, " +
				"Clinical Trials 5:93-106; Geisser S (1993), Predictive Inference: An Introduction.",
			Caution: true,
		},
		Run: runPredict,
	}
}

func runPredict(c *call) error {
	a, s := c.Args, c.S
	if err := a.Want(1, 1); err != nil {
		return err
	}
	x, n, err := a.KN(0, "X/N")
	if err != nil {
		return err
	}
	if err := a.Need("final"); err != nil {
		return err
	}
	final, err := a.Count("final", 0)
	if err != nil {
		return err
	}
	prior, err := priorArg(a)
	if err != nil {
		return err
	}
	var r power.Predictive
	crit := ""
	switch {
	case a.Has("need") && a.Has("p0"):
		return inputErr("need="+a.Str("need", ""), "does not go with p0=; give one criterion")
	case a.Has("need"):
		need, err := a.Count("need", 0)
		if err != nil {
			return err
		}
		if r, err = power.PredictiveAtLeast(x, n, final, need, prior); err != nil {
			return err
		}
		crit = "at least " + count(need) + " successes of " + count(final)
	case a.Has("p0"):
		p0, err := a.OpenProb("p0", 0)
		if err != nil {
			return err
		}
		th, err := a.OpenProb("threshold", 0.9)
		if err != nil {
			return err
		}
		if r, err = power.PredictiveSuccess(x, n, final, p0, th, prior); err != nil {
			return err
		}
		crit = "P(p > " + in(p0) + " | all " + count(final) + ") > " + in(th) + ", i.e. at least " + count(r.NeedTotal) + " successes"
	default:
		return inputErr("predict", "needs need=R or p0=P0; usage: "+a.cmd.Usage)
	}
	c.Data(r)
	b := c.Block("predictive probability after " + kn(x, n) + ", prior " + r.Prior.String())
	b.Row("criterion", crit)
	b.Row("remaining", count(final-n)+" trials", "beta-binomial with shapes "+in(r.Prior.A+float64(x))+", "+in(r.Prior.B+float64(n-x)))
	b.Row("probability", s.num(r.Prob))
	b.Warn(r.Warnings...)
	return nil
}

func monitorCommand() *command {
	return &command{
		Name:    "monitor",
		Group:   "planning",
		Summary: "Bayesian: a single-arm design stopped by predictive probability, with its exact error rates",
		Usage:   "monitor final=F p0=P0 p1=P1 [threshold=T] [futility=L] [efficacy=U] [from=N0] [every=S] [prior=...]",
		Options: []opt{optPrior, {Name: "final", Doc: "the maximum number of trials"},
			{Name: "p0", Doc: "the rate of no interest (type I error is computed there)"},
			{Name: "p1", Doc: "the rate of interest (power is computed there)"},
			{Name: "threshold", Doc: "posterior probability of p > p0 required at the end (default 0.9)"},
			{Name: "futility", Doc: "stop when the predictive probability falls below this (default 0.05)"},
			{Name: "efficacy", Doc: "stop for efficacy when it exceeds this (default 1: never)"},
			{Name: "from", Doc: "first look, in trials (default 10)"},
			{Name: "every", Doc: "trials between looks (default 1)"}},
		Help: helpText{
			Computes: "The stopping boundaries of the predictive-probability design of Lee and Liu (2008) and its " +
				"exact frequentist operating characteristics at p0 and p1: the probability of declaring the " +
				"treatment promising (type I error at p0, power at p1), of stopping early, and the expected " +
				"number of trials. The prior is printed with the result.",
			Methods: "Boundaries from the beta-binomial predictive probability at each look; operating " +
				"characteristics by exact forward recursion over the looks (no simulation).",
			Assumptions: "Independent trials with one success probability; looks at the planned sizes only.",
			Examples:    []string{"monitor final=40 p0=0.2 p1=0.4 prior=0.6,0.4", "monitor final=60 p0=0.15 p1=0.3 from=5 every=5 futility=0.02"},
			Sources: "Lee JJ, Liu DD (2008), A predictive probability design for phase II cancer clinical trials, " +
				"Clinical Trials 5:93-106.",
			Caution: true,
		},
		Run: runMonitor,
	}
}

func runMonitor(c *call) error {
	a, s := c.Args, c.S
	if err := a.Want(0, 0); err != nil {
		return err
	}
	if err := a.Need("final", "p0", "p1"); err != nil {
		return err
	}
	final, err := a.Count("final", 0)
	if err != nil {
		return err
	}
	p0, err := a.OpenProb("p0", 0)
	if err != nil {
		return err
	}
	p1, err := a.OpenProb("p1", 0)
	if err != nil {
		return err
	}
	th, err := a.OpenProb("threshold", 0.9)
	if err != nil {
		return err
	}
	fut, err := a.Prob("futility", 0.05)
	if err != nil {
		return err
	}
	eff, err := a.Prob("efficacy", 1)
	if err != nil {
		return err
	}
	from, err := a.Count("from", 10)
	if err != nil {
		return err
	}
	every, err := a.Count("every", 1)
	if err != nil {
		return err
	}
	if every < 1 {
		return inputErr("every="+a.Str("every", ""), "must be at least 1")
	}
	prior, err := priorArg(a)
	if err != nil {
		return err
	}
	var looks []int64
	for m := max(from, 1); m < final; m += every {
		looks = append(looks, m)
		if len(looks) > int(power.MaxPredictiveN) {
			break
		}
	}
	d := power.PredictiveDesign{Final: final, Looks: looks, P0: p0, ThetaT: th, ThetaL: fut, ThetaU: eff, Prior: prior}
	if looks == nil {
		d.Looks = []int64{}
	}
	r, err := d.OC(c.Ctx, []float64{p0, p1})
	if err != nil {
		return err
	}
	c.Data(r)
	b := c.Block("predictive-probability design, " + count(final) + " trials at most, prior " + r.Prior.String())
	b.Row("at the end", "promising with "+count(r.FinalNeed)+" or more successes: P(p > "+in(p0)+") > "+in(th))
	var stops []string
	for i, n := range r.Looks {
		if r.Futility[i] >= 0 {
			stops = append(stops, count(r.Futility[i])+"/"+count(n))
		}
	}
	b.Row("futility", "stop at or below (predictive probability < "+in(fut)+"):")
	if len(stops) == 0 {
		b.Row("", "no look")
	}
	for i := 0; i < len(stops); i += 8 {
		b.Row("", strings.Join(stops[i:min(i+8, len(stops))], ", "))
	}
	for i, oc := range r.OC {
		label := "at p0 = " + in(oc.P)
		what := "type I error "
		if i == 1 {
			label, what = "at p1 = "+in(oc.P), "power "
		}
		b.Row(label, what+s.num(oc.Reject), "stop early "+s.num(oc.EarlyStop)+", expected trials "+s.num(oc.ExpectedN))
	}
	b.Warn(r.Warnings...)
	return nil
}

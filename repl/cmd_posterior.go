package repl

import (
	"math"
	"strconv"
	"strings"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

var optPrior = opt{Name: "prior", Doc: "the Beta prior: jeffreys (default), uniform, or A,B for an informative Beta(A, B), like 2,8",
	Values: []string{"jeffreys", "uniform"}}

// priorArg reads prior= (jeffreys, uniform or A,B).
func priorArg(a *argSet) (interval.Prior, error) {
	v := a.Str("prior", "jeffreys")
	if i := strings.IndexByte(v, ','); i >= 0 {
		pa, err1 := parseFloat(v[:i])
		pb, err2 := parseFloat(v[i+1:])
		if err1 != nil || err2 != nil || !(pa > 0) || !(pb > 0) {
			return interval.Prior{}, inputErr("prior="+v, "is not A,B with two positive numbers")
		}
		return interval.BetaPrior(pa, pb), nil
	}
	k, err := interval.ParsePriorKind(v)
	if err != nil || k == interval.PriorBeta {
		return interval.Prior{}, inputErr("prior="+v, "is not jeffreys, uniform or A,B")
	}
	return interval.Prior{Kind: k}, nil
}

func posteriorCommand() *command {
	return &command{
		Name:    "posterior",
		Group:   "intervals",
		Summary: "Bayesian: the posterior of a proportion under a Beta prior, a credible interval, P(p > c)",
		Usage:   "posterior K/N [prior=jeffreys|uniform|A,B] [level=L] [shape=equal-tailed|hpd] [above=C]",
		Options: []opt{optPrior, optLevel,
			{Name: "shape", Doc: "equal-tailed (default) or hpd, the highest posterior density interval", Values: []string{"equal-tailed", "hpd"}},
			{Name: "above", Doc: "a value c: also print P(p > c | data) and P(p <= c | data)"}},
		Help: helpText{
			Computes: "The Beta posterior of a success probability p after K successes in N trials under the " +
				"stated prior: mean, median, mode and spread, a credible interval holding posterior probability " +
				"level, and with above=C the posterior probabilities that p exceeds C or not, with a plot of the " +
				"posterior density. The prior is printed with every result.",
			Methods: "Conjugate updating Beta(A + K, B + N - K) (Gelman et al. 2013, Bayesian Data Analysis, " +
				"section 2.4). equal-tailed: quantiles at (1 - level)/2 from each side; under the Jeffreys prior it " +
				"is the Jeffreys interval (Brown, Cai and DasGupta 2001) except that its lower end stays above 0 " +
				"at K = 0. hpd: the shortest interval, with equal density at both ends.",
			Assumptions: "Independent trials with one success probability; the prior stated before seeing the " +
				"data. A credible interval is a statement about the posterior, not a coverage guarantee: with " +
				"little data it depends on the prior.",
			Examples: []string{"posterior 7/30", "posterior 7/30 prior=uniform shape=hpd above=0.15", "posterior 0/40 prior=1,9 level=0.9"},
			Sources: "Jeffreys H (1946), Proc R Soc A 186:453-461; Brown LD, Cai TT, DasGupta A (2001), Statist " +
				"Sci 16:101-133; Box GEP, Tiao GC (1973), Bayesian Inference in Statistical Analysis, section 2.8.",
			Caution: true,
		},
		Run: runPosterior,
	}
}

type posteriorResult struct {
	Posterior interval.Posterior `json:"posterior"`
	Interval  interval.Interval  `json:"interval"`
	Above     *tailPair          `json:"above,omitempty"`
}

type tailPair struct {
	C     float64 `json:"c"`
	Above float64 `json:"prob_above"`
	Below float64 `json:"prob_below"`
}

func runPosterior(c *call) error {
	a, s := c.Args, c.S
	if err := a.Want(1, 1); err != nil {
		return err
	}
	k, n, err := a.KN(0, "K/N")
	if err != nil {
		return err
	}
	prior, err := priorArg(a)
	if err != nil {
		return err
	}
	lev, err := c.Level()
	if err != nil {
		return err
	}
	shape, err := a.Choice("shape", "equal-tailed", "equal-tailed", "hpd")
	if err != nil {
		return err
	}
	post, err := interval.NewPosterior(k, n, prior)
	if err != nil {
		return err
	}
	opt := interval.CredibleOptions{Level: lev, Prior: prior}
	if shape == "hpd" {
		opt.Kind = interval.HighestDensity
	}
	iv, err := interval.Credible(k, n, opt)
	if err != nil {
		return err
	}
	r := posteriorResult{Posterior: post, Interval: iv}
	if a.Has("above") {
		cv, err := a.Prob("above", 0)
		if err != nil {
			return err
		}
		pa, _, _ := post.ProbAbove(cv)
		pb, _, _ := post.ProbBelow(cv)
		r.Above = &tailPair{C: cv, Above: pa, Below: pb}
	}
	c.Data(r)
	b := c.Block("posterior of p after " + kn(k, n) + ", prior " + post.Prior.String())
	b.Row("posterior", "Beta("+in(post.A)+", "+in(post.B)+")")
	mode := "none (flat or U-shaped density)"
	if post.HasMode {
		mode = s.num(post.Mode)
	}
	b.Row("mean", s.num(post.Mean), "median "+s.num(post.Median)+", mode "+mode+", sd "+s.num(post.StdDev))
	b.Row(pct(lev)+" credible", s.num(iv.Lower)+" to "+s.num(iv.Upper), iv.Method)
	if r.Above != nil {
		b.Row("P(p > "+in(r.Above.C)+")", s.num(r.Above.Above), "P(p <= "+in(r.Above.C)+") = "+s.num(r.Above.Below))
	}
	b.Warn(post.Warnings...)
	b.Warn(iv.Warnings...)
	if p := densityPlot(s, []interval.Posterior{post}, []string{"p | " + kn(k, n)}); p != "" {
		c.Plot(p)
	}
	return nil
}

// densityPlot draws the posterior densities over the range holding all but
// 1e-4 of each.
func densityPlot(s *Session, posts []interval.Posterior, names []string) string {
	lo, hi := 1.0, 0.0
	for _, p := range posts {
		lo = math.Min(lo, p.Quantile(1e-4))
		hi = math.Max(hi, p.Quantile(1-1e-4))
	}
	if !(hi > lo) {
		return ""
	}
	cols := s.plotColumns(8)
	if len(posts) > 1 {
		cols = min(cols, 60)
	}
	xs := make([]float64, cols)
	var ser []series
	top := 0.0
	for i := range xs {
		xs[i] = lo + (hi-lo)*(float64(i)+0.5)/float64(cols)
	}
	for j, p := range posts {
		ys := make([]float64, cols)
		for i, x := range xs {
			ys[i] = p.Density(x)
			if !math.IsInf(ys[i], 0) {
				top = math.Max(top, ys[i])
			}
		}
		ser = append(ser, series{names[j], ys})
	}
	if !(top > 0) {
		return ""
	}
	for _, sr := range ser {
		for i := range sr.ys {
			sr.ys[i] = math.Min(sr.ys[i], top)
		}
	}
	ch := chart{xs: xs, series: ser, yLo: 0, yHi: top, ref: math.NaN(), height: 8, ascii: s.Set.ASCII,
		width: s.Set.Width, digits: 3, xLabel: "p"}
	return "posterior density\n" + ch.render()
}

func beatsCommand() *command {
	return &command{
		Name:    "beats",
		Group:   "tests",
		Summary: "Bayesian: the chance that each arm has the higher success probability, and the expected loss",
		Usage:   "beats K1/N1 K2/N2 [K3/N3 ...] [prior=jeffreys|uniform|A,B]",
		Options: []opt{optPrior},
		Help: helpText{
			Computes: "For two arms: the posterior probability that arm 1's success probability exceeds arm 2's " +
				"and the reverse, and the expected loss of choosing each arm (the success probability given up " +
				"on average), under the same Beta prior on each arm; for three or more arms, the probability " +
				"that each arm is the best. A plot shows the posteriors; the prior is printed with the result.",
			Methods: "Two arms: an exact finite sum when a posterior shape is a whole number (uniform prior, or " +
				"A,B with a whole number), otherwise the trapezoidal rule in the log-odds with a certified error " +
				"bound (up to 1e5 trials in all; shapes below 1 beside tens of thousands of trials may be refused). " +
				"Expected loss in closed form. Three or more arms: the same rule and bound.",
			Assumptions: "Independent arms of independent trials; the prior chosen before seeing the data. These " +
				"probabilities are not p-values and do not control any error rate; stopping an experiment when " +
				"they cross a threshold changes their frequentist meaning.",
			Examples: []string{"beats 120/1000 100/1000 prior=uniform", "beats 1000/1000 999/1000 prior=uniform", "beats 12/100 30/100 25/120"},
			Sources: "Closed form: the negative-binomial expansion of the incomplete beta integrated against the " +
				"other Beta density (derivable by hand; 1000/1000 against 999/1000 gives 0.750124937531234). " +
				"Berry DA (2006), Bayesian clinical trials, Nat Rev Drug Discov 5:27-36.",
			Caution: true,
		},
		Run: runBeats,
	}
}

func runBeats(c *call) error {
	a, s := c.Args, c.S
	x, n, err := armCounts(a)
	if err != nil {
		return err
	}
	prior, err := priorArg(a)
	if err != nil {
		return err
	}
	posts := make([]interval.Posterior, len(x))
	names := make([]string, len(x))
	for i := range x {
		if posts[i], err = interval.NewPosterior(x[i], n[i], prior); err != nil {
			return err
		}
		names[i] = "arm " + strconv.Itoa(i+1)
	}
	if len(x) == 2 {
		r, err := test.Compare(x[0], n[0], x[1], n[1], test.CompareOptions{Prior1: prior, Prior2: prior})
		if err != nil {
			return err
		}
		c.Data(r)
		b := c.Block("which arm is better: " + kn(x[0], n[0]) + " against " + kn(x[1], n[1]) + ", prior " + r.Prior1.String() + " on each")
		b.Row("P(arm 1 better)", s.num(r.ProbFirstBetter), "posterior Beta("+in(r.A1)+", "+in(r.B1)+")")
		b.Row("P(arm 2 better)", s.num(r.ProbSecondBetter), "posterior Beta("+in(r.A2)+", "+in(r.B2)+")")
		b.Row("loss if arm 1", s.num(r.LossFirst), "expected shortfall in success probability")
		b.Row("loss if arm 2", s.num(r.LossSecond))
		b.Row("method", r.Method, "error at most "+s.num(r.ErrorBound))
		b.Warn(r.Warnings...)
	} else {
		r, err := test.ProbBest(c.Ctx, x, n, []interval.Prior{prior})
		if err != nil {
			return err
		}
		c.Data(r)
		b := c.Block("which of " + strconv.Itoa(len(x)) + " arms is best, prior " + r.Priors[0].String() + " on each")
		for i := range x {
			b.Row(names[i], kn(x[i], n[i]), "P(best) = "+s.num(r.ProbBest[i]))
		}
		b.Row("method", r.Method, "error at most "+s.num(r.ErrorBound))
		b.Warn(r.Warnings...)
	}
	if p := densityPlot(s, posts, names); p != "" {
		c.Plot(p)
	}
	return nil
}

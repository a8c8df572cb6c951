package repl

import (
	"math"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/power"
	"github.com/kofnlab/kofn/test"
)

var (
	optP0       = opt{Name: "p0", Doc: "success probability under H0 (not worth pursuing at or below it)"}
	optP1       = opt{Name: "p1", Doc: "success probability under H1 (worth pursuing at or above it)"}
	optAlphaOne = opt{Name: "alpha", Doc: "one-sided size (default 0.05)"}
	optBeta     = opt{Name: "beta", Doc: "type II error; power is 1 - beta (default 0.2)"}
	optObserved = opt{Name: "observed", Doc: "the outcome K/N at the look where the study stopped: the p-value and interval that respect the stopping rule"}
)

func simonCommand() *command {
	return &command{
		Name:    "simon",
		Group:   "planning",
		Summary: "Simon two-stage designs: find, evaluate, and analyse after the study",
		Usage:   "simon p0=P0 p1=P1 [alpha=A] [beta=B] [upto=N] | simon R1/N1 R/N p0=P0 [p1=P1] [observed=K/N] [level=L]",
		Options: []opt{optP0, optP1, optAlphaOne, optBeta,
			{Name: "upto", Doc: "largest total size searched (default 500, at most 1000)"}, optObserved, optLevel},
		Help: helpText{
			Computes: "Without a design: Simon's optimal design (least expected size when p = p0) and minimax design " +
				"(least total size), and the admissible designs between them, for H0 p <= p0 against H1 p >= p1. A " +
				"design R1/N1 R/N treats N1, stops when at most R1 succeed, else goes on to N and rejects H0 when more " +
				"than R of N succeed. Each design shows the chance of stopping after stage one (early stop) and the " +
				"expected size under p0, the attained size and the power. With a design R1/N1 R/N: its size, power, " +
				"early stop and expected size; with observed=K/N also the exact p-value and confidence interval by the " +
				"stage-wise ordering, which the plain K/N interval is not after a design that may stop early, and the " +
				"median estimate (the midpoint of the one-sided 50% stage-wise bounds) beside K/N.",
			Methods: "Exact binomial sums; an exhaustive search with pruning that never drops a candidate. Admissible " +
				"designs minimise q n + (1 - q) EN0 for a weight q (the range of q is shown). Stage-wise ordering " +
				"p-value and interval (one-sided for the p-value, the interval two-sided at level).",
			Assumptions: "Independent trials with one common success probability; the second stage is run exactly as " +
				"planned. The p-value and interval are valid only if the study followed the design.",
			Examples: []string{"simon p0=0.05 p1=0.25", "simon p0=0.2 p1=0.4 beta=0.1",
				"simon 3/13 12/43 p0=0.2 p1=0.4", "simon 0/9 2/17 p0=0.05 observed=4/17"},
			Sources: "Simon R (1989), Optimal two-stage designs for phase II clinical trials, Controlled Clinical " +
				"Trials 10:1-10; Jung SH, Lee T, Kim K, George SL (2004), Admissible two-stage designs for phase II " +
				"cancer clinical trials, Statistics in Medicine 23:561-569; Koyama T, Chen H (2008), Proper inference " +
				"from Simon's two-stage designs, Statistics in Medicine 27:3145-3154.",
			Caution: true,
		},
		Run: runSimon,
	}
}

func runSimon(c *call) error {
	a := c.Args
	if err := a.Want(0, 2); err != nil {
		return err
	}
	if err := a.Need("p0"); err != nil {
		return err
	}
	p0, err := a.OpenProb("p0", 0)
	if err != nil {
		return err
	}
	if a.Len() == 0 {
		return simonSearch(c, p0)
	}
	if a.Len() != 2 {
		return a.Want(2, 2)
	}
	r1, n1, err := a.KN(0, "a stage-one rule R1/N1")
	if err != nil {
		return err
	}
	r, n, err := a.KN(1, "a final rule R/N")
	if err != nil {
		return err
	}
	d := power.TwoStage{R1: r1, N1: n1, R: r, N: n}
	e0, err := power.EvaluateTwoStage(d, p0)
	if err != nil {
		return err
	}
	res := simonEval{Design: d, Null: e0}
	b := c.Block("Simon two-stage design " + kn(r1, n1) + ", " + kn(r, n) + ": stop after " + count(n1) +
		" with at most " + count(r1) + " successes; reject H0 with more than " + count(r) + " of " + count(n))
	b.Row("size", c.S.num(e0.Reject), "chance of rejecting H0 when p = "+in(p0))
	b.Row("early stop", c.S.num(e0.EarlyStop), "when p = "+in(p0))
	b.Row("expected n", c.S.num(e0.ExpectedN), "when p = "+in(p0))
	if a.Has("p1") {
		p1, err := a.OpenProb("p1", 0)
		if err != nil {
			return err
		}
		e1, err := power.EvaluateTwoStage(d, p1)
		if err != nil {
			return err
		}
		res.Alternative = &e1
		b.Row("power", c.S.num(e1.Reject), "chance of rejecting H0 when p = "+in(p1))
		b.Row("early stop", c.S.num(e1.EarlyStop), "when p = "+in(p1))
		b.Row("expected n", c.S.num(e1.ExpectedN), "when p = "+in(p1))
	}
	if a.Has("observed") {
		o := a.lookup("observed")
		o.used = true
		k, m, err := parseKN(o.value)
		if err != nil {
			return wrap(o, err)
		}
		look := 0
		switch m {
		case n1:
			look = 1
		case n:
			look = 2
		default:
			return inputErr(o.word, "has N = "+count(m)+", which is neither N1 = "+count(n1)+" nor N = "+count(n))
		}
		if res.Observed, err = stagedAnalysis(c, d.Looks(), look, k, p0, "stage "+count(int64(look))); err != nil {
			return err
		}
	}
	c.Data(res)
	return a.Check()
}

// simonEval is the JSON of an evaluated design.
type simonEval struct {
	Design      power.TwoStage      `json:"design"`
	Null        power.TwoStageEval  `json:"null"`
	Alternative *power.TwoStageEval `json:"alternative,omitempty"`
	Observed    *stagedInference    `json:"observed,omitempty"`
}

// stagedInference is the JSON of the analysis after a multi-stage study.
type stagedInference struct {
	Look     int               `json:"look"`
	K        int64             `json:"k"`
	N        int64             `json:"n"`
	PValue   float64           `json:"p_value"`
	Interval interval.Interval `json:"interval"`
	// Median is the midpoint of the one-sided 50% stage-wise bounds: the p
	// at which the outcome sits at the median of the stage-wise ordering
	// (exactly so for a continuous statistic).
	Median float64 `json:"median"`
}

// stagedAnalysis writes and returns the stage-wise ordering analysis of the
// outcome k at look (1-based) of the design st: the one-sided p-value
// against p0, the two-sided interval at the session level, the naive k/n
// and the median estimate.
func stagedAnalysis(c *call, st []interval.Look, look int, k int64, p0 float64, where string) (*stagedInference, error) {
	lv, err := c.Level()
	if err != nil {
		return nil, err
	}
	r, err := test.StageWise(c.Ctx, st, look, k, p0, test.StageWiseOptions{Alternative: test.Higher, SkipInterval: true})
	if err != nil {
		return nil, err
	}
	iv, err := interval.StageWise(c.Ctx, st, look, k, interval.StageWiseOptions{Level: lv})
	if err != nil {
		return nil, err
	}
	lo, err := interval.StageWise(c.Ctx, st, look, k, interval.StageWiseOptions{Level: 0.5, Side: interval.LowerBound})
	if err != nil {
		return nil, err
	}
	hi, err := interval.StageWise(c.Ctx, st, look, k, interval.StageWiseOptions{Level: 0.5, Side: interval.UpperBound})
	if err != nil {
		return nil, err
	}
	n := st[look-1].N
	out := &stagedInference{Look: look, K: k, N: n, PValue: r.PValue, Interval: iv, Median: (lo.Lower + hi.Upper) / 2}
	b := c.Block("after the study: " + kn(k, n) + " at " + where + ", stage-wise ordering (exact)")
	b.Row("p-value", c.S.num(r.PValue), "one-sided, H0 p <= "+in(p0))
	b.Row("interval", c.S.num(iv.Lower)+" to "+c.S.num(iv.Upper), pct(iv.Level)+" two-sided")
	b.Row("median estimate", c.S.num(out.Median), "midpoint of the one-sided 50% bounds "+c.S.num(lo.Lower)+" and "+c.S.num(hi.Upper))
	b.Row("k/n", c.S.num(iv.Estimate), "biased after a design that can stop early")
	return out, nil
}

func simonSearch(c *call, p0 float64) error {
	a := c.Args
	if err := a.Need("p1"); err != nil {
		return err
	}
	p1, err := a.OpenProb("p1", 0)
	if err != nil {
		return err
	}
	alpha, err := a.OpenProb("alpha", 0.05)
	if err != nil {
		return err
	}
	beta, err := a.OpenProb("beta", 0.2)
	if err != nil {
		return err
	}
	upto, err := a.Count("upto", 0)
	if err != nil {
		return err
	}
	if err := a.Check(); err != nil {
		return err
	}
	res, err := power.Simon(c.Ctx, p0, p1, alpha, beta, power.SimonOptions{MaxN: upto})
	if err != nil {
		return err
	}
	c.Data(res)
	b := c.Block("Simon two-stage designs, H0 p <= " + in(p0) + " against H1 p >= " + in(p1) + ", alpha " + in(alpha) +
		", power " + in(1-beta))
	row := func(label string, d power.SimonDesign, note string) {
		b.Row(label, kn(d.R1, d.N1)+" "+kn(d.R, d.N), "EN0 "+c.S.num(d.ExpectedN0)+"  early stop "+c.S.num(d.EarlyStop0)+
			"  size "+c.S.num(d.Alpha)+"  power "+c.S.num(d.Power)+note)
	}
	row("optimal", res.Optimal, "")
	row("minimax", res.Minimax, "")
	if len(res.Admissible) > 2 { // the first and last admissible designs are the minimax and optimal ones
		for _, d := range res.Admissible[1 : len(res.Admissible)-1] {
			row("admissible", d, "  q "+formatNum(d.WeightLow, 2)+" to "+formatNum(d.WeightHigh, 2))
		}
	}
	b.Row("reading", "R1/N1 R/N", "stop after N1 with at most R1 successes; reject H0 with more than R of N")
	b.Row("searched", "n up to "+count(res.SearchedN))
	b.Warn(res.Warnings...)
	c.Plot(simonPlot(c.S, res))
	return nil
}

// simonPlot draws the optimal and minimax rules as the proportion of
// successes that continues (stage one) and that rejects (end), against n.
func simonPlot(s *Session, res power.SimonResult) string {
	nMax := max(res.Optimal.N, res.Minimax.N)
	cols := min(int(nMax), s.plotColumns(5))
	xs := make([]float64, cols)
	for j := range xs {
		xs[j] = math.Round(1 + float64(j)*float64(nMax-1)/float64(max(cols-1, 1)))
	}
	place := func(ys []float64, n int64, v float64) {
		j := int(math.Round(float64(n-1) / float64(nMax-1) * float64(cols-1)))
		ys[min(max(j, 0), cols-1)] = v
	}
	var ser []series
	top := res.P0
	for _, d := range []struct {
		name string
		d    power.SimonDesign
	}{{"optimal", res.Optimal}, {"minimax", res.Minimax}} {
		ys := make([]float64, cols)
		for j := range ys {
			ys[j] = math.NaN()
		}
		place(ys, d.d.N1, float64(d.d.R1+1)/float64(d.d.N1))
		place(ys, d.d.N, float64(d.d.R+1)/float64(d.d.N))
		ser = append(ser, series{d.name, ys})
		top = math.Max(top, math.Max(float64(d.d.R1+1)/float64(d.d.N1), float64(d.d.R+1)/float64(d.d.N)))
	}
	_, yHi := niceRange(0, top, 0.1, 0, 1)
	ch := chart{xs: xs, series: ser, yLo: 0, yHi: yHi, ref: res.P0, height: 10, ascii: s.Set.ASCII,
		width: s.Set.Width, digits: 2, xLabel: "n"}
	return "boundaries: proportion of successes needed to go on (at N1) and to reject H0 (at N); line at p0\n" + ch.render()
}

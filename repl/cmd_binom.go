package repl

import (
	"math"
	"strconv"
	"strings"

	"github.com/kofnlab/kofn/binom"
)

var optN = opt{Name: "n", Doc: "number of trials"}
var optP = opt{Name: "p", Doc: "success probability per trial, in [0, 1] (0.3 or 30%)"}

const sourcesBinom = "Loader C (2000), Fast and accurate computation of binomial probabilities; " +
	"the incomplete beta representation of the tails, e.g. Abramowitz M, Stegun IA (1964), Handbook of Mathematical Functions, 26.5.24."

func spreadCommand() *command {
	return &command{
		Name:    "spread",
		Group:   "distribution",
		Summary: "the sampling distribution of k (and k/n) in n trials, with a plot",
		Usage:   "spread n=N p=P [k=LO..HI] [level=L] [within=D]",
		Options: []opt{optN, optP, {Name: "k", Doc: "range of k to plot, like 0..20 (default: where the probability is)"}, optLevel,
			{Name: "within", Doc: "a distance D: print the chance that k/n lands within D of p"}},
		Help: helpText{
			Computes: "The binomial distribution of the number of successes k in n independent trials with " +
				"success probability p: mean, standard deviation, mode, skewness, the central range of k holding " +
				"at least the level of probability, and a plot of P(X = k). The same numbers divided by n describe " +
				"the sample proportion k/n. within=D adds the exact chance that k/n lands within D of p, " +
				"P(|k/n - p| <= D), boundaries included and decided on the decimals as written.",
			Assumptions: "Independent trials with one common success probability.",
			Examples:    []string{"spread n=40 p=0.3", "spread n=1000 p=0.02 level=99%", "spread n=20 p=0.5 k=0..20", "spread n=50 p=0.3 within=0.1"},
			Sources:     sourcesBinom,
		},
		Run: runSpread,
	}
}

// distArgs reads n= and p= and builds the distribution.
func distArgs(a *argSet) (binom.Dist, error) {
	if err := a.Need("n", "p"); err != nil {
		return binom.Dist{}, err
	}
	n, err := a.Count("n", 0)
	if err != nil {
		return binom.Dist{}, err
	}
	p, err := a.Prob("p", 0)
	if err != nil {
		return binom.Dist{}, err
	}
	return binom.New(n, p)
}

type massBin struct {
	From int64   `json:"from"`
	To   int64   `json:"to"`
	Prob float64 `json:"prob"`
}

type spreadResult struct {
	N              int64     `json:"n"`
	P              float64   `json:"p"`
	Mean           float64   `json:"mean"`
	StdDev         float64   `json:"std_dev"`
	Mode           int64     `json:"mode"`
	Skewness       float64   `json:"skewness"`
	ExcessKurtosis float64   `json:"excess_kurtosis"`
	Entropy        float64   `json:"entropy"`
	Level          float64   `json:"level"`
	CentralFrom    int64     `json:"central_from"`
	CentralTo      int64     `json:"central_to"`
	CentralProb    float64   `json:"central_prob"`
	Within         *float64  `json:"within,omitempty"`
	WithinProb     *float64  `json:"within_prob,omitempty"`
	Mass           []massBin `json:"mass"`
}

func runSpread(c *call) error {
	a := c.Args
	if err := a.Want(0, 0); err != nil {
		return err
	}
	d, err := distArgs(a)
	if err != nil {
		return err
	}
	level, err := c.Level()
	if err != nil {
		return err
	}
	alpha := (1 - level) / 2
	lo, hi := d.Quantile(alpha), d.UpperQuantile(alpha)
	r := spreadResult{N: d.N, P: d.P, Mean: d.Mean(), StdDev: d.StdDev(), Mode: d.Mode(),
		Skewness: d.Skewness(), ExcessKurtosis: d.ExKurtosis(), Entropy: d.Entropy(), Level: level,
		CentralFrom: lo, CentralTo: hi, CentralProb: d.ProbRange(lo, hi)}
	// Plot range: where all but 1e-4 of the probability lies, unless given.
	plo, phi := d.Quantile(5e-5), d.UpperQuantile(5e-5)
	if a.Has("k") {
		if plo, phi, err = a.Range("k", 0); err != nil {
			return err
		}
		if phi > d.N {
			return inputErr("k="+a.Str("k", ""), "reaches beyond n = "+count(d.N))
		}
	}
	var plot string
	r.Mass, plot = massPlot(c.S, plo, phi, d.ProbRange)
	s := c.S
	nf := float64(d.N)
	perN := func(x float64) string { // the same on the k/n scale
		if d.N == 0 {
			return ""
		}
		return "k/n: " + s.num(x/nf)
	}
	b := c.Block("binomial distribution of k successes in n = " + count(d.N) + " trials, p = " + in(d.P))
	b.Row("mean", s.num(r.Mean), perN(r.Mean))
	b.Row("std deviation", s.num(r.StdDev), perN(r.StdDev))
	b.Row("most likely k", count(r.Mode))
	b.Row("skewness", s.num(r.Skewness))
	b.Row("excess kurtosis", s.num(r.ExcessKurtosis))
	b.Row("entropy", s.num(r.Entropy), "nats")
	central := "holds " + s.num(r.CentralProb)
	if d.N > 0 {
		central = "k/n: " + s.num(float64(lo)/nf) + " to " + s.num(float64(hi)/nf) + "; " + central
	}
	b.Row("central "+pct(level), count(lo)+" to "+count(hi), central)
	if a.Has("within") {
		eps, err := a.Prob("within", 0)
		if err != nil {
			return err
		}
		pw := d.ProportionWithin(eps)
		r.Within, r.WithinProb = &eps, &pw
		b.Row("k/n within "+in(eps), s.num(pw), "chance that |k/n - p| "+s.le()+" "+in(eps))
	}
	if d.N == 0 {
		b.Warn("n = 0: no trials, k is always 0")
	}
	c.Data(r)
	c.Plot(plot)
	return nil
}

func tailCommand() *command {
	return &command{
		Name:    "tail",
		Group:   "distribution",
		Summary: "point and tail probabilities of k successes in n trials",
		Usage:   "tail K/N p=P   or   tail LO..HI/N p=P   or   tail k=K n=N p=P",
		Options: []opt{optP, {Name: "k", Doc: "the count K, with n= (instead of K/N)"}, {Name: "n", Doc: "the trials N, with k="}},
		Help: helpText{
			Computes: "For X, the number of successes in N trials with success probability p, and the " +
				"count K: first the three chances that split every outcome - below K (X < K), exactly K and above " +
				"K (X > K), which add up to 1 - then the two cumulative tails, at most K (X <= K) and at least K " +
				"(X >= K). For LO..HI/N: the chance that X lies from LO to HI. Each probability is computed " +
				"directly in log space, never as 1 minus another, so tiny tails keep their digits; one below " +
				"1e-300 prints as a power of ten beside its natural log. The count may also be given as k=K n=N.",
			Assumptions: "Independent trials with one common success probability.",
			Examples:    []string{"tail 17/40 p=0.3", "tail 0/299 p=1%", "tail 10..20/40 p=0.3", "tail 900/1000 p=0.5"},
			Sources:     sourcesBinom,
		},
		Run: runTail,
	}
}

// tailResult is tail's JSON: the partition of the outcomes at k (below,
// exactly, above; they sum to 1) and the two cumulative tails, each with
// its natural log (finite where the value underflows to 0).
type tailResult struct {
	N          int64   `json:"n"`
	P          float64 `json:"p"`
	K          int64   `json:"k"`
	Below      float64 `json:"below"`
	Exactly    float64 `json:"exactly"`
	Above      float64 `json:"above"`
	AtMost     float64 `json:"at_most"`
	AtLeast    float64 `json:"at_least"`
	LogBelow   float64 `json:"log_below"`
	LogExactly float64 `json:"log_exactly"`
	LogAbove   float64 `json:"log_above"`
	LogAtMost  float64 `json:"log_at_most"`
	LogAtLeast float64 `json:"log_at_least"`
}

type rangeResult struct {
	N       int64   `json:"n"`
	P       float64 `json:"p"`
	From    int64   `json:"from"`
	To      int64   `json:"to"`
	Prob    float64 `json:"prob"`
	LogProb float64 `json:"log_prob"`
}

// le and ge return the comparison signs for the session's character set.
func (s *Session) le() string {
	if s.Set.ASCII {
		return "<="
	}
	return "≤"
}

func (s *Session) ge() string {
	if s.Set.ASCII {
		return ">="
	}
	return "≥"
}

func runTail(c *call) error {
	a := c.Args
	if err := a.Want(0, 1); err != nil {
		return err
	}
	if err := a.Need("p"); err != nil {
		return err
	}
	p, err := a.Prob("p", 0)
	if err != nil {
		return err
	}
	tok := a.Pos(0)
	if a.Len() == 0 {
		// tail k=K n=N p=P
		if !a.Has("k") || !a.Has("n") {
			return &InputError{Token: "tail", Reason: "needs the count K/N (or k= and n=); usage: " + a.cmd.Usage}
		}
		k, err := a.Count("k", 0)
		if err != nil {
			return err
		}
		n, err := a.Count("n", 0)
		if err != nil {
			return err
		}
		if k > n {
			return inputErr("k="+a.Str("k", ""), "exceeds n="+a.Str("n", "")+": more successes than trials")
		}
		tok = count(k) + "/" + count(n)
	} else if a.Has("k") || a.Has("n") {
		return inputErr(tok, "gives the count twice: write K/N or k= n=, not both")
	}
	s := c.S
	if ks, ns, ok := strings.Cut(tok, "/"); ok && strings.Contains(ks, "..") {
		lo, hi, err := parseRange(ks)
		if err != nil {
			return inputErr(tok, reasonOf(err))
		}
		if ns == "" {
			return inputErr(tok, "lacks the number of trials after /")
		}
		n, err := parseCount(ns)
		if err != nil {
			return inputErr(tok, "has trials "+ns+", which "+reasonOf(err))
		}
		if hi > n {
			return inputErr(tok, "has a range beyond the trials ("+count(hi)+" > "+count(n)+")")
		}
		d, err := binom.New(n, p)
		if err != nil {
			return err
		}
		lp := d.LogProbRange(lo, hi)
		c.Data(rangeResult{n, p, lo, hi, math.Exp(lp), lp})
		b := c.Block("binomial, n = " + count(n) + " trials, p = " + in(p))
		b.Row("from "+count(lo)+" to "+count(hi), s.logNum(lp), "P("+count(lo)+" "+s.le()+" X "+s.le()+" "+count(hi)+")"+lnNote(lp))
		return nil
	}
	k, n, err := parseKN(tok)
	if err != nil {
		return err
	}
	d, err := binom.New(n, p)
	if err != nil {
		return err
	}
	r := tailResult{N: n, P: p, K: k,
		LogBelow: d.LogCDF(k - 1), LogExactly: d.LogProb(k), LogAbove: d.LogSurvival(k),
		LogAtMost: d.LogCDF(k), LogAtLeast: d.LogSurvival(k - 1)}
	r.Below, r.Exactly, r.Above = d.CDF(k-1), math.Exp(r.LogExactly), d.Survival(k)
	r.AtMost, r.AtLeast = d.CDF(k), d.Survival(k-1)
	c.Data(r)
	ks := count(k)
	title := "binomial, n = " + count(n) + " trials, p = " + in(p) + "; k = " + ks
	if n > 0 {
		title += " (k/n = " + s.num(float64(k)/float64(n)) + ")"
	}
	b := c.Block(title)
	b.Row("below "+ks, s.logNum(r.LogBelow), "X < "+ks+lnNote(r.LogBelow))
	b.Row("exactly "+ks, s.logNum(r.LogExactly), "X = "+ks+lnNote(r.LogExactly))
	b.Row("above "+ks, s.logNum(r.LogAbove), "X > "+ks+lnNote(r.LogAbove))
	b.Row("", "", "(these three add up to 1)")
	b.Row("at most "+ks, s.logNum(r.LogAtMost), "X "+s.le()+" "+ks+", the lower tail"+lnNote(r.LogAtMost))
	b.Row("at least "+ks, s.logNum(r.LogAtLeast), "X "+s.ge()+" "+ks+", the upper tail"+lnNote(r.LogAtLeast))
	return nil
}

// lnNote gives the natural log of a probability that prints as a power
// of ten (below 1e-300), where the plain value underflows.
func lnNote(lp float64) string {
	if lp > -690 || math.IsInf(lp, -1) {
		return ""
	}
	return "; ln = " + strconv.FormatFloat(lp, 'f', 2, 64)
}

func cutCommand() *command {
	return &command{
		Name:    "cut",
		Group:   "distribution",
		Summary: "cut-off counts: the k that a tail probability q falls at",
		Usage:   "cut n=N p=P q=Q   or   cut n=N p=P logq=L",
		Options: []opt{optN, optP, {Name: "q", Doc: "tail probability, in [0, 1]"},
			{Name: "logq", Doc: "the natural log of the tail probability, for tails below 1e-300 (like -2000)"}},
		Help: helpText{
			Computes: "The lower cut-off: the smallest k with P(X <= k) >= q; and the upper cut-off: the smallest k " +
				"with P(X > k) <= q. With the actual tail probabilities at those counts, which differ from q because " +
				"k is discrete. A quality engineer's question: with 200 parts at a 2% defect rate, above how many " +
				"defects is a lot unusual at the 1% level?",
			Assumptions: "Independent trials with one common success probability.",
			Examples:    []string{"cut n=200 p=0.02 q=0.01", "cut n=40 p=0.3 q=5%", "cut n=100000 p=0.5 logq=-2000"},
			Sources:     sourcesBinom,
		},
		Run: runCut,
	}
}

type cutResult struct {
	N          int64    `json:"n"`
	P          float64  `json:"p"`
	Q          float64  `json:"q"`
	LogQ       *float64 `json:"log_q,omitempty"`
	Lower      int64    `json:"lower_cut"`
	LowerTail  float64  `json:"p_at_most_lower_cut"`
	Upper      int64    `json:"upper_cut"`
	UpperTail  float64  `json:"p_above_upper_cut"`
	LowerFound bool     `json:"lower_found"`
}

func runCut(c *call) error {
	a := c.Args
	if err := a.Want(0, 0); err != nil {
		return err
	}
	d, err := distArgs(a)
	if err != nil {
		return err
	}
	s := c.S
	if a.Has("logq") {
		lq, err := a.Float("logq", 0)
		if err != nil {
			return err
		}
		if lq > 0 {
			return inputErr("logq="+a.Str("logq", ""), "is above 0; the log of a probability is 0 or less")
		}
		lo, hi := d.LogQuantile(lq), d.LogUpperQuantile(lq)
		r := cutResult{N: d.N, P: d.P, Q: math.Exp(lq), LogQ: &lq, Lower: lo, LowerTail: d.CDF(lo), Upper: hi, UpperTail: d.Survival(hi), LowerFound: lo >= 0}
		c.Data(r)
		qs := "e^" + in(lq)
		b := c.Block("binomial cut-offs, n = " + count(d.N) + " trials, p = " + in(d.P) + ", q = " + qs)
		b.Row("lower cut-off", count(lo), "smallest k with P(X "+s.le()+" k) "+s.ge()+" "+qs+"; actual "+s.logNum(d.LogCDF(lo)))
		b.Row("upper cut-off", count(hi), "smallest k with P(X > k) "+s.le()+" "+qs+"; actual "+s.logNum(d.LogSurvival(hi)))
		return nil
	}
	if err := a.Need("q"); err != nil {
		return err
	}
	q, err := a.Prob("q", 0)
	if err != nil {
		return err
	}
	lo, hi := d.Quantile(q), d.UpperQuantile(q)
	r := cutResult{N: d.N, P: d.P, Q: q, Lower: lo, LowerTail: d.CDF(lo), Upper: hi, UpperTail: d.Survival(hi), LowerFound: lo >= 0}
	c.Data(r)
	b := c.Block("binomial cut-offs, n = " + count(d.N) + " trials, p = " + in(d.P) + ", q = " + in(q))
	b.Row("lower cut-off", count(lo), "smallest k with P(X "+s.le()+" k) "+s.ge()+" "+in(q)+"; actual "+s.num(r.LowerTail))
	b.Row("upper cut-off", count(hi), "smallest k with P(X > k) "+s.le()+" "+in(q)+"; actual "+s.num(r.UpperTail))
	return nil
}

// massPlot bins the probabilities of k = lo..hi into at most as many
// columns as the session width allows (each column summing its values with
// probRange) and returns the bins and the rendered plot.
func massPlot(s *Session, lo, hi int64, probRange func(a, b int64) float64) ([]massBin, string) {
	cols := int64(s.plotColumns(7))
	width := max((hi-lo+cols)/cols, 1) // k values per column
	var bins []massBin
	var xs, ys []float64
	top := 0.0
	for k := lo; k <= hi; k += width {
		to := min(k+width-1, hi)
		pr := probRange(k, to)
		bins = append(bins, massBin{k, to, pr})
		xs = append(xs, float64(k))
		ys = append(ys, pr)
		top = math.Max(top, pr)
	}
	if top == 0 {
		return bins, ""
	}
	label := "k"
	if width > 1 {
		label = "k (" + count(width) + " values per column)"
	}
	ch := chart{xs: xs, series: []series{{"P(X = k)", ys}}, yLo: 0, yHi: top, ref: math.NaN(),
		height: 8, ascii: s.Set.ASCII, width: s.Set.Width, digits: 2, xLabel: label}
	return bins, "P(X = k)\n" + ch.render()
}

package repl

import (
	"math"
	"strings"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/power"
	"github.com/kofnlab/kofn/test"
)

var watchModes = []string{"sprt", "pairs", "always", "ab"}

func watchCommand() *command {
	return &command{
		Name:    "watch",
		Group:   "tests",
		Summary: "sequential tests over looks at cumulative counts: Wald's SPRT, always-valid p-values and confidence sequences",
		Usage: "watch sprt p0=P0 p1=P1 [alpha=A] [beta=B] [max=N] [looks=K/N,..|from=FILE|-] | " +
			"watch pairs theta=T [alpha=A] [beta=B] [max=N] [looks=N12:N21,..|from=..] | " +
			"watch always p0=P0 [alpha=A] [planned=N] [guess=P] [looks=K/N,..|from=..] | " +
			"watch ab [delta=D] [alpha=A] [method=product|normal] [planned=N] [tau2=V] [looks=K1/N1:K2/N2,..|from=..]",
		Options: []opt{
			{Name: "p0", Doc: "sprt, always: the success probability under H0"},
			{Name: "p1", Doc: "sprt: the success probability under H1"},
			{Name: "theta", Doc: "pairs: the share of n12 among discordant pairs under H1 (H0: 1/2)"},
			{Name: "alpha", Doc: "chance of rejecting a true H0 (default 0.05)"},
			{Name: "beta", Doc: "sprt, pairs: chance of accepting H0 when H1 holds (default 0.1)"},
			{Name: "max", Doc: "sprt, pairs: truncate at this many observations (default none)"},
			{Name: "yn", Doc: "pairs, design: the chance of an n12 pair (yes in the first, no in the second) under H1"},
			{Name: "ny", Doc: "pairs, design: the chance of an n21 pair under H1; with yn= the expected number of all pairs is shown"},
			{Name: "planned", Doc: "always, ab: the size (per group) the mixture is tuned for (default 1000)"},
			{Name: "guess", Doc: "always: the proportion the mixture is tuned around (default 0.5)"},
			{Name: "delta", Doc: "ab: the null difference p1 - p2 (default 0)"},
			{Name: "tau2", Doc: "ab, method=normal: the variance of the normal mixing distribution on p1 - p2 (default: tuned for planned=)"},
			optMethod("ab: product (exact, default) or normal (asymptotic mixture SPRT)", []string{"product", "normal"}),
			{Name: "looks", Doc: "the looks, cumulative: K/N,K/N,.. (pairs N12:N21,..; ab K1/N1:K2/N2,..)"},
			{Name: "from", Doc: "read the looks from a CSV file, or - for standard input (columns k,n; n12,n21; k1,n1,k2,n2)"},
		},
		Help: helpText{
			Computes: "A sequential test read at looks while the data come in: one line per look with the counts so far, " +
				"the statistic and the decision, then a plot of the path against its boundaries. Without looks, the design. " +
				"sprt: Wald's sequential probability ratio test of p = p0 against p = p1, with its decision lines, and the exact " +
				"error rates and expected sample numbers at p0 and p1 (by dynamic programming over k) beside Wald's approximations. " +
				"pairs: the same test on the discordant pairs of paired data (H0: n12 and n21 equally likely). " +
				"always: the always-valid p-value and confidence sequence for one proportion from the beta-binomial mixture " +
				"martingale, exact: the chance that the p-value ever falls to alpha under H0, or that the sequence ever misses p, " +
				"is at most alpha at any number of looks. ab: the always-valid comparison of two groups, p1 - p2: the product " +
				"method (two one-proportion sequences at alpha/2, exact and conservative) or the normal mixture SPRT (narrower, " +
				"valid only as the counts grow).",
			Methods: "Wald's SPRT (truncated at max= by the sign of the log likelihood ratio); beta-binomial mixture " +
				"(centred Beta(r p, r (1-p)) prior, r tuned for planned= around guess=); product of mixtures or normal mixture SPRT " +
				"for two groups. When to use which: sprt when the question is p0 against a stated p1 and the smallest expected " +
				"number of observations matters (it needs a look after every observation for its error rates); always or ab when " +
				"the looks are irregular, chosen while watching, or an interval is wanted at every look.",
			Assumptions: "Independent trials with one constant success probability (per group); the counts at each look are " +
				"cumulative. The always-valid methods need no look schedule fixed in advance, but the hypotheses, alpha and the " +
				"tuning (planned=, guess=) must be fixed before the data are seen; choosing them after a look voids the guarantee. " +
				"A fixed-n test or interval re-run at every look is not valid: its error rate grows with the number of looks.",
			Examples: []string{"watch sprt p0=0.02 p1=0.06 max=500", "watch sprt p0=0.02 p1=0.06 looks=1/20,3/40,5/60",
				"watch always p0=0.1 planned=2000 looks=31/250,70/520,118/800",
				"watch ab looks=30/400:22/410,71/800:48/790,120/1200:80/1210", "watch pairs theta=0.75 looks=4:1,9:2"},
			Sources: "Wald A (1945), Annals of Mathematical Statistics 16:117-186, and (1947) Sequential Analysis; Robbins H (1970), " +
				"Annals of Mathematical Statistics 41:1397-1409; Howard SR, Ramdas A, McAuliffe J, Sekhon J (2021), Annals of " +
				"Statistics 49:1055-1080; Johari R, Koomen P, Pekelis L, Walsh D (2022), Operations Research 70:1806-1821; " +
				"Waudby-Smith I, Arbour D, Sinha R, Kennedy EH, Ramdas A (2024), Annals of Statistics 52:2613-2640.",
			Caution: true,
		},
		Run: runWatch,
	}
}

func runWatch(c *call) error {
	a := c.Args
	if err := a.Want(1, 1); err != nil {
		return err
	}
	mode := strings.ToLower(a.Pos(0))
	switch mode {
	case "sprt", "pairs":
		return watchSPRT(c, mode == "pairs")
	case "always":
		return watchAlways(c)
	case "ab":
		return watchAB(c)
	}
	return inputErr(a.Pos(0), "is not a sequential test; use "+strings.Join(watchModes, ", "))
}

// watchSPRT runs Wald's SPRT (one proportion or discordant pairs).
func watchSPRT(c *call, paired bool) error {
	a := c.Args
	alpha, err := a.OpenProb("alpha", 0.05)
	if err != nil {
		return err
	}
	beta, err := a.OpenProb("beta", 0.1)
	if err != nil {
		return err
	}
	maxN, err := a.Count("max", 0)
	if err != nil {
		return err
	}
	var s test.SPRT
	var title string
	if paired {
		if err := a.Need("theta"); err != nil {
			return err
		}
		th, err := a.OpenProb("theta", 0)
		if err != nil {
			return err
		}
		if s, err = test.NewPairedSPRT(th, alpha, beta, test.SPRTOptions{MaxN: maxN}); err != nil {
			return err
		}
		title = "SPRT on discordant pairs, H0 theta = 0.5 against theta = " + in(th)
	} else {
		if err := a.Need("p0", "p1"); err != nil {
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
		if s, err = test.NewSPRT(p0, p1, alpha, beta, test.SPRTOptions{MaxN: maxN}); err != nil {
			return err
		}
		title = "Wald SPRT, H0 p = " + in(s.P0) + " against p = " + in(s.P1)
	}
	title += ", alpha " + in(alpha) + ", beta " + in(beta)
	if maxN > 0 {
		title += ", truncated at " + count(maxN)
	}
	cols, parse := []string{"k", "n"}, oneLook
	if paired {
		cols, parse = []string{"n12", "n21"}, pairLook
	}
	looks, labels, err := lookSource(c, cols, parse)
	if err != nil {
		return err
	}
	var cells []float64 // yn=, ny= for the paired design
	if paired && (a.Has("yn") || a.Has("ny")) {
		if err := a.Need("yn", "ny"); err != nil {
			return err
		}
		p12, err := a.Prob("yn", 0)
		if err != nil {
			return err
		}
		p21, err := a.Prob("ny", 0)
		if err != nil {
			return err
		}
		cells = []float64{p12, p21}
	}
	if err := a.Check(); err != nil {
		return err
	}
	b := c.Block(title)
	side := "k >= "
	accSide := "k <= "
	if s.P1 < s.P0 {
		side, accSide = "k <= ", "k >= "
	}
	b.Row("reject H0", side+c.S.num(s.Lines.Reject)+" + "+c.S.num(s.Lines.Slope)+" n")
	b.Row("accept H0", accSide+c.S.num(s.Lines.Accept)+" + "+c.S.num(s.Lines.Slope)+" n")
	out := watchSPRTResult{Test: s}
	if looks == nil {
		for _, p := range []float64{s.P0, s.P1} {
			r, err := power.SPRTOperating(c.Ctx, s, p)
			if err != nil {
				return err
			}
			what := "at H0"
			if p == s.P1 {
				what = "at H1"
			}
			b.Row(what+" p = "+in(p), "reject "+c.S.num(r.Reject)+", expected n "+c.S.num(r.ASN),
				"exact; Wald's approximation: reject "+c.S.num(1-r.WaldAccept)+", expected n "+c.S.num(r.WaldASN))
			b.Warn(r.Warnings...)
			out.Operating = append(out.Operating, r)
		}
		if paired {
			b.Row("counts", "discordant pairs", "expected pairs in all = expected n / (p12 + p21); give yn= and ny= to see them")
			if cells != nil {
				p12, p21 := cells[0], cells[1]
				r, err := power.PairedSPRTOperating(c.Ctx, s, p12, p21)
				if err != nil {
					return err
				}
				b.Row("at yn = "+in(p12)+", ny = "+in(p21), "theta "+c.S.num(r.P)+", reject "+c.S.num(r.Reject),
					"expected discordant pairs "+c.S.num(r.ASN)+", expected pairs in all "+c.S.num(r.ExpectedPairs))
				out.Operating = append(out.Operating, r)
			}
		}
		c.Data(out)
		return nil
	}
	lb := c.Block("looks")
	var ns []int64
	var ks []float64
	decided := false
	var prevN int64 = -1
	var prevK int64
	for i, v := range looks {
		k, n := v[0], v[1]
		if paired {
			k, n = v[0], v[0]+v[1]
		} else if k > n {
			return lookInputErr(c, labels[i], kn(k, n)+" has more successes than trials")
		}
		if n < prevN || k < prevK || n-k < prevN-prevK {
			return lookInputErr(c, labels[i], kn(k, n)+" is below the previous look; the counts are cumulative")
		}
		prevN, prevK = n, k
		l, err := s.Decide(k, n)
		if err != nil {
			return err
		}
		note := l.Decision.String()
		if l.Truncated {
			note += " (at the maximum)"
		}
		if decided {
			note += "; after the decision"
		}
		label := kn(k, n)
		if paired {
			label = count(v[0]) + ":" + count(v[1])
		}
		lb.Row("look "+labels[i], label, "Z "+c.S.num(l.LogRatio), note)
		if l.Decision != test.Continue {
			decided = true
		}
		out.Looks = append(out.Looks, l)
		ns, ks = append(ns, n), append(ks, float64(k))
	}
	c.Data(out)
	c.Plot(pathPlot(c.S, "successes k against the decision lines", ns, []series{{"k", ks}},
		[]line{{"reject line", func(n float64) float64 { return s.Lines.Reject + s.Lines.Slope*n }},
			{"accept line", func(n float64) float64 { return s.Lines.Accept + s.Lines.Slope*n }}}, math.NaN()))
	return nil
}

type watchSPRTResult struct {
	Test      test.SPRT                  `json:"test"`
	Operating []power.SPRTOperatingPoint `json:"operating,omitempty"`
	Looks     []test.SPRTLook            `json:"looks,omitempty"`
}

// mixtureOptions reads planned= and guess=.
func mixtureOptions(a *argSet) (interval.SequenceOptions, error) {
	n, err := a.Count("planned", 0)
	if err != nil {
		return interval.SequenceOptions{}, err
	}
	g, err := a.OpenProb("guess", 0)
	if err != nil {
		return interval.SequenceOptions{}, err
	}
	return interval.SequenceOptions{PlannedN: n, PlannedP: g}, nil
}

func watchAlways(c *call) error {
	a := c.Args
	if err := a.Need("p0"); err != nil {
		return err
	}
	p0, err := a.OpenProb("p0", 0)
	if err != nil {
		return err
	}
	alpha, err := a.OpenProb("alpha", 0.05)
	if err != nil {
		return err
	}
	opt, err := mixtureOptions(a)
	if err != nil {
		return err
	}
	s, err := test.NewMixtureSequence(p0, alpha, opt)
	if err != nil {
		return err
	}
	looks, labels, err := lookSource(c, []string{"k", "n"}, oneLook)
	if err != nil {
		return err
	}
	if err := a.Check(); err != nil {
		return err
	}
	planned := opt.PlannedN
	if planned == 0 {
		planned = interval.DefaultPlannedN
	}
	b := c.Block("always-valid test of H0 p = " + in(p0) + " (beta-binomial mixture, exact), alpha " + in(alpha) +
		"; confidence sequence at " + pct(1-alpha))
	b.Row("mixture", "Beta(r p, r (1-p)), r = "+c.S.num(s.Mix.Concentration), "tuned for n = "+count(planned))
	out := watchAlwaysResult{Test: s}
	if looks == nil {
		e, err := interval.SequenceErrorProb(c.Ctx, p0, planned, 1-alpha, opt)
		if err != nil {
			return err
		}
		b.Row("false rejection", c.S.num(e), "exact chance under H0 of rejecting by n = "+count(planned)+" (at most "+in(alpha)+" at any n)")
		out.ErrorByPlanned = &e
		c.Data(out)
		return nil
	}
	lb := c.Block("looks (p-value: running minimum; interval: running intersection)")
	var prev *test.MixtureLook
	var ns []int64
	var est, lo, hi []float64
	decided := false
	for i, v := range looks {
		l, err := s.Look(prev, v[0], v[1])
		if err != nil {
			return lookInputErr(c, labels[i], kn(v[0], v[1])+": "+shellError(c.S.cmds, "watch", err))
		}
		note := l.Decision.String()
		if decided {
			note += "; after the decision"
		}
		lb.Row("look "+labels[i], kn(l.K, l.N), "p "+c.S.num(l.PValue), "["+c.S.num(l.Running.Lower)+", "+c.S.num(l.Running.Upper)+"]", note)
		lb.Warn(l.Warnings...)
		decided = decided || l.Decision != test.Continue
		out.Looks = append(out.Looks, l)
		prev = &out.Looks[len(out.Looks)-1]
		ns = append(ns, l.N)
		est, lo, hi = append(est, l.Interval.Estimate), append(lo, l.Running.Lower), append(hi, l.Running.Upper)
	}
	c.Data(out)
	c.Plot(pathPlot(c.S, "estimate and confidence sequence (running intersection); line at p0", ns,
		[]series{{"k/n", est}, {"lower", lo}, {"upper", hi}}, nil, p0))
	return nil
}

type watchAlwaysResult struct {
	Test           test.MixtureSequence `json:"test"`
	ErrorByPlanned *float64             `json:"error_by_planned,omitempty"`
	Looks          []test.MixtureLook   `json:"looks,omitempty"`
}

func watchAB(c *call) error {
	a := c.Args
	alpha, err := a.OpenProb("alpha", 0.05)
	if err != nil {
		return err
	}
	delta, err := a.Float("delta", 0)
	if err != nil {
		return err
	}
	m, err := a.Choice("method", "product", "product", "normal")
	if err != nil {
		return err
	}
	n, err := a.Count("planned", 0)
	if err != nil {
		return err
	}
	o := test.DifferenceSequenceOptions{Prior: interval.SequenceOptions{PlannedN: n}}
	if m == "normal" {
		o.Method = test.NormalMixtureSequence
		if o.Tau2, err = a.Float("tau2", 0); err != nil {
			return err
		}
	}
	s, err := test.NewDifferenceSequence(delta, alpha, o)
	if err != nil {
		return err
	}
	looks, labels, err := lookSource(c, []string{"k1", "n1", "k2", "n2"}, twoLook)
	if err != nil {
		return err
	}
	if err := a.Check(); err != nil {
		return err
	}
	kind := "exact, conservative"
	if s.Method == test.NormalMixtureSequence {
		kind = "asymptotic: valid as the counts grow"
	}
	b := c.Block("always-valid comparison, H0 p1 - p2 = " + in(delta) + ", " + s.Method.String() + " (" + kind + "), alpha " + in(alpha))
	if s.Method == test.NormalMixtureSequence {
		b.Row("mixing variance", c.S.num(s.Tau2), "tau^2 on the scale of p1 - p2")
	} else {
		b.Row("mixture", "Beta(r p, r (1-p)), r = "+c.S.num(s.Mix.Concentration), "per group, at level "+pct(1-alpha/2))
	}
	out := watchABResult{Test: s}
	if looks == nil {
		c.Data(out)
		return nil
	}
	lb := c.Block("looks (p-value: running minimum; interval for p1 - p2: running intersection)")
	var prev *test.DifferenceLook
	var ns []int64
	var est, lo, hi []float64
	decided := false
	for i, v := range looks {
		l, err := s.Look(prev, v[0], v[1], v[2], v[3])
		if err != nil {
			return lookInputErr(c, labels[i], kn(v[0], v[1])+":"+kn(v[2], v[3])+": "+shellError(c.S.cmds, "watch", err))
		}
		note := l.Decision.String()
		if decided {
			note += "; after the decision"
		}
		lb.Row("look "+labels[i], kn(l.K1, l.N1)+" vs "+kn(l.K2, l.N2), "p "+c.S.num(l.PValue), "["+c.S.num(l.Running.Lower)+", "+c.S.num(l.Running.Upper)+"]", note)
		lb.Warn(l.Warnings...)
		decided = decided || l.Decision != test.Continue
		out.Looks = append(out.Looks, l)
		prev = &out.Looks[len(out.Looks)-1]
		ns = append(ns, l.N1+l.N2)
		est, lo, hi = append(est, l.Interval.Estimate), append(lo, l.Running.Lower), append(hi, l.Running.Upper)
	}
	c.Data(out)
	c.Plot(pathPlot(c.S, "difference p1 - p2 and its confidence sequence (running intersection) against n1 + n2; line at the null difference",
		ns, []series{{"p1 - p2", est}, {"lower", lo}, {"upper", hi}}, nil, delta))
	return nil
}

type watchABResult struct {
	Test  test.DifferenceSequence `json:"test"`
	Looks []test.DifferenceLook   `json:"looks,omitempty"`
}

// line is a boundary drawn at every column of a path plot, as a
// function of the number of observations.
type line struct {
	name string
	at   func(n float64) float64
}

// pathPlot draws values observed at the looks' sizes ns (each held until
// the next look, so a running quantity reads as the step function it is)
// and boundary lines over n from the first look to the last, with an
// optional reference line.
func pathPlot(s *Session, title string, ns []int64, ser []series, lines []line, ref float64) string {
	if len(ns) == 0 {
		return ""
	}
	n0, n1 := float64(ns[0]), float64(ns[len(ns)-1])
	cols := s.plotColumns(6)
	if span := int(n1-n0) + 1; span < cols {
		cols = span
	}
	cols = max(cols, 1)
	xs := make([]float64, cols)
	for j := range xs {
		xs[j] = n0
		if cols > 1 {
			xs[j] = math.Round(n0 + float64(j)*(n1-n0)/float64(cols-1))
		}
	}
	var out []series
	lo, hi := math.Inf(1), math.Inf(-1)
	keep := func(v float64) {
		if !math.IsNaN(v) && !math.IsInf(v, 0) {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	for _, sr := range ser {
		ys := make([]float64, cols)
		li := 0
		for j, x := range xs {
			for li+1 < len(ns) && float64(ns[li+1]) <= x {
				li++
			}
			ys[j] = sr.ys[li]
			keep(ys[j])
		}
		out = append(out, series{name: sr.name, ys: ys})
	}
	for _, l := range lines {
		ys := make([]float64, cols)
		for j, x := range xs {
			ys[j] = l.at(x)
			keep(ys[j])
		}
		out = append(out, series{name: l.name, ys: ys})
	}
	if !math.IsNaN(ref) {
		keep(ref)
	}
	if math.IsInf(lo, 1) {
		return ""
	}
	if hi <= lo {
		hi = lo + 1
	}
	pad := 0.05 * (hi - lo)
	yLo := lo - pad
	if lo >= 0 && yLo < 0 {
		yLo = 0 // a nonnegative path (a count, a CUSUM) keeps its floor at 0
	}
	ch := chart{xs: xs, series: out, yLo: yLo, yHi: hi + pad, ref: ref, height: 12, ascii: s.Set.ASCII,
		width: s.Set.Width, digits: 3, xLabel: "n"}
	return title + "\n" + ch.render()
}

// lookInputErr reports a problem at one look, naming the option word that
// gave the looks (looks= or from=), which is what the user typed.
func lookInputErr(c *call, label, reason string) error {
	tok := c.Args.cmd.Name
	for _, name := range []string{"looks", "from"} {
		if o := c.Args.lookup(name); o != nil {
			tok = o.word
			break
		}
	}
	return inputErr(tok, "at look "+label+": "+reason)
}

package repl

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/power"
	"github.com/kofnlab/kofn/test"
)

// oneSampleMethods are the method words of the one-sample planning forms:
// the exact test (default; its two-sided rule by rule=, mid-p by midp=)
// and the normal approximation.
var oneSampleMethods = []string{"exact", "normal"}

// twoPlanMethods are the two-group planning methods: the normal formula
// (default) or the exact enumeration of a test's power; pairedPlanMethods
// the McNemar tests whose power is computed (exact first, the default;
// midp=on for its mid-p form).
var (
	twoPlanMethods    = append([]string{"normal"}, enumWords(power.ExactTestValues(), func(t power.ExactTest) string { return t.String() })...)
	pairedPlanMethods = []string{"exact", "asymptotic"}
	planMethods       = unique(oneSampleMethods, twoPlanMethods, pairedPlanMethods)
)

// unique concatenates word lists, dropping repeats.
func unique(lists ...[]string) []string {
	seen := map[string]bool{}
	var out []string
	for _, l := range lists {
		for _, w := range l {
			if !seen[w] {
				seen[w] = true
				out = append(out, w)
			}
		}
	}
	return out
}

var twoSampleWords = struct{ variance, correction, hypothesis []string }{
	enumWords(power.VarianceValues(), func(v power.Variance) string { return v.String() }),
	enumWords(power.CorrectionValues(), func(v power.Correction) string { return v.String() }),
	enumWords(power.HypothesisValues(), func(v power.Hypothesis) string { return v.String() }),
}

var planOptions = []opt{
	{Name: "p", Doc: "one sample: the proportion under H0"},
	{Name: "truth", Doc: "one sample: the true proportion the study should detect"},
	{Name: "p1", Doc: "two groups: the proportion in group 1"},
	{Name: "p2", Doc: "two groups: the proportion in group 2"},
	{Name: "p12", Doc: "paired: probability a pair is yes then no (the n12 cell)"},
	{Name: "p21", Doc: "paired: probability a pair is no then yes (the n21 cell)"},
	{Name: "alpha", Doc: "significance level (default: 1 - the session level)"},
	optAlt("two-sided (default); one sample: lower or higher than p; two groups: p1 lower or higher than p2; paired: p12 lower or higher than p21"),
	{Name: "method", Doc: "one sample: exact (default) or normal; two groups: normal (default), fisher, barnard or z-pooled (exact power by enumeration); paired: exact (default) or asymptotic", Values: planMethods},
	optRule,
	{Name: "midp", Doc: "one sample and paired, method=exact: on plans for the mid-p test; off (default)", Values: onOffWords},
	{Name: "variance", Doc: "two groups: null variance of the normal formula", Values: twoSampleWords.variance},
	{Name: "correction", Doc: "two groups: continuity correction (cps: Casagrande-Pike-Smith; none)", Values: twoSampleWords.correction},
	{Name: "hypothesis", Doc: "two groups: equality, non-inferiority or equivalence", Values: twoSampleWords.hypothesis},
	{Name: "margin", Doc: "two groups: the non-inferiority or equivalence margin on p1 - p2"},
}

const planSources = "Exact binomial power by enumeration of the rejection region (e.g. Chernick MR, Liu CY (2002), " +
	"The saw-toothed behavior of power versus sample size and software solutions, The American Statistician " +
	"56:149-155); Fleiss JL (1981), Statistical Methods for Rates and Proportions, 2nd ed.; Casagrande JT, Pike " +
	"MC, Smith PG (1978), Biometrics 34:483-486; Connor RJ (1987), Biometrics 43:207-211 (paired)."

// planMethodsHelp is the Methods section of detect and size.
const planMethodsHelp = "One sample: exact (default), two-sided by rule=point-probability (default), central " +
	"or blaker, with midp=on for the mid-p test; or normal. Two groups: normal (default), Fleiss' formula with " +
	"pooled or unpooled null variance and the Casagrande-Pike-Smith correction; or the exact power of " +
	"fisher, barnard or z-pooled (the pooled z test) by enumerating both binomials, limited to n1 + n2 <= " +
	"2000000. Paired: McNemar exact (default; midp=on for mid-p), or asymptotic (Connor's formula)."

func detectCommand() *command {
	return &command{
		Name:    "detect",
		Group:   "planning",
		Summary: "power: the chance a study of n trials detects a given effect; n=LO..HI plots the sawtooth",
		Usage:   "detect n=N|LO..HI (p=P0 truth=P1 | p1=P1 p2=P2 [n2=N2] | p12=A p21=B) [alpha=A] [alt=S] [method=M]",
		Options: append([]opt{{Name: "n", Doc: "trials (one sample), group 1 size (two groups) or pairs; LO..HI for a curve"},
			{Name: "n2", Doc: "two groups: size of group 2 (default: n)"}, optShow}, planOptions...),
		Help: helpText{
			Computes: "The probability that a test at level alpha rejects H0 when the truth is as stated. One " +
				"sample (p, truth): the exact binomial test's power, by summing the true distribution over the " +
				"rejection region, with the attained size and the counts that do not reject. Two groups (p1, p2): " +
				"the power of the comparison. Paired (p12, p21): the power of McNemar's test. With n=LO..HI the power is drawn against n: exact power is a sawtooth, because " +
				"adding a trial can shrink the rejection region; show=table lists every n with its power, show=csv " +
				"the same as CSV.",
			Methods:     planMethodsHelp,
			Assumptions: "Independent trials; fixed n; the stated truth is the effect worth detecting.",
			Examples: []string{"detect n=40 p=0.3 truth=0.5", "detect n=10..120 p=0.3 truth=0.5", "detect n=30..45 p=0.2 truth=0.4 alt=higher show=table",
				"detect n=474 p1=0.05 p2=0.10", "detect n=60 p1=0.2 p2=0.5 method=fisher", "detect n=100 p12=0.15 p21=0.05"},
			Sources: planSources,
		},
		Run: runDetect,
	}
}

func sizeCommand() *command {
	return &command{
		Name:    "size",
		Group:   "planning",
		Summary: "sample size for a target power (exact sawtooth-aware for one sample)",
		Usage:   "size (p=P0 truth=P1 | p1=P1 p2=P2 [ratio=R] | p12=A p21=B) [power=0.8] [alpha=A] [alt=S] [method=M]",
		Options: append([]opt{{Name: "power", Doc: "target power (default 0.8)"},
			{Name: "ratio", Doc: "two groups: n2/n1 (default 1)"},
			{Name: "upto", Doc: "largest n searched (one sample and paired exact searches)"}}, planOptions...),
		Help: helpText{
			Computes: "The number of trials (per group, or pairs) that gives the target power. One sample: the " +
				"exact search reports the first n whose power reaches the target and the n from which every larger " +
				"n keeps it (they differ because exact power is a sawtooth in n), beside the normal-approximation " +
				"n, with a plot of the sawtooth. Two groups: Fleiss' formula with the Casagrande-Pike-Smith " +
				"continuity correction by default, also for non-inferiority and equivalence margins, or an exact " +
				"search on the enumerated power of fisher, barnard or z-pooled. Paired: an exact search on McNemar's " +
				"test (default), or Connor's formula with method=asymptotic.",
			Methods:     planMethodsHelp,
			Assumptions: "Independent trials; the stated truth is the smallest effect worth detecting.",
			Examples: []string{"size p=0.3 truth=0.5", "size p1=0.05 p2=0.10", "size p1=0.05 p2=0.10 correction=none",
				"size p1=0.2 p2=0.5 method=fisher", "size p12=0.15 p21=0.05 power=90%"},
			Sources: planSources + " Fleiss (1981) Table A.3 gives 474 per group for 0.05 against 0.10.",
		},
		Run: runSize,
	}
}

// planForm is the design a planning command was called for.
type planForm int

const (
	oneSample planForm = iota
	twoSample
	paired
)

// planInputs holds the parsed common inputs of detect and size.
type planInputs struct {
	form         planForm
	p0, p1       float64 // one sample
	q1, q2       float64 // two groups
	p12, p21     float64 // paired
	alpha        float64
	alt          test.Alternative
	sideText     string
	method       string
	two          power.TwoSampleOptions
	exactOneSide power.OneSampleOptions
	pair         power.PairedOptions
}

func planArgs(c *call) (planInputs, error) {
	a := c.Args
	var in planInputs
	var err error
	switch {
	case a.Has("p") || a.Has("truth"):
		in.form = oneSample
		if err = a.Need("p", "truth"); err != nil {
			return in, err
		}
		if in.p0, err = a.OpenProb("p", 0); err != nil {
			return in, err
		}
		if in.p1, err = a.Prob("truth", 0); err != nil {
			return in, err
		}
	case a.Has("p1") || a.Has("p2"):
		in.form = twoSample
		if err = a.Need("p1", "p2"); err != nil {
			return in, err
		}
		if in.q1, err = a.Prob("p1", 0); err != nil {
			return in, err
		}
		if in.q2, err = a.Prob("p2", 0); err != nil {
			return in, err
		}
	case a.Has("p12") || a.Has("p21"):
		in.form = paired
		if err = a.Need("p12", "p21"); err != nil {
			return in, err
		}
		if in.p12, err = a.Prob("p12", 0); err != nil {
			return in, err
		}
		if in.p21, err = a.Prob("p21", 0); err != nil {
			return in, err
		}
	default:
		return in, &InputError{Token: a.cmd.Name, Reason: "needs p= and truth= (one sample), p1= and p2= (two groups) or p12= and p21= (paired); usage: " + a.cmd.Usage}
	}
	if in.alpha, err = a.OpenProb("alpha", complement(c.S.Set.Level)); err != nil {
		return in, err
	}
	if in.alt, in.sideText, err = readAlt(a, test.TwoSided); err != nil {
		return in, err
	}
	if in.form == oneSample {
		if in.method, err = a.Choice("method", oneSampleMethods[0], oneSampleMethods...); err != nil {
			return in, err
		}
		in.exactOneSide = power.OneSampleOptions{Alpha: in.alpha, Alternative: in.alt}
		if in.method == "exact" {
			if in.exactOneSide.Rule, in.exactOneSide.MidP, err = readExact(a); err != nil {
				return in, err
			}
		}
	}
	if in.form == paired {
		if in.method, err = a.Choice("method", pairedPlanMethods[0], pairedPlanMethods...); err != nil {
			return in, err
		}
		in.pair = power.PairedOptions{Alpha: in.alpha, Alternative: in.alt}
		if in.method == "asymptotic" {
			in.pair.Method = test.McNemarAsymptotic
		} else {
			mid, err := a.Choice("midp", "off", onOffWords...)
			if err != nil {
				return in, err
			}
			in.pair.MidP = mid == "on"
		}
	}
	if in.form == twoSample {
		if in.method, err = a.Choice("method", twoPlanMethods[0], twoPlanMethods...); err != nil {
			return in, err
		}
		o := power.TwoSampleOptions{Alpha: in.alpha, Alternative: in.alt}
		if in.method != "normal" {
			o.Test = enumValue[power.ExactTest](twoPlanMethods[1:], in.method)
		}
		v, err := a.Choice("variance", twoSampleWords.variance[0], twoSampleWords.variance...)
		if err != nil {
			return in, err
		}
		o.Variance = enumValue[power.Variance](twoSampleWords.variance, v)
		cc, err := a.Choice("correction", twoSampleWords.correction[0], twoSampleWords.correction...)
		if err != nil {
			return in, err
		}
		o.Correction = enumValue[power.Correction](twoSampleWords.correction, cc)
		h, err := a.Choice("hypothesis", twoSampleWords.hypothesis[0], twoSampleWords.hypothesis...)
		if err != nil {
			return in, err
		}
		o.Hypothesis = enumValue[power.Hypothesis](twoSampleWords.hypothesis, h)
		if o.Margin, err = a.Prob("margin", 0); err != nil {
			return in, err
		}
		in.two = o
	}
	return in, nil
}

// describe returns the title words for the design.
func (in planInputs) describe(s *Session) string {
	switch in.form {
	case oneSample:
		return "one sample, H0 p = " + fmtIn(in.p0) + ", truth " + fmtIn(in.p1) + ", alpha " + fmtIn(in.alpha) + ", " + in.sideText
	case twoSample:
		h := ", " + in.sideText
		if in.two.Hypothesis != power.Equality { // margins fix the side themselves
			h = ", " + in.two.Hypothesis.String() + " margin " + fmtIn(in.two.Margin)
		}
		return "two groups, p1 = " + fmtIn(in.q1) + ", p2 = " + fmtIn(in.q2) + ", alpha " + fmtIn(in.alpha) + h
	}
	return "paired, p12 = " + fmtIn(in.p12) + " (yes then no), p21 = " + fmtIn(in.p21) + " (no then yes), alpha " + fmtIn(in.alpha) + ", " + in.sideText
}

func fmtIn(x float64) string { return in(x) }

// exact reports whether the design's method enumerates exact power.
func (in planInputs) exact() bool {
	return in.method != "normal" && !(in.form == paired && in.method == "asymptotic")
}

// powerAt returns the power of the design at size n (group 1 n, group 2
// n2), with the exact result where the method is exact.
func (in planInputs) powerAt(ctx context.Context, n, n2 int64) (float64, string, *power.ExactPower, error) {
	var ex power.ExactPower
	var err error
	switch {
	case in.form == oneSample && in.exact():
		ex, err = power.OneSamplePower(n, in.p0, in.p1, in.exactOneSide)
	case in.form == oneSample:
		p, err := power.OneSampleNormalPower(n, in.p0, in.p1, power.OneSampleOptions{Alpha: in.alpha, Alternative: in.alt})
		return p, "normal approximation", nil, err
	case in.form == twoSample && in.exact():
		ex, err = power.TwoSamplePower(ctx, n, n2, in.q1, in.q2, in.two)
	case in.form == twoSample:
		p, err := power.TwoSampleNormalPower(n, n2, in.q1, in.q2, in.two)
		if in.two.Hypothesis != power.Equality {
			return p, "normal approximation (" + in.two.Hypothesis.String() + ", unpooled variance)", nil, err
		}
		return p, "normal approximation (" + in.two.Variance.String() + " variance, correction " + in.two.Correction.String() + ")", nil, err
	default:
		ex, err = power.PairedPower(ctx, n, in.p12, in.p21, in.pair)
		if ex.Test == "" {
			ex.Test = "McNemar " + in.method
		}
	}
	if err != nil {
		return 0, "", nil, err
	}
	return ex.Power, ex.Test, &ex, nil
}

type detectResult struct {
	Method string            `json:"method"`
	N      int64             `json:"n,omitempty"`
	N2     int64             `json:"n2,omitempty"`
	Power  float64           `json:"power"`
	Exact  *power.ExactPower `json:"exact,omitempty"`
	Curve  []power.NPower    `json:"curve,omitempty"`
}

func runDetect(c *call) error {
	a := c.Args
	if err := a.Want(0, 0); err != nil {
		return err
	}
	if err := a.Need("n"); err != nil {
		return err
	}
	lo, hi, err := a.Range("n", 0)
	if err != nil {
		return err
	}
	if lo < 1 {
		return inputErr("n="+a.Str("n", ""), "must be at least 1")
	}
	in, err := planArgs(c)
	if err != nil {
		return err
	}
	n2 := lo
	if in.form == twoSample {
		if n2, err = a.Count("n2", lo); err != nil {
			return err
		}
	}
	s := c.S
	if lo == hi {
		pw, method, ex, err := in.powerAt(c.Ctx, lo, n2)
		if err != nil {
			return err
		}
		r := detectResult{Method: method, N: lo, Power: pw}
		b := c.Block("power, " + in.describe(s))
		b.Row("method", method)
		if in.form == twoSample {
			r.N2 = n2
			b.Row("n", count(lo)+" and "+count(n2), "group sizes")
		} else {
			b.Row("n", count(lo))
		}
		b.Row("power", s.num(pw), "chance the test rejects H0 under the stated truth")
		if ex != nil {
			r.Exact = ex
			b.Row("attained size", s.num(ex.Size), "chance it rejects when H0 is true (alpha "+fmtIn(in.alpha)+")")
			switch {
			case in.form != oneSample:
			case ex.AcceptLo <= ex.AcceptHi:
				b.Row("not rejected", "k = "+count(ex.AcceptLo)+" to "+count(ex.AcceptHi))
			default:
				b.Row("not rejected", "none: every outcome rejects")
			}
		}
		c.Data(r)
		return nil
	}
	// A curve over n.
	if hi-lo > 100000 {
		return inputErr("n="+a.Str("n", ""), "spans more than 100000 sizes; narrow the range")
	}
	if in.form == twoSample && a.Has("n2") {
		return inputErr("n2="+a.Str("n2", ""), "does not combine with a range of n; the curve uses equal groups")
	}
	var curve []power.NPower
	method := ""
	if in.form == oneSample && in.exact() {
		all, err := power.OneSampleCurve(c.Ctx, in.p0, in.p1, hi, in.exactOneSide)
		if err != nil {
			return err
		}
		curve = all[lo-1:]
		_, method, _, _ = in.powerAt(c.Ctx, lo, lo)
	} else {
		if in.form == twoSample && in.exact() && hi-lo > 400 {
			return inputErr("n="+a.Str("n", ""), "spans more than 400 sizes for an exact two-group curve; narrow the range")
		}
		for n := lo; n <= hi; n++ {
			if c.Ctx.Err() != nil {
				return c.Ctx.Err()
			}
			pw, m, _, err := in.powerAt(c.Ctx, n, n)
			if err != nil {
				return err
			}
			method = m
			curve = append(curve, power.NPower{N: n, Power: pw})
		}
	}
	c.Data(detectResult{Method: method, Power: curve[len(curve)-1].Power, Curve: curve})
	b := c.Block("power against n, " + in.describe(s))
	b.Row("method", method)
	minP, maxP := curve[0], curve[0]
	for _, pt := range curve {
		if pt.Power < minP.Power {
			minP = pt
		}
		if pt.Power > maxP.Power {
			maxP = pt
		}
	}
	b.Row("n", count(lo)+" to "+count(hi))
	b.Row("lowest power", s.num(minP.Power), "at n = "+count(minP.N))
	b.Row("highest power", s.num(maxP.Power), "at n = "+count(maxP.N))
	t := valueTable{cols: []string{"n", "power"}}
	for _, pt := range curve {
		t.add(float64(pt.N), pt.Power)
	}
	return c.showCurve(t, func() string { return powerPlot(s, curve, 0.8, "power") })
}

// powerPlot draws power against n as bars, one column per n; when the
// range is wider than the plot, each column shows the lowest power of the
// sizes it covers (so the dips of the sawtooth stay visible), with a
// reference line at target and optional marks under the axis.
func powerPlot(s *Session, curve []power.NPower, target float64, what string, marks ...int64) string {
	cols := s.plotColumns(6)
	step := max(1, (len(curve)+cols-1)/cols)
	var xs, ys []float64
	lo, hi := 1.0, 0.0
	for i := 0; i < len(curve); i += step {
		m := math.Inf(1)
		for _, pt := range curve[i:min(i+step, len(curve))] {
			m = math.Min(m, pt.Power)
			hi = math.Max(hi, pt.Power)
		}
		xs = append(xs, float64(curve[i].N))
		ys = append(ys, m)
		lo = math.Min(lo, m)
	}
	yLo, yHi := niceRange(math.Min(lo, target), math.Max(hi, target), 0.1, 0, 1)
	label := "n"
	if step > 1 {
		label = "n (" + count(int64(step)) + " sizes per column, the lowest shown)"
	}
	ch := chart{xs: xs, series: []series{{what, ys}}, yLo: yLo, yHi: yHi, ref: target, height: 10,
		ascii: s.Set.ASCII, width: s.Set.Width, digits: 2, xLabel: label}
	if len(marks) == 2 {
		ch.marks = []float64{float64(marks[0]), float64(marks[1])}
		ch.markNote = "first n " + count(marks[0]) + ", safe n " + count(marks[1])
		if marks[0] == marks[1] {
			ch.markNote = "first and safe n " + count(marks[0])
		}
	}
	return what + " (line at " + fmtIn(target) + ")\n" + ch.render()
}

type sizeResult struct {
	Exact  *power.ExactSize  `json:"exact,omitempty"`
	Normal *power.NormalSize `json:"normal,omitempty"`
}

func runSize(c *call) error {
	a := c.Args
	if err := a.Want(0, 0); err != nil {
		return err
	}
	in, err := planArgs(c)
	if err != nil {
		return err
	}
	target, err := a.OpenProb("power", 0.8)
	if err != nil {
		return err
	}
	upto, err := a.Count("upto", 0)
	if err != nil {
		return err
	}
	s := c.S
	b := c.Block("sample size for power " + fmtIn(target) + ", " + in.describe(s))
	switch in.form {
	case oneSample:
		if in.method == "normal" {
			r, err := power.OneSampleNormalN(in.p0, in.p1, power.OneSampleOptions{Alpha: in.alpha, Power: target, Alternative: in.alt})
			if err != nil {
				return err
			}
			c.Data(sizeResult{Normal: &r})
			normalRows(s, b, r, "trials")
			return nil
		}
		o := in.exactOneSide
		o.Power, o.MaxN = target, upto
		r, err := power.OneSampleN(c.Ctx, in.p0, in.p1, o)
		if err != nil {
			return err
		}
		exactSizeRows(c, b, r, target, "power")
	case twoSample:
		o := in.two
		o.Power, o.MaxN = target, upto
		if o.Ratio, err = a.Float("ratio", 0); err != nil {
			return err
		}
		if a.Has("ratio") && !(o.Ratio > 0) {
			return inputErr("ratio="+a.Str("ratio", ""), "must be above 0")
		}
		if in.exact() {
			r, err := power.TwoSampleN(c.Ctx, in.q1, in.q2, o)
			if err != nil {
				return err
			}
			exactSizeRows(c, b, r, target, "power")
			return nil
		}
		if a.Has("upto") {
			return inputErr("upto="+a.Str("upto", ""), "applies to exact searches only")
		}
		r, err := power.TwoSampleNormalN(in.q1, in.q2, o)
		if err != nil {
			return err
		}
		c.Data(sizeResult{Normal: &r})
		normalRows(s, b, r, "per group")
	case paired:
		o := in.pair
		o.Power, o.MaxN = target, upto
		r, err := power.PairedN(c.Ctx, in.p12, in.p21, o)
		if err != nil {
			return err
		}
		exactSizeRows(c, b, r, target, "power")
	}
	return nil
}

// exactSizeRows writes an exact sample size search: the first and the
// safe n, the attained size and the normal-approximation n, and plots the
// sawtooth around them.
func exactSizeRows(c *call, b *block, r power.ExactSize, target float64, what string) {
	s := c.S
	c.Data(sizeResult{Exact: &r})
	b.Row("method", r.Test)
	b.Row("first n", count(r.First), what+" "+s.num(r.FirstPower)+": the smallest n reaching "+fmtIn(target))
	if r.Stable > 0 {
		b.Row("safe n", count(r.Stable), what+" "+s.num(r.StablePower)+": every n from here to "+count(r.Horizon)+" reaches it")
	} else {
		b.Row("safe n", "not found", what+" drops below the target again up to n = "+count(r.Horizon))
	}
	if what == "power" {
		at := r.Stable
		if at == 0 {
			at = r.First
		}
		b.Row("attained size", s.num(r.Size), "at n = "+count(at)+": the chance the test rejects when H0 is true")
	}
	b.Row("normal approx.", count(r.Normal.N), r.Normal.Method)
	b.Warn(r.Warnings...)
	// Plot the sawtooth around the first and safe n, from the curve points
	// the search computed.
	cols := int64(s.plotColumns(6))
	from := max(1, r.First-cols/3)
	to := from + cols - 1
	if r.Stable > to {
		to = r.Stable + cols/6
		from = max(1, to-cols+1)
	}
	var pts []power.NPower
	for _, pt := range r.Curve {
		if pt.N >= from && pt.N <= to {
			pts = append(pts, pt)
		}
	}
	if len(pts) > 1 {
		c.Plot(powerPlot(s, pts, target, what, r.First, max(r.Stable, r.First)))
	}
}

// normalRows writes a normal-approximation sample size.
func normalRows(s *Session, b *block, r power.NormalSize, unit string) {
	b.Row("method", r.Method)
	if r.N2 > 0 {
		b.Row("n", count(r.N)+" and "+count(r.N2), "group 1 and group 2")
	} else {
		b.Row("n", count(r.N), unit)
	}
	b.Row("unrounded", s.numFine(r.Real), "the formula's n before rounding up")
	if r.Uncorrected != r.Real {
		b.Row("uncorrected", s.numFine(r.Uncorrected), "before the continuity correction")
	}
	b.Row("power at n", s.num(r.Power), "by the same approximation")
	b.Warn(r.Warnings...)
}

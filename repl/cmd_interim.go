package repl

import (
	"errors"
	"math"
	"regexp"
	"strconv"
	"strings"

	"github.com/kofnlab/kofn/internal/argerr"

	"github.com/kofnlab/kofn/power"
)

var spendWords = []string{"obf", "pocock", "rho:R"}

func interimCommand() *command {
	return &command{
		Name:    "interim",
		Group:   "planning",
		Summary: "group-sequential designs with interim looks: one proportion (exact) or two (normal, checked exactly)",
		Usage: "interim p0=P0 p1=P1 looks=N1,N2,..|K [spend=S] [futility=S] [binding=yes] [alpha=A] [beta=B] [observed=K/N] | " +
			"interim p1=P1 p2=P2 looks=K|T1,T2,..,1 [spend=S] [futility=S] [binding=yes] [alpha=A] [beta=B]",
		Options: []opt{optP0, {Name: "p1", Doc: "one proportion: the success probability under H1; two: group 1's (the higher)"},
			{Name: "p2", Doc: "two proportions: group 2's success probability (below p1)"},
			{Name: "looks", Doc: "one proportion: cumulative sizes N1,N2,... or a number of equally spaced looks K (sized for the power); two: K, or information fractions ending in 1"},
			{Name: "spend", Doc: "alpha spending: obf (O'Brien-Fleming type, default), pocock, or rho:R (power family)", Values: spendWords},
			{Name: "futility", Doc: "futility bounds from beta spending with this function (obf, pocock, rho:R); default none", Values: spendWords},
			{Name: "binding", Doc: "yes: the efficacy bounds count on the futility stops (default no: non-binding)", Values: []string{"yes", "no"}},
			{Name: "alpha", Doc: "one-sided size (default 0.05 for one proportion, 0.025 for two)"}, optBeta,
			{Name: "upto", Doc: "largest final size searched when looks=K (one proportion; default 5000)"},
			{Name: "reject", Doc: "evaluate a given one-proportion design: the counts that reject H0 at each look (- for none), like reject=-,12,15"},
			{Name: "futile", Doc: "with reject=: the counts at or below which the study stops for futility at each look (- for none; the last look's is reject - 1)"},
			optObserved, optLevel},
		Help: helpText{
			Computes: "A group-sequential design: planned looks at which the study stops when the data cross an efficacy " +
				"bound (reject H0) or a futility bound, with Lan-DeMets error spending. One proportion (p0, p1): exact " +
				"stopping counts at each look, the smallest count whose cumulative chance under p0 stays within the " +
				"alpha spent, found on the exact binomial by dynamic programming over the count; futility counts from " +
				"beta spending under p1. With looks=K the smallest equally spaced design reaching the power. " +
				"With observed=K/N the stage-wise ordering p-value, interval and median estimate at the end of the study. " +
				"With reject= (and futile=) the exact operating characteristic of a design of one's own at p0 (and p1). Two " +
				"proportions (p1, p2, equal groups): bounds on the pooled z statistic by the normal approximation, the " +
				"maximum size from the inflation factor, and the attained size and power checked exactly by enumerating " +
				"both groups' counts (up to 300 per group). Shows, per look, the bounds and the alpha spent and attained, " +
				"then power and expected sizes under H0 and H1, and a plot of the bounds on the z scale.",
			Methods: "Spending: obf (O'Brien-Fleming type, 2 - 2 Phi(z/sqrt t)), pocock (Pocock type, a ln(1 + (e-1) t)), " +
				"rho:R (power family a t^R). Futility bounds are non-binding unless binding=yes.",
			Assumptions: "Independent trials with one common success probability per group; looks at the planned sizes " +
				"(the exact counts apply only at those sizes). Two proportions: the normal approximation fixes the " +
				"bounds; the exact check reports how far the attained size strays.",
			Examples: []string{"interim p0=0.2 p1=0.4 looks=15,30,45", "interim p0=0.2 p1=0.4 looks=3 futility=obf",
				"interim p0=0.2 p1=0.4 looks=15,30,45 observed=12/30", "interim p1=0.5 p2=0.3 looks=3 spend=pocock",
				"interim looks=15,30,45 reject=-,12,15 futile=2,8 p0=0.2 p1=0.4"},
			Sources: "Lan KKG, DeMets DL (1983), Discrete sequential boundaries for clinical trials, Biometrika 70:659-663; " +
				"Kim K, DeMets DL (1987), Biometrika 74:149-154; Jennison C, Turnbull BW (2000), Group Sequential Methods " +
				"with Applications to Clinical Trials, Chapman & Hall/CRC (chapters 7, 8, 12 and 19).",
			Caution: true,
		},
		Run: runInterim,
	}
}

// parseSpend reads a spending word: obf, pocock or rho:R.
func parseSpend(o *option) (power.SpendingFunction, error) {
	v := strings.ToLower(o.value)
	switch v {
	case "obf", "obrien-fleming":
		return power.SpendingFunction{Family: power.OBrienFleming}, nil
	case "pocock":
		return power.SpendingFunction{Family: power.Pocock}, nil
	}
	if r, ok := strings.CutPrefix(v, "rho:"); ok {
		rho, err := parseFloat(r)
		if err != nil || !(rho > 0 && rho <= 100) {
			return power.SpendingFunction{}, inputErr(o.word, "needs an exponent in (0, 100] after rho:, like rho:2")
		}
		return power.SpendingFunction{Family: power.PowerFamily, Rho: rho}, nil
	}
	return power.SpendingFunction{}, inputErr(o.word, "is not a spending function; use obf, pocock or rho:R")
}

// interimOptions reads spend=, futility= and binding=.
func interimOptions(a *argSet) (power.SequentialOptions, error) {
	var o power.SequentialOptions
	var err error
	if opt := a.lookup("spend"); opt != nil {
		if o.Spending, err = parseSpend(opt); err != nil {
			return o, err
		}
	}
	if opt := a.lookup("futility"); opt != nil && strings.ToLower(opt.value) != "none" {
		o.Futility = true
		if o.FutilitySpending, err = parseSpend(opt); err != nil {
			return o, err
		}
	}
	b, err := a.Choice("binding", "no", "yes", "no")
	o.Binding = b == "yes"
	return o, err
}

// lookList reads looks= as a list of numbers, or one count.
func lookList(o *option) ([]float64, error) {
	var out []float64
	for _, w := range strings.Split(o.value, ",") {
		v, err := parseFloat(w)
		if err != nil {
			return nil, inputErr(o.word, "has "+strconv.Quote(w)+", not a number; write looks=15,30,45 or looks=3")
		}
		out = append(out, v)
	}
	return out, nil
}

func runInterim(c *call) error {
	a := c.Args
	if err := a.Want(0, 0); err != nil {
		return err
	}
	if a.Has("reject") {
		return interimEvaluate(c)
	}
	if err := a.Need("p1", "looks"); err != nil {
		return err
	}
	opts, err := interimOptions(a)
	if err != nil {
		return err
	}
	lo := a.lookup("looks")
	looks, err := lookList(lo)
	if err != nil {
		return err
	}
	beta, err := a.OpenProb("beta", 0.2)
	if err != nil {
		return err
	}
	if a.Has("p2") {
		return interimTwo(c, looks, lo, beta, opts)
	}
	if err := a.Need("p0"); err != nil {
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
	alpha, err := a.OpenProb("alpha", 0.05)
	if err != nil {
		return err
	}
	var d power.SequentialOneDesign
	if len(looks) == 1 && looks[0] == math.Trunc(looks[0]) && looks[0] >= 1 && looks[0] <= power.MaxLooks && !a.Has("observed") {
		upto, err := a.Count("upto", 0)
		if err != nil {
			return err
		}
		if err := a.Check(); err != nil {
			return err
		}
		if d, err = power.SequentialOneN(c.Ctx, p0, p1, alpha, beta, int(looks[0]), upto, opts); err != nil {
			return err
		}
	} else {
		sizes := make([]int64, len(looks))
		for i, v := range looks {
			if v != math.Trunc(v) || v < 1 {
				return inputErr(lo.word, "needs whole cumulative sizes like 15,30,45 for one proportion")
			}
			sizes[i] = int64(v)
		}
		if d, err = power.SequentialOne(c.Ctx, p0, p1, alpha, beta, sizes, opts); err != nil {
			return err
		}
	}
	out := interimOneResult{Design: d}
	title := "group-sequential design, one proportion, H0 p <= " + in(p0) + " against p = " + in(p1) +
		", one-sided alpha " + in(alpha) + ", " + d.Spending + " spending"
	if opts.Futility {
		title += ", futility " + d.FutilitySpending + map[bool]string{true: " (binding)", false: " (non-binding)"}[d.Binding]
	}
	b := c.Block(title)
	for k, l := range d.Looks {
		rule := "reject if k >= " + count(l.Efficacy)
		if l.Efficacy > l.N {
			rule = "no efficacy stop"
		}
		if k == len(d.Looks)-1 {
			rule += ", else accept H0"
		} else if l.Futility >= 0 {
			rule += ", futility if k <= " + count(l.Futility)
		}
		b.Row("look "+count(int64(k+1)), "n "+count(l.N), rule+"; alpha spent "+c.S.num(l.AlphaSpent)+", attained "+c.S.num(l.AlphaCumulative))
	}
	b.Row("size", c.S.num(d.AttainedAlpha), "chance of rejecting H0 at p0, futility stops obeyed")
	if opts.Futility {
		b.Row("non-binding size", c.S.num(d.AlphaNonBinding), "the same if the futility stops are ignored")
	}
	b.Row("power", c.S.num(d.Power), "at p = "+in(p1))
	b.Row("expected n", c.S.num(d.ExpectedN0)+" / "+c.S.num(d.ExpectedN1), "under p0 / p1; at most "+count(d.MaxN))
	b.Warn(d.Warnings...)
	if o := a.lookup("observed"); o != nil {
		k, n, err := parseKN(o.value)
		if err != nil {
			return wrap(o, err)
		}
		look := 0
		for i, l := range d.Looks {
			if l.N == n {
				look = i + 1
			}
		}
		if look == 0 {
			return inputErr(o.word, "has N = "+count(n)+", which is not one of the looks")
		}
		if out.Observed, err = stagedAnalysis(c, d.StageLooks(), look, k, p0, "look "+count(int64(look))); err != nil {
			return err
		}
	}
	if err := a.Check(); err != nil {
		return err
	}
	c.Data(out)
	var ns []int64
	var up, down []float64
	for _, l := range d.Looks {
		ns, up, down = append(ns, l.N), append(up, l.Z), append(down, l.ZFutility)
	}
	if !opts.Futility {
		down = nil
	}
	c.Plot(boundsPlot(c.S, ns, up, down))
	return nil
}

type interimOneResult struct {
	Design   power.SequentialOneDesign `json:"design"`
	Observed *stagedInference          `json:"observed,omitempty"`
}

func interimTwo(c *call, looks []float64, lo *option, beta float64, opts power.SequentialOptions) error {
	a := c.Args
	p1, err := a.OpenProb("p1", 0)
	if err != nil {
		return err
	}
	p2, err := a.OpenProb("p2", 0)
	if err != nil {
		return err
	}
	alpha, err := a.OpenProb("alpha", 0.025)
	if err != nil {
		return err
	}
	if err := a.Check(); err != nil {
		return err
	}
	t := looks
	if len(looks) == 1 && looks[0] > 1 {
		k := looks[0]
		if k != math.Trunc(k) || k > power.MaxLooks {
			return inputErr(lo.word, "needs a whole number of looks up to "+count(power.MaxLooks)+", or fractions ending in 1")
		}
		t = make([]float64, int(k))
		for i := range t {
			t[i] = float64(i+1) / k
		}
	}
	d, err := power.SequentialTwo(c.Ctx, p1, p2, alpha, beta, t, opts)
	if err != nil {
		return err
	}
	c.Data(d)
	title := "group-sequential design, two proportions, H0 p1 = p2 against p1 = " + in(p1) + ", p2 = " + in(p2) +
		", one-sided alpha " + in(alpha) + ", " + d.Spending + " spending"
	if opts.Futility {
		title += ", futility " + d.FutilitySpending + map[bool]string{true: " (binding)", false: " (non-binding)"}[d.Binding]
	}
	b := c.Block(title)
	for k, l := range d.Looks {
		rule := "reject if z >= " + c.S.num(l.Z)
		if k < len(d.Looks)-1 && !math.IsInf(l.ZFutility, -1) {
			rule += ", futility if z <= " + c.S.num(l.ZFutility)
		}
		note := rule + "; alpha spent " + c.S.num(l.AlphaSpent)
		if d.Exact {
			note += ", exact " + c.S.num(l.AlphaExact)
		}
		b.Row("look "+count(int64(k+1)), "n "+count(l.N)+" per group", note)
	}
	b.Row("fixed design", c.S.num(d.FixedN)+" per group", "single stage, normal approximation; inflation "+c.S.num(d.Inflation))
	b.Row("power", c.S.num(d.PowerNormal), "normal theory")
	b.Row("expected n", c.S.num(d.ExpectedN0Normal)+" / "+c.S.num(d.ExpectedN1Normal), "per group under H0 / H1, normal theory; at most "+count(d.MaxN))
	if d.Exact {
		b.Row("exact size", c.S.num(d.AlphaExact), "at p1 = p2 = "+in(d.ExactNull)+" (the largest of three null values)")
		b.Row("exact power", c.S.num(d.PowerExact), "by enumeration of both groups' counts")
		b.Row("exact expected n", c.S.num(d.ExpectedN0)+" / "+c.S.num(d.ExpectedN1), "per group under H0 / H1")
	}
	b.Warn(d.Warnings...)
	var ns []int64
	var up, down []float64
	for _, l := range d.Looks {
		ns, up, down = append(ns, l.N), append(up, l.Z), append(down, l.ZFutility)
	}
	if !opts.Futility {
		down = nil
	}
	c.Plot(boundsPlot(c.S, ns, up, down))
	return nil
}

// boundsPlot draws the efficacy and futility bounds on the z scale at
// each look's size; without futility bounds the interim efficacy bounds
// and the final bound are the two series.
func boundsPlot(s *Session, ns []int64, up, down []float64) string {
	nMax := ns[len(ns)-1]
	cols := min(int(nMax), s.plotColumns(5))
	xs := make([]float64, cols)
	for j := range xs {
		xs[j] = math.Round(1 + float64(j)*float64(nMax-1)/float64(max(cols-1, 1)))
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	mk := func(v []float64, from, to int) []float64 {
		ys := make([]float64, cols)
		for j := range ys {
			ys[j] = math.NaN()
		}
		for i := from; i < to; i++ {
			if math.IsInf(v[i], 0) || math.IsNaN(v[i]) {
				continue
			}
			j := int(math.Round(float64(ns[i]-1) / float64(max(nMax-1, 1)) * float64(cols-1)))
			ys[min(max(j, 0), cols-1)] = v[i]
			lo, hi = math.Min(lo, v[i]), math.Max(hi, v[i])
		}
		return ys
	}
	K := len(ns)
	var ser []series
	if down != nil {
		ser = []series{{"efficacy z", mk(up, 0, K)}, {"futility z", mk(down, 0, K-1)}}
	} else {
		ser = []series{{"interim efficacy z", mk(up, 0, K-1)}, {"final z", mk(up, K-1, K)}}
	}
	if math.IsInf(lo, 1) {
		return ""
	}
	yLo, yHi := niceRange(math.Min(lo, 0), hi, 1, -10, 10)
	if yHi <= yLo {
		yHi = yLo + 1
	}
	ch := chart{xs: xs, series: ser, yLo: yLo, yHi: yHi, ref: 0, height: 10, ascii: s.Set.ASCII,
		width: s.Set.Width, digits: 2, xLabel: "n"}
	return "bounds on the z scale at each look (line at 0)\n" + ch.render()
}

// countList reads a list of counts, one per look, where "-" means none
// (none=none is returned for it).
func countList(o *option, k int, none func(i int) int64) ([]int64, error) {
	words := strings.Split(o.value, ",")
	if len(words) > k {
		return nil, inputErr(o.word, "lists "+count(int64(len(words)))+" counts for "+count(int64(k))+" looks")
	}
	out := make([]int64, k)
	for i := range out {
		if i >= len(words) || words[i] == "-" {
			out[i] = none(i)
			continue
		}
		v, err := parseCount(words[i])
		if err != nil {
			return nil, inputErr(o.word, "has "+strconv.Quote(words[i])+", not a count or -")
		}
		out[i] = v
	}
	return out, nil
}

// interimEvaluate runs interim with reject=: the operating characteristic
// of a given one-proportion design.
func interimEvaluate(c *call) error {
	a := c.Args
	if err := a.Need("looks", "p0"); err != nil {
		return err
	}
	lo := a.lookup("looks")
	vals, err := lookList(lo)
	if err != nil {
		return err
	}
	sizes := make([]int64, len(vals))
	for i, v := range vals {
		if v != math.Trunc(v) || v < 1 {
			return inputErr(lo.word, "needs whole cumulative sizes like 15,30,45")
		}
		sizes[i] = int64(v)
	}
	K := len(sizes)
	eff, err := countList(a.lookup("reject"), K, func(i int) int64 { return sizes[i] + 1 })
	if err != nil {
		return err
	}
	fut := make([]int64, K)
	for i := range fut {
		fut[i] = -1
	}
	if o := a.lookup("futile"); o != nil {
		if fut, err = countList(o, K, func(int) int64 { return -1 }); err != nil {
			return err
		}
	}
	if len(strings.Split(a.Str("futile", ""), ",")) < K || fut[K-1] == -1 {
		fut[K-1] = eff[K-1] - 1
	}
	st := make([]power.Look, K)
	for i := range st {
		st[i] = power.Look{N: sizes[i], Futility: fut[i], Efficacy: eff[i]}
	}
	p0, err := a.OpenProb("p0", 0)
	if err != nil {
		return err
	}
	e0, err := power.EvaluateStages(c.Ctx, st, p0)
	if err != nil {
		return lookError(a, err)
	}
	out := interimEval{Null: e0}
	var e1 *power.StagesEval
	if a.Has("p1") {
		p1, err := a.OpenProb("p1", 0)
		if err != nil {
			return err
		}
		v, err := power.EvaluateStages(c.Ctx, st, p1)
		if err != nil {
			return err
		}
		e1, out.Alternative = &v, &v
	}
	b := c.Block("group-sequential design of one's own, one proportion, evaluated exactly at p = " + in(p0) +
		map[bool]string{true: " and " + a.Str("p1", ""), false: ""}[e1 != nil])
	for k, l := range st {
		rule := "reject if k >= " + count(l.Efficacy)
		if l.Efficacy > l.N {
			rule = "no efficacy stop"
		}
		if k == K-1 {
			rule += ", else accept H0"
		} else if l.Futility >= 0 {
			rule += ", futility if k <= " + count(l.Futility)
		}
		note := rule + "; at p0 reach " + c.S.num(e0.Looks[k].Reach) + ", reject " + c.S.num(e0.Looks[k].Reject)
		if e1 != nil {
			note += "; at p1 reject " + c.S.num(e1.Looks[k].Reject)
		}
		b.Row("look "+count(int64(k+1)), "n "+count(l.N), note)
	}
	b.Row("size", c.S.num(e0.Reject), "chance of rejecting H0 at p0 = "+in(p0))
	if e1 != nil {
		b.Row("power", c.S.num(e1.Reject), "at p1 = "+in(e1.P))
		b.Row("expected n", c.S.num(e0.ExpectedN)+" / "+c.S.num(e1.ExpectedN), "under p0 / p1; at most "+count(sizes[K-1]))
	} else {
		b.Row("expected n", c.S.num(e0.ExpectedN), "under p0; at most "+count(sizes[K-1]))
	}
	if o := a.lookup("observed"); o != nil {
		k, n, err := parseKN(o.value)
		if err != nil {
			return wrap(o, err)
		}
		look := 0
		for i, l := range st {
			if l.N == n {
				look = i + 1
			}
		}
		if look == 0 {
			return inputErr(o.word, "has N = "+count(n)+", which is not one of the looks")
		}
		if out.Observed, err = stagedAnalysis(c, st, look, k, p0, "look "+count(int64(look))); err != nil {
			return err
		}
	}
	if err := a.Check(); err != nil {
		return err
	}
	c.Data(out)
	sd := math.Sqrt(p0 * (1 - p0))
	z := func(k, n int64) float64 {
		if k > n || k < 0 {
			return math.Inf(1)
		}
		return (float64(k) - float64(n)*p0) / (math.Sqrt(float64(n)) * sd)
	}
	var up, down []float64
	hasFut := false
	for k, l := range st {
		up = append(up, z(l.Efficacy, l.N))
		f := math.Inf(-1)
		if l.Futility >= 0 && k < K-1 {
			f, hasFut = z(l.Futility, l.N), true
		}
		down = append(down, f)
	}
	if !hasFut {
		down = nil
	}
	c.Plot(boundsPlot(c.S, sizes, up, down))
	return nil
}

type interimEval struct {
	Null        power.StagesEval  `json:"null"`
	Alternative *power.StagesEval `json:"alternative,omitempty"`
	Observed    *stagedInference  `json:"observed,omitempty"`
}

// lookErrRE matches the argument of a package error about one look.
var lookErrRE = regexp.MustCompile(`^looks\[(\d+)\]\.(N|Futility|Efficacy)$`)

// lookError rewrites a package error about looks[i].Field in the words of
// interim's options: look i+1's size, futile or reject count.
func lookError(a *argSet, err error) error {
	var ae *argerr.Error
	if !errors.As(err, &ae) {
		return err
	}
	m := lookErrRE.FindStringSubmatch(ae.Arg)
	if m == nil {
		return err
	}
	i, _ := strconv.Atoi(m[1])
	word := map[string]string{"N": "looks", "Futility": "futile", "Efficacy": "reject"}[m[2]]
	tok := word
	if o := a.lookup(word); o != nil {
		tok = o.word
	}
	reason := strings.NewReplacer("Futility + 1", "the futile count + 1", "Futility", "the futile count",
		"Efficacy", "the reject count", "(Futility, N+1]", "(futile, n+1]", "N+1", "n+1", "[-1, N]", "[-1, n]",
		"previous look's N", "previous look's size").Replace(ae.Reason)
	return inputErr(tok, "gives "+ae.Value+" at look "+strconv.Itoa(i+1)+", which "+reason)
}

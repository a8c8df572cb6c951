package repl

import (
	"strconv"
	"strings"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

// Shell words of the multiplicity adjustments, in test.Adjustment order.
var adjustWords = []string{"holm", "bonferroni", "sidak", "hochberg", "hommel", "bh", "by"}

// adjustment returns the test.Adjustment named by a shell word.
func adjustment(word string) test.Adjustment {
	for i, w := range adjustWords {
		if w == word {
			return test.Adjustment(i)
		}
	}
	return test.Holm
}

const adjustHelp = "holm (default: familywise error rate under any dependence), bonferroni, sidak (independent " +
	"tests), hochberg and hommel (independent or positively dependent tests), bh (Benjamini-Hochberg: false " +
	"discovery rate, independent or positively dependent tests), by (Benjamini-Yekutieli: false discovery rate " +
	"under any dependence)."

var armsMethods = []string{"exact", "exact-mid-p", "pearson", "g"}

func armsCommand() *command {
	return &command{
		Name:    "arms",
		Group:   "tests",
		Summary: "several groups: test whether all proportions are equal, compare pairs or against a control",
		Usage:   "arms K1/N1 K2/N2 [K3/N3 ...] [method=M] [compare=pairs|control] [control=I] [adjust=A] [alpha=A]",
		Methods: armsMethods,
		Options: []opt{optMethod("test of equal proportions", armsMethods),
			{Name: "compare", Doc: "pairs: every pair of groups; control: every group against the control (Fisher's test each, adjusted)", Values: []string{"pairs", "control"}},
			{Name: "control", Doc: "the control group's position, 1 for the first (default 1); implies compare=control"},
			{Name: "adjust", Doc: "the multiplicity adjustment of the comparisons (default holm)", Values: adjustWords},
			{Name: "alpha", Doc: "family significance level of the comparisons (default 0.05)"},
			optLevel},
		Help: helpText{
			Computes: "The p-value for H0: every group has the same success probability, from K of N in each of " +
				"two or more groups (arms of an experiment, segments, sites). With compare=pairs, each pair of " +
				"groups is compared by Fisher's exact test and the p-values are adjusted over the family; with " +
				"compare=control (or control=I) each other group is compared with the control, with its " +
				"difference and a simultaneous interval for it (Newcombe intervals at the Bonferroni level, so " +
				"all hold together with the given level).",
			Methods: "exact (default): the Freeman-Halton exact conditional test, tables ordered by probability " +
				"and summed by a dynamic programme over the groups (it may refuse very large totals; then use " +
				"pearson); exact-mid-p halves the tables as probable as the observed one; pearson: the chi-square " +
				"test with k - 1 degrees of freedom; g: the likelihood-ratio test. Adjustments: " + adjustHelp,
			Assumptions: "Independent groups of independent trials. Decide the control and the comparisons before " +
				"seeing the data; a significant overall test does not say which groups differ.",
			Examples: []string{"arms 48/400 61/410 39/395 70/405", "arms 48/400 61/410 39/395 70/405 control=1",
				"arms 12/60 9/58 20/61 method=pearson compare=pairs adjust=hommel"},
			Sources: "Freeman GH, Halton JH (1951), Biometrika 38:141-149; Mehta CR, Patel NR (1983), JASA " +
				"78:427-434; Pearson K (1900), Phil Mag 50:157-175; Holm S (1979), Scand J Statist 6:65-70; Dunn " +
				"OJ (1961), JASA 56:52-64; Newcombe RG (1998), Statist Med 17:873-890.",
		},
		Run: runArms,
	}
}

// armCounts reads two or more K/N words.
func armCounts(a *argSet) (x, n []int64, err error) {
	if a.Len() < 2 {
		return nil, nil, &InputError{Token: a.cmd.Name, Reason: "needs two or more groups K/N; usage: " + a.cmd.Usage}
	}
	for i := range a.Len() {
		k, m, err := a.KN(i, "groups K/N")
		if err != nil {
			return nil, nil, err
		}
		x, n = append(x, k), append(n, m)
	}
	return x, n, nil
}

type armsResult struct {
	Test        test.KSampleResult      `json:"test"`
	Comparisons *test.ComparisonsResult `json:"comparisons,omitempty"`
	Intervals   *interval.Family        `json:"intervals,omitempty"`
}

func runArms(c *call) error {
	a, s := c.Args, c.S
	x, n, err := armCounts(a)
	if err != nil {
		return err
	}
	m, err := c.Method()
	if err != nil {
		return err
	}
	opt := test.KSampleOptions{MidP: m == "exact-mid-p"}
	switch m {
	case "pearson":
		opt.Method = test.PearsonChiSquare
	case "g":
		opt.Method = test.LikelihoodRatioG
	}
	compare, err := a.Choice("compare", "", "pairs", "control")
	if err != nil {
		return err
	}
	control := int64(1)
	if a.Has("control") {
		if control, err = a.Count("control", 1); err != nil {
			return err
		}
		if control < 1 || control > int64(len(x)) {
			return inputErr("control="+a.Str("control", ""), "is not a group position 1.."+strconv.Itoa(len(x)))
		}
		if compare == "pairs" {
			return inputErr("control="+a.Str("control", ""), "does not go with compare=pairs")
		}
		compare = "control"
	}
	adj, err := a.Choice("adjust", "holm", adjustWords...)
	if err != nil {
		return err
	}
	alpha, err := a.OpenProb("alpha", 0.05)
	if err != nil {
		return err
	}
	level, err := c.Level()
	if err != nil {
		return err
	}
	if compare == "" {
		for _, name := range []string{"adjust", "alpha", "level"} {
			if a.Has(name) {
				return inputErr(name+"="+a.Str(name, ""), "applies to the comparisons; add compare=pairs or control=I")
			}
		}
	}
	r, err := test.EqualProportions(c.Ctx, x, n, opt)
	if err != nil {
		return err
	}
	res := armsResult{Test: r}
	b := c.Block(r.Method + " test that all " + strconv.Itoa(len(x)) + " groups share one proportion")
	for i := range x {
		b.Row("group "+strconv.Itoa(i+1), kn(x[i], n[i]), "k/n = "+s.num(r.Proportions[i]))
	}
	b.Row("pooled", s.num(r.Pooled))
	b.Row("p-value", s.logNum(r.LogPValue))
	stat := r.Statistic.Name + " = " + s.stat(r.Statistic.Value)
	if r.DF > 0 {
		stat += ", " + strconv.Itoa(r.DF) + " degrees of freedom"
	}
	b.Row("statistic", stat)
	b.Warn(r.Warnings...)
	if compare != "" {
		copt := test.ComparisonOptions{Adjustment: adjustment(adj), Alpha: alpha}
		var cr test.ComparisonsResult
		title := "pairs"
		if compare == "pairs" {
			cr, err = test.Pairwise(c.Ctx, x, n, copt)
		} else {
			cr, err = test.VersusControl(c.Ctx, x, n, int(control-1), copt)
			title = "against group " + strconv.FormatInt(control, 10)
		}
		if err != nil {
			return err
		}
		res.Comparisons = &cr
		var fam *interval.Family
		if compare == "control" {
			f, err := interval.VersusControl(x, n, int(control-1), interval.ControlOptions{Level: level})
			if err != nil {
				return err
			}
			fam, res.Intervals = &f, &f
		}
		cb := c.Block(cr.Test + " tests, " + title + ", " + cr.Adjustment.String() + "-adjusted at alpha " + in(cr.Alpha))
		for i, cmp := range cr.Comparisons {
			label := strconv.Itoa(cmp.First+1) + " vs " + strconv.Itoa(cmp.Second+1)
			verdict := "not significant"
			if cmp.Reject {
				verdict = "significant"
			}
			value := "difference " + s.num(cmp.Difference)
			if fam != nil {
				iv := fam.Intervals[i]
				value += ", " + s.num(iv.Lower) + " to " + s.num(iv.Upper)
			}
			cb.Row(label, value, "p = "+s.num(cmp.PValue)+", adjusted "+s.num(cmp.AdjustedPValue)+": "+verdict)
		}
		if fam != nil {
			cb.Row("intervals", pct(fam.Level)+" simultaneous", "each "+fam.Method+" at "+s.num(fam.EachLevel))
		}
		cb.Warn(cr.Warnings...)
	}
	c.Data(res)
	return nil
}

var splitMethods = []string{"pearson", "g", "exact"}

func splitCommand() *command {
	return &command{
		Name:    "split",
		Group:   "tests",
		Summary: "sample-ratio check: do an experiment's group sizes fit the intended split?",
		Usage:   "split C1 C2 [C3 ...] [weights=W1,W2,...] [method=M] [alpha=A]",
		Methods: splitMethods,
		Options: []opt{optMethod("goodness-of-fit test", splitMethods),
			{Name: "weights", Doc: "the intended split as positive weights, one per group, like 1,1 or 50,25,25 (default equal)"},
			{Name: "alpha", Doc: "flag a mismatch below this p-value (default 0.001, common practice for this check)"}},
		Help: helpText{
			Computes: "Whether the observed group sizes C1, C2, ... of an experiment fit the intended allocation: " +
				"a goodness-of-fit p-value and, per group, the observed against the intended share. A mismatch " +
				"(p below alpha) means assignment, logging or filtering did not work as designed, and the " +
				"comparison of the groups is not trustworthy until the cause is found.",
			Methods: "pearson (default): chi-square with k - 1 degrees of freedom; g: the likelihood-ratio " +
				"statistic; exact: the exact multinomial test (the exact binomial test for two groups, at any " +
				"size; for more groups it lists the outcomes and is for small totals).",
			Assumptions: "Units are assigned independently with the intended probabilities.",
			Examples:    []string{"split 50512 49488", "split 20310 10125 9904 weights=2,1,1", "split 14 6 method=exact"},
			Sources: "Pearson K (1900), Phil Mag 50:157-175; Kohavi R, Tang D, Xu Y (2020), Trustworthy Online " +
				"Controlled Experiments, chapter 21; Fabijan A et al. (2019), KDD '19.",
		},
		Run: runSplit,
	}
}

// countWords reads two or more plain counts.
func countWords(a *argSet, what string) ([]int64, error) {
	if a.Len() < 2 {
		return nil, &InputError{Token: a.cmd.Name, Reason: "needs two or more " + what + "; usage: " + a.cmd.Usage}
	}
	var v []int64
	for i := range a.Len() {
		c, err := parseCount(a.Pos(i))
		if err != nil {
			return nil, err
		}
		v = append(v, c)
	}
	return v, nil
}

func runSplit(c *call) error {
	a, s := c.Args, c.S
	counts, err := countWords(a, "group sizes")
	if err != nil {
		return err
	}
	m, err := c.Method()
	if err != nil {
		return err
	}
	w := make([]float64, len(counts))
	for i := range w {
		w[i] = 1
	}
	if a.Has("weights") {
		word := a.Str("weights", "")
		parts := strings.Split(word, ",")
		if len(parts) != len(counts) {
			return inputErr("weights="+word, "gives "+strconv.Itoa(len(parts))+" weights for "+strconv.Itoa(len(counts))+" groups")
		}
		for i, p := range parts {
			if w[i], err = parseFloat(p); err != nil {
				return inputErr("weights="+word, "has weight "+strconv.Itoa(i+1)+" "+strconv.Quote(p)+", which "+reasonOf(err))
			}
			if !(w[i] > 0) {
				return inputErr("weights="+word, "has weight "+strconv.Itoa(i+1)+" "+strconv.Quote(p)+", which is not positive")
			}
		}
	}
	alpha, err := a.OpenProb("alpha", 0.001)
	if err != nil {
		return err
	}
	opt := test.SampleRatioOptions{Alpha: alpha}
	switch m {
	case "g":
		opt.Method = test.FitG
	case "exact":
		opt.Method = test.FitExact
	}
	r, err := test.SampleRatio(c.Ctx, counts, w, opt)
	if err != nil {
		return err
	}
	c.Data(r)
	b := c.Block("sample-ratio check, " + r.Method)
	for i, arm := range r.Arms {
		b.Row("group "+strconv.Itoa(i+1), count(arm.Observed), "share "+s.num(arm.Share)+", intended "+s.num(arm.Intended)+", ratio "+s.num(arm.Ratio))
	}
	b.Row("p-value", s.logNum(r.LogPValue))
	stat := r.Statistic.Name + " = " + s.stat(r.Statistic.Value)
	if r.DF > 0 {
		stat += ", " + strconv.Itoa(r.DF) + " degrees of freedom"
	}
	b.Row("statistic", stat)
	verdict := "no mismatch detected at alpha " + in(r.Alpha)
	if r.Mismatch {
		verdict = "MISMATCH at alpha " + in(r.Alpha)
	}
	b.Row("verdict", verdict)
	b.Warn(r.Warnings...)
	return nil
}

var sharesMethods = []string{"sison-glaz", "quesenberry-hurst", "goodman"}

func sharesCommand() *command {
	return &command{
		Name:    "shares",
		Group:   "intervals",
		Summary: "simultaneous intervals for the shares of several categories (multinomial)",
		Usage:   "shares C1 C2 [C3 ...] [method=M] [level=L]",
		Methods: sharesMethods,
		Options: []opt{optMethod("simultaneous interval", sharesMethods), optLevel},
		Help: helpText{
			Computes: "From counts C1, C2, ... of one sample sorted into categories (answers to a question, " +
				"failure modes, browsers), an interval for each category's probability such that all hold " +
				"together with the given level. Categories with count 0 are allowed.",
			Methods: "sison-glaz (default: closest to the level with many categories and small counts; by " +
				"Levin's formula and an Edgeworth expansion, exactly by convolution where the expansion fails); " +
				"quesenberry-hurst: projections of the chi-square region with k - 1 degrees of freedom " +
				"(conservative); goodman: the same with a Bonferroni split over the categories.",
			Assumptions: "One multinomial sample: independent units, each in exactly one category.",
			Examples:    []string{"shares 41 27 19 8 5", "shares 12 0 3 1 0 4 method=goodman level=0.9"},
			Sources: "Sison CP, Glaz J (1995), JASA 90:366-369; Levin B (1981), Ann Statist 9:1123-1126; " +
				"Quesenberry CP, Hurst DC (1964), Technometrics 6:191-195; Goodman LA (1965), Technometrics 7:247-254.",
		},
		Run: runShares,
	}
}

func runShares(c *call) error {
	a, s := c.Args, c.S
	counts, err := countWords(a, "category counts")
	if err != nil {
		return err
	}
	m, err := c.Method()
	if err != nil {
		return err
	}
	level, err := c.Level()
	if err != nil {
		return err
	}
	opt := interval.MultinomialOptions{Level: level}
	switch m {
	case "quesenberry-hurst":
		opt.Method = interval.QuesenberryHurst
	case "goodman":
		opt.Method = interval.Goodman
	}
	f, err := interval.Multinomial(counts, opt)
	if err != nil {
		return err
	}
	c.Data(f)
	b := c.Block(pct(f.Level) + " simultaneous " + f.Method + " intervals for " + strconv.Itoa(len(counts)) + " shares")
	for i, iv := range f.Intervals {
		b.Row("category "+strconv.Itoa(i+1), s.num(iv.Lower)+" to "+s.num(iv.Upper), count(counts[i])+" observed, share "+s.num(iv.Estimate))
	}
	b.Warn(f.Warnings...)
	return nil
}

func familyCommand() *command {
	return &command{
		Name:    "family",
		Group:   "tests",
		Summary: "adjust a family of p-values for multiplicity and decide each",
		Usage:   "family P1 P2 [P3 ...] [method=M] [alpha=A]",
		Methods: adjustWords,
		Options: []opt{optMethod("adjustment", adjustWords),
			{Name: "alpha", Doc: "family level: familywise error rate, or false discovery rate for bh and by (default 0.05)"}},
		Help: helpText{
			Computes: "The adjusted p-value of each of the p-values P1, P2, ... (the smallest family level at " +
				"which the procedure rejects that hypothesis) and the decision at alpha. For a whole file of " +
				"tests use each with adjust=.",
			Methods:     adjustHelp,
			Assumptions: "The p-values are the whole family tested, chosen before seeing the results; each is valid on its own.",
			Examples:    []string{"family 0.012 0.041 0.003 0.27", "family 0.012 0.041 0.003 0.27 method=bh alpha=0.1"},
			Sources: "Holm S (1979), Scand J Statist 6:65-70; Hochberg Y (1988), Biometrika 75:800-802; Hommel " +
				"G (1988), Biometrika 75:383-386; Benjamini Y, Hochberg Y (1995), JRSS B 57:289-300; Benjamini Y, " +
				"Yekutieli D (2001), Ann Statist 29:1165-1188; Šidák Z (1967), JASA 62:626-633.",
		},
		Run: runFamily,
	}
}

func runFamily(c *call) error {
	a, s := c.Args, c.S
	if a.Len() < 1 {
		return &InputError{Token: "family", Reason: "needs one or more p-values; usage: " + a.cmd.Usage}
	}
	p := make([]float64, a.Len())
	for i := range p {
		v, err := parseProb(a.Pos(i))
		if err != nil {
			return err
		}
		p[i] = v
	}
	m, err := c.Method()
	if err != nil {
		return err
	}
	alpha, err := a.OpenProb("alpha", 0.05)
	if err != nil {
		return err
	}
	r, err := test.Adjust(c.Ctx, p, alpha, adjustment(m))
	if err != nil {
		return err
	}
	c.Data(r)
	b := c.Block(r.Method.String() + " adjustment of " + strconv.Itoa(len(p)) + " p-values at alpha " + in(r.Alpha))
	for i, q := range r.AdjustedPValues {
		verdict := "kept"
		if r.Reject[i] {
			verdict = "rejected"
		}
		b.Row("p"+strconv.Itoa(i+1)+" = "+in(p[i]), "adjusted "+s.num(q), verdict)
	}
	b.Row("rejected", strconv.Itoa(r.Rejections)+" of "+strconv.Itoa(len(p)))
	b.Warn(r.Warnings...)
	return nil
}

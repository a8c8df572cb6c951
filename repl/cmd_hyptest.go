package repl

import (
	"context"

	"github.com/kofnlab/kofn/test"
)

// binomialTestMethods are the method words of check: the exact test under
// each two-sided rule, with and without mid-p, then the asymptotic tests;
// binomialTestOptions[i] is the test binomialTestMethods[i] names.
var binomialTestMethods, binomialTestOptions = func() ([]string, []test.BinomialOptions) {
	var ws []string
	var os []test.BinomialOptions
	for _, r := range test.TwoSidedRuleValues() {
		for _, mid := range []bool{false, true} {
			w := methodWord(r.String())
			if mid {
				w += "-mid-p"
			}
			ws, os = append(ws, w), append(os, test.BinomialOptions{Rule: r, MidP: mid})
		}
	}
	for _, m := range test.BinomialMethodValues()[1:] {
		ws, os = append(ws, methodWord(m.String())), append(os, test.BinomialOptions{Method: m})
	}
	return ws, os
}()

// mcnemarMethods are the method words of flips; the first is the default,
// the exact conditional test, as in test.McNemarOptions and power.
var mcnemarMethods = []string{"exact", "mid-p", "asymptotic", "asymptotic-cc"}

// mcnemarOptions returns the test a flips method word names.
func mcnemarOptions(word string) test.McNemarOptions {
	switch word {
	case "mid-p":
		return test.McNemarOptions{MidP: true}
	case "asymptotic":
		return test.McNemarOptions{Method: test.McNemarAsymptotic}
	case "asymptotic-cc":
		return test.McNemarOptions{Method: test.McNemarAsymptoticCC}
	}
	return test.McNemarOptions{}
}

const cautionSides = "side=high or side=low is honest only when the direction was fixed before the data were seen."

var optTestSide = opt{Name: "side", Doc: "two (default): the proportion differs; high: it is higher; low: it is lower", Values: sideWords}

func checkCommand() *command {
	return &command{
		Name:    "check",
		Group:   "tests",
		Summary: "test one proportion against a stated value p, with the interval that inverts the test",
		Usage:   "check K/N p=P [method=M] [side=two|high|low] [level=L]",
		Methods: binomialTestMethods,
		Options: []opt{optP, optMethod("test", binomialTestMethods), optTestSide, optLevel},
		Help: helpText{
			Computes: "The p-value for H0: the success probability equals p, from K successes in N trials, and " +
				"the confidence interval made of the values of p the same test does not reject. " + cautionSides,
			Methods: "Exact tests: point-probability (default; two-sided p-value sums the outcomes no more likely " +
				"than the one observed; inverts to Sterne's interval), central (twice the smaller tail; inverts to " +
				"Clopper-Pearson), Blaker (Blaker 2000), each also as mid-p. Large-sample tests: score (inverts to " +
				"Wilson), score-cc (with continuity correction), likelihood-ratio.",
			Assumptions: "Independent trials with one common success probability; the large-sample tests need " +
				"n p and n (1-p) of about 5 or more (common practice).",
			Examples: []string{"check 17/40 p=0.3", "check 3/50 p=0.15 side=low method=central", "check 81/263 p=0.25 method=score"},
			Sources: "Sterne TE (1954), Biometrika 41:275-278; Clopper CJ, Pearson ES (1934), Biometrika 26:404-413; " +
				"Blaker H (2000), Canadian Journal of Statistics 28:783-798; Lancaster HO (1961), JASA 56:223-234 (mid-p).",
		},
		Run: runCheck,
		Row: checkRow(),
	}
}

// testSide reads side= as a test alternative.
func testSide(a *argSet) (test.Alternative, string, error) {
	w, err := a.Choice("side", "two", sideWords...)
	if err != nil {
		return 0, "", err
	}
	switch w {
	case "high":
		return test.Higher, "one-sided, higher", nil
	case "low":
		return test.Lower, "one-sided, lower", nil
	}
	return test.TwoSided, "two-sided", nil
}

// checkSetup reads the options of check.
func checkSetup(c *call) (p0 float64, o test.BinomialOptions, sideText string, err error) {
	a := c.Args
	if err = a.Need("p"); err != nil {
		return
	}
	if p0, err = a.OpenProb("p", 0); err != nil {
		return
	}
	m, err := c.Method()
	if err != nil {
		return
	}
	for i, w := range binomialTestMethods {
		if w == m {
			o = binomialTestOptions[i]
		}
	}
	if o.Alternative, sideText, err = testSide(a); err != nil {
		return
	}
	o.Level, err = c.Level()
	return
}

func runCheck(c *call) error {
	a := c.Args
	if err := a.Want(1, 1); err != nil {
		return err
	}
	k, n, err := a.KN(0, "a count K/N")
	if err != nil {
		return err
	}
	p0, o, sideText, err := checkSetup(c)
	if err != nil {
		return err
	}
	r, err := test.Binomial(k, n, p0, o)
	if err != nil {
		return err
	}
	c.Data(r)
	s := c.S
	b := c.Block(r.Method + " test of p = " + in(p0) + ", " + sideText)
	b.Row("observed", kn(k, n), "k/n = "+s.num(r.Estimate))
	testRows(s, b, r, "proportion")
	return nil
}

// testRows writes the common rows of a test result: p-value, statistic,
// inverted interval, warnings.
func testRows(s *Session, b *block, r test.Result, what string) {
	b.Row("p-value", s.logNum(r.LogPValue))
	b.Row("statistic", r.Statistic.Name+" = "+s.stat(r.Statistic.Value))
	if r.Interval != nil {
		b.Row(pct(r.Interval.Level)+" interval", s.num(r.Interval.Lower)+" to "+s.num(r.Interval.Upper), what+" values this test does not reject")
	}
	b.Warn(r.Warnings...)
}

func flipsCommand() *command {
	return &command{
		Name:    "flips",
		Group:   "tests",
		Summary: "paired yes/no data: test whether the two answers differ (McNemar)",
		Usage:   "flips A B C D [method=M] [side=two|high|low]",
		Methods: mcnemarMethods,
		Options: []opt{optMethod("test", mcnemarMethods), optTestSide},
		Help: helpText{
			Computes: "For n pairs each scored yes/no twice (before and after, two raters, two tests on one " +
				"sample), the counts A B C D in reading order: A both yes, B yes then no, C no then yes, D both no. " +
				"Tests H0: the chance of a yes is the same the first and the second time, which depends only on " +
				"the pairs that flipped (B and C). side=high claims the first yes-rate is higher. " + cautionSides,
			Methods: "McNemar mid-p (default: closest to the nominal size in Fagerland et al. 2013), exact " +
				"(conditional binomial; never exceeds the size), asymptotic (chi-square), asymptotic-cc (with " +
				"Edwards' continuity correction).",
			Assumptions: "Pairs are independent of each other; each pair is scored twice on the same scale.",
			Examples:    []string{"flips 1 1 7 12", "flips 30 12 4 54 method=exact"},
			Sources: "McNemar Q (1947), Psychometrika 12:153-157; Fagerland MW, Lydersen S, Laake P (2013), BMC " +
				"Medical Research Methodology 13:91.",
		},
		Run: runFlips,
		Row: flipsRow(),
	}
}

// pairCounts reads the four cell counts A B C D of a paired table.
func pairCounts(a *argSet) ([4]int64, error) {
	var cells [4]int64
	if err := a.Want(4, 4); err != nil {
		return cells, err
	}
	for i := range cells {
		v, err := parseCount(a.Pos(i))
		if err != nil {
			return cells, err
		}
		cells[i] = v
	}
	return cells, nil
}

// flipsSetup reads the options of flips.
func flipsSetup(c *call) (o test.McNemarOptions, sideText string, err error) {
	m, err := c.Method()
	if err != nil {
		return
	}
	o = mcnemarOptions(m)
	o.Alternative, sideText, err = testSide(c.Args)
	return
}

func runFlips(c *call) error {
	a := c.Args
	cells, err := pairCounts(a)
	if err != nil {
		return err
	}
	o, sideText, err := flipsSetup(c)
	if err != nil {
		return err
	}
	r, err := test.McNemar(cells[1], cells[2], o)
	if err != nil {
		return err
	}
	c.Data(r)
	s := c.S
	n := cells[0] + cells[1] + cells[2] + cells[3]
	b := c.Block(r.Method + " test for paired data, " + sideText)
	b.Row("pairs", count(n), "both yes "+count(cells[0])+", yes-no "+count(cells[1])+", no-yes "+count(cells[2])+", both no "+count(cells[3]))
	b.Row("flipped", count(cells[1]+cells[2]), "estimate (B - C)/(B + C) = "+s.num(r.Estimate))
	testRows(s, b, r, "")
	return nil
}

// checkRow is the row form of check for each. It leaves out the inverted
// interval, which costs about a hundred p-values; each ROWS bounds gives
// intervals.
func checkRow() *rowSpec {
	return &rowSpec{In: []string{"k", "n"}, Out: []string{"estimate", "p_value"},
		prepare: func(c *call) (rowFunc, error) {
			p0, o, _, err := checkSetup(c)
			o.SkipInterval = true
			return func(_ context.Context, v []int64) ([]float64, error) {
				r, err := test.Binomial(v[0], v[1], p0, o)
				if err != nil {
					return nil, err
				}
				return []float64{r.Estimate, r.PValue}, nil
			}, err
		}}
}

// flipsRow is the row form of flips for each.
func flipsRow() *rowSpec {
	return &rowSpec{In: []string{"a", "b", "c", "d"}, Out: []string{"estimate", "p_value"},
		prepare: func(c *call) (rowFunc, error) {
			o, _, err := flipsSetup(c)
			return func(_ context.Context, v []int64) ([]float64, error) {
				r, err := test.McNemar(v[1], v[2], o)
				if err != nil {
					return nil, err
				}
				return []float64{r.Estimate, r.PValue}, nil
			}, err
		}}
}

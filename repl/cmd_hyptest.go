package repl

import (
	"context"
	"strings"

	"github.com/kofnlab/kofn/test"
)

// binomialTestMethods are the method words of check, from
// test.BinomialMethodValues: exact (default; with rule= and midp=), score,
// score-cc, likelihood-ratio.
var binomialTestMethods = enumWords(test.BinomialMethodValues(), test.BinomialMethod.String)

// mcnemarMethods are the method words of flips, from
// test.McNemarMethodValues without the leading "McNemar": exact (default;
// midp=on for mid-p), asymptotic, asymptotic-cc.
var mcnemarMethods = enumWords(test.McNemarMethodValues(), func(m test.McNemarMethod) string {
	return strings.TrimPrefix(m.String(), "McNemar ")
})

func checkCommand() *command {
	return &command{
		Name:    "check",
		Group:   "tests",
		Summary: "test one proportion against a stated value p, with the interval that inverts the test",
		Usage:   "check K/N p=P [method=M] [rule=R] [midp=on] [alt=two-sided|lower|higher] [level=L]",
		Methods: binomialTestMethods,
		Options: []opt{optP, optMethod("test", binomialTestMethods), optRule, optMidP,
			optAlt("two-sided (default): the proportion differs from p; lower: it is below p; higher: above"), optLevel},
		Help: helpText{
			Computes: "The p-value for H0: the success probability equals p, from K successes in N trials, and " +
				"the confidence interval made of the values of p the same test does not reject. " + cautionSides,
			Methods: "exact (default), whose two-sided p-value follows rule=: point-probability (default; the " +
				"outcomes no more likely than the one observed; inverts to Sterne's interval), central (twice the " +
				"smaller tail; inverts to Clopper-Pearson) or blaker (Blaker 2000); midp=on gives its mid-p form. " +
				"Large-sample tests: score (inverts to Wilson), score-cc (with continuity correction), likelihood-ratio.",
			Assumptions: "Independent trials with one common success probability; the large-sample tests need " +
				"n p and n (1-p) of about 5 or more (common practice).",
			Examples: []string{"check 17/40 p=0.3", "check 3/50 p=0.15 alt=lower rule=central", "check 17/40 p=0.3 midp=on", "check 81/263 p=0.25 method=score"},
			Sources: "Sterne TE (1954), Biometrika 41:275-278; Clopper CJ, Pearson ES (1934), Biometrika 26:404-413; " +
				"Blaker H (2000), Canadian Journal of Statistics 28:783-798; Lancaster HO (1961), JASA 56:223-234 (mid-p).",
		},
		Run: runCheck,
		Row: checkRow(),
	}
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
	o.Method = enumValue[test.BinomialMethod](binomialTestMethods, m)
	if o.Method == test.Exact {
		if o.Rule, o.MidP, err = readExact(a); err != nil {
			return
		}
	}
	if o.Alternative, sideText, err = readAlt(a, test.TwoSided); err != nil {
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
		Usage:   "flips N11 N12 N21 N22 [method=M] [midp=on] [alt=two-sided|lower|higher]",
		Methods: mcnemarMethods,
		Options: []opt{optMethod("test", mcnemarMethods), {Name: "midp", Doc: "method=exact: on gives the mid-p test (closest to the nominal size in Fagerland et al. 2013, but not guaranteed to keep it); off (default)", Values: onOffWords},
			optAlt("two-sided (default); higher: the first yes-rate is above the second (n12 > n21 expected); lower: below")},
		Help: helpText{
			Computes: "For n pairs each scored yes/no twice (before and after, two raters, two tests on one " +
				"sample), the four cell counts in reading order: n11 both yes, n12 yes then no, n21 no then yes, " +
				"n22 both no. Tests H0: the chance of a yes is the same the first and the second time, which " +
				"depends only on the discordant pairs n12 and n21. alt=higher claims the first yes-rate is " +
				"higher. " + cautionSides,
			Methods: "McNemar exact (default: the conditional binomial test on n12 of n12 + n21; never exceeds " +
				"the size), with midp=on its mid-p form (closest to the nominal size in Fagerland et al. 2013), " +
				"asymptotic (chi-square), asymptotic-cc (with Edwards' continuity correction).",
			Assumptions: "Pairs are independent of each other; each pair is scored twice on the same scale.",
			Examples:    []string{"flips 1 1 7 12", "flips 30 12 4 54 midp=on"},
			Sources: "McNemar Q (1947), Psychometrika 12:153-157; Fagerland MW, Lydersen S, Laake P (2013), BMC " +
				"Medical Research Methodology 13:91.",
		},
		Run: runFlips,
		Row: flipsRow(),
	}
}

// pairCells describes the four cells of a paired table in the one
// notation of the shell and the packages.
func pairCells(cells [4]int64) string {
	return "n11 = " + count(cells[0]) + " both yes, n12 = " + count(cells[1]) + " yes then no, n21 = " +
		count(cells[2]) + " no then yes, n22 = " + count(cells[3]) + " both no"
}

// pairCounts reads the four cell counts n11 n12 n21 n22 of a paired table.
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
	o.Method = enumValue[test.McNemarMethod](mcnemarMethods, m)
	if o.Method == test.McNemarExact {
		mid, err := c.Args.Choice("midp", "off", onOffWords...)
		if err != nil {
			return o, "", err
		}
		o.MidP = mid == "on"
	}
	o.Alternative, sideText, err = readAlt(c.Args, test.TwoSided)
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
	b.Row("pairs", count(n), pairCells(cells))
	b.Row("discordant", count(cells[1]+cells[2]), "n12 + n21; estimate (n12 - n21)/(n12 + n21) = "+s.num(r.Estimate))
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
	return &rowSpec{In: []string{"n11", "n12", "n21", "n22"}, Out: []string{"estimate", "p_value"},
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

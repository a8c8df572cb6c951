package repl

import (
	"context"
	"strings"

	"github.com/kofnlab/kofn/interval"
)

// shortWords shortens published interval names to shell words where the
// full name is long; the replacements keep every list's words distinct
// (checked by the tests).
var shortWords = strings.NewReplacer(
	"-with-continuity-correction", "-cc", "-paired-hybrid-score", "", "-hybrid-score", "",
	"woolf-logit", "woolf", "-exact-conditional", "", "tango-score", "tango", "katz-log", "katz")

func shortWord(name string) string { return shortWords.Replace(methodWord(name)) }

var (
	gapMethods   = enumWords(interval.DiffMethodValues(), func(m interval.DiffMethod) string { return shortWord(m.String()) })
	ratioMethods = enumWords(interval.RatioMethodValues(), func(m interval.RatioMethod) string { return shortWord(m.String()) })
	oddsMethods  = enumWords(interval.OddsMethodValues(), func(m interval.OddsMethod) string { return shortWord(m.String()) })
	pairMethods  = enumWords(interval.PairedMethodValues(), func(m interval.PairedMethod) string { return shortWord(m.String()) })
)

// twoInterval computes one two-group interval from the method's index.
type twoInterval func(k1, n1, k2, n2 int64, method int, level float64, side interval.Side) (interval.Interval, error)

const twoAssumptions = "Two independent groups of independent trials, each with one common success probability."

const sourcesTwo = "Newcombe RG (1998), Interval estimation for the difference between independent proportions: " +
	"comparison of eleven methods, Statistics in Medicine 17:873-890; Miettinen O, Nurminen M (1985), " +
	"Comparative analysis of two rates, Statistics in Medicine 4:213-226; Fagerland MW, Lydersen S, Laake P " +
	"(2015), Statistical Methods in Medical Research 24:224-254."

// newTwoBounds builds a two-group interval command.
func newTwoBounds(name, summary string, methods []string, help helpText, f twoInterval) *command {
	cmd := &command{
		Name:    name,
		Group:   "intervals",
		Summary: summary,
		Usage:   name + " K1/N1 K2/N2 [method=M] [level=L] [bound=two|lower|upper]",
		Methods: methods,
		Options: []opt{optMethod("interval method", methods), optLevel, optBound},
		Help:    help,
	}
	setup := func(c *call) (int, float64, interval.Side, error) {
		m, err := c.Method()
		if err != nil {
			return 0, 0, 0, err
		}
		level, err := c.Level()
		if err != nil {
			return 0, 0, 0, err
		}
		side, err := boundSide(c.Args)
		return enumValue[int](methods, m), level, side, err
	}
	cmd.Run = func(c *call) error {
		k1, n1, k2, n2, err := twoCounts(c.Args)
		if err != nil {
			return err
		}
		m, level, side, err := setup(c)
		if err != nil {
			return err
		}
		iv, err := f(k1, n1, k2, n2, m, level, side)
		if err != nil {
			return err
		}
		c.Data(iv)
		s := c.S
		b := c.Block(iv.Method + " interval for " + iv.Parameter + ", " + pct(iv.Level) + " " + iv.Side.String())
		b.Row("group 1", kn(k1, n1), "k/n = "+s.num(float64(k1)/float64(n1)))
		b.Row("group 2", kn(k2, n2), "k/n = "+s.num(float64(k2)/float64(n2)))
		b.Row("estimate", s.num(iv.Estimate), iv.Parameter)
		intervalRows(s, b, iv)
		return nil
	}
	cmd.Row = &rowSpec{In: []string{"k1", "n1", "k2", "n2"}, Out: []string{"estimate", "lower", "upper"},
		prepare: func(c *call) (rowFunc, error) {
			m, level, side, err := setup(c)
			return func(_ context.Context, v []int64) ([]float64, error) {
				iv, err := f(v[0], v[1], v[2], v[3], m, level, side)
				if err != nil {
					return nil, err
				}
				return []float64{iv.Estimate, iv.Lower, iv.Upper}, nil
			}, err
		}}
	return cmd
}

// gapCommand is the interval for a difference of two proportions.
func gapCommand() *command {
	return newTwoBounds("gap", "confidence interval for the difference p1 - p2 of two groups' proportions", gapMethods, helpText{
		Computes: "A confidence interval for p1 - p2 from K1 of N1 and K2 of N2, with the estimate " +
			"K1/N1 - K2/N2. bound=lower or upper gives a one-sided bound.",
		Methods: "newcombe (default: Newcombe's hybrid score, method 10 of his eleven), wald (for comparison), " +
			"wald-cc, agresti-caffo, newcombe-cc (method 11), mee (score, method 5), miettinen-nurminen " +
			"(score, method 6).",
		Assumptions: twoAssumptions,
		Examples:    []string{"gap 17/40 9/38", "gap 56/70 48/80 method=miettinen-nurminen", "gap 0/10 0/20"},
		Sources:     sourcesTwo + " Newcombe (1998) Table II gives 56/70 - 48/80 and 0/10 - 0/20.",
	}, func(k1, n1, k2, n2 int64, m int, level float64, side interval.Side) (interval.Interval, error) {
		return interval.Difference(k1, n1, k2, n2, interval.DiffOptions{Level: level, Method: interval.DiffMethod(m), Side: side})
	})
}

// ratioCommand is the interval for a ratio of two proportions.
func ratioCommand() *command {
	return newTwoBounds("ratio", "confidence interval for the ratio p1/p2 of two groups' proportions (relative risk)", ratioMethods, helpText{
		Computes: "A confidence interval for the ratio p1/p2 (the relative risk, when successes are " +
			"events) from K1 of N1 and K2 of N2, with the estimate (K1/N1)/(K2/N2).",
		Methods: "koopman (default: the score interval of Koopman 1984), katz (log-scale Wald, Katz et al. " +
			"1978), adjusted-log (1/2 added to each count), miettinen-nurminen.",
		Assumptions: twoAssumptions,
		Examples:    []string{"ratio 189/11034 104/11037", "ratio 189/11034 104/11037 method=katz", "ratio 5/40 0/38"},
		Sources: "Koopman PAR (1984), Biometrics 40:513-517; Katz D et al. (1978), Biometrics 34:469-474; " +
			"Agresti A (2019), An Introduction to Categorical Data Analysis, 3rd ed., section 2.2 (189/11034 " +
			"against 104/11037).",
	}, func(k1, n1, k2, n2 int64, m int, level float64, side interval.Side) (interval.Interval, error) {
		return interval.Ratio(k1, n1, k2, n2, interval.RatioOptions{Level: level, Method: interval.RatioMethod(m), Side: side})
	})
}

// oddsCommand is the interval for an odds ratio.
func oddsCommand() *command {
	return newTwoBounds("odds", "confidence interval for the odds ratio of two groups", oddsMethods, helpText{
		Computes: "A confidence interval for the odds ratio [p1/(1-p1)] / [p2/(1-p2)] from K1 of N1 and K2 " +
			"of N2, with the sample odds ratio (the conditional maximum-likelihood estimate for Cornfield).",
		Methods: "miettinen-nurminen (default: score), woolf (log-scale Wald, Woolf 1955, 1/2 added to " +
			"zero cells), cornfield (exact conditional, Cornfield 1956: coverage never below the level), " +
			"cornfield-mid-p.",
		Assumptions: twoAssumptions,
		Examples:    []string{"odds 189/11034 104/11037", "odds 3/4 1/4 method=cornfield", "odds 17/40 9/38 method=woolf"},
		Sources: "Woolf B (1955), Annals of Human Genetics 19:251-253; Cornfield J (1956), Proc. Third " +
			"Berkeley Symposium 4:135-148; Miettinen and Nurminen (1985); Agresti A (2019), section 2.2.",
	}, func(k1, n1, k2, n2 int64, m int, level float64, side interval.Side) (interval.Interval, error) {
		return interval.OddsRatio(k1, n1, k2, n2, interval.OddsOptions{Level: level, Method: interval.OddsMethod(m), Side: side})
	})
}

// pairsRow is the row form of pairs for each.
func pairsRow() *rowSpec {
	return &rowSpec{In: []string{"n11", "n12", "n21", "n22"}, Out: []string{"estimate", "lower", "upper"},
		prepare: func(c *call) (rowFunc, error) {
			f, err := pairsSetup(c)
			return func(_ context.Context, v []int64) ([]float64, error) {
				iv, err := f([4]int64{v[0], v[1], v[2], v[3]})
				if err != nil {
					return nil, err
				}
				return []float64{iv.Estimate, iv.Lower, iv.Upper}, nil
			}, err
		}}
}

func pairsCommand() *command {
	return &command{
		Name:    "pairs",
		Group:   "intervals",
		Summary: "paired yes/no data: interval for the change in the yes-rate (or the ratio of flips)",
		Usage:   "pairs N11 N12 N21 N22 [method=M] [level=L] [bound=two|lower|upper] [measure=difference|ratio]",
		Methods: pairMethods,
		Options: []opt{optMethod("interval method (for measure=ratio: a bounds method)", unique(pairMethods, boundsMethods)), optLevel, optBound,
			{Name: "measure", Doc: "difference (default): p1 - p2 of the yes-rates; ratio: n12/n21, the ratio of the two kinds of discordant pair", Values: []string{"difference", "ratio"}}},
		Help: helpText{
			Computes: "For n pairs each scored yes/no twice, with n11 both yes, n12 yes then no, n21 no then yes " +
				"and n22 both no: a confidence interval for p1 - p2, the first yes-rate (n11+n12)/n minus the second " +
				"(n11+n21)/n, estimated by (n12 - n21)/n. measure=ratio gives instead an interval for the ratio of " +
				"the two kinds of discordant pair, n12/n21 (the matched-pairs odds ratio), from the split of the " +
				"n12 + n21 discordant pairs.",
			Methods: "newcombe (default: Newcombe's hybrid score for paired data), wald, tango (Tango's score " +
				"interval). For measure=ratio, any bounds method on the split (clopper-pearson gives the exact " +
				"conditional interval).",
			Assumptions: "Pairs independent of each other; each pair scored twice on the same scale.",
			Examples:    []string{"pairs 1 1 7 12", "pairs 30 12 4 54 method=tango", "pairs 30 12 4 54 measure=ratio method=clopper-pearson"},
			Sources: "Newcombe RG (1998), Improved confidence intervals for the difference between binomial " +
				"proportions based on paired data, Statistics in Medicine 17:2635-2650; Tango T (1998), Statistics " +
				"in Medicine 17:891-908; Fagerland MW, Lydersen S, Laake P (2014), Statistics in Medicine 33:2850-2875.",
		},
		Run: runPairs,
		Row: pairsRow(),
	}
}

// pairsSetup reads the options of pairs and returns the interval function.
func pairsSetup(c *call) (func(cells [4]int64) (interval.Interval, error), error) {
	a := c.Args
	measure, err := a.Choice("measure", "difference", "difference", "ratio")
	if err != nil {
		return nil, err
	}
	level, err := c.Level()
	if err != nil {
		return nil, err
	}
	side, err := boundSide(a)
	if err != nil {
		return nil, err
	}
	if measure == "ratio" {
		m, err := a.Choice("method", boundsMethods[0], boundsMethods...)
		if err != nil {
			return nil, err
		}
		o := interval.Options{Level: level, Side: side, Method: enumValue[interval.Method](boundsMethods, m)}
		return func(v [4]int64) (interval.Interval, error) { return interval.DiscordantRatio(v[1], v[2], o) }, nil
	}
	m, err := c.Method()
	if err != nil {
		return nil, err
	}
	o := interval.PairedOptions{Level: level, Side: side, Method: enumValue[interval.PairedMethod](pairMethods, m)}
	return func(v [4]int64) (interval.Interval, error) {
		return interval.PairedDifference(v[0], v[1], v[2], v[3], o)
	}, nil
}

func runPairs(c *call) error {
	cells, err := pairCounts(c.Args)
	if err != nil {
		return err
	}
	f, err := pairsSetup(c)
	if err != nil {
		return err
	}
	iv, err := f(cells)
	if err != nil {
		return err
	}
	c.Data(iv)
	s := c.S
	n := cells[0] + cells[1] + cells[2] + cells[3]
	b := c.Block(iv.Method + " interval for " + iv.Parameter + ", " + pct(iv.Level) + " " + iv.Side.String())
	b.Row("pairs", count(n), pairCells(cells))
	b.Row("estimate", s.num(iv.Estimate), iv.Parameter)
	intervalRows(s, b, iv)
	return nil
}

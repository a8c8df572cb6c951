package repl

import (
	"context"
	"slices"

	"github.com/kofnlab/kofn/test"
)

// versusMethods are the two-sample test words: Fisher's conditional test
// in its two-sided definitions and mid-p forms, the unconditional exact
// tests, then the large-sample tests (cmd_versus_asym.go).
var versusMethods = append([]string{"fisher", "boschloo", "barnard"},
	asymptoticTwoMethods...)

func versusCommand() *command {
	return &command{
		Name:    "versus",
		Group:   "tests",
		Summary: "test whether two groups' proportions differ (Fisher, Boschloo, Barnard)",
		Usage:   "versus K1/N1 K2/N2 [method=M] [rule=R] [midp=on] [alt=two-sided|lower|higher] [berger-boos=G]",
		Methods: versusMethods,
		Options: []opt{optMethod("test", versusMethods),
			{Name: "rule", Doc: "fisher: the two-sided rule: point-probability (default), central (twice the smaller tail) or blaker", Values: ruleWords},
			{Name: "midp", Doc: "fisher: on gives the mid-p test; off (default)", Values: onOffWords},
			optAlt("two-sided (default); higher: group 1's proportion is higher; lower: it is lower"),
			{Name: "berger-boos", Doc: "Boschloo and Barnard: restrict the nuisance supremum to a 1-G interval and add G (G in (0, 0.5), 0.001 is usual)"}},
		Help: helpText{
			Computes: "The p-value for H0: both groups share one success probability, from K1 of N1 and K2 of " +
				"N2. alt=higher claims group 1's proportion is higher. " + cautionSides,
			Methods: "fisher (default): Fisher's exact test conditional on the margins, two-sided by " +
				"rule=point-probability (default), central (doubles the smaller tail) or blaker; midp=on halves " +
				"the tables as likely as the one observed. boschloo: the unconditional exact test ordered by Fisher's p-value, uniformly more " +
				"powerful than Fisher's; barnard: the unconditional exact test ordered by the pooled z statistic. " +
				"The unconditional tests take the supremum over the common proportion and are limited to " +
				"N1 + N2 <= 2000000 (large balanced groups take seconds; Ctrl-C stops them). Two-sided Boschloo orders tables by Fisher's two-sided p-value; " +
				"some other software instead doubles the one-sided Boschloo p-value (1/1 against 0/1: 1 here, 0.5 " +
				"there), so compare one-sided values. An empty group, or no successes (no failures) in both groups, " +
				"gives p = 1 exactly." + asymptoticVersusHelp,
			Assumptions: "Two independent groups of independent trials.",
			Examples: []string{"versus 7/15 12/15 alt=lower", "versus 7/15 12/15 alt=lower method=barnard", "versus 7/15 12/15 rule=central midp=on",
				"versus 17/40 9/38 method=boschloo"},
			Sources: "Fisher RA (1935), The Design of Experiments; Boschloo RD (1970), Statistica Neerlandica " +
				"24:1-35; Barnard GA (1947), Biometrika 34:123-138; Mehta CR, Senchaudhuri P (2003), Conditional " +
				"versus unconditional exact tests for comparing two binomials; Berger RL, Boos DD (1994), JASA 89:1012-1016.",
		},
		Run: runVersus,
		Row: versusRow(),
	}
}

// twoCounts reads the two count pairs of a two-group command.
func twoCounts(a *argSet) (k1, n1, k2, n2 int64, err error) {
	if err = a.Want(2, 2); err != nil {
		return
	}
	if k1, n1, err = a.KN(0, "two counts K1/N1 K2/N2"); err != nil {
		return
	}
	k2, n2, err = a.KN(1, "two counts K1/N1 K2/N2")
	return
}

// versusSetup reads the options of versus and returns the test to run.
func versusSetup(c *call) (run func(ctx context.Context, k1, n1, k2, n2 int64) (test.Result, error), m, sideText string, err error) {
	a := c.Args
	if m, err = c.Method(); err != nil {
		return
	}
	alt, sideText, err := readAlt(a, test.TwoSided)
	if err != nil {
		return
	}
	if slices.Contains(asymptoticTwoMethods, m) {
		run = asymptoticVersus(m, alt)
		return
	}
	switch m {
	case "barnard", "boschloo":
		o := test.UnconditionalOptions{Alternative: alt}
		if o.BergerBoos, err = a.Prob("berger-boos", 0); err != nil {
			return
		}
		f := test.Boschloo
		if m == "barnard" {
			f = test.Barnard
		}
		run = func(ctx context.Context, k1, n1, k2, n2 int64) (test.Result, error) { return f(ctx, k1, n1, k2, n2, o) }
	default:
		o := test.FisherOptions{Alternative: alt}
		if o.Rule, o.MidP, err = readExact(a); err != nil {
			return
		}
		run = func(_ context.Context, k1, n1, k2, n2 int64) (test.Result, error) {
			return test.Fisher(k1, n1, k2, n2, o)
		}
	}
	return
}

func runVersus(c *call) error {
	a := c.Args
	k1, n1, k2, n2, err := twoCounts(a)
	if err != nil {
		return err
	}
	run, m, sideText, err := versusSetup(c)
	if err != nil {
		return err
	}
	r, err := run(c.Ctx, k1, n1, k2, n2)
	if err != nil {
		return err
	}
	c.Data(r)
	s := c.S
	b := c.Block(r.Method + " test of p1 = p2, " + sideText)
	b.Row("group 1", kn(k1, n1), "k/n = "+s.num(float64(k1)/float64(n1)))
	b.Row("group 2", kn(k2, n2), "k/n = "+s.num(float64(k2)/float64(n2)))
	b.Row("difference", s.num(r.Estimate), "p1 - p2")
	testRows(s, b, r, "")
	if m == "barnard" || m == "boschloo" {
		b.Row("nuisance", s.num(r.Nuisance.At), "common proportion where the p-value's supremum is attained")
	}
	return nil
}

// versusRow is the row form of versus for each.
func versusRow() *rowSpec {
	return &rowSpec{In: []string{"k1", "n1", "k2", "n2"}, Out: []string{"difference", "p_value"},
		prepare: func(c *call) (rowFunc, error) {
			run, _, _, err := versusSetup(c)
			return func(ctx context.Context, v []int64) ([]float64, error) {
				r, err := run(ctx, v[0], v[1], v[2], v[3])
				if err != nil {
					return nil, err
				}
				return []float64{r.Estimate, r.PValue}, nil
			}, err
		}}
}

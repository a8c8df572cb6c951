package repl

import (
	"context"
	"strings"

	"github.com/kofnlab/kofn/interval"
)

// intervalWord shortens a published interval name to a shell word.
func intervalWord(name string) string {
	return strings.ReplaceAll(methodWord(name), "-with-continuity-correction", "-cc")
}

var boundsMethods = enumWords(interval.MethodValues(), func(m interval.Method) string { return intervalWord(m.String()) })

var optBound = opt{Name: "bound", Doc: "two (default): both limits; lower: a lower bound only (at least ...); upper: an upper bound only (at most ...)", Values: []string{"two", "lower", "upper"}}

func boundsCommand() *command {
	return &command{
		Name:    "bounds",
		Group:   "intervals",
		Summary: "confidence interval for one proportion from K successes in N trials",
		Usage:   "bounds K/N [method=M] [level=L] [bound=two|lower|upper]",
		Methods: boundsMethods,
		Options: []opt{optMethod("interval method", boundsMethods), optLevel, optBound},
		Help: helpText{
			Computes: "A confidence interval for the success probability from K successes in N trials, with the " +
				"estimate K/N. bound=lower gives a one-sided lower bound (the proportion is at least ...), " +
				"bound=upper a one-sided upper bound (at most ...), each with the whole of 1 - level in one tail.",
			Methods: "wilson (default: the score interval, coverage close to nominal at every n; Newcombe 1998, " +
				"Brown, Cai and DasGupta 2001), wald (for comparison only: erratic coverage), wald-cc, wilson-cc, " +
				"agresti-coull, jeffreys, clopper-pearson (exact: coverage never below the level; the usual choice " +
				"for acceptance and safety claims), mid-p, blaker (exact, inside Clopper-Pearson), " +
				"likelihood-ratio, arcsine, logit. Limits of wald, wald-cc and agresti-coull that leave [0, 1] are " +
				"clipped, with a warning.",
			Assumptions: "Independent trials with one common success probability.",
			Examples: []string{"bounds 17/40", "bounds 81/263 method=clopper-pearson", "bounds 0/20 method=jeffreys",
				"bounds 4/20 method=clopper-pearson level=90%", "bounds 0/299 bound=upper method=clopper-pearson"},
			Sources: "Newcombe RG (1998), Two-sided confidence intervals for the single proportion: comparison of " +
				"seven methods, Statistics in Medicine 17:857-872; Brown LD, Cai TT, DasGupta A (2001), Interval " +
				"estimation for a binomial proportion, Statistical Science 16:101-133; Clopper CJ, Pearson ES (1934); " +
				"Wilson EB (1927); Blaker H (2000).",
		},
		Run: runBounds,
		Row: boundsRow(),
	}
}

// boundSide reads bound= as an interval side.
func boundSide(a *argSet) (interval.Side, error) {
	w, err := a.Choice("bound", "two", "two", "lower", "upper")
	return map[string]interval.Side{"two": interval.TwoSided, "lower": interval.LowerBound, "upper": interval.UpperBound}[w], err
}

// boundsSetup reads the options of bounds.
func boundsSetup(c *call) (o interval.Options, err error) {
	m, err := c.Method()
	if err != nil {
		return
	}
	o.Method = enumValue[interval.Method](boundsMethods, m)
	if o.Level, err = c.Level(); err != nil {
		return
	}
	o.Side, err = boundSide(c.Args)
	return
}

func runBounds(c *call) error {
	a := c.Args
	if err := a.Want(1, 1); err != nil {
		return err
	}
	k, n, err := a.KN(0, "a count K/N")
	if err != nil {
		return err
	}
	o, err := boundsSetup(c)
	if err != nil {
		return err
	}
	iv, err := interval.Proportion(k, n, o)
	if err != nil {
		return err
	}
	c.Data(iv)
	b := c.Block(iv.Method + " interval for " + iv.Parameter + ", " + pct(iv.Level) + " " + iv.Side.String())
	b.Row("observed", kn(k, n), "k/n = "+c.S.num(iv.Estimate))
	intervalRows(c.S, b, iv)
	return nil
}

// intervalRows writes the limits, width and warnings of an interval.
func intervalRows(s *Session, b *block, iv interval.Interval) {
	switch iv.Side {
	case interval.LowerBound:
		b.Row("lower bound", s.num(iv.Lower), iv.Parameter+" is at least this")
	case interval.UpperBound:
		b.Row("upper bound", s.num(iv.Upper), iv.Parameter+" is at most this")
	default:
		b.Row("interval", s.num(iv.Lower)+" to "+s.num(iv.Upper))
		b.Row("width", s.num(iv.Width()))
	}
	b.Warn(iv.Warnings...)
}

// boundsRow is the row form of bounds for each.
func boundsRow() *rowSpec {
	return &rowSpec{In: []string{"k", "n"}, Out: []string{"estimate", "lower", "upper"},
		prepare: func(c *call) (rowFunc, error) {
			o, err := boundsSetup(c)
			return func(_ context.Context, v []int64) ([]float64, error) {
				iv, err := interval.Proportion(v[0], v[1], o)
				if err != nil {
					return nil, err
				}
				return []float64{iv.Estimate, iv.Lower, iv.Upper}, nil
			}, err
		}}
}

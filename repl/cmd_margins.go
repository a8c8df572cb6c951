package repl

import (
	"strings"

	"github.com/kofnlab/kofn/test"
)

var marginTestMethods = enumWords(test.MarginMethodValues(), func(m test.MarginMethod) string { return m.String() })

// marginMethodsHelp, marginAssumptions and marginSources are shared by
// noninf and equiv.
const (
	marginMethodsHelp = "miettinen-nurminen (default: the restricted variance times N/(N-1)), farrington-manning " +
		"(the restricted variance)."
	marginAssumptions = "Two independent groups of independent trials; large samples (the normal approximation " +
		"of the score statistic)."
	marginSources = "Miettinen O, Nurminen M (1985), Statistics in Medicine 4:213-226; Farrington CP, Manning G " +
		"(1990), Statistics in Medicine 9:1447-1454."
)

const marginCaution = "Margin tests steer regulatory and clinical decisions: fix the margin, the method and the " +
	"analysis set in advance with a qualified statistician and the applicable guidance, not from this output."

func noninfCommand() *command {
	return &command{
		Name:    "noninf",
		Group:   "tests",
		Summary: "margin test of two groups: non-inferiority or superiority by a margin on p1 - p2 or p1/p2",
		Usage:   "noninf K1/N1 K2/N2 (margin=M | diff=D | ratio=R) [alt=higher|lower|two-sided] [method=M]",
		Methods: marginTestMethods,
		Options: []opt{{Name: "margin", Doc: "the non-inferiority margin m > 0 on p1 - p2: with alt=higher (default, higher proportions better) the null value is -m, with alt=lower (lower is better, as for error rates) it is +m"},
			{Name: "diff", Doc: "the null value of p1 - p2, in (-1, 1): -0.1 for non-inferiority within 0.1"},
			{Name: "ratio", Doc: "the null value of p1/p2, above 0: 0.8 for non-inferiority within 80%"},
			optAlt("higher (default): H1 says p1 - p2 (or p1/p2) is above the null value; lower: below; two-sided: differs"),
			optMethod("score variance", marginTestMethods)},
		Help: helpText{
			Computes: "The score test of H0: p1 - p2 = D (or p1/p2 = R) for K1 of N1 against K2 of N2. " +
				"margin=m states non-inferiority directly: group 1 is not worse than group 2 by m or more. With " +
				"higher proportions better (alt=higher, the default) that is diff=-m (H0: p1 - p2 <= -m); with " +
				"lower proportions better (alt=lower, error rates) diff=m (H0: p1 - p2 >= m). Superiority by m is " +
				"diff=m with alt=higher. " + marginCaution,
			Methods:     marginMethodsHelp,
			Assumptions: marginAssumptions,
			Examples: []string{"noninf 170/200 178/200 margin=0.1", "noninf 170/200 178/200 diff=-0.1",
				"noninf 170/200 178/200 ratio=0.9", "noninf 60/80 45/80 diff=0.05", "noninf 12/400 10/400 margin=0.02 alt=lower"},
			Sources: marginSources,
		},
		Run: runNoninf,
	}
}

func equivCommand() *command {
	return &command{
		Name:    "equiv",
		Group:   "tests",
		Summary: "equivalence of two groups: is p1 - p2 (or p1/p2) inside a stated range? (two one-sided tests)",
		Usage:   "equiv K1/N1 K2/N2 (margin=M | lo=LO hi=HI | diff=LO..HI | ratio=LO..HI) [method=M]",
		Methods: marginTestMethods,
		Options: []opt{{Name: "margin", Doc: "the equivalence margin m > 0: the range -m..m of p1 - p2"},
			{Name: "lo", Doc: "the lower end of the equivalence range of p1 - p2, with hi="},
			{Name: "hi", Doc: "the upper end of the equivalence range of p1 - p2, with lo="},
			{Name: "diff", Doc: "the equivalence range of p1 - p2, like -0.1..0.1"},
			{Name: "ratio", Doc: "the equivalence range of p1/p2, like 0.8..1.25"},
			optMethod("score variance", marginTestMethods)},
		Help: helpText{
			Computes: "Two one-sided score tests (Schuirmann 1987) of H0: p1 - p2 outside (LO, HI) against H1: " +
				"inside; the p-value is the larger of the two, and equivalence is shown at level alpha when it is " +
				"below alpha. The range of p1 - p2 is given as margin=m (-m to m), as lo= and hi=, or as " +
				"diff=LO..HI; a range of p1/p2 as ratio=LO..HI. " + marginCaution,
			Methods:     marginMethodsHelp,
			Assumptions: marginAssumptions,
			Examples: []string{"equiv 170/200 178/200 margin=0.1", "equiv 170/200 178/200 lo=-0.05 hi=0.1",
				"equiv 170/200 178/200 diff=-0.1..0.1", "equiv 170/200 178/200 ratio=0.8..1.25"},
			Sources: marginSources + " Schuirmann DJ (1987), Journal of Pharmacokinetics and Biopharmaceutics 15:657-680.",
		},
		Run: runEquiv,
	}
}

// marginScale reads the one way the null value or range is given -
// margin=, diff=, ratio=, or (equiv) lo= with hi= - and returns its scale
// ("margin", "diff", "ratio" or "lo"), the option word and its raw value.
func marginScale(a *argSet) (string, string, error) {
	var given []string
	for _, name := range []string{"margin", "diff", "ratio", "lo", "hi"} {
		if a.cmd.option(name) != nil && a.Has(name) {
			given = append(given, name)
		}
	}
	switch {
	case len(given) == 2 && given[0] == "lo" && given[1] == "hi":
		return "lo", "", nil
	case len(given) == 1 && (given[0] == "lo" || given[0] == "hi"):
		return "", "", &InputError{Token: given[0] + "=" + a.Str(given[0], ""), Reason: "needs its partner: give both lo= and hi="}
	case len(given) > 1:
		return "", "", inputErr(given[1]+"="+a.Str(given[1], ""), "cannot be combined with "+given[0]+"=; state the margin one way")
	case len(given) == 1:
		return given[0], a.Str(given[0], ""), nil
	}
	ways := "margin=, diff= or ratio="
	if a.cmd.option("lo") != nil {
		ways = "margin=, lo= and hi=, diff= or ratio="
	}
	return "", "", &InputError{Token: a.cmd.Name, Reason: "needs " + ways + "; usage: " + a.cmd.Usage}
}

func runNoninf(c *call) error {
	a := c.Args
	k1, n1, k2, n2, err := twoCounts(a)
	if err != nil {
		return err
	}
	scale, raw, err := marginScale(a)
	if err != nil {
		return err
	}
	null, err := parseFloat(raw)
	if err != nil {
		return inputErr(scale+"="+raw, reasonOf(err))
	}
	m, err := c.Method()
	if err != nil {
		return err
	}
	alt, _, err := readAlt(a, test.Higher)
	if err != nil {
		return err
	}
	if scale == "margin" {
		switch {
		case !(null > 0 && null < 1):
			return inputErr("margin="+raw, "must lie strictly between 0 and 1: the largest difference p1 - p2 that still counts as not worse")
		case alt == test.TwoSided:
			return inputErr("alt=two-sided", "does not go with margin=, which is one-sided; use alt=higher (higher is better) or alt=lower, or diff=")
		case alt == test.Higher:
			null = -null
		}
		scale = "diff"
	}
	o := test.MarginOptions{Method: enumValue[test.MarginMethod](marginTestMethods, m), Alternative: alt}
	var r test.Result
	param := "p1 - p2"
	if scale == "diff" {
		r, err = test.DifferenceMargin(k1, n1, k2, n2, null, o)
	} else {
		param = "p1 / p2"
		r, err = test.RatioMargin(k1, n1, k2, n2, null, o)
	}
	if err != nil {
		return err
	}
	c.Data(r)
	claim := map[test.Alternative]string{test.TwoSided: param + " differs from " + in(null), test.Higher: param + " above " + in(null), test.Lower: param + " below " + in(null)}[alt]
	marginBlock(c, r, k1, n1, k2, n2, param, "H1: "+claim)
	return nil
}

func runEquiv(c *call) error {
	a := c.Args
	k1, n1, k2, n2, err := twoCounts(a)
	if err != nil {
		return err
	}
	scale, raw, err := marginScale(a)
	if err != nil {
		return err
	}
	var lo, hi float64
	switch scale {
	case "margin":
		m, err := parseFloat(raw)
		if err != nil || !(m > 0 && m < 1) {
			return inputErr("margin="+raw, "must be a number strictly between 0 and 1: the range is -margin to margin")
		}
		lo, hi, scale = -m, m, "diff"
	case "lo":
		if lo, err = a.Float("lo", 0); err != nil {
			return err
		}
		if hi, err = a.Float("hi", 0); err != nil {
			return err
		}
		if lo >= hi {
			return inputErr("hi="+a.Str("hi", ""), "is not above lo="+a.Str("lo", "")+"; the range is empty")
		}
		scale = "diff"
	default:
		word := scale + "=" + raw
		los, his, ok := strings.Cut(raw, "..")
		if !ok {
			return inputErr(word, "is not a range; write low..high, like -0.1..0.1")
		}
		if lo, err = parseFloat(los); err != nil {
			return inputErr(word, "starts with "+los+", which "+reasonOf(err))
		}
		if hi, err = parseFloat(his); err != nil {
			return inputErr(word, "ends with "+his+", which "+reasonOf(err))
		}
		if lo >= hi {
			return inputErr(word, "is an empty range; write low..high")
		}
	}
	m, err := c.Method()
	if err != nil {
		return err
	}
	o := test.MarginOptions{Method: enumValue[test.MarginMethod](marginTestMethods, m)}
	var r test.Result
	param := "p1 - p2"
	if scale == "diff" {
		r, err = test.DifferenceEquivalence(k1, n1, k2, n2, lo, hi, o)
	} else {
		param = "p1 / p2"
		r, err = test.RatioEquivalence(k1, n1, k2, n2, lo, hi, o)
	}
	if err != nil {
		return err
	}
	c.Data(r)
	marginBlock(c, r, k1, n1, k2, n2, param, "H1: "+in(lo)+" < "+param+" < "+in(hi)+" (two one-sided tests)")
	return nil
}

// marginBlock prints a margin or equivalence test.
func marginBlock(c *call, r test.Result, k1, n1, k2, n2 int64, param, claim string) {
	s := c.S
	b := c.Block(r.Method + " score test, " + claim)
	b.Row("group 1", kn(k1, n1), "k/n = "+s.num(float64(k1)/float64(n1)))
	b.Row("group 2", kn(k2, n2), "k/n = "+s.num(float64(k2)/float64(n2)))
	b.Row("estimate", s.num(r.Estimate), param)
	b.Row("p-value", s.logNum(r.LogPValue))
	b.Row("statistic", r.Statistic.Name+" = "+s.stat(r.Statistic.Value), "at the null value "+in(r.Null))
	b.Warn(r.Warnings...)
}

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
		Usage:   "noninf K1/N1 K2/N2 (diff=D | ratio=R) [side=high|low|two] [method=M]",
		Methods: marginTestMethods,
		Options: []opt{{Name: "diff", Doc: "the null value of p1 - p2, in (-1, 1): -0.1 for non-inferiority within 0.1"},
			{Name: "ratio", Doc: "the null value of p1/p2, above 0: 0.8 for non-inferiority within 80%"},
			{Name: "side", Doc: "high (default): H1 says p1 - p2 (or p1/p2) is above the null value; low: below; two: differs", Values: sideWords},
			optMethod("score variance", marginTestMethods)},
		Help: helpText{
			Computes: "The score test of H0: p1 - p2 = D (or p1/p2 = R) for K1 of N1 against K2 of N2. With " +
				"higher proportions better, non-inferiority of group 1 within a margin m is side=high with " +
				"diff=-m (H0: p1 - p2 <= -m); superiority by m is side=high with diff=m. " + marginCaution,
			Methods:     marginMethodsHelp,
			Assumptions: marginAssumptions,
			Examples:    []string{"noninf 170/200 178/200 diff=-0.1", "noninf 170/200 178/200 ratio=0.9", "noninf 60/80 45/80 diff=0.05"},
			Sources:     marginSources,
		},
		Run: runNoninf,
	}
}

func equivCommand() *command {
	return &command{
		Name:    "equiv",
		Group:   "tests",
		Summary: "equivalence of two groups: is p1 - p2 (or p1/p2) inside a stated range? (two one-sided tests)",
		Usage:   "equiv K1/N1 K2/N2 (diff=LO..HI | ratio=LO..HI) [method=M]",
		Methods: marginTestMethods,
		Options: []opt{{Name: "diff", Doc: "the equivalence range of p1 - p2, like -0.1..0.1"},
			{Name: "ratio", Doc: "the equivalence range of p1/p2, like 0.8..1.25"},
			optMethod("score variance", marginTestMethods)},
		Help: helpText{
			Computes: "Two one-sided score tests (Schuirmann 1987) of H0: p1 - p2 outside (LO, HI) against H1: " +
				"inside; the p-value is the larger of the two, and equivalence is shown at level alpha when it is " +
				"below alpha. " + marginCaution,
			Methods:     marginMethodsHelp,
			Assumptions: marginAssumptions,
			Examples:    []string{"equiv 170/200 178/200 diff=-0.1..0.1", "equiv 170/200 178/200 ratio=0.8..1.25"},
			Sources:     marginSources + " Schuirmann DJ (1987), Journal of Pharmacokinetics and Biopharmaceutics 15:657-680.",
		},
		Run: runEquiv,
	}
}

// marginScale reads diff= or ratio= (exactly one) and returns its word,
// option word and raw value.
func marginScale(a *argSet) (string, string, error) {
	switch {
	case a.Has("diff") && a.Has("ratio"):
		return "", "", inputErr("ratio="+a.Str("ratio", ""), "cannot be combined with diff=; test one scale at a time")
	case a.Has("diff"):
		return "diff", a.Str("diff", ""), nil
	case a.Has("ratio"):
		return "ratio", a.Str("ratio", ""), nil
	}
	return "", "", &InputError{Token: a.cmd.Name, Reason: "needs diff= or ratio=; usage: " + a.cmd.Usage}
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
	w, err := a.Choice("side", "high", sideWords...)
	if err != nil {
		return err
	}
	alt := map[string]test.Alternative{"two": test.TwoSided, "high": test.Higher, "low": test.Lower}[w]
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
	claim := map[string]string{"two": param + " differs from " + in(null), "high": param + " above " + in(null), "low": param + " below " + in(null)}[w]
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
	word := scale + "=" + raw
	los, his, ok := strings.Cut(raw, "..")
	if !ok {
		return inputErr(word, "is not a range; write low..high, like -0.1..0.1")
	}
	lo, err := parseFloat(los)
	if err != nil {
		return inputErr(word, "starts with "+los+", which "+reasonOf(err))
	}
	hi, err := parseFloat(his)
	if err != nil {
		return inputErr(word, "ends with "+his+", which "+reasonOf(err))
	}
	if lo >= hi {
		return inputErr(word, "is an empty range; write low..high")
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

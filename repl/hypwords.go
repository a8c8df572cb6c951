package repl

import (
	"github.com/kofnlab/kofn/test"
)

// The words of a test's hypothesis, shared by every test and planning
// command, read from the package's lists of values: alt= takes
// test.AlternativeValues (two-sided, lower, higher), rule= takes
// test.TwoSidedRuleValues (point-probability, central, blaker) and midp=
// turns on the mid-p form of an exact test.
var (
	altWords   = enumWords(test.AlternativeValues(), test.Alternative.String)
	ruleWords  = enumWords(test.TwoSidedRuleValues(), test.TwoSidedRule.String)
	onOffWords = []string{"off", "on"}
)

// cautionSides is the warning on every help page with alt=.
const cautionSides = "alt=lower or alt=higher is honest only when the direction was fixed before the data were seen."

// optAlt documents alt= with the default word first.
func optAlt(doc string) opt { return opt{Name: "alt", Doc: doc, Values: altWords} }

var (
	optRule = opt{Name: "rule", Doc: "exact tests: how the two-sided p-value is made: point-probability (default; the outcomes no more likely than the one observed), central (twice the smaller tail) or blaker", Values: ruleWords}
	optMidP = opt{Name: "midp", Doc: "exact tests: on counts the outcomes as likely as the one observed by half (mid-p; closer to the nominal size, but not guaranteed to keep it); off (default)", Values: onOffWords}
)

// readAlt reads alt= (default def) and returns the alternative and the
// words for a title: "two-sided", "one-sided, lower" or "one-sided, higher".
func readAlt(a *argSet, def test.Alternative) (test.Alternative, string, error) {
	w, err := a.Choice("alt", def.String(), altWords...)
	if err != nil {
		return 0, "", err
	}
	alt := enumValue[test.Alternative](altWords, w)
	if alt == test.TwoSided {
		return alt, "two-sided", nil
	}
	return alt, "one-sided, " + w, nil
}

// readExact reads rule= and midp= of an exact test.
func readExact(a *argSet) (rule test.TwoSidedRule, midp bool, err error) {
	w, err := a.Choice("rule", ruleWords[0], ruleWords...)
	if err != nil {
		return 0, false, err
	}
	m, err := a.Choice("midp", "off", onOffWords...)
	return enumValue[test.TwoSidedRule](ruleWords, w), m == "on", err
}

// renamedOptions maps option words of earlier versions of the shell to
// today's, for the hint of an unknown option.
var renamedOptions = map[string]string{
	"side": "alt=two-sided|lower|higher",
	"conf": "level=L",
	"yn":   "p12=P",
	"ny":   "p21=P",
}

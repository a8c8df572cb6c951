package power

import (
	"github.com/kofnlab/kofn/internal/onesample"
	"github.com/kofnlab/kofn/test"
)

// oneTest is the one-sample exact test of p0 that test.Binomial runs with
// the same alternative, two-sided rule and mid-p choice.
func oneTest(p0 float64, alt test.Alternative, rule test.TwoSidedRule, midP bool) onesample.Test {
	return onesample.Test{P0: p0, Alternative: alt, Rule: rule, MidP: midP}
}

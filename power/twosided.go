package power

import (
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/onesample"
)

// TwoSidedMethod selects how the exact one-sample test (and the exact
// conditional McNemar test) forms a two-sided p-value; the definitions are
// those of the test package (internal/onesample). The zero value,
// PointProbability, is the default: it is the usual "exact binomial test"
// (the total probability of the outcomes no more likely than the observed
// one) and is more powerful than doubling the smaller tail.
type TwoSidedMethod int

const (
	// PointProbability sums the probabilities of all outcomes no more
	// likely than the observed one under H0 (relative tolerance 1e-7).
	PointProbability TwoSidedMethod = iota
	// Central doubles the smaller one-sided p-value (capped at 1): the
	// test whose inversion is the Clopper-Pearson interval.
	Central
	// Blaker is Blaker's (2000) acceptability: the observed smaller tail
	// plus the largest opposite tail not exceeding it.
	Blaker
)

var twoSidedNames = [...]string{"point-probability", "central", "blaker"}

// String returns "point-probability", "central" or "blaker".
func (m TwoSidedMethod) String() string {
	if m < 0 || int(m) >= len(twoSidedNames) {
		return "TwoSidedMethod(" + argerr.Format(int(m)) + ")"
	}
	return twoSidedNames[m]
}

// ParseTwoSidedMethod converts "point-probability", "central" or
// "blaker" (case insensitive; "minlike" is accepted for the first).
func ParseTwoSidedMethod(s string) (TwoSidedMethod, error) {
	if equalFold(s, "minlike") {
		return PointProbability, nil
	}
	for i, n := range twoSidedNames {
		if equalFold(s, n) {
			return TwoSidedMethod(i), nil
		}
	}
	return 0, argerr.Invalid("power.ParseTwoSidedMethod", "s", s, `is not a two-sided method; use "point-probability", "central" or "blaker"`)
}

// oneTest maps a power alternative and method to the onesample test.
func oneTest(p0 float64, alt Alternative, m TwoSidedMethod, mid bool) onesample.Test {
	t := onesample.Test{P0: p0, Mid: mid}
	switch alt {
	case Greater:
		t.Alternative = onesample.Greater
	case Less:
		t.Alternative = onesample.Less
	default:
		t.Alternative = onesample.TwoSided
	}
	switch m {
	case Central:
		t.Method = onesample.Central
	case Blaker:
		t.Method = onesample.Blaker
	default:
		t.Method = onesample.PointProbability
	}
	return t
}

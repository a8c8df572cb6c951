package power

import (
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/test"
)

// Alternative is the direction of the alternative hypothesis. It is the
// test package's type, so one value serves both the plan and the analysis
// it plans for. The zero value, TwoSided, is the default because a
// two-sided test is what most protocols and reviewers expect unless a
// one-sided question was fixed in advance.
type Alternative = test.Alternative

// The alternatives, as in package test.
const (
	// TwoSided: the parameter differs from its null value in either direction.
	TwoSided = test.TwoSided
	// Greater: the parameter exceeds its null value (p > p0, p1 - p2 > margin).
	Greater = test.Greater
	// Less: the parameter falls below its null value (p < p0, p1 - p2 < margin).
	Less = test.Less
)

// ParseAlternative converts "two-sided", "greater" or "less" (case
// insensitive) to an Alternative; it is test.ParseAlternative.
func ParseAlternative(s string) (Alternative, error) { return test.ParseAlternative(s) }

func checkAlternative(fn string, a Alternative) error {
	switch a {
	case TwoSided, Greater, Less:
		return nil
	}
	return argerr.Invalid(fn, "Alternative", int(a), "is not a defined Alternative")
}

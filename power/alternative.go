package power

import (
	"strings"

	"github.com/kofnlab/kofn/internal/argerr"
)

// Alternative is the direction of the alternative hypothesis of a test.
// The zero value, TwoSided, is the default because a two-sided test is what
// most protocols and reviewers expect unless a one-sided question was fixed
// in advance.
type Alternative int

const (
	// TwoSided: the parameter differs from its null value in either direction.
	TwoSided Alternative = iota
	// Greater: the parameter exceeds its null value (p > p0, p1 - p2 > margin).
	Greater
	// Less: the parameter falls below its null value (p < p0, p1 - p2 < margin).
	Less
)

var alternativeNames = [...]string{"two-sided", "greater", "less"}

// String returns "two-sided", "greater" or "less" ("Alternative(n)" for an
// undefined value).
func (a Alternative) String() string {
	if a < 0 || int(a) >= len(alternativeNames) {
		return "Alternative(" + argerr.Format(int(a)) + ")"
	}
	return alternativeNames[a]
}

// ParseAlternative converts "two-sided", "greater" or "less" (case
// insensitive; "twosided", "two", "upper" and "lower" are accepted too) to
// an Alternative.
func ParseAlternative(s string) (Alternative, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "two-sided", "twosided", "two":
		return TwoSided, nil
	case "greater", "upper":
		return Greater, nil
	case "less", "lower":
		return Less, nil
	}
	return 0, argerr.Invalid("power.ParseAlternative", "s", s, `is not an alternative; use "two-sided", "greater" or "less"`)
}

func (a Alternative) valid() bool { return a >= TwoSided && a <= Less }

func checkAlternative(fn string, a Alternative) error {
	if !a.valid() {
		return argerr.Invalid(fn, "Alternative", int(a), "is not a defined Alternative")
	}
	return nil
}

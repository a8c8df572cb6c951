// Package hyp defines the words of a hypothesis test that every kofn
// package shares: the alternative hypothesis and the rule that makes a
// two-sided p-value from a discrete distribution. The test package
// re-exports both types (test.Alternative, test.TwoSidedRule) with their
// constants; internal packages below test use them from here, so there is
// one type for each idea.
package hyp

import "github.com/kofnlab/kofn/internal/enum"

// Alternative is the alternative hypothesis of a test, about a tested
// quantity (a proportion, a difference, a ratio) and its null value. The
// zero value, TwoSided, is the default because a one-sided test is only
// honest when its direction was fixed before the data were seen.
type Alternative int

// The alternatives; their text forms are "two-sided", "lower" and
// "higher", the words of the shell and of the JSON schema.
const (
	TwoSided Alternative = iota // the quantity differs from its null value
	Lower                       // the quantity is below its null value
	Higher                      // the quantity is above its null value
)

var altNames = enum.New[Alternative]("test.Alternative",
	[]string{"two-sided", "lower", "higher"},
	map[string]Alternative{"two": TwoSided, "both": TwoSided})

// String returns "two-sided", "lower" or "higher".
func (a Alternative) String() string { return altNames.String(a) }

// MarshalText encodes the alternative by its String form.
func (a Alternative) MarshalText() ([]byte, error) { return altNames.MarshalText(a) }

// UnmarshalText decodes any spelling ParseAlternative accepts.
func (a *Alternative) UnmarshalText(b []byte) error { return altNames.UnmarshalText(a, b) }

// Check reports an invalid alternative as argument arg of fn.
func (a Alternative) Check(fn, arg string) error { return altNames.Check(fn, arg, a) }

// ParseAlternative returns the alternative named s: "two-sided" (also
// "two" or "both"), "lower" or "higher", ignoring case.
func ParseAlternative(fn, s string) (Alternative, error) { return altNames.Parse(fn, s) }

// Alternatives lists the alternatives in order.
func Alternatives() []Alternative { return altNames.Values() }

// TwoSidedRule is how an exact test on a discrete, possibly asymmetric,
// null distribution turns "as or more extreme" into a two-sided p-value.
// The zero value, PointProbability, is the default: it is the usual
// definition of the exact binomial and Fisher tests (the outcomes no more
// probable than the observed one) and is more powerful than doubling the
// smaller tail.
type TwoSidedRule int

// The two-sided rules.
const (
	// PointProbability: the total probability of the outcomes whose
	// probability is at most the observed one's, compared with a relative
	// tolerance of 1e-7 (common practice). Inverts to Sterne's interval.
	PointProbability TwoSidedRule = iota
	// Central: twice the smaller one-sided p-value, capped at 1. Inverts
	// to the equal-tailed (Clopper-Pearson) interval.
	Central
	// Blaker: the observed smaller tail plus the largest opposite tail
	// not exceeding it (Blaker 2000, Canadian Journal of Statistics
	// 28:783-798). Inverts to Blaker's nested interval.
	Blaker
)

var ruleNames = enum.New[TwoSidedRule]("test.TwoSidedRule",
	[]string{"point-probability", "central", "Blaker"}, nil)

// String returns "point-probability", "central" or "Blaker".
func (r TwoSidedRule) String() string { return ruleNames.String(r) }

// MarshalText encodes the rule by its String form.
func (r TwoSidedRule) MarshalText() ([]byte, error) { return ruleNames.MarshalText(r) }

// UnmarshalText decodes any spelling ParseTwoSidedRule accepts.
func (r *TwoSidedRule) UnmarshalText(b []byte) error { return ruleNames.UnmarshalText(r, b) }

// Check reports an invalid rule as argument arg of fn.
func (r TwoSidedRule) Check(fn, arg string) error { return ruleNames.Check(fn, arg, r) }

// ParseTwoSidedRule returns the rule named s, ignoring case.
func ParseTwoSidedRule(fn, s string) (TwoSidedRule, error) { return ruleNames.Parse(fn, s) }

// TwoSidedRules lists the rules in order.
func TwoSidedRules() []TwoSidedRule { return ruleNames.Values() }

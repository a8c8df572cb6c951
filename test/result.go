package test

import (
	"math"
	"strings"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
)

// Alternative is the alternative hypothesis of a test. The zero value,
// TwoSided, is the default because a one-sided test is only honest when
// the direction was fixed before the data were seen.
type Alternative int

// The alternatives. For one sample the tested quantity is the proportion P
// against p0; for two samples it is p1 - p2 (or p1/p2) against its null
// value; for paired data it is p12 - p21, the difference of the discordant
// cell probabilities.
const (
	TwoSided Alternative = iota // the quantity differs from its null value
	Less                        // the quantity is below its null value
	Greater                     // the quantity is above its null value
)

// String returns "two-sided", "less" or "greater".
func (a Alternative) String() string {
	switch a {
	case TwoSided:
		return "two-sided"
	case Less:
		return "less"
	case Greater:
		return "greater"
	}
	return "Alternative(" + argerr.Format(int(a)) + ")"
}

// MarshalText encodes the alternative by its name.
func (a Alternative) MarshalText() ([]byte, error) { return []byte(a.String()), nil }

// UnmarshalText decodes a name accepted by ParseAlternative.
func (a *Alternative) UnmarshalText(b []byte) error {
	v, err := ParseAlternative(string(b))
	if err != nil {
		return err
	}
	*a = v
	return nil
}

// ParseAlternative returns the alternative named s: "two-sided", "less" or
// "greater" (case-insensitive; other spellings are not accepted,
// to keep one spelling).
func ParseAlternative(s string) (Alternative, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "two-sided":
		return TwoSided, nil
	case "less":
		return Less, nil
	case "greater":
		return Greater, nil
	}
	return TwoSided, argerr.Invalid("test.ParseAlternative", "s", s, "is not an alternative; use two-sided, less or greater")
}

// checkAlt validates an alternative for function fn.
func checkAlt(fn string, a Alternative) error {
	if a < TwoSided || a > Greater {
		return argerr.Invalid(fn, "alternative", int(a), "is not two-sided, less or greater")
	}
	return nil
}

// Interval is a confidence interval that inverts a test: the set of null
// values the test does not reject at level 1 - Level (closed, [Lower,
// Upper]). For a one-sided test one end is the end of the parameter range.
type Interval struct {
	Lower float64 // lower bound
	Upper float64 // upper bound
	Level float64 // confidence level, e.g. 0.95
}

// Contains reports whether x lies in [Lower, Upper].
func (iv Interval) Contains(x float64) bool { return x >= iv.Lower && x <= iv.Upper }

// Result is the outcome of a hypothesis test.
type Result struct {
	// Method is the published name of the test and of its two-sided
	// definition, e.g. "Fisher point-probability" or "Barnard".
	Method string
	// Alternative is the alternative hypothesis tested.
	Alternative Alternative
	// Statistic is the test statistic; StatisticName says which (for
	// example "k", "z", "chi-square", "G2", "x12").
	Statistic     float64
	StatisticName string
	// PValue is the p-value, in [0, 1]; it is 0 where it underflows.
	PValue float64
	// LogPValue is ln PValue, finite and accurate where PValue underflows
	// (-Inf only when the p-value is exactly 0).
	LogPValue float64
	// Estimate is the estimate of the tested quantity (k/n, p1 - p2,
	// p1/p2, the conditional odds ratio estimate, ...): see each function.
	Estimate float64
	// Null is the null value of the tested quantity (p0, a margin, 0 or 1).
	Null float64
	// Interval is the confidence interval that inverts the same test, when
	// the function computes one; nil otherwise.
	Interval *Interval `json:",omitempty"`
	// Nuisance is, for the unconditional exact tests, the common
	// proportion at which the supremum of the p-value over the nuisance
	// parameter is attained; NaN for other tests.
	Nuisance float64
	// Warnings lists conditions that do not stop the answer but weaken it
	// (small expected counts for a normal approximation, a degenerate
	// table, a mid-p value that may exceed the nominal size, ...).
	Warnings []string `json:",omitempty"`
}

// MarshalJSON encodes the result with non-finite floats as strings
// ("+Inf", "-Inf", "NaN").
func (r Result) MarshalJSON() ([]byte, error) {
	type plain Result // drops the method, avoiding recursion
	return jsonfloat.Marshal(plain(r))
}

// newResult fills the p-value fields from a log p-value.
func newResult(method string, alt Alternative, logP float64) Result {
	if logP > 0 {
		logP = 0
	}
	return Result{Method: method, Alternative: alt, LogPValue: logP, PValue: math.Exp(logP), Nuisance: math.NaN()}
}

// level validates a confidence level (0 means 0.95).
func level(fn string, l float64) (float64, error) {
	if l == 0 {
		return 0.95, nil
	}
	if !(l > 0 && l < 1) {
		return 0, argerr.Invalid(fn, "level", l, "must lie strictly between 0 and 1 (0 means 0.95)")
	}
	return l, nil
}

package test

import (
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/hyp"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/interval"
)

// Alternative is the alternative hypothesis of a test (one type for every
// kofn package; defined in internal/hyp). The zero value, TwoSided, is the
// default because a one-sided test is only honest when its direction was
// fixed before the data were seen. Its text forms, "two-sided", "lower" and
// "higher", are the shell's words and the JSON schema's.
type Alternative = hyp.Alternative

// The alternatives. For one sample the tested quantity is the proportion P
// against p0; for two samples it is p1 - p2 (or p1/p2) against its null
// value; for paired data it is p12 - p21, the difference of the discordant
// cell probabilities.
const (
	TwoSided = hyp.TwoSided // the quantity differs from its null value
	Lower    = hyp.Lower    // the quantity is below its null value
	Higher   = hyp.Higher   // the quantity is above its null value
)

// ParseAlternative returns the alternative named s: "two-sided" (also
// "two" or "both"), "lower" or "higher", ignoring case.
func ParseAlternative(s string) (Alternative, error) {
	return hyp.ParseAlternative("test.ParseAlternative", s)
}

// AlternativeValues lists the alternatives in order.
func AlternativeValues() []Alternative { return hyp.Alternatives() }

// TwoSidedRule is how an exact test on a discrete null distribution forms
// a two-sided p-value (one type for the one-sample exact test, Fisher's
// test and the power functions; defined in internal/hyp). The zero value,
// PointProbability, is the default: it is the usual definition of the
// exact binomial and Fisher tests and is more powerful than doubling the
// smaller tail. One-sided tests ignore it.
type TwoSidedRule = hyp.TwoSidedRule

// The two-sided rules: see the package comment, "Two-sided p-values".
const (
	PointProbability = hyp.PointProbability // outcomes no more probable than the observed one (Sterne's interval)
	Central          = hyp.Central          // twice the smaller tail, capped at 1 (Clopper-Pearson)
	Blaker           = hyp.Blaker           // Blaker's (2000) acceptability (Blaker's interval)
)

// ParseTwoSidedRule returns the rule named s ("point-probability",
// "central" or "Blaker"), ignoring case.
func ParseTwoSidedRule(s string) (TwoSidedRule, error) {
	return hyp.ParseTwoSidedRule("test.ParseTwoSidedRule", s)
}

// TwoSidedRuleValues lists the two-sided rules in order.
func TwoSidedRuleValues() []TwoSidedRule { return hyp.TwoSidedRules() }

// checkAlt validates an alternative for function fn.
func checkAlt(fn string, a Alternative) error { return a.Check(fn, "Alternative") }

// Statistic is a test statistic with its name.
type Statistic struct {
	// Name says which statistic: "k", "x1", "n12", "z", "chi-square",
	// "G2", ... (see each function).
	Name string `json:"name"`
	// Value is the statistic's value for the data.
	Value float64 `json:"value"`
}

// Nuisance describes the supremum over the nuisance parameter of an
// unconditional exact test.
type Nuisance struct {
	// At is the common proportion at which the supremum of the p-value
	// over the nuisance parameter is attained, in [0, 1].
	At float64 `json:"at"`
}

// Result is the outcome of a hypothesis test. Its JSON form is the
// project's schema (README, "JSON schema"): the method, the alternative,
// the null value and the estimate, the statistic with its name, the
// p-value and its logarithm, then the interval, the nuisance location and
// warnings where they apply.
type Result struct {
	// Method is the published name of the test and of its two-sided
	// rule, e.g. "Fisher point-probability" or "Barnard".
	Method string `json:"method"`
	// Alternative is the alternative hypothesis tested.
	Alternative Alternative `json:"alternative"`
	// Null is the null value of the tested quantity (p0, a margin, 0 or 1).
	Null float64 `json:"null"`
	// Estimate is the estimate of the tested quantity (k/n, p1 - p2,
	// p1/p2, ...): see each function. It is NaN, with a warning, where the
	// data do not define it (an empty sample).
	Estimate float64 `json:"estimate"`
	// Statistic is the test statistic and its name.
	Statistic Statistic `json:"statistic"`
	// PValue is the p-value, in [0, 1]; it is 0 where it underflows.
	PValue float64 `json:"p_value"`
	// LogPValue is ln PValue, finite and accurate where PValue underflows
	// (-Inf only when the p-value is exactly 0).
	LogPValue float64 `json:"log_p_value"`
	// Interval is the confidence interval that inverts the same test, when
	// the function computes one; nil otherwise.
	Interval *interval.Interval `json:"interval,omitempty"`
	// Nuisance is set by the unconditional exact tests (Barnard,
	// Boschloo) only; nil otherwise.
	Nuisance *Nuisance `json:"nuisance,omitempty"`
	// Warnings lists conditions that do not stop the answer but weaken it
	// (small expected counts for a normal approximation, a degenerate
	// table, a mid-p value that may exceed the nominal size, ...).
	Warnings []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the result with non-finite floats as the strings
// "+Inf", "-Inf" and "NaN".
func (r Result) MarshalJSON() ([]byte, error) {
	type plain Result // drops the method, avoiding recursion
	return jsonfloat.Marshal(plain(r))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (r *Result) UnmarshalJSON(b []byte) error {
	type plain Result
	return jsonfloat.Unmarshal(b, (*plain)(r))
}

// newResult fills the p-value fields from a log p-value.
func newResult(method string, alt Alternative, logP float64) Result {
	if logP > 0 {
		logP = 0
	}
	return Result{Method: method, Alternative: alt, LogPValue: logP, PValue: math.Exp(logP)}
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

// invertedInterval returns the confidence interval [lo, hi] that inverts a
// test against alternative alt at confidence level lvl: two-sided for a
// two-sided test, an upper bound for a lower alternative (the quantity is
// below its null value: the interval is [start of range, hi]) and a lower
// bound for a higher one.
func invertedInterval(lo, hi, est, lvl float64, alt Alternative, method, param string) *interval.Interval {
	side := interval.TwoSided
	switch alt {
	case Lower:
		side = interval.UpperBound
	case Higher:
		side = interval.LowerBound
	}
	return &interval.Interval{Lower: lo, Upper: hi, Estimate: est, Level: lvl, Side: side, Method: method, Parameter: param}
}

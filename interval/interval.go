package interval

import (
	"github.com/kofnlab/kofn/internal/enum"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"gonum.org/v1/gonum/mathext"
)

// Interval is a confidence interval with the estimate it surrounds and what
// a reader needs to trust it.
//
// For a two-sided interval both Lower and Upper are computed, each with
// tail probability (1 - Level)/2. A one-sided interval computes one bound at
// tail probability 1 - Level and sets the other to the end of the
// parameter's range: 0 or 1 for a proportion, -1 or 1 for a difference, 0
// or +Inf for a ratio or an odds ratio.
type Interval struct {
	Lower    float64 `json:"lower"`    // lower confidence limit
	Upper    float64 `json:"upper"`    // upper confidence limit
	Estimate float64 `json:"estimate"` // point estimate (k/n, p1 - p2, p1/p2, odds ratio, ...); see Parameter
	Level    float64 `json:"level"`    // requested confidence level, in (0, 1)
	Side     Side    `json:"side"`     // two-sided, lower bound only or upper bound only
	// Method is the published name of the method, as its String() gives it.
	Method string `json:"method"`
	// Parameter names what the interval is for: "p", "p1 - p2", "p1 / p2",
	// "odds ratio", "paired p1 - p2" or "discordant ratio n12 / n21".
	Parameter string `json:"parameter"`
	// Prior is the Beta prior of a credible interval (Credible and the
	// credible intervals for two arms); nil for a confidence interval.
	Prior *Prior `json:"prior,omitempty"`
	// Clipped reports that a limit of an approximate method fell outside
	// the parameter's range and was moved to its end (a Warning says which).
	Clipped bool `json:"clipped"`
	// Warnings lists things that do not stop the answer but that a reader
	// should know: clipping, a zero-width interval, an undefined estimate,
	// a boundary convention that replaced the method's own formula.
	Warnings []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the interval with non-finite values (an infinite
// upper limit of a ratio, an undefined estimate) as "+Inf", "-Inf", "NaN".
func (iv Interval) MarshalJSON() ([]byte, error) {
	type plain Interval
	return jsonfloat.Marshal(plain(iv))
}

// UnmarshalJSON decodes what MarshalJSON writes, non-finite numbers
// included.
func (iv *Interval) UnmarshalJSON(b []byte) error {
	type plain Interval
	return jsonfloat.Unmarshal(b, (*plain)(iv))
}

// Width returns Upper - Lower (+Inf for an unbounded ratio interval).
func (iv Interval) Width() float64 { return iv.Upper - iv.Lower }

// Contains reports whether x lies in the closed interval [Lower, Upper].
func (iv Interval) Contains(x float64) bool { return x >= iv.Lower && x <= iv.Upper }

func (iv *Interval) warn(msg string) { iv.Warnings = append(iv.Warnings, msg) }

// Side says which limits an interval has.
type Side int

const (
	// TwoSided computes both limits, each with tail probability (1-Level)/2.
	// It is the zero value because a two-sided interval is what a report of
	// an estimate's precision normally shows.
	TwoSided Side = iota
	// LowerBound computes only the lower limit, with tail probability
	// 1-Level; the upper limit is the end of the range ("at least ...").
	LowerBound
	// UpperBound computes only the upper limit, with tail probability
	// 1-Level; the lower limit is the start of the range ("at most ...").
	UpperBound
)

var sideNames = enum.New[Side]("interval.Side", []string{"two-sided", "lower bound", "upper bound"},
	map[string]Side{"two": TwoSided, "lowerbound": LowerBound, "upperbound": UpperBound})

// String returns "two-sided", "lower bound" or "upper bound".
func (s Side) String() string { return sideNames.String(s) }

// MarshalText encodes the side by its String form.
func (s Side) MarshalText() ([]byte, error) { return sideNames.MarshalText(s) }

// UnmarshalText decodes any spelling ParseSide accepts.
func (s *Side) UnmarshalText(b []byte) error { return sideNames.UnmarshalText(s, b) }

// ParseSide accepts the String forms case-insensitively (with '-' or '_'
// for the space), and "two" for two-sided. "lower" and "upper" alone are
// not accepted: the alternative hypothesis uses "lower" for the opposite
// direction (a test against a lower alternative has only an upper bound).
func ParseSide(s string) (Side, error) { return sideNames.Parse("interval.ParseSide", s) }

// SideValues lists the sides in order.
func SideValues() []Side { return sideNames.Values() }

// level holds the validated confidence level and the tail probability and
// normal quantile each computed limit uses.
type level struct {
	level float64 // confidence level in (0, 1)
	side  Side
	tail  float64 // tail probability per computed limit: (1-level)/2 or 1-level
	z     float64 // upper tail quantile of the standard normal at tail
}

// newLevel validates level and side for function fn; lev = 0 means 0.95.
func newLevel(fn string, lev float64, side Side) (level, error) {
	if lev == 0 {
		lev = 0.95
	}
	if !(lev > 0 && lev < 1) {
		return level{}, argerr.Invalid(fn, "Level", lev, "must lie strictly between 0 and 1 (0 means 0.95)")
	}
	if side < TwoSided || side > UpperBound {
		return level{}, argerr.Invalid(fn, "Side", int(side), "is not a side; use TwoSided, LowerBound or UpperBound")
	}
	if side != TwoSided && lev < 0.5 {
		return level{}, argerr.Invalid(fn, "Level", lev, "is below 0.5; a one-sided bound at such a level lies on the far side of the estimate")
	}
	a := 1 - lev
	if side == TwoSided {
		a /= 2
	}
	return level{level: lev, side: side, tail: a, z: -mathext.NormalQuantile(a)}, nil
}

// wantLower and wantUpper report which limits the side asks for.
func (l level) wantLower() bool { return l.side != UpperBound }
func (l level) wantUpper() bool { return l.side != LowerBound }

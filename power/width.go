package power

import (
	"context"
	"errors"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/internal/root"
	"github.com/kofnlab/kofn/interval"
)

// WidthOptions configures the interval-width planning functions. The zero
// value means: the interval package's default method (Wilson) at its
// default level (95%, two-sided), assurance 0.80, search limit
// DefaultMaxWidthN.
type WidthOptions struct {
	// Interval selects the interval method and level (interval.Options;
	// Side must be two-sided).
	Interval interval.Options
	// Assurance is the required probability that the half-width is at most
	// halfWidth (AssuranceN), in (0, 1); 0 means 0.80.
	Assurance float64
	// MaxN bounds the search; 0 means DefaultMaxWidthN, at most MaxWidthN.
	MaxN int64
}

// DefaultMaxWidthN and MaxWidthN bound the interval-width searches (each n
// costs one interval per likely count, O(sqrt n) intervals).
const (
	DefaultMaxWidthN int64 = 1_000_000
	MaxWidthN        int64 = 1 << 40
)

// WidthPlan is the result of ExpectedWidthN or AssuranceN.
type WidthPlan struct {
	// Method is the interval method's name.
	Method string `json:"method"`
	// N is the planned number of trials.
	N int64 `json:"n"`
	// Value is the expected half-width at N (ExpectedWidthN) or the
	// probability that the half-width is at most halfWidth (AssuranceN); Previous
	// is the same at N - 1 (0, and omitted from JSON, when N = 1).
	Value    float64 `json:"value"`
	Previous float64 `json:"previous,omitempty"`
	// Checked lists the (n, value) pairs evaluated by the search, for
	// plotting.
	Checked []Point `json:"checked"`
	// Warnings lists caveats that do not stop the answer.
	Warnings []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the result with non-finite floats as strings.
func (r WidthPlan) MarshalJSON() ([]byte, error) {
	type plain WidthPlan
	return jsonfloat.Marshal(plain(r))
}

// UnmarshalJSON decodes what MarshalJSON writes, non-finite numbers
// included.
func (r *WidthPlan) UnmarshalJSON(b []byte) error {
	type plain WidthPlan
	return jsonfloat.Unmarshal(b, (*plain)(r))
}

// halfWidths evaluates, over the counts k that carry probability (the
// pmfWindow of Binomial(n, p)), the sum of P(X = k) g(half-width(k)).
// ctx is checked every 16 intervals (each a bounded number of tail
// evaluations). Memory: the window, 8 bytes per likely count
// (about 17 standard deviations' worth: 75 MB at n = MaxWidthN, p = 1/2).
func halfWidthSum(ctx context.Context, fn string, n int64, p float64, opt interval.Options, g func(float64) float64) (float64, error) {
	lo, w := pmfWindow(n, p, nil)
	s := 0.0
	for i, b := range w {
		if i&15 == 15 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return 0, err
			}
		}
		iv, err := interval.Proportion(lo+int64(i), n, opt)
		if err != nil {
			return 0, err
		}
		s += b * g((iv.Upper-iv.Lower)/2)
	}
	return s, nil
}

func (o WidthOptions) check(fn string, p, halfWidth float64) (int64, error) {
	if err := argerr.OpenProb(fn, "p", p); err != nil {
		return 0, err
	}
	if !(halfWidth > 0 && halfWidth < 0.5) {
		return 0, argerr.Invalid(fn, "halfWidth", halfWidth, "must lie in (0, 0.5)")
	}
	if o.Interval.Side != interval.TwoSided {
		return 0, argerr.Invalid(fn, "Interval.Side", o.Interval.Side.String(), "must be two-sided for a half-width")
	}
	if _, err := interval.Proportion(0, 1, o.Interval); err != nil {
		return 0, asOption(fn, "Interval.", err)
	}
	return maxN(fn, o.MaxN, DefaultMaxWidthN, MaxWidthN)
}

// asOption restates an error about an option that another package's
// function rejected as fn's error about that option (its name prefixed,
// for example "Interval.Level"), keeping the value, the reason and the
// sentinel.
func asOption(fn, prefix string, err error) error {
	var e *argerr.Error
	if !errors.As(err, &e) {
		return err
	}
	c := *e
	c.Func = fn
	if c.Arg != "" {
		c.Arg = prefix + c.Arg
	}
	return &c
}

// searchN finds the smallest n in [1, limit] with ok(n) by doubling and
// bisection, recording every evaluation; it assumes ok is monotone, which
// the averaging over counts makes true up to the small ripples the
// documentation of each caller describes.
func searchN(ctx context.Context, fn string, limit int64, val func(int64) (float64, error), ok func(float64) bool) (int64, []Point, error) {
	var pts []Point
	var ferr error
	test := func(n int64) bool {
		if ferr != nil {
			return true
		}
		if err := argerr.Canceled(fn, ctx); err != nil {
			ferr = err
			return true
		}
		v, err := val(n)
		if err != nil {
			ferr = err
			return true
		}
		pts = append(pts, Point{X: float64(n), Y: v})
		return ok(v)
	}
	hi := int64(1)
	for !test(hi) {
		if hi >= limit {
			return 0, pts, argerr.NoSolution(fn, "no n up to MaxN = "+argerr.Format(limit)+" meets the target")
		}
		hi = min(2*hi, limit)
	}
	if ferr != nil {
		return 0, pts, ferr
	}
	n := root.SmallestInt(test, hi/2+1, hi)
	if ferr != nil {
		return 0, pts, ferr
	}
	return n, pts, nil
}

// ExpectedWidthN returns the smallest n whose expected half-width of the
// chosen two-sided interval, at the planning proportion p, is at most halfWidth:
//
//	E[(U(X) - L(X))/2] = sum_k P(X = k) (U(k) - L(k))/2,  X ~ Binomial(n, p),
//
// with the limits from interval.Proportion (the sum runs over the counts
// within the probability window of pmfWindow). The expected half-width
// falls with n but, for exact methods, with small ripples; the search
// (doubling then bisection) treats it as monotone, and the result reports
// the value at N and at N - 1 so the ripple can be seen. Domain:
// 0 < p < 1, 0 < halfWidth < 0.5. Cost: one interval per likely count at each n
// tried, O(sqrt(n)) intervals (minutes for the exact methods near
// MaxWidthN); ctx is checked every 16 intervals. Memory: 8 bytes per
// likely count of the largest n tried (about 75 MB at MaxWidthN, p = 1/2).
func ExpectedWidthN(ctx context.Context, p, halfWidth float64, o WidthOptions) (WidthPlan, error) {
	const fn = "power.ExpectedWidthN"
	limit, err := o.check(fn, p, halfWidth)
	if err != nil {
		return WidthPlan{}, err
	}
	val := func(n int64) (float64, error) {
		return halfWidthSum(ctx, fn, n, p, o.Interval, func(h float64) float64 { return h })
	}
	return widthPlan(ctx, fn, limit, o, val, func(v float64) bool { return v <= halfWidth })
}

// AssuranceN returns the smallest n for which the half-width of the
// chosen two-sided interval is at most halfWidth with probability at least
// o.Assurance (default 0.80) at the planning proportion p:
//
//	P( (U(X) - L(X))/2 <= halfWidth ) >= assurance,  X ~ Binomial(n, p).
//
// The probability jumps as counts enter or leave the set of narrow
// enough intervals, so it is a sawtooth; the search treats it as monotone
// (doubling then bisection) and reports the value at N - 1 beside the one
// at N. Domain, cost, cancellation and memory as ExpectedWidthN.
func AssuranceN(ctx context.Context, p, halfWidth float64, o WidthOptions) (WidthPlan, error) {
	const fn = "power.AssuranceN"
	limit, err := o.check(fn, p, halfWidth)
	if err != nil {
		return WidthPlan{}, err
	}
	as := orDefault(o.Assurance, 0.80)
	if err := checkLevel(fn, "Assurance", as); err != nil {
		return WidthPlan{}, err
	}
	val := func(n int64) (float64, error) {
		return halfWidthSum(ctx, fn, n, p, o.Interval, func(h float64) float64 {
			if h <= halfWidth {
				return 1
			}
			return 0
		})
	}
	return widthPlan(ctx, fn, limit, o, val, func(v float64) bool { return v >= as })
}

func widthPlan(ctx context.Context, fn string, limit int64, o WidthOptions, val func(int64) (float64, error), ok func(float64) bool) (WidthPlan, error) {
	n, pts, err := searchN(ctx, fn, limit, val, ok)
	if err != nil {
		return WidthPlan{}, err
	}
	r := WidthPlan{Method: o.Interval.Method.String(), N: n, Checked: pts}
	if r.Value, err = val(n); err != nil {
		return WidthPlan{}, err
	}
	if n > 1 {
		if r.Previous, err = val(n - 1); err != nil {
			return WidthPlan{}, err
		}
	}
	return r, nil
}

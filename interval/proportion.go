package interval

import (
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
)

// Options configures Proportion. The zero value asks for a two-sided 95%
// Wilson interval.
type Options struct {
	// Level is the confidence level in (0, 1); 0 means 0.95.
	Level float64
	// Method is the interval method; the zero value is Wilson.
	Method Method
	// Side selects a two-sided interval (the zero value) or a one-sided
	// bound.
	Side Side
}

// flags record what happened while computing limits, turned into Warnings
// by Proportion.
type flags uint8

const (
	clipLow   flags = 1 << iota // the lower limit fell below 0 and was set to 0
	clipHigh                    // the upper limit fell above 1 and was set to 1
	exactEnd                    // logit: the Clopper-Pearson limit replaced an undefined one at k = 0 or n
	zeroWidth                   // Wald: zero-width interval at k = 0 or k = n
)

// Proportion returns a confidence interval for a binomial proportion p
// from k successes in n trials, with Estimate k/n.
//
// Boundary conventions (all methods):
//   - k = 0: the lower limit is 0 and k = n: the upper limit is 1, exactly,
//     for every method except Wald, whose formula gives the zero-width
//     interval [0, 0] (or [1, 1]); a warning says so.
//   - One-sided exact bounds at the ends are in closed form: with tail
//     probability a = 1 - Level, Clopper-Pearson gives the upper bound
//     1 - a^(1/n) at k = 0 (and the lower bound a^(1/n) at k = n); the
//     two-sided interval uses a = (1-Level)/2.
//   - Wald, Wald with continuity correction and Agresti-Coull limits that
//     fall outside [0, 1] are clipped to it, with Clipped set and a
//     warning; the arcsine interval clips the angle to [0, pi/2] the same
//     way. No other method can leave [0, 1].
//   - Logit is undefined at k = 0 and k = n; there the finite limit is the
//     Clopper-Pearson one, with a warning.
//
// Accuracy: the closed-form limits (Wald, Wald with cc, Wilson, Wilson with
// cc, Agresti-Coull, arcsine, logit) are computed without cancellation, to
// a few units in the last place. The limits found by root finding
// (Clopper-Pearson, mid-p, Jeffreys, Blaker, likelihood ratio) are searched
// on the log-odds scale to a relative tolerance of 1e-15, so that p and
// 1-p are both held to full precision, and agree with mpmath at 50 digits
// to 1e-13 relative for n up to 1e12 (testdata/interval_mpmath.tsv,
// testdata/interval_cp_wilson.tsv). Binomial tails come from package binom
// (1e-13 relative for n up to 1e12); Jeffreys uses a real-parameter
// incomplete beta in log space with Loader's (2000) saddle-point prefactor
// and, above the mean, a positive series, so that a small upper tail is
// never taken from a continued fraction in the rounded 1 - p.
//
// Cost: O(1) for the closed forms; a bounded number of tail evaluations for
// the root-found limits (Blaker's about 90 evaluations of the shared
// acceptability test). Measured times are in the README's speed table
// (go test -run '^$' -bench . ./interval).
//
// Errors: k < 0, k > n, n = 0, n > 2^53, Level outside (0, 1) or NaN (or
// below 0.5 for a one-sided bound, which would lie on the far side of the
// estimate), an unknown Method or Side give a typed *Error naming the
// argument.
func Proportion(k, n int64, opt Options) (Interval, error) {
	const fn = "interval.Proportion"
	if err := checkKN(fn, "k", "n", k, n); err != nil {
		return Interval{}, err
	}
	lv, err := newLevel(fn, opt.Level, opt.Side)
	if err != nil {
		return Interval{}, err
	}
	if opt.Method < 0 || opt.Method >= numMethods {
		return Interval{}, argerr.Invalid(fn, "Method", int(opt.Method), "is not a method; see the Method constants")
	}
	lo, hi, fl := limits(opt.Method, k, n, lv)
	iv := Interval{
		Lower: lo, Upper: hi, Estimate: float64(k) / float64(n),
		Level: lv.level, Side: lv.side, Method: opt.Method.String(), Parameter: "p",
	}
	iv.flagWarnings(fl, opt.Method)
	return iv, nil
}

// checkKN validates a count pair for a proportion: 0 <= k <= n, 1 <= n <= 2^53.
func checkKN(fn, kArg, nArg string, k, n int64) error {
	if err := argerr.KN(fn, kArg, nArg, k, n); err != nil {
		return err
	}
	if n == 0 {
		return argerr.Invalid(fn, nArg, n, "is 0; a proportion needs at least one trial")
	}
	if n > binom.MaxN {
		return argerr.TooLarge(fn, nArg, n, "exceeds 2^53, the largest count held exactly in float64")
	}
	return nil
}

func (iv *Interval) flagWarnings(fl flags, m Method) {
	if fl&(clipLow|clipHigh) != 0 {
		iv.Clipped = true
	}
	if fl&clipLow != 0 {
		iv.warn(m.String() + ": the lower limit fell below 0 and was clipped to 0")
	}
	if fl&clipHigh != 0 {
		iv.warn(m.String() + ": the upper limit fell above 1 and was clipped to 1")
	}
	if fl&exactEnd != 0 {
		iv.warn("logit: undefined at k = 0 or k = n; the Clopper-Pearson limit is used there")
	}
	if fl&zeroWidth != 0 {
		iv.warn("Wald: zero-width interval at k = 0 or k = n; its coverage there is 0 for every p inside (0, 1), use another method")
	}
}

// limits computes the interval limits of method m; the side's missing limit
// is 0 or 1. Arguments are valid.
func limits(m Method, k, n int64, lv level) (lo, hi float64, fl flags) {
	switch m {
	case Wald, WaldCC, AgrestiCoull:
		lo, hi = waldType(m, k, n, lv.z)
		if lo < 0 {
			lo, fl = 0, fl|clipLow
		}
		if hi > 1 {
			hi, fl = 1, fl|clipHigh
		}
		if m == Wald && (k == 0 || k == n) {
			fl |= zeroWidth
		}
	case Wilson:
		lo, hi = wilsonLower(k, n, lv.z), wilsonUpper(k, n, lv.z)
	case WilsonCC:
		lo, hi = wilsonCCLower(k, n, lv.z), wilsonCCUpper(k, n, lv.z)
	case Arcsine:
		lo, hi, fl = arcsine(k, n, lv.z)
	case Logit:
		lo, hi, fl = logit(k, n, lv)
	default:
		if lv.wantLower() {
			lo = exactLower(m, k, n, lv)
		}
		if lv.wantUpper() {
			hi = exactUpper(m, k, n, lv)
		}
	}
	// The side's missing limit; clipping flags of the dropped side do not count.
	if !lv.wantLower() {
		lo, fl = 0, fl&^clipLow
	}
	if !lv.wantUpper() {
		hi, fl = 1, fl&^clipHigh
	}
	return lo, hi, fl
}

// waldType returns the unclipped Wald, Wald-cc or Agresti-Coull limits.
func waldType(m Method, k, n int64, z float64) (lo, hi float64) {
	fk, fn := float64(k), float64(n)
	switch m {
	case AgrestiCoull:
		nt := fn + z*z
		pt := (fk + z*z/2) / nt
		h := z * math.Sqrt(pt*(1-pt)/nt)
		return pt - h, pt + h
	case WaldCC:
		p := fk / fn
		h := z*math.Sqrt(fk*(fn-fk)/fn)/fn + 0.5/fn
		return p - h, p + h
	default:
		p := fk / fn
		h := z * math.Sqrt(fk*(fn-fk)/fn) / fn
		return p - h, p + h
	}
}

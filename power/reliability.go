package power

import (
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/internal/root"
)

// Demonstration is the test plan that demonstrates a reliability.
type Demonstration struct {
	// Trials is the smallest number of trials n such that observing at
	// most Failures failures demonstrates Reliability at confidence Level:
	// P(X <= Failures; n, 1 - Reliability) <= 1 - Level.
	Trials int64 `json:"trials"`
	// Failures is the number of failures the plan allows.
	Failures int64 `json:"failures"`
	// Reliability and Level are the requested reliability and confidence
	// level.
	Reliability float64 `json:"reliability"`
	Level       float64 `json:"level"`
	// AchievedLevel is 1 - P(X <= Failures; Trials, 1 - Reliability), at
	// least Level.
	AchievedLevel float64 `json:"achieved_level"`
	// PreviousLevel is the confidence level Trials - 1 trials would give
	// (below Level; 0 when Trials - 1 <= Failures).
	PreviousLevel float64 `json:"previous_level"`
}

// MarshalJSON encodes the result with non-finite floats as strings.
func (r Demonstration) MarshalJSON() ([]byte, error) {
	type plain Demonstration
	return jsonfloat.Marshal(plain(r))
}

// UnmarshalJSON decodes what MarshalJSON writes, non-finite numbers
// included.
func (r *Demonstration) UnmarshalJSON(b []byte) error {
	type plain Demonstration
	return jsonfloat.Unmarshal(b, (*plain)(r))
}

// MaxDemonstrationTrials bounds DemonstrationTrials: 2^50 trials.
const MaxDemonstrationTrials int64 = 1 << 50

// DemonstrationTrials returns the number of trials needed to demonstrate
// a reliability at confidence level level when at most failures failures
// are allowed, by the exact binomial criterion
//
//	smallest n with  P(X <= failures; n, 1 - reliability) <= 1 - level.
//
// For failures = 0 this is the success-run formula n = ceil(ln(1 - level) /
// ln reliability) (common practice; e.g. reliability 0.99 at level 0.95 gives 299, and 298
// trials give only 0.94996), which the search confirms exactly. The
// probability decreases in n, so the search (doubling then bisection on
// log tails from binom) is O(log n) tail evaluations. Domain: 0 < reliability < 1,
// 0 < level < 1, failures >= 0; ErrTooLarge when n would exceed
// MaxDemonstrationTrials.
func DemonstrationTrials(failures int64, reliability, level float64) (Demonstration, error) {
	r, c := reliability, level
	const fn = "power.DemonstrationTrials"
	if err := argerr.OpenProb(fn, "reliability", r); err != nil {
		return Demonstration{}, err
	}
	if err := checkLevel(fn, "level", c); err != nil {
		return Demonstration{}, err
	}
	if err := argerr.Count(fn, "failures", failures); err != nil {
		return Demonstration{}, err
	}
	// More trials than failures are always needed, so a failure count at
	// or beyond the limit is refused before any search (and lo + 1 below
	// cannot overflow).
	if failures >= MaxDemonstrationTrials {
		return Demonstration{}, argerr.TooLarge(fn, "failures", failures, "needs more than 2^50 trials (MaxDemonstrationTrials)")
	}
	q := 1 - r
	lt := math.Log1p(-c) // ln(1 - c)
	// Decided on the reported confidence itself, so the plan never shows a
	// confidence a rounding below c.
	ok := func(n int64) bool {
		return -math.Expm1(binom.Dist{N: n, P: q}.LogCDF(failures)) >= c
	}
	// The zero-failure formula gives a lower bound for any failures.
	guess := ceilN(lt / math.Log(r))
	if guess > MaxDemonstrationTrials {
		return Demonstration{}, argerr.TooLarge(fn, "reliability", r, "needs more than 2^50 trials at this confidence")
	}
	lo := guess - 1
	if lo < failures {
		lo = failures
	}
	hi := lo + 1
	for !ok(hi) {
		lo = hi
		hi = 2 * hi
		if hi > MaxDemonstrationTrials {
			if !ok(MaxDemonstrationTrials) {
				return Demonstration{}, argerr.TooLarge(fn, "failures", failures, "needs more than 2^50 trials at this reliability and confidence")
			}
			hi = MaxDemonstrationTrials
		}
	}
	n := root.SmallestInt(ok, lo, hi)
	res := Demonstration{Trials: n, Failures: failures, Reliability: r, Level: c}
	res.AchievedLevel = -math.Expm1(binom.Dist{N: n, P: q}.LogCDF(failures))
	if n-1 > failures {
		res.PreviousLevel = -math.Expm1(binom.Dist{N: n - 1, P: q}.LogCDF(failures))
	}
	return res, nil
}

// DemonstratedReliability returns the exact lower confidence bound on
// reliability after failures failures in n trials, one-sided at
// confidence level level: R_L = 1 - q_U, where q_U is the Clopper-Pearson upper
// bound on the failure probability,
//
//	P(X <= failures; n, q_U) = 1 - level   (q_U = 1 when failures = n).
//
// For failures = 0 the closed form R_L = (1 - level)^(1/n) is used (e.g. 30
// trials, no failures, 90%: 0.10^(1/30) = 0.9261, common practice); the
// one-sided 95% upper bound 1 - 0.05^(1/n) on the failure rate is what the
// rule of three, 3/n, approximates (Hanley and Lippman-Hand 1983). Other
// counts are solved by Brent's method on the log CDF to 1e-14 relative.
// Domain: n >= 1, 0 <= failures <= n, 0 < level < 1.
func DemonstratedReliability(n, failures int64, level float64) (float64, error) {
	c := level
	const fn = "power.DemonstratedReliability"
	if n < 1 {
		return 0, argerr.Invalid(fn, "n", n, "must be at least 1")
	}
	if err := argerr.KN(fn, "failures", "n", failures, n); err != nil {
		return 0, err
	}
	if n > binom.MaxN {
		return 0, argerr.TooLarge(fn, "n", n, "exceeds 2^53")
	}
	if err := checkLevel(fn, "level", c); err != nil {
		return 0, err
	}
	if failures == n {
		return 0, nil
	}
	lt := math.Log1p(-c)
	if failures == 0 {
		return math.Exp(lt / float64(n)), nil
	}
	// f(q) = ln P(X <= failures; n, q) - ln(1-c) decreases in q from 0 - lt > 0.
	f := func(q float64) float64 { return binom.Dist{N: n, P: q}.LogCDF(failures) - lt }
	// f(0) = -ln(1-c) > 0; just below 1 the log CDF is finite and far below ln(1-c).
	qu, err := root.Brent(f, 0, math.Nextafter(1, 0), 1e-14, 0)
	if err != nil {
		return 0, argerr.NoSolution(fn, "the bound could not be bracketed: "+err.Error())
	}
	return 1 - qu, nil
}

package power

import (
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/test"
	"gonum.org/v1/gonum/mathext"
)

// Defaults used when an options field is left at its zero value.
const (
	// DefaultAlpha is the significance level used when Alpha is 0.
	DefaultAlpha = 0.05
	// DefaultPower is the target power used when Power is 0.
	DefaultPower = 0.80
)

// orDefault returns v, or def when v is 0.
func orDefault(v, def float64) float64 {
	if v == 0 {
		return def
	}
	return v
}

// alphaPower applies the defaults to a significance level and a target
// power and checks both lie in (0, 1).
func alphaPower(fn string, alpha, pw float64) (float64, float64, error) {
	alpha, pw = orDefault(alpha, DefaultAlpha), orDefault(pw, DefaultPower)
	if err := checkLevel(fn, "Alpha", alpha); err != nil {
		return 0, 0, err
	}
	if err := checkLevel(fn, "Power", pw); err != nil {
		return 0, 0, err
	}
	return alpha, pw, nil
}

// checkLevel checks that v (a significance level, power, confidence or
// target probability) lies strictly inside (0, 1).
func checkLevel(fn, arg string, v float64) error {
	return argerr.OpenProb(fn, arg, v)
}

// zq returns the standard normal quantile Phi^{-1}(p) for 0 < p < 1
// (gonum's mathext.NormalQuantile, Wichura's AS 241, about 1e-16 relative).
func zq(p float64) float64 { return mathext.NormalQuantile(p) }

// phi returns the standard normal CDF Phi(x), accurate in the lower tail
// (erfc keeps full relative accuracy for x << 0).
func phi(x float64) float64 { return 0.5 * math.Erfc(-x/math.Sqrt2) }

// zAlpha returns the critical normal quantile for level alpha under the
// alternative: z_{1-alpha/2} for two-sided tests, z_{1-alpha} otherwise.
func zAlpha(alpha float64, alt test.Alternative) float64 {
	if alt == test.TwoSided {
		return -zq(alpha / 2)
	}
	return -zq(alpha)
}

// maxRealN is the largest sample size the normal-approximation formulas
// report: 2^53, the largest count float64 holds exactly with all smaller
// ones. A larger size means an effect too small for any feasible study.
const maxRealN = 1 << 53

// ceilN rounds a real sample size up to an integer, treating values within
// 1e-9 relative (and at most 1e-6 absolute) of an integer as that integer
// (so 299.0000000001 computed from an exact 299 does not become 300, while
// 1e10 + 0.3 still rounds up), and never below 1. NaN, +Inf and sizes over
// maxRealN give maxRealN + 1; callers reject those with checkRealN.
func ceilN(x float64) int64 {
	if !(x <= maxRealN) {
		return maxRealN + 1
	}
	r := math.Round(x)
	if d := math.Abs(x - r); d <= 1e-9*math.Max(1, r) && d <= 1e-6 {
		x = r
	}
	n := int64(math.Ceil(x))
	if n < 1 {
		n = 1
	}
	return n
}

// checkRealN rejects a normal-approximation size that is undefined (NaN)
// or beyond maxRealN, instead of letting it round to a meaningless count.
func checkRealN(fn string, real float64) error {
	if math.IsNaN(real) {
		return argerr.NoSolution(fn, "the normal formula is undefined at these probabilities (the effect is below the resolution of float64)")
	}
	if !(real <= maxRealN) {
		return argerr.TooLarge(fn, "n", real, "exceeds 2^53: the effect is too small for any feasible study")
	}
	return nil
}

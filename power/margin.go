package power

import (
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
)

// MarginOfErrorN returns the common-practice number of trials for a Wald
// margin of error halfWidth at two-sided confidence level when the proportion is
// near p (use p = 0.5 for the worst case):
//
//	n = ceil( z_{(1+level)/2}^2 p (1-p) / halfWidth^2 ).
//
// Example (common practice): p = 0.5, halfWidth = 0.03, 95% gives n = 1068. The
// formula ignores the discreteness of k/n; PrecisionN gives the exact
// probability that k/n lands within halfWidth of p. Domain: 0 < p < 1, 0 < halfWidth < 1,
// 0 < level < 1. The result is at least 1 (a level so low that z rounds the
// formula to 0 still needs one trial).
func MarginOfErrorN(p, halfWidth, level float64) (int64, error) {
	const fn = "power.MarginOfErrorN"
	if err := argerr.OpenProb(fn, "p", p); err != nil {
		return 0, err
	}
	if err := argerr.OpenProb(fn, "halfWidth", halfWidth); err != nil {
		return 0, err
	}
	if err := checkLevel(fn, "level", level); err != nil {
		return 0, err
	}
	z := -zq((1 - level) / 2)
	n := z * z * p * (1 - p) / (halfWidth * halfWidth)
	if n > 1<<53 {
		return 0, argerr.TooLarge(fn, "halfWidth", halfWidth, "needs more than 2^53 trials")
	}
	return max(1, int64(math.Ceil(n))), nil
}

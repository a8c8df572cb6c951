package power

import (
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
)

// MarginOfErrorN returns the common-practice number of trials for a Wald
// margin of error d at two-sided confidence conf when the proportion is
// near p (use p = 0.5 for the worst case):
//
//	n = ceil( z_{(1+conf)/2}^2 p (1-p) / d^2 ).
//
// Example (common practice): p = 0.5, d = 0.03, 95% gives n = 1068. The
// formula ignores the discreteness of k/n; PrecisionN gives the exact
// probability that k/n lands within d of p. Domain: 0 < p < 1, 0 < d < 1,
// 0 < conf < 1.
func MarginOfErrorN(p, d, conf float64) (int64, error) {
	const fn = "power.MarginOfErrorN"
	if err := argerr.OpenProb(fn, "p", p); err != nil {
		return 0, err
	}
	if err := argerr.OpenProb(fn, "d", d); err != nil {
		return 0, err
	}
	if err := checkLevel(fn, "conf", conf); err != nil {
		return 0, err
	}
	z := -zq((1 - conf) / 2)
	n := z * z * p * (1 - p) / (d * d)
	if n > 1<<53 {
		return 0, argerr.TooLarge(fn, "d", d, "needs more than 2^53 trials")
	}
	return int64(math.Ceil(n)), nil
}

package interval

import (
	"math"

	"github.com/kofnlab/kofn/internal/onesample"
)

// blakerLowerT returns the log-odds of the lower limit of Blaker's (2000)
// interval, "Confidence curves and improved exact confidence intervals for
// discrete distributions", Canadian Journal of Statistics 28:783-798: the
// smallest p whose acceptability (the two-sided Blaker p-value of
// onesample.LogAcceptability) is at least alpha = 1 - Level.
//
// The acceptability lies between the observed tail P(X >= k) and twice
// it, so the limit lies between the two-sided Clopper-Pearson limit at the
// same level and the one-sided one at tail alpha; it is found there by
// Brent's method on ln(acceptability) - ln(alpha) in the log-odds; the
// acceptability is a step function of the opposite tail's index with
// continuous pieces, so the limit is found to 1e-15 relative whether it
// falls inside a piece or at a jump. The acceptability test is two-sided:
// one-sided Blaker bounds are the Clopper-Pearson ones.
func blakerLowerT(k, n int64, lv level) float64 {
	tcp := lowerT(ClopperPearson, k, n, lv)
	if lv.side != TwoSided {
		return tcp
	}
	la := math.Log(2 * lv.tail) // alpha = 1 - Level
	g := func(t float64) float64 {
		// The acceptability is symmetric, acc(k; p) = acc(n-k; 1-p); above
		// p = 1/2 it is evaluated at the accurately held 1-p.
		p, q := pq(t)
		v, err := onesample.LogAcceptability(k, n, p, false)
		if p > 0.5 {
			v, err = onesample.LogAcceptability(n-k, n, q, false)
		}
		if err != nil {
			return math.NaN()
		}
		return v - la
	}
	// The acceptability lies between the observed tail P(X >= k) and twice
	// it, so the limit lies between the two-sided Clopper-Pearson limit and
	// the one-sided one at tail alpha.
	one := lv
	one.side, one.tail = LowerBound, 2*lv.tail
	// At levels below 1/2 that one-sided limit passes k/n; the search stops
	// there (the acceptability is not monotone beyond the estimate).
	hi := math.Min(lowerT(ClopperPearson, k, n, one), logOdds(float64(k)/float64(n)))
	if hi <= tcp {
		return tcp
	}
	return rootIncreasing(g, tcp, hi, 1e-15)
}

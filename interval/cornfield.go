package interval

import (
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/xmath"
)

// conditional returns Fisher's noncentral hypergeometric distribution of
// k1 given the margins of the table (k1, n1-k1; k2, n2-k2), at odds ratio
// psi: total n1 + n2, successes k1 + k2, draws n1.
func conditional(k1, n1, k2, n2 int64, psi float64) binom.NoncentralHyper {
	return binom.NoncentralHyper{Total: n1 + n2, Successes: k1 + k2, Draws: n1, OddsRatio: psi}
}

// cornfield fills in the exact conditional limits of Cornfield (1956), "A
// statistical problem arising from retrospective studies", Proc. Third
// Berkeley Symposium 4:135-148: with X the first sample's count given the
// margins and a the tail probability,
//
//	lower psi_L:  P(X >= k1; psi_L) = a      (0 when k1 is the smallest possible)
//	upper psi_U:  P(X <= k1; psi_U) = a      (+Inf when k1 is the largest possible)
//
// and in the mid-p version P(X > k1) + P(X = k1)/2 = a, P(X < k1) + P(X = k1)/2 = a.
// Both tails are monotone in psi; the roots are found by Brent's method on
// ln psi to 1e-15 relative. The estimate is the conditional MLE.
func cornfield(iv *Interval, k1, n1, k2, n2 int64, lv level, midp bool) error {
	if err := checkConditional("interval.OddsRatio", k1, n1, k2, n2, "use OddsMiettinenNurminen, the score interval, which the exact conditional one approaches at these counts"); err != nil {
		return err
	}
	lo, hi := conditional(k1, n1, k2, n2, 1).Support()
	la := math.Log(lv.tail)
	a, b, c, d := float64(k1), float64(n1-k1), float64(k2), float64(n2-k2)
	guess := ((a + 0.5) * (d + 0.5)) / ((b + 0.5) * (c + 0.5))
	// ge returns ln P(X >= k1) (or its mid-p form) at psi; le the lower twin.
	ge := func(psi float64) float64 {
		x := conditional(k1, n1, k2, n2, psi)
		if midp {
			return xmath.LogAddExp(x.LogSurvival(k1), x.LogProb(k1)-math.Ln2)
		}
		return x.LogSurvival(k1 - 1)
	}
	le := func(psi float64) float64 {
		x := conditional(k1, n1, k2, n2, psi)
		if midp {
			return xmath.LogAddExp(x.LogCDF(k1-1), x.LogProb(k1)-math.Ln2)
		}
		return x.LogCDF(k1)
	}
	iv.Lower, iv.Upper = 0, math.Inf(1)
	if lv.wantLower() && k1 > lo {
		iv.Lower = logScaleRoot(func(psi float64) float64 { return ge(psi) - la }, guess)
	}
	if lv.wantUpper() && k1 < hi {
		iv.Upper = logScaleRoot(func(psi float64) float64 { return la - le(psi) }, guess)
	}
	iv.Estimate = cmle(k1, n1, k2, n2, lo, hi, guess)
	return nil
}

// MaxConditionalStdDev bounds the exact conditional computations
// (OddsRatio with OddsCornfield or OddsCornfieldMidP, and OddsRatioCMLE):
// the standard deviation of k1 given the margins, estimated from the
// table as
//
//	sigma^2 ~ 1 / (1/(a+1/2) + 1/(b+1/2) + 1/(c+1/2) + 1/(d+1/2)),
//
// must not exceed 2048. Each evaluation of the conditional tails or mean
// sums O(sigma) terms and the limits need about 100 evaluations, so the
// bound keeps a call within about 10 ms. Beyond it (all four cells in the
// millions) ErrTooLarge names the method that answers: the score interval
// (OddsMiettinenNurminen), and for the estimate the sample odds ratio
// ad/(bc), which the conditional ones approach at such counts.
const MaxConditionalStdDev = 2048

// checkConditional refuses tables beyond MaxConditionalStdDev (and
// totals beyond 2^53) for function fn; instead says what answers there.
func checkConditional(fn string, k1, n1, k2, n2 int64, instead string) error {
	if n1+n2 > binom.MaxN {
		return argerr.TooLarge(fn, "n1 + n2", n1+n2, "exceeds 2^53")
	}
	a, b, c, d := float64(k1)+0.5, float64(n1-k1)+0.5, float64(k2)+0.5, float64(n2-k2)+0.5
	if v := 1 / (1/a + 1/b + 1/c + 1/d); v > MaxConditionalStdDev*MaxConditionalStdDev {
		return argerr.TooLarge(fn, "n1 + n2", n1+n2, "with these cells gives the conditional distribution a standard deviation of "+
			argerr.Format(float64(float32(math.Sqrt(v))))+", beyond MaxConditionalStdDev = 2048 (each evaluation would sum that many terms); "+instead)
	}
	return nil
}

// cmle returns the conditional maximum-likelihood estimate of the odds
// ratio: the psi with E[X; psi] = k1, 0 when k1 is the smallest possible
// value and +Inf when it is the largest; NaN when the margins allow only one
// table, so that the conditional likelihood is flat. The mean increases strictly in
// psi; the root is found by Brent's method on ln psi to 1e-15 relative.
func cmle(k1, n1, k2, n2, lo, hi int64, guess float64) float64 {
	switch {
	case lo == hi:
		// The margins allow one table only: the conditional likelihood is
		// flat and no estimate exists.
		return math.NaN()
	case k1 <= lo:
		return 0
	case k1 >= hi:
		return math.Inf(1)
	}
	return logScaleRoot(func(psi float64) float64 {
		return conditional(k1, n1, k2, n2, psi).Mean() - float64(k1)
	}, guess)
}

// OddsRatioCMLE returns the conditional maximum-likelihood estimate of the
// odds ratio of two independent proportions k1/n1 and k2/n2: the odds ratio
// psi at which the mean of Fisher's noncentral hypergeometric distribution
// of k1 given the table's margins equals k1 (Cornfield 1956; Agresti 2002,
// section 3.6.4, recalled). It is 0 when k1 is the smallest count the
// margins allow and +Inf when it is the largest. When the margins allow one
// table only (no successes, or no failures, in both groups together) the
// conditional likelihood is flat and no estimate exists: ErrNoSolution. It is shrunk toward 1
// relative to the sample odds ratio in small tables. Accuracy 1e-15
// relative; cost O(standard deviation of k1) per evaluation, about 40
// evaluations; ErrTooLarge beyond MaxConditionalStdDev, where the sample
// odds ratio ad/(bc) answers.
func OddsRatioCMLE(k1, n1, k2, n2 int64) (float64, error) {
	const fn = "interval.OddsRatioCMLE"
	if _, err := newTwoSample(fn, k1, n1, k2, n2); err != nil {
		return math.NaN(), err
	}
	if err := checkConditional(fn, k1, n1, k2, n2, "use the sample odds ratio ad/(bc), which the conditional estimate approaches at these counts"); err != nil {
		return math.NaN(), err
	}
	lo, hi := conditional(k1, n1, k2, n2, 1).Support()
	if lo == hi {
		return math.NaN(), argerr.NoSolution(fn, "the margins allow one table only (k1 + k2 = 0 or k1 + k2 = n1 + n2): the conditional likelihood is flat and has no maximum")
	}
	a, b, c, d := float64(k1), float64(n1-k1), float64(k2), float64(n2-k2)
	return cmle(k1, n1, k2, n2, lo, hi, ((a+0.5)*(d+0.5))/((b+0.5)*(c+0.5))), nil
}

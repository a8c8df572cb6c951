package power

import (
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/test"
)

// OneSampleOptions configures the one-sample power and sample size
// functions. The zero value means: two-sided test at alpha = 0.05, target
// power 0.80, the point-probability two-sided rule, search limit
// DefaultMaxN.
type OneSampleOptions struct {
	// Alpha is the significance level in (0, 1); 0 means 0.05.
	Alpha float64
	// Power is the target power in (0, 1) for sample size searches; 0 means 0.80.
	Power float64
	// Alternative is the direction of the test; the zero value is test.TwoSided.
	Alternative test.Alternative
	// Rule is the two-sided rule of the exact test (test.TwoSidedRule,
	// as in test.BinomialOptions). Ignored by one-sided tests and the
	// normal approximations.
	Rule test.TwoSidedRule
	// MidP selects the mid-p version of the exact test (not guaranteed to
	// keep the size at or below Alpha; the attained size is reported).
	MidP bool
	// MaxN bounds exact sample size searches and power curves; 0 means
	// DefaultMaxN, and values above MaxSearchN give ErrTooLarge.
	MaxN int64
}

// DefaultMaxN is the search limit of the exact one-sample and paired
// searches when MaxN is 0.
const DefaultMaxN int64 = 100_000

// MaxSearchN is the largest MaxN the exact one-sample and paired functions
// accept; a curve that long takes seconds.
const MaxSearchN int64 = 10_000_000

// maxN applies the default and the limit to a search bound.
func maxN(fn string, v, def, limit int64) (int64, error) {
	if v == 0 {
		return def, nil
	}
	if v < 1 {
		return 0, argerr.Invalid(fn, "MaxN", v, "must be at least 1 (0 means the default)")
	}
	if v > limit {
		return 0, argerr.TooLarge(fn, "MaxN", v, "exceeds the limit "+argerr.Format(limit))
	}
	return v, nil
}

// levels validates the options and the proportions of a one-sample
// calculation that needs an effect, returning alpha and power with defaults
// applied.
func (o OneSampleOptions) levels(fn string, p0, p1 float64) (alpha, pw float64, err error) {
	if alpha, pw, err = o.base(fn, p0, p1); err != nil {
		return
	}
	if p1 == p0 {
		err = argerr.Invalid(fn, "p1", p1, "equals p0: a sample size needs an effect to detect")
		return
	}
	if (o.Alternative == test.Higher && p1 < p0) || (o.Alternative == test.Lower && p1 > p0) {
		err = argerr.NoSolution(fn, "p1 = "+argerr.Format(p1)+" lies on the null side of p0 = "+argerr.Format(p0)+
			" for the "+o.Alternative.String()+" alternative: the power never exceeds alpha")
		return
	}
	if pw <= alpha {
		err = argerr.Invalid(fn, "Power", pw, "does not exceed Alpha = "+argerr.Format(alpha)+"; a test reaches that without data")
	}
	return
}

// base validates the options and proportions without requiring an effect.
func (o OneSampleOptions) base(fn string, p0, p1 float64) (alpha, pw float64, err error) {
	if err = argerr.OpenProb(fn, "p0", p0); err != nil {
		return
	}
	if err = argerr.Prob(fn, "p1", p1); err != nil {
		return
	}
	if err = checkAlternative(fn, o.Alternative); err != nil {
		return
	}
	if err = o.Rule.Check(fn, "Rule"); err != nil {
		return
	}
	return alphaPower(fn, o.Alpha, o.Power)
}

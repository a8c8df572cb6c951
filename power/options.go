package power

import (
	"github.com/kofnlab/kofn/internal/argerr"
)

// OneSampleOptions configures the one-sample power and sample size
// functions. The zero value means: two-sided test at alpha = 0.05, target
// power 0.80, the two-sided method's default, search limit
// DefaultMaxN.
type OneSampleOptions struct {
	// Alpha is the significance level in (0, 1); 0 means 0.05.
	Alpha float64
	// Power is the target power in (0, 1) for sample size searches; 0 means 0.80.
	Power float64
	// Alternative is the direction of the test; the zero value is TwoSided.
	Alternative Alternative
	// TwoSided selects how the exact test forms a two-sided p-value; see
	// TwoSidedMethod. Ignored by the normal approximations.
	TwoSided TwoSidedMethod
	// MaxN bounds exact sample size searches and power curves; 0 means
	// DefaultMaxN, and values above MaxSearchN give ErrTooLarge.
	MaxN int64
}

// levels validates the options and the proportions of a one-sample
// calculation that needs an effect, returning alpha and power with defaults
// applied.
func (o OneSampleOptions) levels(fn string, p0, p1 float64) (alpha, pw float64, err error) {
	if err = argerr.OpenProb(fn, "p0", p0); err != nil {
		return
	}
	if err = argerr.Prob(fn, "p1", p1); err != nil {
		return
	}
	if err = checkAlternative(fn, o.Alternative); err != nil {
		return
	}
	alpha, pw = orDefault(o.Alpha, DefaultAlpha), orDefault(o.Power, DefaultPower)
	if err = checkLevel(fn, "Alpha", alpha); err != nil {
		return
	}
	if err = checkLevel(fn, "Power", pw); err != nil {
		return
	}
	if p1 == p0 {
		err = argerr.Invalid(fn, "p1", p1, "equals p0: a sample size needs an effect to detect")
		return
	}
	if (o.Alternative == Greater && p1 < p0) || (o.Alternative == Less && p1 > p0) {
		err = argerr.NoSolution(fn, "p1 = "+argerr.Format(p1)+" lies on the null side of p0 = "+argerr.Format(p0)+
			" for the "+o.Alternative.String()+" alternative: the power never exceeds alpha")
		return
	}
	if pw <= alpha {
		err = argerr.Invalid(fn, "Power", pw, "does not exceed Alpha = "+argerr.Format(alpha)+"; a test reaches that without data")
	}
	return
}

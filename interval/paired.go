package interval

import (
	"math"

	"github.com/kofnlab/kofn/internal/enum"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
)

// PairedMethod selects how an interval for the difference p1 - p2 of two
// proportions measured on the same subjects (a matched 2x2 table) is
// computed. The zero value is PairedNewcombe, the hybrid score interval of
// Newcombe (1998, paired data), closed-form with coverage near the nominal
// level; Fagerland, Lydersen and Laake (2014, "Recommended tests and
// confidence intervals for paired binomial proportions", Statistics in
// Medicine 33:2850-2875) list it with Tango's score interval among their
// recommendations (recalled).
type PairedMethod int

const (
	// PairedNewcombe is Newcombe's (1998) hybrid score interval for paired
	// data (his method 10): the Wilson limits of the two marginal
	// proportions combined with the phi correlation of the table.
	PairedNewcombe PairedMethod = iota
	// PairedWald is D +- z sqrt((n12 + n21)/n - D^2) / sqrt(n), D = (n12 - n21)/n.
	PairedWald
	// PairedTango inverts the score test of Tango (1998), "Equivalence test
	// and confidence interval for the difference in proportions for the
	// paired-sample design", Statistics in Medicine 17:891-908.
	PairedTango
	numPairedMethods
)

var pairedMethodNames = []string{
	PairedNewcombe: "Newcombe paired hybrid score",
	PairedWald:     "Wald",
	PairedTango:    "Tango score",
}

// String returns the published name of the method.
func (m PairedMethod) String() string { return pairedMethodNamesSet.String(m) }

// MarshalText encodes the method by its published name.
func (m PairedMethod) MarshalText() ([]byte, error) { return pairedMethodNamesSet.MarshalText(m) }

// UnmarshalText decodes any spelling ParsePairedMethod accepts.
func (m *PairedMethod) UnmarshalText(b []byte) error { return pairedMethodNamesSet.UnmarshalText(m, b) }

// PairedMethodValues lists the methods in order.
func PairedMethodValues() []PairedMethod { return pairedMethodNamesSet.Values() }

// ParsePairedMethod returns the method whose published name matches s
// case-insensitively; "newcombe" and "tango" are accepted too.
func ParsePairedMethod(s string) (PairedMethod, error) {
	return pairedMethodNamesSet.Parse("interval.ParsePairedMethod", s)
}

var pairedMethodNamesSet = enum.New[PairedMethod]("interval.PairedMethod", pairedMethodNames, map[string]PairedMethod{
	"newcombe": PairedNewcombe, "tango": PairedTango, "score": PairedTango,
})

// PairedOptions configures PairedDifference. The zero value asks for a
// two-sided 95% Newcombe paired hybrid score interval.
type PairedOptions struct {
	Level  float64      // confidence level in (0, 1); 0 means 0.95
	Method PairedMethod // the zero value is PairedNewcombe
	Side   Side         // two-sided (zero value) or one bound
}

// PairedDifference returns a confidence interval for p1 - p2 from a matched
// table of n pairs,
//
//	                second yes  second no
//	first yes         n11          n12
//	first no          n21          n22
//
// with p1 = (n11 + n12)/n, p2 = (n11 + n21)/n and Estimate (n12 - n21)/n.
//
// Newcombe's interval is L = D - sqrt(dl1^2 - 2 phi dl1 du2 + du2^2),
// U = D + sqrt(du1^2 - 2 phi du1 dl2 + dl2^2), with dl_i = p_i - l_i,
// du_i = u_i - p_i from the Wilson limits (l_i, u_i) of p1 and p2, and phi
// the correlation (n11 n22 - n12 n21)/sqrt of the product of the four
// margins, taken as 0 when a margin is 0. Tango's limits are found by
// Brent's method (1e-15 relative, 1e-20 absolute) and checked by inversion in the tests.
// Wald limits outside [-1, 1] are clipped, with a warning.
//
// Errors: a negative cell, all cells 0, n over 2^53, a bad Level, Method
// or Side.
func PairedDifference(n11, n12, n21, n22 int64, opt PairedOptions) (Interval, error) {
	const fn = "interval.PairedDifference"
	n, err := checkCells(fn, n11, n12, n21, n22)
	if err != nil {
		return Interval{}, err
	}
	lv, err := newLevel(fn, opt.Level, opt.Side)
	if err != nil {
		return Interval{}, err
	}
	if err := checkMethod(fn, int(opt.Method), int(numPairedMethods)); err != nil {
		return Interval{}, err
	}
	fn1 := float64(n)
	dd := float64(n12-n21) / fn1
	iv := Interval{Estimate: dd, Level: lv.level, Side: lv.side, Method: opt.Method.String(), Parameter: "paired p1 - p2"}
	z := lv.z
	switch opt.Method {
	case PairedWald:
		h := z * math.Sqrt(math.Max(0, float64(n12+n21)/fn1-dd*dd)/fn1)
		iv.Lower, iv.Upper = dd-h, dd+h
		iv.sided(-1, 1)
		iv.clipRange(-1, 1)
	case PairedNewcombe:
		a, b := n11+n12, n11+n21 // successes of the first and second measurement
		p1, p2 := float64(a)/fn1, float64(b)/fn1
		l1, u1 := wilsonLower(a, n, z), wilsonUpper(a, n, z)
		l2, u2 := wilsonLower(b, n, z), wilsonUpper(b, n, z)
		phi := 0.0
		if den := float64(n11+n12) * float64(n21+n22) * float64(n11+n21) * float64(n12+n22); den > 0 {
			phi = (float64(n11)*float64(n22) - float64(n12)*float64(n21)) / math.Sqrt(den)
		}
		dl1, du1, dl2, du2 := p1-l1, u1-p1, p2-l2, u2-p2
		iv.Lower = dd - math.Sqrt(math.Max(0, dl1*dl1-2*phi*dl1*du2+du2*du2))
		iv.Upper = dd + math.Sqrt(math.Max(0, du1*du1-2*phi*du1*dl2+dl2*dl2))
	case PairedTango:
		tf := func(delta float64) float64 { return tangoZ(n12, n21, n, delta) }
		if lv.wantLower() {
			iv.Lower = rootIncreasing(func(x float64) float64 { return z - tf(x) }, -1, dd, 1e-20)
		}
		if lv.wantUpper() {
			iv.Upper = rootIncreasing(func(x float64) float64 { return -z - tf(x) }, dd, 1, 1e-20)
		}
	}
	iv.sided(-1, 1)
	return iv, nil
}

// checkCells validates the four cells of a matched table and returns n.
func checkCells(fn string, n11, n12, n21, n22 int64) (int64, error) {
	for i, c := range [4]int64{n11, n12, n21, n22} {
		name := [4]string{"n11", "n12", "n21", "n22"}[i]
		if err := argerr.Count(fn, name, c); err != nil {
			return 0, err
		}
		// Each cell is checked before the sum, so the sum cannot overflow
		// and the message shows the caller's values.
		if c > binom.MaxN {
			return 0, argerr.TooLarge(fn, name, c, "exceeds 2^53 pairs")
		}
	}
	n := n11 + n12 + n21 + n22
	if n == 0 || n > binom.MaxN {
		if n == 0 {
			return 0, argerr.Invalid(fn, "n11 + n12 + n21 + n22", n, "is 0; the table needs at least one pair")
		}
		return 0, argerr.TooLarge(fn, "n11 + n12 + n21 + n22", n, "exceeds 2^53 pairs")
	}
	return n, nil
}

// tangoZ returns Tango's (1998) score statistic for H0: p1 - p2 = delta,
//
//	T = (n12 - n21 - n delta) / sqrt(n (2 q~ + delta (1 - delta))),
//
// with q~ the restricted MLE of the discordant cell probability q21, the
// root of 2n q^2 + W q - n21 delta(1 - delta) = 0,
// W = -n12 - n21 + (2n - n12 + n21) delta, taken in cancellation-free form
// and kept at or above max(0, -delta). T decreases in delta.
func tangoZ(n12, n21, n int64, delta float64) float64 {
	fn, b, c := float64(n), float64(n12), float64(n21)
	w := -b - c + (2*fn-b+c)*delta
	e := c * delta * (1 - delta)
	s := math.Sqrt(math.Max(0, w*w+8*fn*e))
	var q float64
	if w <= 0 {
		q = (s - w) / (4 * fn)
	} else {
		q = 2 * e / (s + w)
	}
	q = math.Max(q, math.Max(0, -delta))
	num := b - c - fn*delta
	v := fn * (2*q + delta*(1-delta))
	if num == 0 {
		return 0
	}
	if !(v > 0) {
		return math.Copysign(math.Inf(1), num)
	}
	return num / math.Sqrt(v)
}

// DiscordantRatio returns a confidence interval for the ratio of the two
// discordant cell probabilities q12/q21 of a matched table, from the
// discordant counts alone: given n12 + n21 = m, n12 is binomial with
// theta = q12/(q12 + q21), and the limits for theta from Proportion with
// opt map to psi = theta/(1 - theta). With Method ClopperPearson this is
// the exact conditional interval; with MidP its mid-p version; the zero
// value (Wilson) gives the score version. Each limit is formed as a ratio
// of two limits for theta and 1 - theta (every method is symmetric in
// k -> m - k), so no precision is lost near theta = 1. Estimate n12/n21
// (+Inf when n21 = 0).
//
// The ratio q12/q21 equals the odds ratio of the matched pairs and, in a
// before/after design, the ratio p1'/p2' of the changes.
//
// Errors: a negative count, n12 + n21 = 0 (no discordant pairs), or a bad
// option, as in Proportion.
func DiscordantRatio(n12, n21 int64, opt Options) (Interval, error) {
	const fn = "interval.DiscordantRatio"
	if err := argerr.Count(fn, "n12", n12); err != nil {
		return Interval{}, err
	}
	if err := argerr.Count(fn, "n21", n21); err != nil {
		return Interval{}, err
	}
	if n12 > binom.MaxN-n21 { // checked before the sum, which could overflow
		return Interval{}, argerr.TooLarge(fn, "n12", n12, "plus n21 = "+argerr.Format(n21)+" exceeds 2^53")
	}
	m := n12 + n21
	if m == 0 {
		return Interval{}, argerr.Invalid(fn, "n12 + n21", m, "is 0; the ratio needs at least one discordant pair")
	}
	if err := checkKN(fn, "n12", "n12 + n21", n12, m); err != nil {
		return Interval{}, err
	}
	lv, err := newLevel(fn, opt.Level, opt.Side)
	if err != nil {
		return Interval{}, err
	}
	if opt.Method < 0 || opt.Method >= numMethods {
		return Interval{}, argerr.Invalid(fn, "Method", int(opt.Method), "is not a method; see the Method constants")
	}
	lv2 := lv
	switch lv.side {
	case LowerBound:
		lv2.side = UpperBound
	case UpperBound:
		lv2.side = LowerBound
	}
	lo1, hi1, fl := limits(opt.Method, n12, m, lv)
	lo2, hi2, _ := limits(opt.Method, n21, m, lv2)
	iv := Interval{
		Lower: lo1 / hi2, Upper: hi1 / lo2, Estimate: float64(n12) / float64(n21),
		Level: lv.level, Side: lv.side, Method: opt.Method.String(), Parameter: "discordant ratio n12 / n21",
	}
	if lo2 == 0 {
		iv.Upper = math.Inf(1)
	}
	iv.flagWarnings(fl, opt.Method)
	iv.sided(0, math.Inf(1))
	return iv, nil
}

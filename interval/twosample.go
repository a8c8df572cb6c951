package interval

import (
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/root"
)

// twoSample holds validated counts of two independent binomial samples.
type twoSample struct {
	k1, n1, k2, n2 int64
	p1, p2         float64 // k1/n1, k2/n2
}

// newTwoSample validates two count pairs for function fn.
func newTwoSample(fn string, k1, n1, k2, n2 int64) (twoSample, error) {
	if err := checkKN(fn, "k1", "n1", k1, n1); err != nil {
		return twoSample{}, err
	}
	if err := checkKN(fn, "k2", "n2", k2, n2); err != nil {
		return twoSample{}, err
	}
	return twoSample{k1, n1, k2, n2, float64(k1) / float64(n1), float64(k2) / float64(n2)}, nil
}

// setupTwoSample validates the counts, level, side and method of a
// two-sample interval for function fn.
func setupTwoSample(fn string, k1, n1, k2, n2 int64, lev float64, side Side, method, count int) (twoSample, level, error) {
	d, err := newTwoSample(fn, k1, n1, k2, n2)
	if err != nil {
		return twoSample{}, level{}, err
	}
	lv, err := newLevel(fn, lev, side)
	if err != nil {
		return twoSample{}, level{}, err
	}
	return d, lv, checkMethod(fn, method, count)
}

// checkMethod validates an enum value against its count.
func checkMethod(fn string, m, count int) error {
	if m < 0 || m >= count {
		return argerr.Invalid(fn, "Method", m, "is not a method; see the method constants")
	}
	return nil
}

// rootIncreasing returns x in [lo, hi] with g(x) = 0 for g increasing:
// lo when g(lo) >= 0 (the limit is the end of the range), hi when
// g(hi) <= 0, otherwise Brent's root to |dx| <= 2(1e-15 |x| + absTol).
func rootIncreasing(g func(float64) float64, lo, hi, absTol float64) float64 {
	if !(g(lo) < 0) {
		return lo
	}
	if !(g(hi) > 0) {
		return hi
	}
	x, err := root.Brent(g, lo, hi, 1e-15, absTol)
	if err != nil { // a NaN of g inside the bracket: bisect on the sign
		x = root.Bisect(func(x float64) bool { return g(x) >= 0 }, lo, hi, 1e-15, absTol)
	}
	return x
}

// logScaleRoot solves g(e^u) = 0 for u and returns e^u, for the ratio
// scales: g increasing in x > 0, searched over [x0 e^-s, x0 e^s] with s
// growing until the sign changes (s <= 700), where x0 > 0 is a guess.
// It returns 0 or +Inf when g keeps one sign down to e^-700 or up to e^700.
func logScaleRoot(g func(float64) float64, x0 float64) float64 {
	h := func(u float64) float64 { return g(math.Exp(u)) }
	u0 := math.Log(x0)
	if math.IsNaN(u0) || math.IsInf(u0, 0) {
		u0 = 0
	}
	lo, hi := u0, u0
	if h(u0) < 0 {
		for s := 0.5; h(hi) < 0; s *= 2 {
			lo = hi
			if hi >= 700 {
				return math.Inf(1)
			}
			hi = math.Min(u0+s, 700)
		}
	} else {
		for s := 0.5; h(lo) > 0; s *= 2 {
			hi = lo
			if lo <= -700 {
				return 0
			}
			lo = math.Max(u0-s, -700)
		}
	}
	return math.Exp(rootIncreasing(h, lo, hi, 1e-15))
}

// clipRange clips [lo, hi] to [min, max], recording the clipping.
func (iv *Interval) clipRange(min, max float64) {
	if iv.Lower < min {
		iv.Lower, iv.Clipped = min, true
		iv.warn(iv.Method + ": the lower limit fell below " + argerr.Format(min) + " and was clipped to it")
	}
	if iv.Upper > max {
		iv.Upper, iv.Clipped = max, true
		iv.warn(iv.Method + ": the upper limit fell above " + argerr.Format(max) + " and was clipped to it")
	}
}

// sided sets the limit the side does not ask for to the end of the range.
// It also orders limits that crossed by rounding: at levels near 0 the
// two limits solve nearly the same equation (for the mid-p intervals
// exactly the same one in the limit), and two root searches, each to
// 1e-15 relative, can leave the lower a few units in the last place above
// the upper; such a pair (within 1e-12 relative) becomes their midpoint.
func (iv *Interval) sided(min, max float64) {
	switch iv.Side {
	case LowerBound:
		iv.Upper = max
	case UpperBound:
		iv.Lower = min
	}
	if iv.Lower > iv.Upper && iv.Lower-iv.Upper <= 1e-12*math.Max(math.Abs(iv.Lower), math.Abs(iv.Upper)) {
		m := iv.Lower + (iv.Upper-iv.Lower)/2
		iv.Lower, iv.Upper = m, m
	}
}

package interval

import (
	"math"
	"sort"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/beta"
	"github.com/kofnlab/kofn/internal/root"
	"gonum.org/v1/gonum/integrate/quad"
)

// MaxCredibleTwoArmN is the largest n1 + n2 that CredibleDifference and
// CredibleRatio accept: each limit takes about 40 distribution-function
// quadratures of some 600 incomplete beta evaluations, whose cost grows
// like the square root of the counts (tens of ms at the limit).
const MaxCredibleTwoArmN = 100000

// CredibleDifference returns the equal-tailed credible interval for
// p1 - p2 from k1 of n1 and k2 of n2 under independent Beta priors
// (opt.Prior on both arms; opt.Kind must be EqualTailed), with Estimate
// the posterior mean of p1 - p2 and Prior set. The distribution function
//
//	P(p1 - p2 <= d) = integral f2(y) F1(y + d) dy
//
// is integrated by 20-point Gauss-Legendre rules on panels in the
// log-odds of y, eight across arm 2's posterior and eight across the
// points where F1(y + d) rises, and each limit is the root of
// P(p1 - p2 <= d) = tail found by Brent's method to 1e-12 absolute. At
// d = 0 the distribution function is P(p2 >= p1), which the tests check
// against the exact sums of test.Compare; accuracy about 1e-10 in the
// limits. Errors: as Credible, HighestDensity (not offered),
// n1 + n2 > MaxCredibleTwoArmN (ErrTooLarge).
func CredibleDifference(k1, n1, k2, n2 int64, opt CredibleOptions) (Interval, error) {
	return credibleTwo("interval.CredibleDifference", k1, n1, k2, n2, opt, false)
}

// CredibleRatio returns the equal-tailed credible interval for p1 / p2, as
// CredibleDifference, from P(p1 / p2 <= r) = integral f2(y) F1(r y) dy,
// with each limit solved on the log scale of r; Estimate is the ratio of
// the posterior means (the posterior mean of the ratio may not exist).
func CredibleRatio(k1, n1, k2, n2 int64, opt CredibleOptions) (Interval, error) {
	return credibleTwo("interval.CredibleRatio", k1, n1, k2, n2, opt, true)
}

func credibleTwo(fn string, k1, n1, k2, n2 int64, opt CredibleOptions, ratio bool) (Interval, error) {
	prior, a1, b1, err := opt.Prior.Update(fn, "k1", "n1", k1, n1)
	if err != nil {
		return Interval{}, err
	}
	_, a2, b2, err := opt.Prior.Update(fn, "k2", "n2", k2, n2)
	if err != nil {
		return Interval{}, err
	}
	if n1+n2 > MaxCredibleTwoArmN {
		return Interval{}, argerr.TooLarge(fn, "n1", n1, "with n2 exceeds 100000 trials in all, the limit of the quadrature")
	}
	lv, err := newLevel(fn, opt.Level, opt.Side)
	if err != nil {
		return Interval{}, err
	}
	if opt.Kind != EqualTailed {
		return Interval{}, argerr.Invalid(fn, "Kind", int(opt.Kind), "must be EqualTailed: only equal-tailed intervals are offered for two arms")
	}
	t := twoArm{a1: a1, b1: b1, a2: a2, b2: b2}
	t.w1lo = beta.Quantile(a1, b1, math.Log(1e-18), false)
	t.w1hi = beta.Quantile(a1, b1, math.Log(1e-18), true)
	t.w2lo = beta.Quantile(a2, b2, math.Log(1e-18), false)
	t.w2hi = beta.Quantile(a2, b2, math.Log(1e-18), true)
	m1, m2 := a1/(a1+b1), a2/(a2+b2)
	iv := Interval{Level: lv.level, Side: lv.side, Method: "equal-tailed credible", Prior: &prior}
	if ratio {
		iv.Parameter, iv.Estimate = "p1 / p2", m1/m2
		iv.Lower, iv.Upper = 0, math.Inf(1)
		f := func(s float64) float64 { return t.cdf(math.Exp(s), true) }
		if lv.wantLower() {
			iv.Lower = math.Exp(solveCDF(f, lv.tail, math.Log(m1/m2)))
		}
		if lv.wantUpper() {
			iv.Upper = math.Exp(solveCDF(f, 1-lv.tail, math.Log(m1/m2)))
		}
	} else {
		iv.Parameter, iv.Estimate = "p1 - p2", m1-m2
		iv.Lower, iv.Upper = -1, 1
		f := func(d float64) float64 { return t.cdf(d, false) }
		if lv.wantLower() {
			iv.Lower = solveCDF(f, lv.tail, m1-m2)
		}
		if lv.wantUpper() {
			iv.Upper = solveCDF(f, 1-lv.tail, m1-m2)
		}
	}
	if n1 == 0 || n2 == 0 {
		iv.warn("an arm without trials: its posterior is its prior")
	}
	return iv, nil
}

// solveCDF returns the root of f(s) = target for an increasing f, from a
// bracket grown around the guess s0, by Brent's method to 1e-12.
func solveCDF(f func(float64) float64, target, s0 float64) float64 {
	g := func(s float64) float64 { return f(s) - target }
	lo, hi := s0, s0
	step := 1e-3 * math.Max(1e-3, math.Abs(s0))
	for i := 0; i < 200 && g(lo) > 0; i++ {
		lo -= step
		step *= 2
	}
	step = 1e-3 * math.Max(1e-3, math.Abs(s0))
	for i := 0; i < 200 && g(hi) < 0; i++ {
		hi += step
		step *= 2
	}
	x, err := root.Brent(g, lo, hi, 1e-13, 1e-13)
	if err != nil {
		return math.NaN()
	}
	return x
}

// twoArm holds the posteriors and their 1e-18 windows (log-odds).
type twoArm struct {
	a1, b1, a2, b2         float64
	w1lo, w1hi, w2lo, w2hi float64
}

// cdf returns P(p1 - p2 <= d) (ratio false) or P(p1 / p2 <= d) (ratio true).
func (t twoArm) cdf(d float64, ratio bool) float64 {
	// x(y) = y + d or d y, and 1 - x formed from 1 - y without rounding 1 - x.
	xOf := func(y, ym float64) (x, xm float64) {
		if ratio {
			return d * y, 1 - d*y
		}
		return y + d, ym - d
	}
	// Panels: eight across arm 2's window; eight across the y where x(y)
	// crosses arm 1's window.
	cuts := []float64{}
	add := func(lo, hi float64) {
		for j := 0; j <= 8; j++ {
			cuts = append(cuts, lo+(hi-lo)*float64(j)/8)
		}
	}
	add(t.w2lo, t.w2hi)
	x1lo, _ := beta.XY(t.w1lo)
	x1hi, _ := beta.XY(t.w1hi)
	var ylo, yhi float64
	if ratio {
		ylo, yhi = x1lo/d, x1hi/d
	} else {
		ylo, yhi = x1lo-d, x1hi-d
	}
	if yhi > 0 && ylo < 1 {
		ylo, yhi = math.Max(ylo, 1e-300), math.Min(yhi, 1-1e-16)
		tl, th := math.Log(ylo)-math.Log1p(-ylo), math.Log(yhi)-math.Log1p(-yhi)
		tl, th = math.Max(tl, t.w2lo), math.Min(th, t.w2hi)
		if th > tl {
			add(tl, th)
		}
	}
	sort.Float64s(cuts)
	var xs, ws [20]float64
	total := 0.0
	for c := 0; c+1 < len(cuts); c++ {
		l, h := cuts[c], cuts[c+1]
		if !(h > l) {
			continue
		}
		quad.Legendre{}.FixedLocations(xs[:], ws[:], l, h)
		for i, tt := range xs {
			y, ym := beta.XY(tt)
			x, xm := xOf(y, ym)
			var F float64
			switch {
			case x <= 0:
				F = 0
			case xm <= 0:
				F = 1
			default:
				F = math.Exp(beta.LogCDF(t.a1, t.b1, x, xm))
			}
			total += ws[i] * math.Exp(beta.LogDensityXY(t.a2, t.b2, y, ym)) * F
		}
	}
	return math.Min(1, math.Max(0, total))
}

package score

import (
	"math"

	"github.com/kofnlab/kofn/internal/root"
)

// DiffMLE returns the maximum-likelihood estimates of (p1, p2) under the
// restriction p1 - p2 = delta, for -1 < delta < 1 (delta = +-1 is accepted
// and gives the only point of the restriction).
//
// The restricted log-likelihood is concave in p1 on the admissible range
// [max(0, delta), min(1, 1+delta)]; its derivative
//
//	S(p) = x1/p - (n1-x1)/(1-p) + x2/(p-delta) - (n2-x2)/(1-p+delta)
//
// times p(1-p)(p-delta)(1+delta-p) is the cubic of Miettinen and Nurminen
// (1985, Appendix) and Farrington and Manning (1990, equation (4)). Their
// trigonometric closed form subtracts numbers of order 1 and loses every
// digit for proportions of order 1e-9, so the root is found instead by
// Brent's method on the cubic in factored form, to full relative
// precision; when a count that would keep the maximum off an end of the
// range is 0 and the slope there has the wrong sign, the maximum is at that
// end.
func DiffMLE(x1, n1, x2, n2 int64, delta float64) (p1, p2 float64) {
	if delta >= 1 {
		return 1, 0
	}
	if delta <= -1 {
		return 0, 1
	}
	a, b := float64(x1), float64(n1-x1) // successes, failures of sample 1
	c, d := float64(x2), float64(n2-x2) // of sample 2
	lo, hi := math.Max(0, delta), math.Min(1, 1+delta)
	// cubic(p) = S(p) p (1-p) (p-delta) (1+delta-p), each term in factored form.
	cubic := func(p float64) float64 {
		u, v, w, y := p, 1-p, p-delta, 1+delta-p
		return a*v*w*y - b*u*w*y + c*u*v*y - d*u*v*w
	}
	// slope returns S(p) without its singular terms (0/0 taken as 0).
	slope := func(p float64) float64 {
		t := func(cnt, den float64) float64 {
			if cnt == 0 {
				return 0
			}
			return cnt / den
		}
		return t(a, p) - t(b, 1-p) + t(c, p-delta) - t(d, 1+delta-p)
	}
	if lo == hi {
		return clamp01(lo), clamp01(lo - delta)
	}
	l, h := lo, hi
	if !(cubic(l) > 0) {
		// The count singular at lo is 0: the maximum is at lo unless the
		// likelihood still rises there; then step inside until the cubic is
		// positive.
		if !(slope(lo) > 0) {
			return clamp01(lo), clamp01(lo - delta)
		}
		for step := (hi - lo) / 2; step > 0; step /= 2 {
			if cubic(lo+step) > 0 {
				l = lo + step
				break
			}
		}
	}
	if !(cubic(h) < 0) {
		if !(slope(hi) < 0) {
			return clamp01(hi), clamp01(hi - delta)
		}
		for step := (hi - lo) / 2; step > 0; step /= 2 {
			if cubic(hi-step) < 0 {
				h = hi - step
				break
			}
		}
	}
	t, err := root.Brent(cubic, l, h, 0x1p-52, 0)
	if err != nil {
		t = l + (h-l)/2 // unreachable: the bracket was checked
	}
	return clamp01(t), clamp01(t - delta)
}

// DiffZ returns the signed score statistic for H0: p1 - p2 = delta,
//
//	Z = (p1^ - p2^ - delta) / sqrt(f (p1~(1-p1~)/n1 + p2~(1-p2~)/n2)),
//
// with (p1~, p2~) from DiffMLE and f = N/(N-1) (MiettinenNurminen) or 1
// (FarringtonManning, the statistic of Mee 1984's interval). Z decreases
// in delta; Z = 0 when the data fit delta exactly and +-Inf when the
// restricted variance is 0 but the data differ from delta.
func DiffZ(x1, n1, x2, n2 int64, delta float64, v Variance) float64 {
	p1, p2 := DiffMLE(x1, n1, x2, n2, delta)
	f1, f2 := float64(n1), float64(n2)
	num := float64(x1)/f1 - float64(x2)/f2 - delta
	vr := v.factor(n1, n2) * (p1*(1-p1)/f1 + p2*(1-p2)/f2)
	return zRatio(num, vr)
}

// StratifiedDiffZ returns the stratified score statistic of a common
// difference delta across strata (x1[i] of n1[i] against x2[i] of n2[i]),
//
//	Z(delta) = sum w_i (p1^_i - p2^_i - delta) / sqrt( sum w_i^2 V_i(delta) ),
//
// V_i the stratum's restricted variance at delta (as DiffZ, factor f per
// stratum), with the weights w selects: Mantel-Haenszel weights
// w_i = n1_i n2_i / (n1_i + n2_i), or inverse-variance score weights
// w_i = 1 / V_i(delta), recomputed at every delta, which make
//
//	Z(delta) = sum (p1^_i - p2^_i - delta) / V_i(delta) / sqrt( sum 1 / V_i(delta) ).
//
// Strata with an empty group are left out. With Mantel-Haenszel weights Z
// decreases in delta. With inverse-variance weights a stratum whose
// restricted variance is 0 at delta (no successes, or only successes, in
// both groups, at delta = 0) takes an unbounded weight as delta nears 0,
// and Z tends to 0 there from both sides; Z(0) is then 0, its limit. The
// conventions of zRatio apply.
func StratifiedDiffZ(x1, n1, x2, n2 []int64, delta float64, v Variance, w Weights) float64 {
	var num, vr float64
	for i := range x1 {
		if n1[i] == 0 || n2[i] == 0 {
			continue
		}
		f1, f2 := float64(n1[i]), float64(n2[i])
		p1, p2 := DiffMLE(x1[i], n1[i], x2[i], n2[i], delta)
		d := float64(x1[i])/f1 - float64(x2[i])/f2 - delta
		vi := v.factor(n1[i], n2[i]) * (p1*(1-p1)/f1 + p2*(1-p2)/f2)
		if w == InverseVarianceWeights {
			if !(vi > 0) {
				if d == 0 {
					return 0
				}
				return math.Copysign(math.Inf(1), d)
			}
			num += d / vi
			vr += 1 / vi
			continue
		}
		wi := f1 * f2 / (f1 + f2)
		num += wi * d
		vr += wi * wi * vi
	}
	return zRatio(num, vr)
}

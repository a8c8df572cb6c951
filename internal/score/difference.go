package score

import "math"

// DiffMLE returns the maximum-likelihood estimates of (p1, p2) under the
// restriction p1 - p2 = delta, for -1 < delta < 1 (delta = +-1 is accepted
// and gives the only point of the restriction).
//
// The restricted estimate of p1 is the root in [max(0, delta), min(1,
// 1+delta)] of the likelihood equation, a cubic solved in closed form by
// the trigonometric method of Miettinen and Nurminen (1985), Appendix, and
// Farrington and Manning (1990), equation (4): with theta = n2/n1,
//
//	a = 1 + theta
//	b = -(1 + theta + p1^ + theta p2^ + delta (theta + 2))
//	c = delta^2 + delta (2 p1^ + theta + 1) + p1^ + theta p2^
//	d = -p1^ delta (1 + delta)
//	v = b^3/(27a^3) - bc/(6a^2) + d/(2a),  u = sign(v) sqrt(b^2/(9a^2) - c/(3a))
//	w = (pi + acos(v/u^3)) / 3,  p1~ = 2u cos(w) - b/(3a),  p2~ = p1~ - delta.
//
// Two Newton steps on the cubic then polish the root to full precision (the
// closed form loses digits where roots nearly coincide).
func DiffMLE(x1, n1, x2, n2 int64, delta float64) (p1, p2 float64) {
	if delta >= 1 {
		return 1, 0
	}
	if delta <= -1 {
		return 0, 1
	}
	f1, f2 := float64(n1), float64(n2)
	ph1, ph2 := float64(x1)/f1, float64(x2)/f2
	th := f2 / f1
	a := 1 + th
	b := -(1 + th + ph1 + th*ph2 + delta*(th+2))
	c := delta*delta + delta*(2*ph1+th+1) + ph1 + th*ph2
	d := -ph1 * delta * (1 + delta)
	v := b*b*b/(27*a*a*a) - b*c/(6*a*a) + d/(2*a)
	u2 := b*b/(9*a*a) - c/(3*a)
	var t float64
	if u2 <= 0 {
		t = -b / (3 * a)
	} else {
		u := math.Sqrt(u2)
		if v < 0 {
			u = -u
		}
		r := v / (u * u * u)
		r = math.Max(-1, math.Min(1, r))
		w := (math.Pi + math.Acos(r)) / 3
		t = 2*u*math.Cos(w) - b/(3*a)
	}
	lo, hi := math.Max(0, delta), math.Min(1, 1+delta)
	cubic := func(x float64) (f, df float64) {
		return ((a*x+b)*x+c)*x + d, (3*a*x+2*b)*x + c
	}
	for range 2 {
		f, df := cubic(t)
		if df == 0 || f == 0 {
			break
		}
		nt := t - f/df
		if !(nt >= lo && nt <= hi) {
			break
		}
		t = nt
	}
	t = math.Max(lo, math.Min(hi, t))
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

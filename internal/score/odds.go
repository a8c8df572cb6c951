package score

import "math"

// OddsMLE returns the maximum-likelihood estimates of (p1, p2) under the
// restriction that the odds ratio p1(1-p2) / (p2(1-p1)) equals psi > 0,
// given the margins: p1~ = psi p2~ / (1 + p2~(psi - 1)) and
// n1 p1~ + n2 p2~ = x1 + x2 = m. Then p2~ solves (Miettinen and Nurminen
// 1985)
//
//	n2 (psi-1) p2^2 + (n1 psi + n2 - m (psi-1)) p2 - m = 0,
//
// taken in the form p2~ = 2m / (B + sqrt(B^2 + 4 n2 (psi-1) m)), exact at
// psi = 1 (p2~ = m/N), or (sqrt(B^2 + 4 n2 (psi-1) m) - B) / (2 n2 (psi-1))
// when B < 0 (large psi), where the first form cancels.
func OddsMLE(x1, n1, x2, n2 int64, psi float64) (p1, p2 float64) {
	p1, _, p2, _ = oddsMLE(x1, n1, x2, n2, psi)
	return p1, p2
}

// oddsMLE is OddsMLE with the complements q1 = 1 - p1 and q2 = 1 - p2,
// each computed without cancellation. When p2~ > 1/2, q2 is taken from
// the quadratic that q = 1 - p2 solves,
//
//	A q^2 - C q + psi (N - m) = 0,  A = n2 (psi - 1),
//	C = psi (2 n2 + n1 - m) + m - n2,
//
// by its cancellation-free root, and then p1~ = psi p2~ / (q2~ + psi p2~),
// q1~ = q2~ / (q2~ + psi p2~). (1 - p2 from the rounded p2 loses all digits
// when q2 is near 1e-16, as at psi of 1e-12 with a zero cell, which made
// the score statistic jump and a zero lower limit come out as 1e-12.)
func oddsMLE(x1, n1, x2, n2 int64, psi float64) (p1, q1, p2, q2 float64) {
	m := float64(x1 + x2)
	f1, f2 := float64(n1), float64(n2)
	if m == 0 {
		return 0, 1, 0, 1
	}
	if m == f1+f2 {
		return 1, 0, 1, 0
	}
	A := f2 * (psi - 1)
	B := f1*psi + f2 - m*(psi-1)
	disc := math.Max(0, B*B+4*A*m)
	if B >= 0 {
		p2 = clamp01(2 * m / (B + math.Sqrt(disc)))
	} else {
		// B < 0 only when psi > 1 (so A > 0); B + sqrt(disc) would cancel.
		p2 = clamp01((math.Sqrt(disc) - B) / (2 * A))
	}
	q2 = 1 - p2
	if p2 > 0.5 {
		C := psi*(2*f2+f1-m) + m - f2
		D := psi * (f1 + f2 - m)
		t := (C + math.Copysign(math.Sqrt(math.Max(0, C*C-4*A*D)), C)) / 2
		best := math.Inf(1)
		for _, r := range [2]float64{D / t, t / A} {
			if r >= 0 && r <= 1 && math.Abs(r-q2) < best {
				best, q2 = math.Abs(r-q2), r
			}
		}
		p2 = 1 - q2
	}
	den := q2 + psi*p2
	if !(den > 0) || math.IsInf(den, 0) {
		// psi = +Inf or a degenerate margin: the plain form.
		p1 = clamp01(psi * p2 / (1 + p2*(psi-1)))
		return p1, 1 - p1, p2, q2
	}
	p1 = clamp01(psi * p2 / den)
	if p1 > 0.5 {
		q1 = clamp01(q2 / den)
	} else {
		q1 = 1 - p1
	}
	return p1, q1, p2, q2
}

// OddsZ returns the signed score statistic for H0: odds ratio = psi,
//
//	Z = (x1 - n1 p1~) sqrt((1/(n1 p1~(1-p1~)) + 1/(n2 p2~(1-p2~))) / f),
//
// with (p1~, p2~) from OddsMLE and f = N/(N-1) (MiettinenNurminen) or 1
// (FarringtonManning). Z decreases in psi.
func OddsZ(x1, n1, x2, n2 int64, psi float64, v Variance) float64 {
	num, w1, w2 := oddsParts(x1, n1, x2, n2, psi)
	if w1 == 0 || w2 == 0 {
		return zRatio(num, 0)
	}
	// Var(x1 - n1 p1~) = 1 / (1/w1 + 1/w2) = w1 w2 / (w1 + w2).
	return zRatio(num, v.factor(n1, n2)*w1*w2/(w1+w2))
}

// StratifiedOddsZ returns the stratified score statistic of a common odds
// ratio psi across strata,
//
//	Z(psi) = sum w_i d_i / sqrt( sum w_i^2 V_i(psi) ),
//	d_i = (p1^ - p1~)/(p1~ q1~) - (p2^ - p2~)/(p2~ q2~) = (x1 - n1 p1~) s_i,
//	V_i = f s_i,   s_i = 1/(n1 p1~ q1~) + 1/(n2 p2~ q2~),
//
// (p1~, p2~) from OddsMLE in each stratum (the Miettinen-Nurminen form of
// the odds-ratio score, recalled), with Mantel-Haenszel weights
// w_i = n1_i n2_i / (n1_i + n2_i) or inverse-variance score weights
// w_i = 1 / V_i(psi), which make Z = sum (x1 - n1 p1~)/f / sqrt(sum 1/V_i).
// With one stratum it is OddsZ. Strata with an empty group, or whose
// successes are 0 or every trial (no information on an odds ratio), are
// left out.
func StratifiedOddsZ(x1, n1, x2, n2 []int64, psi float64, v Variance, w Weights) float64 {
	var num, vr float64
	for i := range x1 {
		m := x1[i] + x2[i]
		if n1[i] == 0 || n2[i] == 0 || m == 0 || m == n1[i]+n2[i] {
			continue
		}
		d, w1, w2 := oddsParts(x1[i], n1[i], x2[i], n2[i], psi)
		f := v.factor(n1[i], n2[i])
		if w1 == 0 || w2 == 0 {
			// The restricted fit sits at an end (psi at 0 or +Inf in
			// floating point): the stratum's variance of d is unbounded,
			// its inverse-variance weight 0.
			if w == InverseVarianceWeights {
				num += d / f
				continue
			}
			return zRatio(d, 0)
		}
		si := 1/w1 + 1/w2
		if w == InverseVarianceWeights {
			num += d / f
			vr += 1 / (f * si)
			continue
		}
		wi := float64(n1[i]) * float64(n2[i]) / float64(n1[i]+n2[i])
		num += wi * d * si
		vr += wi * wi * f * si
	}
	return zRatio(num, vr)
}

// oddsParts returns x1 - n1 p1~ in its most accurate form and the
// binomial variances w1 = n1 p1~ q1~, w2 = n2 p2~ q2~ at psi.
func oddsParts(x1, n1, x2, n2 int64, psi float64) (num, w1, w2 float64) {
	p1, q1, p2, q2 := oddsMLE(x1, n1, x2, n2, psi)
	f1, f2 := float64(n1), float64(n2)
	// x1 - n1 p1~ equals n2 p2~ - x2 (the restricted estimates keep the
	// margin n1 p1~ + n2 p2~ = x1 + x2) and the two forms through the
	// complements; each loses digits in proportion to the size of its
	// terms, so the form with the smallest terms is taken. (With a zero
	// cell the numerator tends to 0 like q2~ while every other form keeps a
	// rounding of 1e-14, which divided by a vanishing standard error made
	// the statistic jump at odds ratios near 1e-57.)
	num, scale := float64(x1)-f1*p1, math.Max(float64(x1), f1*p1)
	for _, c := range [3][2]float64{
		{f2*p2 - float64(x2), math.Max(f2*p2, float64(x2))},
		{float64(n2-x2) - f2*q2, math.Max(float64(n2-x2), f2*q2)},
		{f1*q1 - float64(n1-x1), math.Max(f1*q1, float64(n1-x1))},
	} {
		if c[1] < scale {
			num, scale = c[0], c[1]
		}
	}
	return num, f1 * p1 * q1, f2 * p2 * q2
}

package score

import "math"

// RatioMLE returns the maximum-likelihood estimates of (p1, p2) under the
// restriction p1 = rho p2, rho > 0. The likelihood equation in p2 is the
// quadratic (Miettinen and Nurminen 1985; Farrington and Manning 1990,
// equation (10))
//
//	rho N p2^2 - (rho n1 + x1 + n2 + rho x2) p2 + (x1 + x2) = 0,  N = n1 + n2,
//
// whose smaller root is taken, in the cancellation-free form
// p2~ = 2C / (-B + sqrt(B^2 - 4AC)); p1~ = rho p2~ (kept <= 1).
func RatioMLE(x1, n1, x2, n2 int64, rho float64) (p1, p2 float64) {
	fx1, fx2 := float64(x1), float64(x2)
	A := rho * float64(n1+n2)
	B := -(rho*float64(n1) + fx1 + float64(n2) + rho*fx2)
	C := fx1 + fx2
	if C == 0 {
		return 0, 0
	}
	disc := math.Max(0, B*B-4*A*C)
	p2 = 2 * C / (-B + math.Sqrt(disc))
	p2 = clamp01(math.Min(p2, 1/rho))
	return clamp01(rho * p2), p2
}

// RatioZ returns the signed score statistic for H0: p1/p2 = rho,
//
//	Z = (p1^ - rho p2^) / sqrt(f (p1~(1-p1~)/n1 + rho^2 p2~(1-p2~)/n2)),
//
// with (p1~, p2~) from RatioMLE and f = N/(N-1) (MiettinenNurminen) or 1
// (FarringtonManning; its square is Koopman's 1984 chi-square). Z
// decreases in rho.
func RatioZ(x1, n1, x2, n2 int64, rho float64, v Variance) float64 {
	p1, p2 := RatioMLE(x1, n1, x2, n2, rho)
	f1, f2 := float64(n1), float64(n2)
	num := float64(x1)/f1 - rho*float64(x2)/f2
	vr := v.factor(n1, n2) * (p1*(1-p1)/f1 + rho*rho*p2*(1-p2)/f2)
	return zRatio(num, vr)
}

// StratifiedRatioZ returns the stratified score statistic of a common
// ratio rho = p1/p2 across strata,
//
//	Z(rho) = sum w_i (p1^_i - rho p2^_i) / sqrt( sum w_i^2 V_i(rho) ),
//
// V_i the stratum's restricted variance at rho (as RatioZ, factor f per
// stratum), with Mantel-Haenszel weights w_i = n1_i n2_i / (n1_i + n2_i)
// or inverse-variance score weights w_i = 1 / V_i(rho), recomputed at
// every rho. Strata with an empty group, and strata without successes
// (which carry no information on a ratio: their numerator and variance
// are 0 at every rho), are left out. With Mantel-Haenszel weights Z
// decreases in rho. With inverse-variance weights a stratum with only
// successes in both groups has variance 0 at rho = 1 and an unbounded
// weight near it, and Z tends to 0 there; Z(1) is then 0, its limit.
func StratifiedRatioZ(x1, n1, x2, n2 []int64, rho float64, v Variance, w Weights) float64 {
	var num, vr float64
	for i := range x1 {
		if n1[i] == 0 || n2[i] == 0 || x1[i]+x2[i] == 0 {
			continue
		}
		f1, f2 := float64(n1[i]), float64(n2[i])
		p1, p2 := RatioMLE(x1[i], n1[i], x2[i], n2[i], rho)
		d := float64(x1[i])/f1 - rho*float64(x2[i])/f2
		vi := v.factor(n1[i], n2[i]) * (p1*(1-p1)/f1 + rho*rho*p2*(1-p2)/f2)
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

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
// psi = 1 (p2~ = m/N).
func OddsMLE(x1, n1, x2, n2 int64, psi float64) (p1, p2 float64) {
	m := float64(x1 + x2)
	f1, f2 := float64(n1), float64(n2)
	if m == 0 {
		return 0, 0
	}
	if m == f1+f2 {
		return 1, 1
	}
	A := f2 * (psi - 1)
	B := f1*psi + f2 - m*(psi-1)
	disc := math.Max(0, B*B+4*A*m)
	p2 = clamp01(2 * m / (B + math.Sqrt(disc)))
	p1 = clamp01(psi * p2 / (1 + p2*(psi-1)))
	return p1, p2
}

// OddsZ returns the signed score statistic for H0: odds ratio = psi,
//
//	Z = (x1 - n1 p1~) sqrt((1/(n1 p1~(1-p1~)) + 1/(n2 p2~(1-p2~))) / f),
//
// with (p1~, p2~) from OddsMLE and f = N/(N-1) (MiettinenNurminen) or 1
// (FarringtonManning). Z decreases in psi.
func OddsZ(x1, n1, x2, n2 int64, psi float64, v Variance) float64 {
	p1, p2 := OddsMLE(x1, n1, x2, n2, psi)
	f1, f2 := float64(n1), float64(n2)
	num := float64(x1) - f1*p1
	w1, w2 := f1*p1*(1-p1), f2*p2*(1-p2)
	if w1 == 0 || w2 == 0 {
		return zRatio(num, 0)
	}
	// Var(x1 - n1 p1~) = 1 / (1/w1 + 1/w2) = w1 w2 / (w1 + w2).
	return zRatio(num, v.factor(n1, n2)*w1*w2/(w1+w2))
}

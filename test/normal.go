package test

import "math"

// logPhi returns ln Phi(x), the log of the standard normal CDF, accurate to
// about 1e-15 relative for all x: from erfc for x > -30 (no underflow there),
// and from the asymptotic series
//
//	Phi(x) = phi(x)/|x| (1 - 1/x^2 + 3/x^4 - 15/x^6 + ...)
//
// below -30, where 12 terms leave a relative error under 1e-17
// (Abramowitz and Stegun 1964, 26.2.12). The log stays finite while x^2/2
// does, that is for |x| below about 1.9e154; beyond, ln Phi(x) is below
// -1.8e308, the most negative float64, and the result is -Inf.
func logPhi(x float64) float64 {
	switch {
	case math.IsNaN(x):
		return math.NaN()
	case x >= 0:
		return math.Log1p(-0.5 * math.Erfc(x/math.Sqrt2))
	case x > -30:
		return math.Log(0.5 * math.Erfc(-x/math.Sqrt2))
	case math.IsInf(x, -1):
		return math.Inf(-1)
	}
	h := (0.5 * x) * x // x^2/2, finite for |x| up to 1.8e154 sqrt(2), where x*x is not
	s, t := 1.0, 1.0
	for k := 1; k <= 12; k++ {
		t *= -float64(2*k-1) / (2 * h)
		s += t
	}
	return -h - math.Log(-x) - 0.5*math.Log(2*math.Pi) + math.Log(s)
}

// logZP returns the log p-value of a standard normal statistic z under the
// alternative: less Phi(z), greater Phi(-z), two-sided 2 Phi(-|z|), from
// log1p(-erf(|z|/sqrt 2)) for |z| < 1 (no cancellation near z = 0).
func logZP(z float64, alt Alternative) float64 {
	switch alt {
	case Lower:
		return logPhi(z)
	case Higher:
		return logPhi(-z)
	}
	a := math.Abs(z)
	if a < 1 {
		// 2 Phi(-|z|) = erfc(|z|/sqrt 2) = 1 - erf(|z|/sqrt 2) is near 1:
		// log1p keeps the digits that ln 2 + ln Phi(-|z|) would cancel.
		return math.Log1p(-math.Erf(a / math.Sqrt2))
	}
	return math.Ln2 + logPhi(-a)
}

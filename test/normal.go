package test

import "math"

// logPhi returns ln Phi(x), the log of the standard normal CDF, accurate to
// about 1e-15 relative for all x: from erfc for x > -30 (no underflow there),
// and from the asymptotic series
//
//	Phi(x) = phi(x)/|x| (1 - 1/x^2 + 3/x^4 - 15/x^6 + ...)
//
// below -30, where 12 terms leave a relative error under 1e-17
// (Abramowitz and Stegun 1964, 26.2.12).
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
	x2 := x * x
	s, t := 1.0, 1.0
	for k := 1; k <= 12; k++ {
		t *= -float64(2*k-1) / x2
		s += t
	}
	return -0.5*x2 - math.Log(-x) - 0.5*math.Log(2*math.Pi) + math.Log(s)
}

// logZP returns the log p-value of a standard normal statistic z under the
// alternative: less Phi(z), greater Phi(-z), two-sided 2 Phi(-|z|).
func logZP(z float64, alt Alternative) float64 {
	switch alt {
	case Less:
		return logPhi(z)
	case Greater:
		return logPhi(-z)
	}
	return math.Min(0, math.Ln2+logPhi(-math.Abs(z)))
}

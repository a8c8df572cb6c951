package interval

import (
	"math"

	"github.com/kofnlab/kofn/internal/xmath"
)

// This file evaluates the regularized incomplete beta function I_x(a, b)
// for real a, b > 0 in log space, which the Jeffreys interval needs at the
// half-integer parameters k + 1/2, n - k + 1/2 (package binom covers the
// integer parameters of binomial tails only). gonum's mathext.RegIncBeta
// forms the prefactor from differences of lgamma, which at a + b = 1e12
// loses about 1e-3 absolute in the logarithm; here the prefactor uses
// Loader's (2000) saddle-point form with real arguments.

const lnSqrt2Pi = 0.91893853320467274178032973640562

// logBinomDensityReal returns the logarithm of the binomial density extended to
// real x in (0, m),
//
//	Gamma(m+1) / (Gamma(x+1) Gamma(m-x+1)) p^x q^(m-x),
//
// in Loader's form se(m) - se(x) - se(m-x) - D(x, mp) - D(m-x, mq)
// (xmath.StirlingError se, xmath.Deviance D) - (1/2) ln(2 pi x (m-x)/m), with q = 1-p given.
func logBinomDensityReal(x, m, p, q float64) float64 {
	y := m - x
	lc := xmath.StirlingError(m) - xmath.StirlingError(x) - xmath.StirlingError(y) - xmath.Deviance(x, m*p) - xmath.Deviance(y, m*q)
	return lc - 0.5*math.Log(x*y/m) - lnSqrt2Pi
}

// logBetaDensity returns ln(x^a y^b / B(a, b)), the Beta(a, b) density
// times x y: d/dt I_x(a, b) in the log-odds t of x. It is
// f(a; a+b, x) a b / (a+b), f the binomial density of logBinomDensityReal, with y = 1 - x given.
func logBetaDensity(a, b, x, y float64) float64 {
	return logBinomDensityReal(a, a+b, x, y) + math.Log(a*b/(a+b))
}

// logBetaCDF returns ln I_x(a, b) = ln P(B <= x) for B ~ Beta(a, b), with
// y = 1 - x supplied to full precision, x, y in [0, 1]. The smaller tail is
// evaluated directly,
//
//	I_x(a, b) = x^a y^b / (a B(a, b)) * cf = f(a; a+b, x) * b/(a+b) * cf,
//
// with the continued fraction cf (which converges fast for x below the
// mean-like point (a+1)/(a+b+2)); the larger as ln(1 - smaller). Accuracy
// about 1e-14 relative to max(1, |ln I|), from the prefactor's terms.
func logBetaCDF(a, b, x, y float64) float64 {
	switch {
	case x <= 0:
		return math.Inf(-1)
	case y <= 0:
		return 0
	}
	if x*(a+b+2) < a+1 {
		return logBetaDirect(a, b, x, y)
	}
	return xmath.Log1mExp(logBetaDirect(b, a, y, x))
}

// logBetaDirect returns ln I_x(a, b) by the continued fraction; see logBetaCDF.
func logBetaDirect(a, b, x, y float64) float64 {
	return logBinomDensityReal(a, a+b, x, y) + math.Log(b/(a+b)) + math.Log(betaFraction(a, b, x))
}

// betaFraction evaluates the continued fraction for I_x(a, b),
//
//	1/(1+ d1/(1+ d2/(1+ ...))),
//	d(2m+1) = -(a+m)(a+b+m) x / ((a+2m)(a+2m+1)),
//	d(2m)   = m(b-m) x / ((a+2m-1)(a+2m)),
//
// by the modified Lentz algorithm (Lentz 1976; Thompson and Barnett 1986),
// to relative 1e-16, in at most 1e7 steps.
func betaFraction(a, b, x float64) float64 {
	const tiny = 1e-300
	clamp := func(v float64) float64 {
		if math.Abs(v) < tiny {
			return tiny
		}
		return v
	}
	// First convergent 1/(1 + d1), d1 = -(a+b) x / (a+1) (m = 0 of the odd
	// formula), then Lentz's updates for d2, d3, ...
	c, d := 1.0, 1/clamp(1-(a+b)*x/(a+1))
	f := d
	step := func(coef float64) float64 {
		d = 1 / clamp(1+coef*d)
		c = clamp(1 + coef/c)
		del := c * d
		f *= del
		return del
	}
	for m := 1.0; m < 1e7; m++ {
		step(m * (b - m) * x / ((a + 2*m - 1) * (a + 2*m)))
		del := step(-(a + m) * (a + b + m) * x / ((a + 2*m) * (a + 2*m + 1)))
		if math.Abs(del-1) < 1e-16 {
			break
		}
	}
	return f
}

// logBetaUpper returns ln(1 - I_x(a, b)) = ln P(B > x), B ~ Beta(a, b),
// with y = 1 - x given. Below the mean-like point (a+1)/(a+b+2) it is the
// complement of the direct continued fraction for I_x(a, b). Above it the
// upper tail is I_y(b, a), whose continued fraction in y converges there,
// but its first coefficient 1 - (a+b) y/(b+1) = (1 - a + (a+b) x)/(b+1)
// is a difference of numbers near 1 that loses about a factor 1/x of
// relative accuracy when x is small and b large. So while (a+b) x <= 1e5
// the lower tail is summed instead as the positive series
//
//	I_x(a, b) = x^a y^b / (a B(a, b)) * sum_j prod_{i<j} (a+b+i) x / (a+1+i),
//
// which needs about (a+b) x + 10 sqrt((a+b) x) + 40 terms, and the upper
// tail is its complement (relative error about 1e-16 / P(B > x)); where
// that complement is below 1e-3 and x >= 1e-3, the continued fraction in y
// is the more accurate (error about 1e-16 / x) and is used. Accuracy: about
// 1e-14 relative to max(1, |ln P|) except for upper tails far below 1e-3
// at x < 1e-3 with (a+b) x <= 1e5, where the complement keeps about
// 1e-16 / P(B > x).
func logBetaUpper(a, b, x, y float64) float64 {
	switch {
	case x <= 0:
		return 0
	case y <= 0:
		return math.Inf(-1)
	}
	if x*(a+b+2) < a+1 {
		return xmath.Log1mExp(logBetaDirect(a, b, x, y))
	}
	if (a+b)*x > 1e5 {
		return logBetaDirect(b, a, y, x)
	}
	sum, t := 1.0, 1.0
	for j := 0.0; j < 3e5; j++ {
		t *= (a + b + j) * x / (a + 1 + j)
		sum += t
		if t < 1e-17*sum {
			break
		}
	}
	lower := logBinomDensityReal(a, a+b, x, y) + math.Log(b/(a+b)) + math.Log(sum)
	up := xmath.Log1mExp(math.Min(lower, 0))
	if x >= 1e-3 && !(up > math.Log(1e-3)) {
		return logBetaDirect(b, a, y, x)
	}
	return up
}

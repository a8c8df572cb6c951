// Package beta evaluates the Beta distribution with real parameters in log
// space, as the Bayesian summaries of interval, test and power and the
// beta-binomial distribution of binom need: densities, both tails of the
// regularized incomplete beta function and their quantiles, with the
// log-Beta-function prefactors in the saddle-point form of Loader C (2000),
// "Fast and accurate computation of binomial probabilities", so that nothing
// cancels at parameters of 1e12.
//
// The incomplete beta evaluation is the one interval uses for the Jeffreys
// interval (continued fraction by the modified Lentz algorithm, a positive
// series for upper tails near 0); it lives here so that every package shares
// one implementation with one accuracy statement.
package beta

import (
	"math"

	"github.com/kofnlab/kofn/internal/xmath"
	"gonum.org/v1/gonum/mathext"
)

const lnSqrt2Pi = 0.91893853320467274178032973640562

// LogBinomReal returns the logarithm of the binomial density extended to
// real x, y >= 0 with m = x + y > 0,
//
//	Gamma(m+1) / (Gamma(x+1) Gamma(y+1)) p^x q^y,
//
// with q = 1-p given to full precision, in Loader's form
// se(m) - se(x) - se(y) - D(x, mp) - D(y, mq) - (1/2) ln(2 pi x y/m)
// (xmath.StirlingError se, xmath.Deviance D). Taking x and y rather than x
// and m keeps y exact when it is much smaller than x. At y = 0 it is
// m ln p, computed as -D(m, m p) - m q when q < 0.1 (Loader's end-point
// form), and symmetrically at x = 0. Accuracy: a few ulp relative to
// max(1, |result|).
func LogBinomReal(x, y, p, q float64) float64 {
	m := x + y
	switch {
	case x <= 0:
		if p < 0.1 {
			return -xmath.Deviance(m, m*q) - m*p
		}
		return m * xmath.Log(q)
	case y <= 0:
		if q < 0.1 {
			return -xmath.Deviance(m, m*p) - m*q
		}
		return m * xmath.Log(p)
	}
	lc := xmath.StirlingError(m) - xmath.StirlingError(x) - xmath.StirlingError(y) - xmath.Deviance(x, m*p) - xmath.Deviance(y, m*q)
	return lc - 0.5*(xmath.Log(x)+xmath.Log(y/m)) - lnSqrt2Pi // xmath.Log: y/m may be subnormal
}

// LogBinomRealShapes returns the part of LogBinomReal(x, y, p, q) that
// does not depend on p, for x, y > 0:
//
//	se(x+y) - se(x) - se(y) - (1/2) ln(2 pi x y/(x+y)),
//
// so that a sum over many p with the same x and y evaluates the Stirling
// errors once: LogBinomReal(x, y, p, q) = LogBinomRealFrom(c, x, y, p, q)
// with c = LogBinomRealShapes(x, y), to a few ulp.
func LogBinomRealShapes(x, y float64) float64 {
	m := x + y
	return xmath.StirlingError(m) - xmath.StirlingError(x) - xmath.StirlingError(y) - 0.5*(xmath.Log(x)+xmath.Log(y/m)) - lnSqrt2Pi
}

// LogBinomRealFrom returns LogBinomReal(x, y, p, q) for x, y > 0 from
// c = LogBinomRealShapes(x, y): c - D(x, m p) - D(y, m q), m = x + y.
func LogBinomRealFrom(c, x, y, p, q float64) float64 {
	m := x + y
	return c - xmath.Deviance(x, m*p) - xmath.Deviance(y, m*q)
}

// LogBeta returns ln B(a, b) for a, b > 0 as
//
//	ln B(a, b) = ln((a+b)/(a b)) - LogBinomReal(a, a+b, a/(a+b), b/(a+b)) + a ln(a/(a+b)) + b ln(b/(a+b)),
//
// whose only large terms are the last two (each rounded once), so the
// absolute error is a few ulp of |ln B| (lgamma differences lose
// |ln Gamma(a+b)| ulp instead).
func LogBeta(a, b float64) float64 {
	s := a + b
	p, q := a/s, b/s
	return math.Log(s/a) - math.Log(b) - LogBinomReal(a, b, p, q) + a*xmath.Log(p) + b*xmath.Log(q)
}

// LogDensityXY returns ln(x^a y^b / B(a, b)), y = 1 - x given: the Beta(a, b)
// density times x y, which is the derivative of I_x(a, b) with respect to
// the log-odds t = ln(x/y). It is LogBinomReal(a, b, x, y) + ln(a b/(a+b)).
func LogDensityXY(a, b, x, y float64) float64 {
	return LogBinomReal(a, b, x, y) + math.Log(a/(a+b)) + math.Log(b)
}

// LogPDF returns the logarithm of the Beta(a, b) density at x, y = 1 - x
// given, for x in (0, 1); at x = 0 or 1 it is the limit (+Inf, a finite
// value or -Inf as the exponent is below, equal to or above 1).
func LogPDF(a, b, x, y float64) float64 {
	switch {
	case x <= 0:
		return endLogPDF(a, b)
	case y <= 0:
		return endLogPDF(b, a)
	}
	return LogDensityXY(a, b, x, y) - xmath.Log(x) - xmath.Log(y)
}

func endLogPDF(a, b float64) float64 {
	switch {
	case a < 1:
		return math.Inf(1)
	case a > 1:
		return math.Inf(-1)
	}
	return math.Log(b) // density b (1-x)^(b-1) at x = 0
}

// LogCDF returns ln I_x(a, b) = ln P(B <= x) for B ~ Beta(a, b), with
// y = 1 - x supplied to full precision, x, y in [0, 1]. The smaller tail is
// evaluated directly,
//
//	I_x(a, b) = x^a y^b / (a B(a, b)) * cf = f(a; a+b, x) * b/(a+b) * cf,
//
// with the continued fraction cf (which converges fast for x below the
// point (a+1)/(a+b+2)); the larger as ln(1 - smaller) by LogUpper's
// evaluation. Accuracy about 1e-14 relative to max(1, |ln I|), from the
// prefactor's terms. Cost: the continued fraction takes O(sqrt(min(a, b)))
// steps near the centre, a handful in a far tail.
func LogCDF(a, b, x, y float64) float64 {
	switch {
	case x <= 0:
		return math.Inf(-1)
	case y <= 0:
		return 0
	}
	if x*(a+b+2) < a+1 {
		return logDirect(a, b, x, y)
	}
	return xmath.Log1mExp(math.Min(0, LogUpper(a, b, x, y)))
}

// LogUpper returns ln(1 - I_x(a, b)) = ln P(B > x), B ~ Beta(a, b), with
// y = 1 - x given. Below the point (a+1)/(a+b+2) it is the complement of the
// direct continued fraction for I_x(a, b). Above it the upper tail is
// I_y(b, a), whose continued fraction in y converges there, but its first
// coefficient 1 - (a+b) y/(b+1) is a difference of numbers near 1 that loses
// about a factor 1/x of relative accuracy when x is small and b large. So
// while x < 1/2 and (a+b) x <= 1e5 the lower tail is summed as the positive
// series (which converges at least as fast as the powers of x)
//
//	I_x(a, b) = x^a y^b / (a B(a, b)) * sum_j prod_{i<j} (a+b+i) x / (a+1+i)
//
// and the upper tail is its complement; where that complement is below 1e-3
// and x >= 1e-3 the continued fraction in y is the more accurate and is used.
// Accuracy: about 1e-14 relative to max(1, |ln P|) except for upper tails far
// below 1e-3 at x < 1e-3 with (a+b) x <= 1e5, where the complement keeps
// about 1e-16 / P(B > x).
func LogUpper(a, b, x, y float64) float64 {
	switch {
	case x <= 0:
		return 0
	case y <= 0:
		return math.Inf(-1)
	}
	if x*(a+b+2) < a+1 {
		return xmath.Log1mExp(math.Min(0, logDirect(a, b, x, y)))
	}
	if x >= 0.5 || (a+b)*x > 1e5 {
		return logDirect(b, a, y, x)
	}
	sum, t := 1.0, 1.0
	for j := 0.0; j < 3e5; j++ {
		t *= (a + b + j) * x / (a + 1 + j)
		sum += t
		if t < 1e-17*sum {
			break
		}
	}
	lower := LogBinomReal(a, b, x, y) + math.Log(b/(a+b)) + math.Log(sum)
	up := xmath.Log1mExp(math.Min(lower, 0))
	if x >= 1e-3 && !(up > math.Log(1e-3)) {
		return logDirect(b, a, y, x)
	}
	return up
}

// logDirect returns ln I_x(a, b) by the continued fraction; see LogCDF.
func logDirect(a, b, x, y float64) float64 {
	return LogBinomReal(a, b, x, y) + math.Log(b/(a+b)) + math.Log(fraction(a, b, x))
}

// fraction evaluates the continued fraction for I_x(a, b),
//
//	1/(1+ d1/(1+ d2/(1+ ...))),
//	d(2m+1) = -(a+m)(a+b+m) x / ((a+2m)(a+2m+1)),
//	d(2m)   = m(b-m) x / ((a+2m-1)(a+2m)),
//
// by the modified Lentz algorithm (Lentz 1976; Thompson and Barnett 1986),
// to relative 1e-16, in at most 1e7 steps.
func fraction(a, b, x float64) float64 {
	const tiny = 1e-300
	clamp := func(v float64) float64 {
		if math.Abs(v) < tiny {
			return tiny
		}
		return v
	}
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

// XY returns x = 1/(1+e^-t) and y = 1 - x = 1/(1+e^t) for log-odds t, both
// to full relative precision.
func XY(t float64) (x, y float64) {
	if t >= 0 {
		e := math.Exp(-t)
		return 1 / (1 + e), e / (1 + e)
	}
	e := math.Exp(t)
	return e / (1 + e), 1 / (1 + e)
}

// tMax bounds the log-odds searched: x = e^-745 is below the smallest double.
const tMax = 745.0

// Quantile returns the log-odds t = ln(x/(1-x)) of the point x with
// ln P(B <= x) = lp (upper false) or ln P(B > x) = lp (upper true), B ~
// Beta(a, b), lp < 0. Working on the log-odds scale keeps x and 1-x both to
// full precision.
//
// Method: ln I_x(a, b) is concave in t (the density of t, proportional to
// x^a y^b, is log-concave, and so is its distribution function; Prékopa
// 1973), increasing, and ln(1 - I_x) concave decreasing, so Newton's method
// on h(t) = ln F(t) - lp converges monotonically from below after at most
// one step and quadratically near the root (h'(t) = x^a y^b / (B F)); a
// bracket is kept and bisection replaces any step that leaves it. The start
// is the normal approximation of t on the log-odds scale, whose mean and
// variance are about ln(a/b) and 1/a + 1/b. Stops after a step below
// 1e-8 max(1, |t|), whose quadratic convergence leaves an error near 1e-16
// (or when the bracket collapses; at most 200 iterations). Accuracy: that of the tail
// evaluation, about 1e-14 relative in the tail probability, hence about
// 1e-14 / (d ln F / dt) in t. A quantile beyond the doubles (x or 1-x below
// e^-745, as for the e^-700 lower tail of Beta(1/2, 1/2)) comes back
// clamped near t = -745 or 745.
func Quantile(a, b, lp float64, upper bool) float64 {
	f := func(t float64) (h, dh float64) {
		x, y := XY(t)
		var l float64
		if upper {
			l = LogUpper(a, b, x, y)
		} else {
			l = LogCDF(a, b, x, y)
		}
		d := math.Exp(LogDensityXY(a, b, x, y) - l)
		if upper {
			d = -d
		}
		return l - lp, d
	}
	// Work with an increasing function g(t) = sign * h.
	sign := 1.0
	if upper {
		sign = -1
	}
	z := normalQuantileLog(lp)
	if upper {
		z = -z
	}
	t := math.Log(a/b) + z*math.Sqrt(1/a+1/b)
	t = math.Max(-tMax, math.Min(tMax, t))
	lo, hi := -tMax, tMax
	prevStep := math.Inf(1)
	for i := 0; i < 200; i++ {
		h, dh := f(t)
		g, dg := sign*h, sign*dh
		if g == 0 {
			return t
		}
		if g < 0 {
			lo = t
		} else {
			hi = t
		}
		var next float64
		if dg > 0 && !math.IsInf(g, 0) && !math.IsNaN(g) {
			next = t - g/dg
		} else {
			next = math.NaN()
		}
		if !(next > lo && next < hi) {
			next = lo + 0.5*(hi-lo)
		}
		step := math.Abs(next - t)
		scale := math.Max(1, math.Abs(t))
		// Converged: a step at rounding level, a collapsed bracket, or a
		// small step that no longer shrinks (the tail's rounding noise).
		// Newton converges quadratically here (h is smooth and its
		// derivative far from 0), so after a step below 1e-8 the next one
		// would be below about 1e-16: accept the point without it.
		if step <= 1e-8*scale || hi-lo <= 2e-16*scale || (step < 1e-13*scale && step > 0.5*prevStep) {
			return next
		}
		prevStep = step
		t = next
	}
	return t
}

// normalQuantileLog returns the standard normal quantile at probability
// e^lp, lp <= 0, as a starting point: gonum's NormalQuantile where e^lp is a
// normal double, the asymptotic -sqrt(-2 lp - ln(-4 pi lp)) beyond.
func normalQuantileLog(lp float64) float64 {
	if lp < -700 {
		return -math.Sqrt(-2*lp - math.Log(-4*math.Pi*lp))
	}
	p := math.Exp(lp)
	if p >= 1 {
		return 8.5
	}
	return mathext.NormalQuantile(p)
}

// Package root finds roots of monotone or bracketed scalar functions, as
// the interval bounds, tests and sample-size searches of kofn need.
//
// Every search is bracketed: the caller proves f(lo) and f(hi) have
// opposite signs (or one is zero) and the result stays inside [lo, hi].
// Iterations are bounded, so a search always ends.
package root

import (
	"errors"
	"math"
)

// ErrNoBracket is returned when f(lo) and f(hi) do not straddle zero.
var ErrNoBracket = errors.New("root: f(lo) and f(hi) have the same sign")

// maxIter bounds Brent's iterations; bisection alone halves a bracket of
// doubles to adjacent values in under 2100 steps, Brent is never slower
// than about twice bisection.
const maxIter = 4200

// Brent returns x in [lo, hi] with f(x) = 0 to within the tolerance
// |x - x*| <= 2*(relTol*|x| + absTol), by Brent's method (Brent 1973,
// Algorithms for Minimization without Derivatives, chapter 4): inverse
// quadratic interpolation and secant steps safeguarded by bisection. f(lo)
// and f(hi) must have opposite signs or one of them be zero; otherwise it
// returns ErrNoBracket. NaN values of f are treated as failures of the
// bracket and also return an error. relTol below 2^-52 is raised to it.
func Brent(f func(float64) float64, lo, hi, relTol, absTol float64) (float64, error) {
	if relTol < 0x1p-52 {
		relTol = 0x1p-52
	}
	a, b := lo, hi
	fa, fb := f(a), f(b)
	if math.IsNaN(fa) || math.IsNaN(fb) {
		return math.NaN(), errors.New("root: f is NaN at an end of the bracket")
	}
	if fa == 0 {
		return a, nil
	}
	if fb == 0 {
		return b, nil
	}
	if (fa > 0) == (fb > 0) {
		return math.NaN(), ErrNoBracket
	}
	c, fc := a, fa
	d := b - a
	e := d
	for i := 0; i < maxIter; i++ {
		if (fb > 0) == (fc > 0) {
			c, fc = a, fa
			d = b - a
			e = d
		}
		if math.Abs(fc) < math.Abs(fb) {
			a, b, c = b, c, b
			fa, fb, fc = fb, fc, fb
		}
		tol := 2*relTol*math.Abs(b) + absTol
		m := 0.5 * (c - b)
		if math.Abs(m) <= tol || fb == 0 {
			return b, nil
		}
		if math.Abs(e) >= tol && math.Abs(fa) > math.Abs(fb) {
			var p, q float64
			s := fb / fa
			if a == c {
				p = 2 * m * s
				q = 1 - s
			} else {
				qq := fa / fc
				r := fb / fc
				p = s * (2*m*qq*(qq-r) - (b-a)*(r-1))
				q = (qq - 1) * (r - 1) * (s - 1)
			}
			if p > 0 {
				q = -q
			} else {
				p = -p
			}
			if 2*p < math.Min(3*m*q-math.Abs(tol*q), math.Abs(e*q)) {
				e = d
				d = p / q
			} else {
				d = m
				e = m
			}
		} else {
			d = m
			e = m
		}
		a, fa = b, fb
		if math.Abs(d) > tol {
			b += d
		} else if m > 0 {
			b += tol
		} else {
			b -= tol
		}
		fb = f(b)
		if math.IsNaN(fb) {
			return math.NaN(), errors.New("root: f is NaN inside the bracket")
		}
	}
	return b, nil
}

// Bisect returns the boundary of a monotone predicate on [lo, hi]: the
// point x where ok changes from false (at lo) to true (at hi), to within
// |x - x*| <= relTol*|x| + absTol, by bisection in at most 2100 steps.
// It assumes ok(hi) is true and ok(lo) false and does not evaluate them.
// Use it where f is a step function (discrete p-values), for which Brent's
// interpolation gains nothing.
func Bisect(ok func(float64) bool, lo, hi, relTol, absTol float64) float64 {
	for i := 0; i < 2100; i++ {
		mid := lo + 0.5*(hi-lo)
		if mid <= lo || mid >= hi || hi-lo <= relTol*math.Abs(mid)+absTol {
			break
		}
		if ok(mid) {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi
}

// SmallestInt returns the smallest integer x in [lo, hi] with ok(x) true,
// for a predicate monotone in x (false ... false true ... true). It returns
// hi+1 when ok(hi) is false. O(log(hi-lo)) evaluations.
func SmallestInt(ok func(int64) bool, lo, hi int64) int64 {
	if lo > hi || !ok(hi) {
		return hi + 1
	}
	l, h := lo-1, hi
	for h-l > 1 {
		mid := l + (h-l)/2
		if ok(mid) {
			h = mid
		} else {
			l = mid
		}
	}
	return h
}

package interval

import (
	"math"

	"github.com/kofnlab/kofn/internal/onesample"
	"github.com/kofnlab/kofn/internal/root"
)

// blakerLowerT returns the log-odds of the lower limit of Blaker's (2000)
// interval, "Confidence curves and improved exact confidence intervals for
// discrete distributions", Canadian Journal of Statistics 28:783-798: the
// smallest p whose acceptability (the two-sided Blaker p-value of
// onesample.LogAcceptability) is at least alpha = 1 - Level.
//
// The acceptability lies between the observed tail P(X >= k) and twice
// it, so the limit lies between the two-sided Clopper-Pearson limit at the
// same level and the one-sided one at tail alpha; it is found there by
// blakerSearch, which works piece by piece on the acceptability (smooth
// between the integer steps of its opposite-tail index, with jumps at the
// steps), to 1e-15 relative in the log-odds whether the limit falls inside
// a piece or at a jump. Where the acceptability crosses alpha more than
// once in that range (the Blaker confidence set need not be an interval),
// the search returns one of the crossings; in every case checked it was
// the outermost, the limit of the set's hull: for every k of n <= 120 at
// levels 0.5, 0.8, 0.95 and 0.99 no p below it on a 400-point grid down to
// the Clopper-Pearson limit is accepted (TestBlakerHull checks n <= 30). The
// acceptability test is two-sided: one-sided Blaker bounds are the
// Clopper-Pearson ones.
func blakerLowerT(k, n int64, lv level) float64 {
	tcp := lowerT(ClopperPearson, k, n, lv)
	if lv.side != TwoSided {
		return tcp
	}
	// The acceptability lies between the observed tail P(X >= k) and twice
	// it, so the limit lies between the two-sided Clopper-Pearson limit and
	// the one-sided one at tail alpha.
	one := lv
	one.side, one.tail = LowerBound, 2*lv.tail
	// At levels below 1/2 that one-sided limit passes k/n; the search stops
	// there (the acceptability is not monotone beyond the estimate).
	hi := math.Min(lowerT(ClopperPearson, k, n, one), logOdds(float64(k)/float64(n)))
	if hi <= tcp {
		return tcp
	}
	bs := blakerSearch{k: k, n: n, la: math.Log(2 * lv.tail)} // alpha = 1 - Level
	return bs.solve(tcp, hi)
}

// blakerSearch finds where Blaker's log acceptability for k of n crosses
// la, the log of alpha, in the log-odds t. The acceptability is
// P(X < a) + P(X > b) with [a, b] the outcomes less extreme than k
// (onesample.BlakerRegion): smooth in t while the integers a and b stay
// fixed, with a jump where either changes. The search keeps a bracket
// whose ends carry their regions; while the regions differ by more than one
// step it bisects, when they differ by one step it finds the step by
// Brent's method on the smooth function that decides it and tells whether
// the crossing lies before, at or after the jump, and on a single piece it
// runs Brent's method on the smooth piece. Each evaluation costs about two
// binomial tails instead of the O(log n) of the full acceptability.
type blakerSearch struct {
	k, n int64
	la   float64
}

// region is a set of less extreme outcomes [a, b] at a point of the search
// and the sign-carrying value ln(acceptability) - ln(alpha) there.
type region struct {
	t, v float64
	a, b int64
}

// coords returns the distribution's p and whether the evaluation runs
// mirrored: above p = 1/2 every quantity is taken for n-k at the
// accurately held 1-p (the acceptability is symmetric, acc(k; p) =
// acc(n-k; 1-p)).
func (s *blakerSearch) coords(t float64) (p float64, mirror bool) {
	p, q := pq(t)
	if p > 0.5 {
		return q, true
	}
	return p, false
}

// at evaluates the region and the acceptability at t, starting the region
// search from the guess [ga, gb] (in k's coordinates).
func (s *blakerSearch) at(t float64, ga, gb int64) region {
	p, m := s.coords(t)
	if m {
		a, b, v := onesample.BlakerRegion(s.n-s.k, s.n, p, s.n-gb, s.n-ga)
		return region{t: t, v: v - s.la, a: s.n - b, b: s.n - a}
	}
	a, b, v := onesample.BlakerRegion(s.k, s.n, p, ga, gb)
	return region{t: t, v: v - s.la, a: a, b: b}
}

// piece returns ln(acceptability) - ln(alpha) at t for the fixed region r.
func (s *blakerSearch) piece(r region) func(float64) float64 {
	return func(t float64) float64 {
		p, m := s.coords(t)
		if m {
			return onesample.LogOutside(s.n, p, s.n-r.b, s.n-r.a) - s.la
		}
		return onesample.LogOutside(s.n, p, r.a, r.b) - s.la
	}
}

// margin returns ln smaller tail(j) - ln smaller tail(k) - ln(1 + RelTol)
// at t: positive while j is less extreme than k.
func (s *blakerSearch) margin(j int64) func(float64) float64 {
	rel := math.Log1p(onesample.RelTol)
	return func(t float64) float64 {
		p, m := s.coords(t)
		if m {
			return onesample.BlakerLogTail(s.n, p, s.n-j) - onesample.BlakerLogTail(s.n, p, s.n-s.k) - rel
		}
		return onesample.BlakerLogTail(s.n, p, j) - onesample.BlakerLogTail(s.n, p, s.k) - rel
	}
}

// solve returns the crossing in [lo, hi]: lo when the acceptability is
// already at least alpha there, hi when it stays below alpha.
func (s *blakerSearch) solve(lo, hi float64) float64 {
	// Guess for the region at lo: the opposite tail mirrors k about the
	// mean n p.
	p, _ := pq(lo)
	mu := float64(s.n) * p
	ga, gb := s.k+1, int64(2*mu)-s.k-1
	if float64(s.k) > mu {
		ga, gb = int64(2*mu)-s.k+1, s.k-1
	}
	L := s.at(lo, ga, gb)
	if !(L.v < 0) {
		return lo
	}
	H := s.at(hi, L.a, L.b)
	if !(H.v > 0) {
		return hi
	}
	for i := 0; i < 200; i++ {
		da, db := H.a-L.a, H.b-L.b
		switch {
		case da == 0 && db == 0:
			return brentOn(s.piece(L), L.t, H.t)
		case da == 1 && db == 0 || da == 0 && db == -1:
			j := L.a // the outcome that turns extreme at the step
			if db != 0 {
				j = L.b
			}
			if !(s.margin(j)(L.t) > 0) || s.margin(j)(H.t) > 0 {
				break // not a single step between the ends: bisect
			}
			st := brentOn(s.margin(j), L.t, H.t)
			left, right := s.piece(L)(st), s.piece(H)(st)
			switch {
			case left >= 0:
				return brentOn(s.piece(L), L.t, st)
			case right > 0:
				return st
			}
			return brentOn(s.piece(H), st, H.t)
		}
		mid := L.t + (H.t-L.t)/2
		if mid <= L.t || mid >= H.t {
			return H.t
		}
		M := s.at(mid, L.a+(H.a-L.a)/2, L.b+(H.b-L.b)/2)
		if M.v < 0 {
			L = M
		} else {
			H = M
		}
	}
	return H.t
}

// brentOn returns a root of f on [lo, hi], where f changes sign, to a
// relative tolerance of 1e-15 in t (bisection on the sign should f give
// NaN).
func brentOn(f func(float64) float64, lo, hi float64) float64 {
	x, err := root.Brent(f, lo, hi, 1e-15, 1e-15)
	if err != nil {
		x = root.Bisect(func(x float64) bool { return f(x) >= 0 }, lo, hi, 1e-15, 1e-15)
	}
	return x
}

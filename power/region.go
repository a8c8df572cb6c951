package power

import (
	"math"

	"github.com/kofnlab/kofn/internal/onesample"
	"github.com/kofnlab/kofn/internal/xmath"
)

// region tracks the acceptance region [lo, hi] of a one-sample exact test
// (onesample's rule: k is accepted when its p-value is at least alpha) as
// n grows by one, so that a whole power curve costs a few p-values per n
// instead of a search per n.
//
// One-sided tests move their single boundary by 0 or 1 per step, provably:
// for the upper test X_{n+1} = X_n + B gives P_{n+1}(X >= k) >=
// P_n(X >= k) >= P_{n+1}(X >= k+1), and the same holds for the mid-p
// averages and mirrored for the lower test; so one p-value decides the
// step. Two-sided boundaries are found by a short walk from the previous
// ones, each certified by the p-values on both sides of it (the region is
// an interval); a walk longer than walkLimit, or an empty region, falls
// back to onesample.Acceptance.
type region struct {
	t      onesample.Test
	alpha  float64
	la     float64
	n      int64
	lo, hi int64
	null   *tailPair // rejection tails at p0, for predicting the next region
}

const walkLimit = 6

func newRegion(t onesample.Test, alpha float64) *region {
	return &region{t: t, alpha: alpha, la: xmath.Log(alpha), n: -1}
}

// ok reports whether k is accepted at n trials.
func (r *region) ok(k, n int64) bool {
	lp, err := onesample.LogPValue(k, n, r.t)
	return err == nil && lp >= r.la
}

// full sets the region at n by onesample.Acceptance.
func (r *region) full(n int64) {
	lo, hi, err := onesample.Acceptance(n, r.alpha, r.t)
	if err != nil { // unreachable after validation; reject nothing
		lo, hi = 0, n
	}
	r.n, r.lo, r.hi = n, lo, hi
}

// at moves the region to n trials (n >= 0) and returns it.
func (r *region) at(n int64) (lo, hi int64) {
	if r.n < 0 || n != r.n+1 || r.lo > r.hi {
		r.full(n)
		return r.lo, r.hi
	}
	r.n = n
	switch r.t.Alternative {
	case onesample.Higher:
		r.lo = 0
		if r.hi+1 <= n && r.ok(r.hi+1, n) {
			r.hi++
		}
	case onesample.Lower:
		r.hi = n
		if !r.ok(r.lo, n) {
			r.lo++
		}
	case onesample.TwoSided:
		if r.t.Rule == onesample.Central && r.hi-r.lo >= 2 {
			// Each boundary is a one-sided boundary at alpha/2 (the doubled
			// smaller tail): the same 0-or-1 step holds while the region
			// keeps at least three outcomes, so neither boundary's
			// opposite tail can be the smaller one.
			if !r.ok(r.lo, n) {
				r.lo++
			}
			if r.hi+1 <= n && r.ok(r.hi+1, n) {
				r.hi++
			}
			break
		}
		if r.t.Rule == onesample.PointProbability {
			if lo, hi, ok := r.certify(n); ok {
				r.lo, r.hi = lo, hi
				break
			}
			r.full(n)
			break
		}
		if r.t.Rule == onesample.Blaker {
			// Blaker's p-value is P(e(X) <= e(k)) for the smaller tail
			// e(k) = min(P(X <= k), P(X >= k)), also unimodal in k, so the
			// same two-decision certificate applies with e for f.
			d := binomDist(n, r.t.P0)
			e := func(k int64) float64 { return math.Min(d.LogCDF(k), d.LogSurvival(k-1)) }
			if lo, hi, ok := certifyInterval(func(k int64) bool { return r.ok(k, n) }, e, 0, n, min(r.lo, n), min(r.hi, n)); ok {
				r.lo, r.hi = lo, hi
				break
			}
			r.full(n)
			break
		}
		lo, okLo := r.walkLo(n)
		hi, okHi := r.walkHi(n)
		if !okLo || !okHi || lo > hi {
			r.full(n)
		} else {
			r.lo, r.hi = lo, hi
		}
	}
	return r.lo, r.hi
}

// walkLo finds the smallest accepted k near the previous lower boundary.
func (r *region) walkLo(n int64) (int64, bool) {
	c := min(r.lo, n)
	if r.ok(c, n) {
		for i := 0; c > 0; i++ {
			if i == walkLimit {
				return 0, false
			}
			if !r.ok(c-1, n) {
				return c, true
			}
			c--
		}
		return 0, true
	}
	for i := 0; i < walkLimit && c < n; i++ {
		c++
		if r.ok(c, n) {
			return c, true
		}
	}
	return 0, false
}

// walkHi finds the largest accepted k near the previous upper boundary.
func (r *region) walkHi(n int64) (int64, bool) {
	c := min(r.hi, n)
	if r.ok(c, n) {
		for i := 0; c < n; i++ {
			if i == walkLimit {
				return 0, false
			}
			if !r.ok(c+1, n) {
				return c, true
			}
			c++
		}
		return n, true
	}
	for i := 0; i < walkLimit && c > 0; i++ {
		c--
		if r.ok(c, n) {
			return c, true
		}
	}
	return 0, false
}

// certify moves a two-sided point-probability region to n; see
// certifyInterval.
//
// The starting guess is predicted, not decided: with the size S (the null
// probability outside the candidate region, carried by recurrence), the
// most likely outcome outside has p-value S and the least likely end
// inside S + its probability, so the candidate is widened while S >=
// alpha and narrowed while S + f(end) < alpha. The prediction is right
// except at ties, and then the certification corrects it; it saves most
// of the extra decisions a moving boundary would cost.
func (r *region) certify(n int64) (lo, hi int64, ok bool) {
	d := binomDist(n, r.t.P0)
	lo, hi = min(r.lo, n), min(r.hi, n)
	if r.null == nil {
		r.null = newTailPair(r.t.P0)
	}
	if !r.t.MidP && lo <= hi {
		s := r.null.at(n, lo, hi)
		lp := func(k int64) float64 {
			if k < 0 || k > n {
				return math.Inf(-1)
			}
			return d.LogProb(k)
		}
		const tol = 1e-7 // onesample's relative tolerance, in log space
		// pAt predicts the p-value of an outcome with log probability f:
		// the outside mass plus the ends of the candidate no more likely.
		pAt := func(f float64) float64 {
			p := s
			if el := lp(lo); el <= f+tol {
				p += math.Exp(el)
			}
			if eh := lp(hi); hi != lo && eh <= f+tol {
				p += math.Exp(eh)
			}
			return p
		}
		for i := 0; i < 4 && lo <= hi; i++ {
			fl, fh := lp(lo-1), lp(hi+1)
			if fo := math.Max(fl, fh); fo > math.Inf(-1) && pAt(fo) >= r.alpha {
				// The most likely outside outcome (both when tied) is accepted.
				if fl >= fo-tol {
					s -= math.Exp(fl)
					lo--
				}
				if fh >= fo-tol {
					s -= math.Exp(fh)
					hi++
				}
				continue
			}
			el, eh := lp(lo), lp(hi)
			if lo < hi {
				if fi := math.Min(el, eh); pAt(fi) < r.alpha {
					// The least likely end (both when tied) is rejected.
					if el <= fi+tol {
						s += math.Exp(el)
						lo++
					}
					if eh <= fi+tol {
						s += math.Exp(eh)
						hi--
					}
					continue
				}
			}
			break
		}
		lo, hi = max(lo, 0), min(hi, n)
	}
	return certifyInterval(func(k int64) bool { return r.ok(k, n) }, d.LogProb, 0, n, lo, hi)
}

// certifyInterval returns the acceptance interval of a two-sided
// point-probability test over the support sLo..sHi, starting from the
// guess [lo, hi]. Its p-value p(k) = P(f(X) <= f(k)) is a non-decreasing
// function of the outcome's probability f(k) (mid-p too), and f is
// unimodal, so [lo, hi] is exact when the more likely of the two outcomes
// just outside it is rejected (then so is everything beyond) and the less
// likely of its two end outcomes is accepted (then so is everything
// inside): two decisions of the test, ok(k). A failed check moves the
// corresponding end by one and checks again, with decisions cached; it
// gives up (ok = false) after walkLimit moves.
func certifyInterval(accept func(int64) bool, logProb func(int64) float64, sLo, sHi, lo, hi int64) (int64, int64, bool) {
	var cache [8]struct {
		k  int64
		ok bool
	}
	nc := 0
	accepted := func(k int64) bool {
		for i := 0; i < nc; i++ {
			if cache[i].k == k {
				return cache[i].ok
			}
		}
		v := accept(k)
		if nc < len(cache) {
			cache[nc].k, cache[nc].ok = k, v
			nc++
		}
		return v
	}
	for moves := 0; moves <= walkLimit; moves++ {
		if lo > hi || lo < sLo || hi > sHi {
			return 0, 0, false
		}
		// Outside: the more likely of lo-1 and hi+1.
		out, fo := sLo-1, math.Inf(-1)
		if lo > sLo {
			out, fo = lo-1, logProb(lo-1)
		}
		if hi < sHi {
			if f := logProb(hi + 1); out < sLo || f > fo {
				out = hi + 1
			}
		}
		if out >= sLo && accepted(out) {
			if out < lo {
				lo--
			} else {
				hi++
			}
			continue
		}
		// Inside: the less likely of lo and hi.
		in := lo
		if hi != lo && logProb(hi) < logProb(lo) {
			in = hi
		}
		if !accepted(in) {
			if in == lo {
				lo++
			} else {
				hi--
			}
			continue
		}
		return lo, hi, true
	}
	return 0, 0, false
}

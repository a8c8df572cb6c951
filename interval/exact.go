package interval

import (
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/root"
	"github.com/kofnlab/kofn/internal/xmath"
)

// The limits found by root finding are searched on the log-odds scale
// t = ln(p/(1-p)): p = 1/(1+e^-t) and 1-p = 1/(1+e^t) are then both held to
// full relative precision, so a lower limit of 1e-13 and an upper limit of
// 1 - 1e-13 are equally accurate, and the upper limit for k is obtained as
// 1 minus the lower limit for n-k without cancellation: every method here is
// symmetric under k -> n-k, p -> 1-p.

// tMax bounds the log-odds searched: expit(-700) = 1e-304 is far below any
// limit a valid level produces (at least about 1e-17/n).
const tMax = 700

// pq returns p and 1-p for log-odds t.
func pq(t float64) (p, q float64) {
	e := math.Exp(-t)
	return 1 / (1 + e), e / (1 + e)
}

// logOdds returns ln(p/(1-p)) for a guess p in (0, 1), clamped to +-tMax.
func logOdds(p float64) float64 {
	t := math.Log(p) - math.Log1p(-p)
	if !(t > -tMax) { // also NaN
		return -tMax
	}
	return math.Min(t, tMax)
}

// solveIncreasing returns the root of f, increasing on [-tMax, tMax],
// starting from the guess t0: it steps away from t0 with growing steps
// until the sign changes, then runs Brent's method on the bracket to a
// relative tolerance of 1e-15 (absolute 1e-15 near t = 0). If f has no sign
// change on [-tMax, tMax] the nearer end is returned.
func solveIncreasing(f func(float64) float64, t0 float64) float64 {
	return solveIncreasingStep(f, t0, 1e-4*(1+math.Abs(t0)))
}

// solveIncreasingStep is solveIncreasing with the first step of the
// bracket search given (it grows fourfold each time).
func solveIncreasingStep(f func(float64) float64, t0, step float64) float64 {
	t0 = math.Max(-tMax, math.Min(tMax, t0))
	f0 := f(t0)
	if f0 == 0 {
		return t0
	}
	lo, hi, flo, fhi := t0, t0, f0, f0
	if f0 < 0 {
		for fhi < 0 {
			lo, flo = hi, fhi
			if hi >= tMax {
				return tMax
			}
			hi = math.Min(hi+step, tMax)
			fhi = f(hi)
			step *= 4
		}
	} else {
		for flo > 0 {
			hi, fhi = lo, flo
			if lo <= -tMax {
				return -tMax
			}
			lo = math.Max(lo-step, -tMax)
			flo = f(lo)
			step *= 4
		}
	}
	// Brent evaluates both ends again; serve them from the bracket search.
	g := func(x float64) float64 {
		switch x {
		case lo:
			return flo
		case hi:
			return fhi
		}
		return f(x)
	}
	t, err := root.Brent(g, lo, hi, 1e-15, 1e-15)
	if err != nil {
		// Only a NaN from f gets here; fall back to bisection on the sign.
		t = root.Bisect(func(x float64) bool { return f(x) >= 0 }, lo, hi, 1e-15, 1e-15)
	}
	return t
}

// logGE returns ln P(X >= k) for X ~ Binomial(n, p), where q = 1-p is
// supplied to full precision: for p > 1/2 it is computed as the lower tail
// of the failures, ln P(F <= n-k) with F ~ Binomial(n, q).
func logGE(k, n int64, p, q float64) float64 {
	if p <= 0.5 {
		return logTail(k-1, n, p, true)
	}
	return logTail(n-k, n, q, false)
}

// logPoint returns ln P(X = k) for X ~ Binomial(n, p), with q = 1-p.
func logPoint(k, n int64, p, q float64) float64 {
	if p <= 0.5 {
		return binom.Dist{N: n, P: p}.LogProb(k)
	}
	return binom.Dist{N: n, P: q}.LogProb(n - k)
}

// logTail returns ln P(X > j) (upper) or ln P(X <= j) for X ~ Binomial(n, s),
// s <= 1/2, from package binom.
func logTail(j, n int64, s float64, upper bool) float64 {
	d := binom.Dist{N: n, P: s}
	if upper {
		return d.LogSurvival(j)
	}
	return d.LogCDF(j)
}

// exactLower returns the lower limit for k of a method found by root
// finding: expit of lowerT.
func exactLower(m Method, k, n int64, lv level) float64 {
	if m == Jeffreys && k > 0 && 2*(n-k) < n {
		return expit(-jeffreysUpperT(n-k, n, lv)) // 1 - U(n-k), see jeffreysUpperT
	}
	return expit(lowerT(m, k, n, lv))
}

// exactUpper returns the upper limit for k by the symmetry of every
// root-found method, U(k, n) = 1 - L(n-k, n), taken on the log-odds scale
// as expit(-t) so that it keeps full precision. U = 1 at k = n.
func exactUpper(m Method, k, n int64, lv level) float64 {
	if m == Jeffreys && k < n && 2*k < n {
		return expit(jeffreysUpperT(k, n, lv))
	}
	return expit(-lowerT(m, n-k, n, lv))
}

// jeffreysUpperT returns the log-odds of the Jeffreys upper limit for
// 2k < n, found directly as the U with P(Beta(k+1/2, n-k+1/2) > U) = a from
// logBetaUpper: through the mirror image the small tail would be evaluated
// in 1 - U. The lower limit for n-k is its mirror, expit(-t).
func jeffreysUpperT(k, n int64, lv level) float64 {
	a, b := float64(k)+0.5, float64(n-k)+0.5
	la := math.Log(lv.tail)
	// tailRoot on ln a - ln P(B > U), whose derivative in t is the beta
	// density over the upper tail, betaDensity / P(B > U).
	return tailRoot(func(t float64, withH bool) (f, h float64) {
		p, q := pq(t)
		lu := logBetaUpper(a, b, p, q)
		if withH {
			h = math.Exp(logBetaDensity(a, b, p, q) - lu)
		}
		return la - lu, h
	}, tailODE{A: a, B: a + b, s: -1}, logOdds(wilsonUpper(k, n, lv.z)))
}

// endT returns the log-odds of p = e^lp, for a closed-form limit p near 1.
func endT(lp float64) float64 { return lp - math.Log(-math.Expm1(lp)) }

// lowerT returns the log-odds t of the lower limit for k of a method found
// by root finding (Clopper-Pearson, mid-p, Jeffreys, likelihood ratio,
// Blaker); -Inf (the limit 0) at k = 0. With a the tail probability:
//
//	Clopper-Pearson:  P(X >= k; L) = a                  (a^(1/n) at k = n)
//	mid-p:            P(X > k; L) + P(X = k; L)/2 = a   ((2a)^(1/n) at k = n)
//	Jeffreys:         I_L(k + 1/2, n - k + 1/2) = a     (the Beta quantile)
//	likelihood ratio: 2[l(k/n) - l(L)] = z^2, L < k/n  (e^(-z^2/(2n)) at k = n)
//	Blaker:           the smallest p whose Blaker p-value exceeds 1 - Level
func lowerT(m Method, k, n int64, lv level) float64 {
	if k == 0 {
		return math.Inf(-1)
	}
	la := math.Log(lv.tail)
	fn := float64(n)
	switch m {
	case ClopperPearson:
		if k == n {
			return endT(la / fn)
		}
		// P(X >= k) = I_p(k, n-k+1): tailRoot on ln P(X >= k) - ln a, with
		// d/dt ln P(X >= k) = k (1-p) b(k; n, p) / P(X >= k), from the Wilson
		// guess with continuity correction.
		fk := float64(k)
		return tailRoot(func(t float64, withH bool) (f, h float64) {
			p, q := pq(t)
			lg := logGE(k, n, p, q)
			if withH {
				h = fk * q * math.Exp(logPoint(k, n, p, q)-lg)
			}
			return lg - la, h
		}, tailODE{A: fk, B: float64(n) + 1, s: 1}, logOdds(wilsonCCLower(k, n, lv.z)))
	case MidP:
		if k == n {
			return endT((la + math.Ln2) / fn)
		}
		return solveIncreasing(func(t float64) float64 {
			p, q := pq(t)
			return xmath.LogAddExp(logGE(k+1, n, p, q), logPoint(k, n, p, q)-math.Ln2) - la
		}, logOdds(wilsonLower(k, n, lv.z)))
	case Jeffreys:
		a, b := float64(k)+0.5, float64(n-k)+0.5
		return tailRoot(func(t float64, withH bool) (f, h float64) {
			p, q := pq(t)
			lc := logBetaCDF(a, b, p, q)
			if withH {
				h = math.Exp(logBetaDensity(a, b, p, q) - lc)
			}
			return lc - la, h
		}, tailODE{A: a, B: a + b, s: 1}, logOdds(wilsonLower(k, n, lv.z)))
	case LikelihoodRatio:
		if k == n {
			return endT(-lv.z * lv.z / (2 * fn))
		}
		fk, fnk := float64(k), float64(n-k)
		return solveIncreasing(func(t float64) float64 {
			p, q := pq(t)
			d := 2 * (xmath.Deviance(fk, fn*p) + xmath.Deviance(fnk, fn*q))
			r := math.Sqrt(math.Max(d, 0))
			if fn*p < fk {
				r = -r
			}
			return r + lv.z
		}, logOdds(wilsonLower(k, n, lv.z)))
	case Blaker:
		return blakerLowerT(k, n, lv)
	}
	return math.NaN() // unreachable for a validated method
}

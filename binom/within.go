package binom

import (
	"math"
	"math/big"
	"strconv"
)

// ProportionWithin returns the probability that the sample proportion X/N
// lies within halfWidth of P, boundaries included:
//
//	P(|X/N - P| <= halfWidth) = P(kmin <= X <= kmax),
//	kmin = ceil(N (P - halfWidth)),  kmax = floor(N (P + halfWidth)),
//
// the exact precision of the empirical estimator X/N (the probability
// that an estimate from N trials misses P by no more than halfWidth).
//
// Boundaries are decided as the caller means them: P and halfWidth are read as
// the shortest decimals that print them (strconv.FormatFloat(x, 'g', -1,
// 64): 0.3 and 0.1, not their binary neighbours) and compared with k/N in
// exact rational arithmetic. For N = 50, P = 0.3, halfWidth = 0.1 that counts
// k = 10 through 20 (probability 0.9120); a floating-point comparison,
// where 0.3 + 0.1 > 0.4, would drop k = 20. The probability of the range
// itself uses the binomial with the double P, by one ProbRange call.
//
// Special cases: halfWidth < 0 gives 0; N = 0 gives 0 (no trials, no estimate);
// otherwise halfWidth >= 1 (+Inf included) gives 1; halfWidth NaN, or an invalid Dist,
// gives NaN (the only NaN). Accuracy: that of ProbRange; cost: one range
// probability (the PMF when the range is one point) plus a few exact
// rational operations.
func (d Dist) ProportionWithin(halfWidth float64) float64 {
	if !d.valid() || math.IsNaN(halfWidth) {
		return math.NaN()
	}
	switch {
	case halfWidth < 0 || d.N == 0:
		return 0
	case halfWidth >= 1:
		return 1
	}
	lo, hi := withinRange(d.N, d.P, halfWidth)
	switch {
	case lo > hi:
		return 0
	case lo == hi: // halfWidth = 0 or a short range: the PMF itself, cheaper
		return d.Prob(lo)
	}
	return d.ProbRange(lo, hi)
}

// withinRange returns kmin = max(0, ceil(n (p - halfWidth))) and
// kmax = min(n, floor(n (p + halfWidth))) with p and halfWidth read as their shortest
// decimals, for n >= 1 and finite halfWidth in [0, 1).
func withinRange(n int64, p, halfWidth float64) (kmin, kmax int64) {
	pr, er := shortestRat(p), shortestRat(halfWidth)
	nr := new(big.Rat).SetInt64(n)
	a := new(big.Rat).Mul(nr, new(big.Rat).Sub(pr, er))
	b := new(big.Rat).Mul(nr, new(big.Rat).Add(pr, er))
	kmin = clampInt(ratCeil(a), 0, n)
	kmax = clampInt(ratFloor(b), 0, n)
	return kmin, kmax
}

// shortestRat returns the shortest decimal that prints x, as an exact
// rational number; x must be finite.
func shortestRat(x float64) *big.Rat {
	r, ok := new(big.Rat).SetString(strconv.FormatFloat(x, 'g', -1, 64))
	if !ok { // unreachable for finite x; fall back to the binary value
		r = new(big.Rat).SetFloat64(x)
	}
	return r
}

// ratFloor returns floor(r).
func ratFloor(r *big.Rat) *big.Int {
	// big.Int.Div is Euclidean: with a positive denominator the quotient
	// is the floor, negative numerators included.
	return new(big.Int).Div(r.Num(), r.Denom())
}

// ratCeil returns ceil(r).
func ratCeil(r *big.Rat) *big.Int {
	q := ratFloor(r)
	if !r.IsInt() {
		q.Add(q, big.NewInt(1))
	}
	return q
}

// clampInt returns v clamped to [lo, hi] as an int64.
func clampInt(v *big.Int, lo, hi int64) int64 {
	switch {
	case v.Cmp(big.NewInt(lo)) < 0:
		return lo
	case v.Cmp(big.NewInt(hi)) > 0:
		return hi
	}
	return v.Int64()
}

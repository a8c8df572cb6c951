package binom

import (
	"math"
	"math/big"
)

// Mean returns E[X] = n K / N (0 when N = 0), NaN for an invalid Hyper.
func (h Hyper) Mean() float64 {
	if !h.valid() {
		return math.NaN()
	}
	if h.Total == 0 {
		return 0
	}
	return ratFloat(mulInts(h.Draws, h.Successes), mulInts(h.Total))
}

// Variance returns
//
//	Var X = n (K/N) ((N-K)/N) ((N-n)/(N-1)),
//
// computed in exact integer arithmetic and rounded once (0 when N <= 1).
// NaN for an invalid Hyper.
func (h Hyper) Variance() float64 {
	if !h.valid() {
		return math.NaN()
	}
	N, K, n := h.Total, h.Successes, h.Draws
	if N <= 1 {
		return 0
	}
	return ratFloat(mulInts(n, K, N-K, N-n), mulInts(N, N, N-1))
}

// StdDev returns sqrt(Variance()).
func (h Hyper) StdDev() float64 { return math.Sqrt(h.Variance()) }

// Skewness returns the skewness E[(X-mu)^3] / sigma^3,
//
//	(N-2K) (N-2n) sqrt(N-1) / ((N-2) sqrt(n K (N-K) (N-n))),
//
// from its square in exact integer arithmetic (two roundings). It is 0 when
// N = 2K or N = 2n (a symmetric distribution). When the support is a single
// point (variance 0) the skewness is 0/0, mathematically undefined, and
// Skewness returns NaN; that is the only NaN for a valid Hyper.
func (h Hyper) Skewness() float64 {
	if !h.valid() {
		return math.NaN()
	}
	N, K, n := h.Total, h.Successes, h.Draws
	if lo, hi := h.Support(); lo == hi {
		return math.NaN()
	}
	if N == 2*K || N == 2*n {
		return 0
	}
	a, b := N-2*K, N-2*n
	s := math.Sqrt(ratFloat(mulInts(a, a, b, b, N-1), mulInts(N-2, N-2, n, K, N-K, N-n)))
	if (a < 0) != (b < 0) {
		s = -s
	}
	return s
}

// ExKurtosis returns the excess kurtosis E[(X-mu)^4] / sigma^4 - 3,
//
//	[(N-1) N^2 (N(N+1) - 6K(N-K) - 6n(N-n)) + 6 n K (N-K) (N-n) (5N-6)]
//	  / [n K (N-K) (N-n) (N-2) (N-3)],
//
// in exact integer arithmetic, rounded once. For N = 2 and 3 (where the
// formula is 0/0) the distribution is a two-point one and the value is -2
// and -3/2. A single-point support gives NaN (0/0, undefined), the only
// NaN for a valid Hyper.
func (h Hyper) ExKurtosis() float64 {
	if !h.valid() {
		return math.NaN()
	}
	N, K, n := h.Total, h.Successes, h.Draws
	if lo, hi := h.Support(); lo == hi {
		return math.NaN()
	}
	switch N {
	case 2:
		return -2
	case 3:
		return -1.5
	}
	inner := new(big.Int).Sub(mulInts(N, N+1), mulInts(6, K, N-K))
	inner.Sub(inner, mulInts(6, n, N-n))
	num := inner.Mul(inner, mulInts(N-1, N, N))
	num.Add(num, mulInts(6, n, K, N-K, N-n, 5*N-6))
	return ratFloat(num, mulInts(n, K, N-K, N-n, N-2, N-3))
}

// Entropy returns the Shannon entropy in nats, -sum_x P(X = x) ln P(X = x),
// summed over the terms around the mode that matter (outward by the PMF
// ratio, re-anchored every 64 terms, until the rest is below 1e-34 of the
// sum), as ln S - (1/S) sum t ln t with t = P(X = x)/P(X = mode); from a
// standard deviation of 64 on, every (sd/8)-th term only (see
// entropyStrided: by Poisson summation the omitted lattice points change
// nothing at double precision). A single-point support gives 0; an invalid
// Hyper NaN. Accuracy: about 1e-14 relative, checked against mpmath
// (testdata/binom_extra_entropy.tsv, to a standard deviation of 32768).
// Cost: O(standard deviation) terms below 64, about 200 LogProb calls
// from there on (so under 0.1 ms at MaxHyperStdDev).
func (h Hyper) Entropy() float64 {
	if !h.valid() {
		return math.NaN()
	}
	lo, hi := h.Support()
	if lo == hi {
		return 0
	}
	if sd := h.StdDev(); sd >= entropyStrideMinSD {
		return h.entropyStrided(int64(sd / 8))
	}
	// s sums the terms off the mode (t = 1 there), kept apart so that a
	// near point mass keeps its tiny entropy to full relative accuracy.
	var s, sl float64
	w := h.centralWeights()
	w.logRangeAtMode(lo, hi, func(j int64, t float64) {
		if j != w.mode && t > 0 {
			s += t
			sl += t * math.Log(t)
		}
	})
	return math.Log1p(s) - sl/(1+s)
}

// entropyStrideMinSD is the standard deviation from which Hyper.Entropy
// sums every m-th term only (m = sd/8).
const entropyStrideMinSD = 64

// entropyStrided returns the entropy from the terms at x = mode + j m
// (j = 0, +-1, ...) as m times their sum. By the Poisson summation formula
// a lattice sum of a smooth function of width sd differs from m times its
// samples at spacing m by the function's Fourier transform at multiples
// of 1/m, of order exp(-2 pi^2 (sd/m)^2) = exp(-2 pi^2 64) relative here
// (the PMF's gamma-function extension is analytic in a strip about the
// real axis, and the support's ends lie at least sd^2 from the mode's
// neighbourhood where the terms matter, since sd >= 64). Each term comes
// from LogProb; the walk stops once a term is below e^-80 of the mode's.
func (h Hyper) entropyStrided(m int64) float64 {
	lo, hi := h.Support()
	mode := h.Mode()
	l0 := h.logProb(mode)
	var s, sl float64 // off the mode, as in Entropy
	for _, dir := range []int64{-1, 1} {
		for x := mode + dir*m; x >= lo && x <= hi; x += dir * m {
			lt := h.logProb(x) - l0
			if lt < -80 {
				break
			}
			t := math.Exp(lt)
			s += t
			sl += t * lt
		}
	}
	// The mode's sample (t = 1) has weight m too: S = m (1 + s) and
	// sum t ln t = m sl, so H = ln m + ln(1 + s) - sl/(1 + s).
	return math.Log(float64(m)) + math.Log1p(s) - sl/(1+s)
}

// mulInts returns the exact product of its arguments.
func mulInts(xs ...int64) *big.Int {
	p := big.NewInt(1)
	var t big.Int
	for _, x := range xs {
		p.Mul(p, t.SetInt64(x))
	}
	return p
}

// ratFloat returns num/den rounded to the nearest float64.
func ratFloat(num, den *big.Int) float64 {
	f, _ := new(big.Rat).SetFrac(num, den).Float64()
	return f
}

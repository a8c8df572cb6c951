package binom

import (
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
)

// MaxN is the largest number of trials a Dist accepts: 2^53, the largest
// count that float64 arithmetic represents exactly together with all
// smaller counts.
const MaxN int64 = 1 << 53

// Dist is the binomial distribution of the number of successes X in N
// independent trials with success probability P each:
//
//	P(X = k) = C(N, k) P^k (1-P)^(N-k),  k = 0, ..., N.
//
// Build it with New, which validates. A Dist built by hand with N outside
// [0, MaxN] or P outside [0, 1] (or NaN) makes every method return NaN
// (or -1 for the integer-valued ones); no method panics.
type Dist struct {
	N int64   // number of trials, 0 <= N <= MaxN
	P float64 // success probability per trial, 0 <= P <= 1
}

// New returns the binomial distribution with n trials and success
// probability p. It fails with ErrInvalidArgument when n < 0 or p is not in
// [0, 1] (NaN included), and with ErrTooLarge when n > MaxN.
func New(n int64, p float64) (Dist, error) {
	if err := argerr.Count("binom.New", "n", n); err != nil {
		return Dist{}, err
	}
	if n > MaxN {
		return Dist{}, argerr.TooLarge("binom.New", "n", n, "exceeds 2^53, the largest count held exactly in float64")
	}
	if err := argerr.Prob("binom.New", "p", p); err != nil {
		return Dist{}, err
	}
	return Dist{N: n, P: p}, nil
}

// valid reports whether d's parameters are in the domain New accepts.
func (d Dist) valid() bool {
	return d.N >= 0 && d.N <= MaxN && d.P >= 0 && d.P <= 1
}

// Mean returns N P (one rounding); NaN only for an invalid Dist.
func (d Dist) Mean() float64 {
	if !d.valid() {
		return math.NaN()
	}
	return float64(d.N) * d.P
}

// Variance returns N P (1-P), within a few units in the last place; 0 for
// a point mass (N = 0, P = 0 or P = 1); NaN only for an invalid Dist.
func (d Dist) Variance() float64 {
	if !d.valid() {
		return math.NaN()
	}
	return float64(d.N) * d.P * (1 - d.P)
}

// StdDev returns sqrt(N P (1-P)).
func (d Dist) StdDev() float64 { return math.Sqrt(d.Variance()) }

// Mode returns floor((N+1) P), a most probable value, decided exactly
// (the product is compensated with math.FMA, so an exact integer (N+1)P is
// not pushed across by rounding). When (N+1)P is an integer m in [1, N]
// both m-1 and m are modes and Mode returns m; for P = 1 it returns N.
func (d Dist) Mode() int64 {
	if !d.valid() {
		return -1
	}
	if d.P == 1 {
		return d.N
	}
	a := float64(d.N + 1)
	prod := a * d.P
	fl := math.Floor(prod)
	if prod == fl && math.FMA(a, d.P, -prod) < 0 {
		fl-- // the exact product lies just below the integer it rounded to
	}
	m := int64(fl)
	if m > d.N {
		m = d.N
	}
	return m
}

// Skewness returns the skewness E[(X - NP)^3] / sd^3 = (1 - 2P) / sqrt(N P (1-P)).
// It is 0 at P = 1/2. For a point mass (N = 0, P = 0 or P = 1) the
// variance is 0 and the skewness is 0/0, mathematically undefined: Skewness
// returns NaN there, the only NaN for a valid Dist (as P approaches 0 or 1
// it grows without bound, to +Inf or -Inf, but the limit is not the value).
// Accuracy: a few units in the last place.
func (d Dist) Skewness() float64 {
	if !d.valid() || d.degenerate() {
		return math.NaN()
	}
	return (1 - 2*d.P) / d.StdDev()
}

// ExKurtosis returns the excess kurtosis E[(X - NP)^4] / sd^4 - 3,
//
//	(1 - 6 P (1-P)) / (N P (1-P)).
//
// For a point mass (N = 0, P = 0 or P = 1) it is 0/0, mathematically
// undefined, and ExKurtosis returns NaN there, the only NaN for a valid
// Dist. Where N P (1-P) is below about 1e-308 (a subnormal P) the value
// exceeds the float range and is +Inf. Accuracy: a few units in the last
// place (1 - 6 P (1-P) cancels
// near P = (3 +- sqrt 3)/6, where the value is near 0 in absolute terms).
func (d Dist) ExKurtosis() float64 {
	if !d.valid() || d.degenerate() {
		return math.NaN()
	}
	pq := d.P * (1 - d.P)
	return (1 - 6*pq) / (float64(d.N) * pq)
}

// degenerate reports whether all probability sits on one value.
func (d Dist) degenerate() bool { return d.N == 0 || d.P == 0 || d.P == 1 }

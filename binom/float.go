package binom

import (
	"math"
	"math/rand/v2"

	"gonum.org/v1/gonum/stat/distuv"
)

// FloatDist is a Dist seen through float64 arguments, so that it plugs
// into code written against gonum's distuv interfaces (distuv.LogProber,
// distuv.Quantiler, distuv.Rander, distuv.RandLogProber) and its
// Binomial's method set (Prob, LogProb, CDF, Survival, Quantile, Rand,
// moments). The values are Dist's, with its log-space accuracy in the
// tails; the float64 argument x is read as distuv reads it:
//
//	Prob(x), LogProb(x)   the PMF at x; 0 (-Inf) where x is not a whole number in [0, N]
//	CDF(x)                P(X <= floor(x)): 0 below 0, 1 from N on
//	Survival(x)           P(X > floor(x)), computed directly (never 1 - CDF)
//	Quantile(p)           the smallest whole x with CDF(x) >= p, for p in [0, 1]
//
// Where distuv panics (a p outside [0, 1] in Quantile) or a Dist method
// returns its -1 sentinel, FloatDist returns NaN; a NaN argument gives
// NaN. Build one with Dist.Float. A FloatDist is a small value, safe for
// concurrent use when Src is (a nil Src draws from math/rand/v2's
// top-level generator, which is).
type FloatDist struct {
	Dist Dist        // the distribution
	Src  rand.Source // source of Rand; nil for math/rand/v2's top-level generator
}

// Compile-time checks that FloatDist has gonum's method sets.
var (
	_ distuv.LogProber     = FloatDist{}
	_ distuv.Quantiler     = FloatDist{}
	_ distuv.Rander        = FloatDist{}
	_ distuv.RandLogProber = FloatDist{}
)

// Float returns d with float64 arguments (FloatDist), drawing Rand's
// variates from src (nil: math/rand/v2's top-level generator).
func (d Dist) Float(src rand.Source) FloatDist { return FloatDist{Dist: d, Src: src} }

// whole returns x as a count and whether it is a whole number in [0, N].
func (f FloatDist) whole(x float64) (int64, bool) {
	if !(x >= 0 && x <= float64(f.Dist.N)) || x != math.Trunc(x) {
		return 0, false
	}
	return int64(x), true
}

// LogProb returns ln P(X = x): -Inf unless x is a whole number in [0, N];
// NaN for a NaN x or an invalid Dist.
func (f FloatDist) LogProb(x float64) float64 {
	if math.IsNaN(x) || !f.Dist.valid() {
		return math.NaN()
	}
	k, ok := f.whole(x)
	if !ok {
		return math.Inf(-1)
	}
	return f.Dist.LogProb(k)
}

// Prob returns P(X = x) = exp(LogProb(x)).
func (f FloatDist) Prob(x float64) float64 { return math.Exp(f.LogProb(x)) }

// floorCount returns floor(x) clamped to [-1, N], which the tails read as
// "below the support" and "the whole support".
func (f FloatDist) floorCount(x float64) int64 {
	switch {
	case x < 0:
		return -1
	case x >= float64(f.Dist.N):
		return f.Dist.N
	}
	return int64(math.Floor(x))
}

// CDF returns P(X <= x) = P(X <= floor(x)); NaN for a NaN x.
func (f FloatDist) CDF(x float64) float64 {
	if math.IsNaN(x) {
		return math.NaN()
	}
	return f.Dist.CDF(f.floorCount(x))
}

// Survival returns P(X > x) = P(X > floor(x)), computed directly; NaN for
// a NaN x.
func (f FloatDist) Survival(x float64) float64 {
	if math.IsNaN(x) {
		return math.NaN()
	}
	return f.Dist.Survival(f.floorCount(x))
}

// Quantile returns the smallest whole x with CDF(x) >= p (Dist.Quantile);
// NaN for p outside [0, 1], NaN p or an invalid Dist.
func (f FloatDist) Quantile(p float64) float64 {
	if !(p >= 0 && p <= 1) {
		return math.NaN()
	}
	k := f.Dist.Quantile(p)
	if k < 0 {
		return math.NaN()
	}
	return float64(k)
}

// Rand returns a variate drawn from Src (Dist.Rand); NaN for an invalid
// Dist.
func (f FloatDist) Rand() float64 {
	var r *rand.Rand
	if f.Src != nil {
		r = rand.New(f.Src)
	}
	k := f.Dist.Rand(r)
	if k < 0 {
		return math.NaN()
	}
	return float64(k)
}

// Mean returns N P.
func (f FloatDist) Mean() float64 { return f.Dist.Mean() }

// Variance returns N P (1 - P).
func (f FloatDist) Variance() float64 { return f.Dist.Variance() }

// StdDev returns the standard deviation.
func (f FloatDist) StdDev() float64 { return f.Dist.StdDev() }

// Skewness returns the skewness.
func (f FloatDist) Skewness() float64 { return f.Dist.Skewness() }

// ExKurtosis returns the excess kurtosis.
func (f FloatDist) ExKurtosis() float64 { return f.Dist.ExKurtosis() }

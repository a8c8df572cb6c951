package binom

import "math"

// search returns the smallest k in [0, N] with ok(k) true, for a predicate
// that is monotone (false ... false true ... true) and true at N; guess is a
// starting point. It brackets by doubling steps from the guess, then
// bisects: O(log N) evaluations.
func (d Dist) search(guess int64, ok func(int64) bool) int64 {
	if guess < 0 {
		guess = 0
	}
	if guess > d.N {
		guess = d.N
	}
	lo, hi := int64(-1), d.N // invariant: ok(hi) true; ok(lo) false or lo = -1
	if ok(guess) {
		hi = guess
		for step := int64(1); ; step *= 2 {
			c := hi - step
			if c < 0 {
				break
			}
			if !ok(c) {
				lo = c
				break
			}
			hi = c
		}
	} else {
		lo = guess
		for step := int64(1); ; step *= 2 {
			c := lo + step
			if c >= d.N {
				break
			}
			if ok(c) {
				hi = c
				break
			}
			lo = c
		}
	}
	for hi-lo > 1 {
		mid := lo + (hi-lo)/2
		if ok(mid) {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi
}

// normalGuess returns the Cornish-Fisher (normal plus skewness) estimate of
// the quantile with lower-tail probability given by z (a standard normal
// quantile), clamped to [0, N].
func (d Dist) normalGuess(z float64) int64 {
	mu, sd := d.Mean(), d.StdDev()
	g := mu + sd*(z+d.Skewness()*(z*z-1)/6) - 0.5
	if math.IsNaN(g) || g < 0 {
		return 0
	}
	if g > float64(d.N) {
		return d.N
	}
	return int64(math.Round(g))
}

// zFromLog returns the standard normal quantile for lower-tail log
// probability lq (lq <= 0), accurate enough for a starting guess.
func zFromLog(lq float64) float64 {
	if lq < -700 {
		return -math.Sqrt(-2 * lq)
	}
	q := math.Exp(lq)
	if q >= 1 {
		return 40
	}
	return math.Sqrt2 * math.Erfinv(2*q-1)
}

// Quantile returns the smallest k with P(X <= k) >= q. Special cases: q <= 0
// gives 0; q = 1 gives the smallest k whose upper tail is exactly 0 (N for
// 0 < P < 1); q > 1 or NaN gives -1 (no such k). Ties with a CDF value are
// decided on the smaller tail (for q > 1/2 as P(X > k) <= 1-q, 1-q being
// exact there), so Quantile(CDF(k)) == k. Cost: O(log N) tail evaluations.
func (d Dist) Quantile(q float64) int64 {
	if !d.valid() || math.IsNaN(q) || q > 1 {
		return -1
	}
	if q <= 0 {
		return 0
	}
	if q > 0.5 {
		return d.UpperQuantile(1 - q)
	}
	return d.LogQuantile(math.Log(q))
}

// LogQuantile returns the smallest k with ln P(X <= k) >= lq, for lq <= 0;
// it reaches far below the smallest double (lq = -1e5 is fine). lq > 0 or
// NaN gives -1; lq = -Inf gives 0.
func (d Dist) LogQuantile(lq float64) int64 {
	if !d.valid() || math.IsNaN(lq) || lq > 0 {
		return -1
	}
	if math.IsInf(lq, -1) || d.LogCDF(0) >= lq {
		return 0
	}
	return d.search(d.normalGuess(zFromLog(lq)), func(k int64) bool { return d.LogCDF(k) >= lq })
}

// UpperQuantile returns the smallest k with P(X > k) <= q. It is exact for q
// down to the smallest positive double (compare LogUpperQuantile for
// smaller). Special cases: q >= 1 gives 0; q = 0 gives the smallest k with
// P(X > k) = 0 exactly (N for 0 < P < 1, 0 for P = 0); q < 0 or NaN gives -1.
func (d Dist) UpperQuantile(q float64) int64 {
	if !d.valid() || math.IsNaN(q) || q < 0 {
		return -1
	}
	if q >= 1 {
		return 0
	}
	if q == 0 {
		switch d.P {
		case 0:
			return 0
		default:
			return d.N
		}
	}
	return d.LogUpperQuantile(math.Log(q))
}

// LogUpperQuantile returns the smallest k with ln P(X > k) <= lq, for
// lq <= 0. lq > 0 or NaN gives -1; lq = -Inf gives the smallest k with an
// upper tail of exactly 0 (N for 0 < P < 1).
func (d Dist) LogUpperQuantile(lq float64) int64 {
	if !d.valid() || math.IsNaN(lq) || lq > 0 {
		return -1
	}
	if lq == 0 {
		return 0
	}
	if math.IsInf(lq, -1) {
		if d.P == 0 {
			return 0
		}
		return d.N
	}
	return d.search(d.normalGuess(-zFromLog(lq)), func(k int64) bool { return d.LogSurvival(k) <= lq })
}

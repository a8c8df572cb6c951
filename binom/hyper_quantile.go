package binom

import (
	"math"

	"github.com/kofnlab/kofn/internal/xmath"
)

// searchRange returns the smallest k in [lo, hi] with ok(k) true, for a
// predicate that is monotone (false ... false true ... true) and true at
// hi; guess is a starting point. It brackets by doubling steps from the
// guess, then bisects: O(log(hi - lo)) evaluations.
func searchRange(lo, hi, guess int64, ok func(int64) bool) int64 {
	guess = min(max(guess, lo), hi)
	below := lo - 1 // invariant: ok(hi) true; ok(below) false or below = lo-1
	if ok(guess) {
		hi = guess
		for step := int64(1); ; step *= 2 {
			c := hi - step
			if c < lo {
				break
			}
			if !ok(c) {
				below = c
				break
			}
			hi = c
		}
	} else {
		below = guess
		for step := int64(1); ; step *= 2 {
			c := below + step
			if c >= hi {
				break
			}
			if ok(c) {
				hi = c
				break
			}
			below = c
		}
	}
	for hi-below > 1 {
		mid := below + (hi-below)/2
		if ok(mid) {
			hi = mid
		} else {
			below = mid
		}
	}
	return hi
}

// guess returns the normal-approximation quantile mean + z sd, clamped to
// the support; z is a standard normal quantile.
func (h Hyper) guess(z float64) int64 {
	lo, hi := h.Support()
	// Plain float moments suffice for a start (Mean and Variance are exact
	// but allocate).
	N, K, n := float64(h.Total), float64(h.Successes), float64(h.Draws)
	mean := n * K / N
	sd := math.Sqrt(mean * (N - K) / N * (N - n) / math.Max(1, N-1))
	g := mean + z*sd
	if math.IsNaN(g) || g < float64(lo) {
		return lo
	}
	if g > float64(hi) {
		return hi
	}
	return int64(math.Round(g))
}

// Quantile returns the smallest k with P(X <= k) >= q, comparing q with
// the computed CDF (so Quantile(CDF(k)) == k). Special cases: q <= 0 gives
// the bottom of the support; q = 1 its top; q > 1 or NaN gives -1 (no such
// k). Exact for q down to the smallest positive double; see LogQuantile
// for smaller. Cost: O(log(spread)) tail evaluations.
func (h Hyper) Quantile(q float64) int64 {
	if !h.valid() || math.IsNaN(q) || q > 1 {
		return -1
	}
	lo, hi := h.Support()
	if q <= 0 {
		return lo
	}
	return searchRange(lo, hi, h.guess(normalZ(q)), func(k int64) bool { return h.CDF(k) >= q })
}

// LogQuantile returns the smallest k with ln P(X <= k) >= lq, for lq <= 0;
// it reaches far below the smallest double. lq > 0 or NaN gives -1;
// lq = -Inf gives the bottom of the support.
func (h Hyper) LogQuantile(lq float64) int64 {
	if !h.valid() || math.IsNaN(lq) || lq > 0 {
		return -1
	}
	lo, hi := h.Support()
	if math.IsInf(lq, -1) {
		return lo
	}
	return searchRange(lo, hi, h.guess(zFromLog(lq)), func(k int64) bool { return h.LogCDF(k) >= lq })
}

// UpperQuantile returns the smallest k with P(X > k) <= q, comparing q
// with the computed survival (so UpperQuantile(Survival(k)) == k). Special
// cases: q >= 1 gives the bottom of the support; q = 0 its top; q < 0 or NaN
// gives -1. Exact for q down to the smallest positive double; see
// LogUpperQuantile for smaller.
func (h Hyper) UpperQuantile(q float64) int64 {
	if !h.valid() || math.IsNaN(q) || q < 0 {
		return -1
	}
	lo, hi := h.Support()
	if q >= 1 {
		return lo
	}
	return searchRange(lo, hi, h.guess(-normalZ(q)), func(k int64) bool { return h.Survival(k) <= q })
}

// LogUpperQuantile returns the smallest k with ln P(X > k) <= lq, for
// lq <= 0. lq > 0 or NaN gives -1; lq = 0 gives the bottom of the support
// and lq = -Inf its top.
func (h Hyper) LogUpperQuantile(lq float64) int64 {
	if !h.valid() || math.IsNaN(lq) || lq > 0 {
		return -1
	}
	lo, hi := h.Support()
	if lq == 0 {
		return lo
	}
	return searchRange(lo, hi, h.guess(-zFromLog(lq)), func(k int64) bool { return h.LogSurvival(k) <= lq })
}

// normalZ returns a standard normal quantile for probability q in (0, 1],
// accurate enough for a starting guess.
func normalZ(q float64) float64 {
	if q > 0.5 {
		return -zFromLog(math.Log1p(-q))
	}
	return zFromLog(xmath.Log(q))
}

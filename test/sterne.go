package test

import (
	"math"
	"sort"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/onesample"
	"github.com/kofnlab/kofn/internal/root"
)

// sterneEnd returns the upper (up) or lower end of Sterne's interval: the
// largest p0 >= k/n, or the smallest p0 <= k/n, that the two-sided
// point-probability test accepts (p-value >= e^la), exactly, for k < n
// (up) or k > 0 (lower end).
//
// Take p0 above k/n (the lower end is the mirror image). Outcomes below k
// always count as extreme there; an outcome j > k counts while
// f(j) <= f(k) (1 + 1e-7), and since f(j)/f(k) = C(n,j)/C(n,k)
// (p0/(1-p0))^(j-k) increases in p0 it stops counting at the threshold
//
//	t_j = logistic((ln C(n,k) - ln C(n,j) + ln(1 + 1e-7)) / (j - k)),
//
// where the p-value drops by f(j). Between thresholds the p-value is
// P(X <= k) + P(X > b) for a fixed b > k, whose derivative in p0,
// n (f_{n-1}(b) - f_{n-1}(k)), changes sign at most once, from minus to
// plus: the p-value is quasi-convex on the piece and largest at an end. So
// the pieces are visited from the outside in, and the first with an
// accepted end holds the answer: that end, or the crossing found by
// bisection. Only pieces inside the bound P(X <= k) + (n-k) f(k) >= alpha
// are considered (the p-value cannot reach alpha beyond it), and runs of
// pieces are skipped, galloping inward, while a second bound keeps the
// p-value below alpha on all of them: on a run from p_in to p_out, the
// outcomes j > k that count as extreme at p0 are beyond edge(p0), which
// does not decrease as p0 moves out (f(j)/f(k) rises with p0), so
//
//	p-value(p0) <= P_{p_in}(X <= k) + P_{p_out}(X > edge(p_in) - 1)
//
// (one outcome more than the edge, against rounding at the tie). So the
// cost is O(log) bounds and p-values plus the pieces next to the answer,
// not one pair of p-values per piece. The PMF ties at
// the thresholds are decided by the p-value itself, evaluated just inside
// each piece (1e-9 of its width), clear of the rounding of t_j.
func sterneEnd(k, n int64, la float64, up bool) float64 {
	acc := func(p float64) bool { return binomialLogP(BinomialOptions{}, k, n, p) >= la }
	phat := float64(k) / float64(n)
	// could(p): the bound lets the p-value reach alpha at p.
	could := func(p float64) bool {
		d := binom.Dist{N: n, P: p}
		if up {
			return onesample.LogAddExp(d.LogCDF(k), math.Log(float64(n-k))+d.LogProb(k)) >= la
		}
		return onesample.LogAddExp(d.LogSurvival(k-1), math.Log(float64(k))+d.LogProb(k)) >= la
	}
	// edge(p) is the outcome beyond which (away from k) the PMF at p is at
	// most f(k) (1 + 1e-7); the thresholds between phat and far belong to
	// the outcomes between edge(phat) and edge(far).
	edge := func(p float64) int64 {
		d := binom.Dist{N: n, P: p}
		lk := d.LogProb(k) + logRelTol
		if up {
			return root.SmallestInt(func(j int64) bool { return d.LogProb(j) <= lk }, max(d.Mode(), k), n) - 1
		}
		return root.SmallestInt(func(j int64) bool { return d.LogProb(j) > lk }, 0, min(d.Mode(), k))
	}
	var far float64
	var j0, j1 int64
	if up {
		far = root.Bisect(func(p float64) bool { return !could(p) }, phat, 1, 1e-12, 1e-300)
		j0, j1 = max(edge(phat), k+1), min(edge(far)+1, n)
	} else {
		far = root.Bisect(could, 0, phat, 1e-12, 1e-300)
		j0, j1 = max(edge(far)-1, 0), min(edge(phat), k-1)
	}
	lo, hi := min(phat, far), max(phat, far)
	// The thresholds need ln C(n, k) - ln C(n, j), far better than the
	// tolerance 1e-7 that decides the ties: summed from j = k outward by
	// ln C(n, j+1) - ln C(n, j) = ln((n - j) / (j + 1)), one logarithm per
	// outcome (rounding below 1e-12 over the range), and compared with the
	// range in logit space, so only the kept thresholds cost an exponential.
	ts := []float64{lo, hi}
	xlo, xhi := math.Log(lo)-math.Log1p(-lo), math.Log(hi)-math.Log1p(-hi)
	keep := func(j int64, dl float64) { // dl = ln C(n, k) - ln C(n, j)
		if x := (dl + logRelTol) / float64(j-k); x > xlo && x < xhi {
			if t := 1 / (1 + math.Exp(-x)); t > lo && t < hi {
				ts = append(ts, t)
			}
		}
	}
	if j0 <= j1 {
		dl := 0.0
		if up {
			for j := k; j < j1; j++ {
				dl -= math.Log(float64(n-j) / float64(j+1)) // now for j+1
				if j+1 >= j0 {
					keep(j+1, dl)
				}
			}
		} else {
			for j := k; j > j0; j-- {
				dl -= math.Log(float64(j) / float64(n-j+1)) // now for j-1
				if j-1 <= j1 {
					keep(j-1, dl)
				}
			}
		}
	}
	sort.Float64s(ts)
	rej := func(p float64) bool { return !acc(p) }
	// piece returns the p0 range of piece i, counted from the outside in.
	piece := func(i int) (a, b float64) {
		if up {
			return ts[len(ts)-1-i], ts[len(ts)-2-i]
		}
		return ts[i], ts[i+1]
	}
	// blockRejected reports whether the bound on pieces i..j (from the
	// outside in) keeps the p-value below alpha on all of them; see the
	// doc comment.
	blockRejected := func(i, j int) bool {
		outer, _ := piece(i)
		_, inner := piece(j)
		var v float64
		if up { // p0 from inner to outer, above k/n
			m := edge(inner) - 1 // outcomes beyond m may count as extreme
			v = onesample.LogAddExp(binom.Dist{N: n, P: inner}.LogCDF(k), binom.Dist{N: n, P: outer}.LogSurvival(m))
		} else {
			m := edge(inner) + 1 // outcomes below m may count as extreme
			v = onesample.LogAddExp(binom.Dist{N: n, P: inner}.LogSurvival(k-1), binom.Dist{N: n, P: outer}.LogCDF(m-1))
		}
		return v < la
	}
	for i, w := 0, 2; i < len(ts)-1; {
		if sz := min(w, len(ts)-1-i); sz >= 2 {
			if blockRejected(i, i+sz-1) {
				i, w = i+sz, 2*sz
				continue
			}
			if sz > 2 {
				w = sz / 2
				continue
			}
		}
		a, b := piece(i) // a outer, b inner
		outer, inner := a+1e-9*(b-a), b-1e-9*(b-a)
		if acc(outer) {
			return a
		}
		if acc(inner) {
			if up {
				return root.Bisect(rej, inner, outer, 1e-12, 1e-300)
			}
			return root.Bisect(acc, outer, inner, 1e-12, 1e-300)
		}
		i, w = i+1, 2
	}
	return phat
}

// sterne returns Sterne's interval at level 1 - e^la (the hull of the p0
// the two-sided point-probability test accepts), and whether one of
// invertGrid points spread over it is rejected (a gap).
func sterne(k, n int64, la float64) (lo, hi float64, gaps, ok bool) {
	lo, hi = 0, 1
	if k > 0 {
		lo = sterneEnd(k, n, la, false)
	}
	if k < n {
		hi = sterneEnd(k, n, la, true)
	}
	for i := 1; i < invertGrid; i++ {
		p := lo + (hi-lo)*float64(i)/invertGrid
		if binomialLogP(BinomialOptions{}, k, n, p) < la {
			return lo, hi, true, true
		}
	}
	return lo, hi, false, true
}

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
// are visited (the p-value cannot reach alpha beyond it). The PMF ties at
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
	lck := lchoose(n, k)
	ts := []float64{lo, hi}
	for j := j0; j <= j1; j++ {
		x := (lck - lchoose(n, j) + logRelTol) / float64(j-k)
		if t := 1 / (1 + math.Exp(-x)); t > lo && t < hi {
			ts = append(ts, t)
		}
	}
	sort.Float64s(ts)
	rej := func(p float64) bool { return !acc(p) }
	for i := range len(ts) - 1 {
		a, b := ts[i], ts[i+1] // piece from a to b, visited from the outside in
		if up {
			a, b = ts[len(ts)-1-i], ts[len(ts)-2-i]
		}
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

// lchoose returns ln C(n, k) from lgamma (the thresholds need it only to
// far better than the tolerance 1e-7 that decides the ties).
func lchoose(n, k int64) float64 {
	a, _ := math.Lgamma(float64(n + 1))
	b, _ := math.Lgamma(float64(k + 1))
	c, _ := math.Lgamma(float64(n - k + 1))
	return a - b - c
}

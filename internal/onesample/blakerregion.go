package onesample

import (
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/root"
)

// Blaker's acceptability of p0 given k of n (LogAcceptability without the
// mid-p variant) is P(X < a) + P(X > b) under Binomial(n, p0), where [a, b]
// is the set of outcomes strictly less extreme than k: those whose smaller
// tail exceeds k's by more than the tolerance RelTol. As p0 moves, a and b
// are integer step functions and between their steps the acceptability is
// smooth; the functions below let a root finder work on one smooth piece at
// a time (BlakerRegion, LogOutside) and locate the steps (BlakerLogTail).

// BlakerLogTail returns ln min(P(X <= j), P(X >= j)) under Binomial(n, p0),
// the log of the smaller tail of j by which Blaker's acceptability orders
// outcomes. Where one tail is below 1/2 by a margin far above the tails'
// rounding (1e-13 relative), the other exceeds 1/2 and is not evaluated.
// Arguments are not validated: 0 <= j <= n, p0 in [0, 1].
func BlakerLogTail(n int64, p0 float64, j int64) float64 {
	m := memo{d: binom.Dist{N: n, P: p0}}
	return m.smaller(j)
}

// LogOutside returns ln P(X < a or X > b) under Binomial(n, p0): Blaker's
// log acceptability on the piece where the less extreme outcomes are a..b;
// 0 when a > b. Arguments are not validated.
func LogOutside(n int64, p0 float64, a, b int64) float64 {
	return outside(binom.Dist{N: n, P: p0}, a, b)
}

// BlakerRegion returns the outcomes [a, b] strictly less extreme than k
// under Blaker's ordering at Binomial(n, p0), and the log acceptability
// ln P(X < a or X > b), equal to LogAcceptability(k, n, p0, false). The
// region's ends are searched from the guesses ga and gb (a region at a
// nearby p0, or an approximation) by galloping and bisection, so that a
// good guess costs four or five tail evaluations instead of the O(log n) of
// LogAcceptability; when neither guess lies inside the region it falls
// back to the full search. Arguments are not validated: 0 <= k <= n, p0 in
// (0, 1).
func BlakerRegion(k, n int64, p0 float64, ga, gb int64) (a, b int64, logAcc float64) {
	m := memo{d: binom.Dist{N: n, P: p0}}
	thr := m.smaller(k) + logRel
	gt := func(j int64) bool { return j != k && j >= 0 && j <= n && m.smaller(j) > thr }
	ga, gb = max(0, min(n, ga)), max(0, min(n, gb))
	inA, inB := gt(ga), gt(gb)
	switch {
	case inA && inB && ga <= gb:
		a, b = edge(gt, ga, -1), edge(gt, gb, +1)
	case inA && ga < gb: // gb lies beyond the region's upper end
		a, b = edge(gt, ga, -1), entry(gt, gb, ga)
	case inA:
		a, b = edge(gt, ga, -1), edge(gt, ga, +1)
	case inB && ga < gb: // ga lies below the region's lower end
		a, b = entry(gt, ga, gb), edge(gt, gb, +1)
	case inB:
		a, b = edge(gt, gb, -1), edge(gt, gb, +1)
	default:
		a, b = blakerOrder(m.d, 0, n).above(0, n, k, thr)
		return a, b, outside(m.d, a, b)
	}
	if a > b {
		return a, b, 0
	}
	return a, b, math.Min(0, LogAddExp(m.cdf(a-1), m.surv(b)))
}

// memo caches the tails of d that one BlakerRegion call evaluates.
type memo struct {
	d    binom.Dist
	js   [48]int64
	lo   [48]float64 // ln P(X <= j), NaN when not evaluated
	up   [48]float64 // ln P(X >= j), NaN when not evaluated
	used int
}

// slot returns the cache index of j, adding it when there is room (-1 when
// the cache is full).
func (m *memo) slot(j int64) int {
	for i := 0; i < m.used; i++ {
		if m.js[i] == j {
			return i
		}
	}
	if m.used == len(m.js) {
		return -1
	}
	i := m.used
	m.used++
	m.js[i], m.lo[i], m.up[i] = j, math.NaN(), math.NaN()
	return i
}

// cdf returns ln P(X <= j).
func (m *memo) cdf(j int64) float64 { return m.get(j, &m.lo, func() float64 { return m.d.LogCDF(j) }) }

// surv returns ln P(X > j) = ln P(X >= j+1).
func (m *memo) surv(j int64) float64 {
	return m.get(j+1, &m.up, func() float64 { return m.d.LogSurvival(j) })
}

// get returns the cached value for j in vals, computing it with eval on
// first use (or every time when the cache is full).
func (m *memo) get(j int64, vals *[48]float64, eval func() float64) float64 {
	i := m.slot(j)
	if i < 0 {
		return eval()
	}
	if math.IsNaN(vals[i]) {
		vals[i] = eval()
	}
	return vals[i]
}

// smaller returns blakerOrder's e(j) = min(ln P(X <= j), ln P(X >= j))
// through the cache, evaluating the second tail only when the first is
// not clearly below 1/2 (see BlakerLogTail).
func (m *memo) smaller(j int64) float64 {
	const half = -math.Ln2 - 1e-9
	lo := m.cdf(j)
	if lo < half {
		return lo
	}
	up := m.surv(j - 1)
	if up < half {
		return up
	}
	return math.Min(lo, up)
}

// edge returns the last j reached from j0 in direction dir (-1 or +1) with
// in(j) true, where in(j0) is true and in is true on an interval.
func edge(in func(int64) bool, j0, dir int64) int64 {
	inside, out := j0, j0+dir
	for step := int64(2); in(out); step *= 2 {
		inside, out = out, j0+dir*step
	}
	// in(inside) is true, in(out) false; the boundary lies between them.
	if dir > 0 {
		return root.SmallestInt(func(j int64) bool { return !in(j) }, inside+1, out-1) - 1
	}
	return root.SmallestInt(in, out+1, inside-1)
}

// entry returns the first j reached from from towards to with in(j) true,
// where in(from) is false, in(to) is true and in is true on an interval.
func entry(in func(int64) bool, from, to int64) int64 {
	dir := int64(1)
	if to < from {
		dir = -1
	}
	out, inside := from, to
	for step := int64(1); ; step *= 2 {
		j := from + dir*step
		if (j-to)*dir >= 0 {
			break
		}
		if in(j) {
			inside = j
			break
		}
		out = j
	}
	// in(out) is false, in(inside) true; the boundary lies between them.
	if dir > 0 {
		return root.SmallestInt(in, out+1, inside-1)
	}
	return root.SmallestInt(func(j int64) bool { return !in(j) }, inside+1, out-1) - 1
}

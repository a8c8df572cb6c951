package power

import (
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/xmath"
)

// tailPair carries the two rejection tails P(X <= lo-1) and P(X > hi) of
// X ~ Binomial(n, p) from n to n+1 (boundaries moving by 0 or +1) with
// O(1) recurrences instead of fresh incomplete-beta evaluations:
//
//	P_{n+1}(X > h)  = P_n(X > h) + p b_n(h),    P(X > h+1) = P(X > h) - b(h+1)
//	P_{n+1}(X <= l) = P_n(X <= l) - p b_n(l),   P(X <= l+1) = P(X <= l) + b(l+1)
//
// with the pmf b carried in log space by its ratios. Each tail keeps a
// running bound on its relative error, which grows only through
// subtractions (by the ratio of the operands to the result); past 1e-11,
// or after any other kind of move, the tail is recomputed directly from
// binom, so the values stay within about 1e-11 relative of binom's.
type tailPair struct {
	p, lp, lq  float64 // p, ln p, ln(1-p)
	n          int64
	low, upp   tail
	recomputes int // direct evaluations, for tests
}

// tail is one carried tail: value v at boundary b, ln pmf at b, error bound.
type tail struct {
	b   int64
	v   float64
	lb  float64
	err float64
	ok  bool
}

const (
	tailErrMax = 1e-11
	tailEps    = 2.3e-16
)

func newTailPair(p float64) *tailPair {
	return &tailPair{p: p, lp: xmath.Log(p), lq: math.Log1p(-p), n: -1}
}

// at returns P(X < lo) + P(X > hi) at n trials.
func (t *tailPair) at(n, lo, hi int64) float64 {
	if lo > hi {
		t.n = n
		t.low.ok, t.upp.ok = false, false
		return 1
	}
	step := n == t.n+1 && t.p > 0 && t.p < 1
	t.moveLow(n, lo-1, step)
	t.moveUpp(n, hi, step)
	t.n = n
	return min(1, t.low.v+t.upp.v)
}

func (t *tailPair) direct(n, b int64, upper bool) tail {
	t.recomputes++
	d := binom.Dist{N: n, P: t.p}
	tl := tail{b: b, lb: d.LogProb(b), err: 1e-13, ok: b >= 0 && b < n && t.p > 0 && t.p < 1}
	if upper {
		tl.v = d.Survival(b)
	} else {
		tl.v = d.CDF(b)
	}
	return tl
}

// moveLow moves the lower tail P(X <= l) to (n, l).
func (t *tailPair) moveLow(n, l int64, step bool) {
	tl := &t.low
	if !step || !tl.ok || (l != tl.b && l != tl.b+1) || l < 0 || l >= n {
		*tl = t.direct(n, l, false)
		return
	}
	m := float64(t.n) // old n
	// advance n: subtract p b_n(l), then b_{n+1}(l) = b_n(l) (n+1)/(n+1-l) q.
	sub := math.Exp(t.lp + tl.lb)
	nv := tl.v - sub
	if nv <= 0 {
		*tl = t.direct(n, l, false)
		return
	}
	tl.err = (tl.err + tailEps) * tl.v / nv
	tl.v = nv
	tl.lb += math.Log((m+1)/(m+1-float64(tl.b))) + t.lq
	if l == tl.b+1 {
		// b(l+1) = b(l) (n+1-l)/(l+1) p/q at the new n.
		tl.lb += math.Log((m+1-float64(tl.b))/float64(tl.b+1)) + t.lp - t.lq
		tl.v += math.Exp(tl.lb)
		tl.err += tailEps
		tl.b = l
	}
	if tl.err > tailErrMax {
		*tl = t.direct(n, l, false)
	}
}

// moveUpp moves the upper tail P(X > h) to (n, h).
func (t *tailPair) moveUpp(n, h int64, step bool) {
	tl := &t.upp
	if !step || !tl.ok || (h != tl.b && h != tl.b+1) || h < 0 || h >= n {
		*tl = t.direct(n, h, true)
		return
	}
	m := float64(t.n)
	tl.v += math.Exp(t.lp + tl.lb)
	tl.err += tailEps
	tl.lb += math.Log((m+1)/(m+1-float64(tl.b))) + t.lq
	if h == tl.b+1 {
		tl.lb += math.Log((m+1-float64(tl.b))/float64(tl.b+1)) + t.lp - t.lq
		sub := math.Exp(tl.lb)
		nv := tl.v - sub
		if nv <= 0 {
			*tl = t.direct(n, h, true)
			return
		}
		tl.err = (tl.err + tailEps) * tl.v / nv
		tl.v = nv
		tl.b = h
	}
	if tl.err > tailErrMax {
		*tl = t.direct(n, h, true)
	}
}

func binomDist(n int64, p float64) binom.Dist { return binom.Dist{N: n, P: p} }

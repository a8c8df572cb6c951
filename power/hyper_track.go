package power

import (
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/onesample"
	"github.com/kofnlab/kofn/test"
)

// hyperTrack decides Fisher's test on the tables of one margin after
// another, s = x1 + x2 growing by one, without a fresh tail sum per
// decision. It follows the conditional distribution of X1, the central
// hypergeometric H_s = Hyper{Total: N, Successes: n1, Draws: s}, through
// two anchors: at kl the point probability P(X1 = kl) and the lower tail
// P(X1 <= kl), at ku P(X1 = ku) and the upper tail P(X1 >= ku). An anchor
// moves by one outcome with the PMF ratio of neighbours and one addition
// or subtraction of a point probability, and follows the margin by one
// draw more, X_{s+1} = X_s + B with P(B = 1 | X_s = k) = (n1 - k)/(N - s):
//
//	P_{s+1}(X = k)  = P_s(X = k) (N - n1 - s + k)/(N - s) + P_s(X = k-1) (n1 - k + 1)/(N - s)
//	P_{s+1}(X <= k) = P_s(X <= k) - P_s(X = k) (n1 - k)/(N - s)
//	P_{s+1}(X >= k) = P_s(X >= k) + P_s(X = k-1) (n1 - k + 1)/(N - s)
//
// so both tails of the outcomes at the acceptance boundaries, which move
// by about n1/N per margin, cost O(1) per margin instead of a sum over
// some standard deviations' worth of terms.
//
// Every value carries a bound on its rounding error, grown by the
// standard model of floating-point arithmetic (each operation within one
// unit in the last place, u = 2^-53) at every step; an anchor whose bound
// grows by more than 1e-10 (relative), or whose point probability
// underflows, is set again from binom.Hyper's own LogProb and tails
// (accuracy 1e-13 relative to max(1, |ln P|), as documented there).
//
// A decision is taken here only when it is certain: when every comparison
// of two point probabilities that fixes the set of outcomes "as or more
// extreme" (onesample's relative tolerance RelTol) is clear of that
// tolerance by more than decideGap plus the error bounds, and when the
// p-value so found is clear of alpha by more than decideGap (relative)
// plus its error bound. decideGap (1e-9) is a thousand times the
// documented error of binom.Hyper's log-probabilities and tails at the
// p-values and point probabilities that decide a test at usual levels
// (ln P of -5 to -20; still fourteen times it at ln P = -700), which is
// what onesample.LogPValueOf, the test package's Fisher p-value, computes
// from; so a certain decision here is the decision the test package
// takes. Every other decision (ties within the gap: alpha met to nine
// digits, or two probabilities within 1e-9 of the tolerance) is left to
// onesample.LogPValueOf itself. An outcome whose probability underflows
// the anchors is rejected here only when hi-lo+1 times its probability
// (from binom.Hyper.LogProb), a bound on its p-value, is below alpha.
// The regions so built are checked against those of the test package's
// decisions alone in exact_two_oracle_check_test.go.
type hyperTrack struct {
	h            binom.Hyper
	n, k         int64 // total N and successes n1 (group 1)
	lo, hi, mode int64
	// Lower anchor: pl = P(X = kl), tl = P(X <= kl); relative error bound
	// of pl rl, absolute error bound of tl el. Upper anchor likewise with
	// tu = P(X >= ku). An anchor with set false has no values yet.
	kl, ku         int64
	pl, tl, rl, el float64
	pu, tu, ru, eu float64
	setL, setU     bool
	bl, bu         float64 // the error bounds the anchors were set with
	// floor is the size of tail whose absolute error matters (alpha): a
	// smaller tail is refreshed by its error relative to floor.
	floor float64
	// Tracker-wide counts, for the tests and benchmarks.
	fallbacks, resets int
}

const (
	unitRound = 0x1p-53 // u, the unit roundoff of float64
	decideGap = 1e-9    // relative gap below which a decision is left to the test package
	// hyperLibErr is the error bound of a value exp(ln P) taken from
	// binom.Hyper's log-probabilities and tails, relative, per unit of
	// max(1, |ln P|): its documented 1e-13 with a margin.
	hyperLibErr = 2e-13
	// anchorJump is the longest move an anchor makes step by step; farther
	// targets are set from binom.Hyper directly.
	anchorJump = 48
	// tinyProb: an anchor whose point probability falls below it is set
	// again (and not used when binom.Hyper's value is as small).
	tinyProb = 1e-280
	// refreshErr is the growth of an anchor's relative error bound past
	// which it is set again from binom.Hyper.
	refreshErr = 1e-10
)

// at points the tracker at margin s of the table with groups n1, n2,
// dropping its anchors.
func (t *hyperTrack) at(n1, n2, s int64) {
	t.h = binom.Hyper{Total: n1 + n2, Successes: n1, Draws: s}
	t.n, t.k = n1+n2, n1
	t.lo, t.hi = t.h.Support()
	t.mode = t.h.Mode()
	t.setL, t.setU = false, false
}

// next moves the tracker from margin s to s + 1 (s + 1 <= N).
func (t *hyperTrack) next() {
	s := t.h.Draws
	ns := float64(t.n - s)
	if t.setL {
		k := t.kl
		var prev float64 // P_s(X = k-1)
		if k > t.lo {
			prev = t.pl * t.ratioDown(k)
		}
		q1 := float64(t.k-k) / ns
		stay := float64(t.n-t.k-s+k) / ns
		gain := float64(t.k-k+1) / ns
		tl := t.tl - t.pl*q1
		t.el += t.pl*q1*(t.rl+3*unitRound) + 2*unitRound*math.Abs(tl)
		t.tl = max(tl, 0)
		t.pl = t.pl*stay + prev*gain
		t.rl += 10 * unitRound
	}
	if t.setU {
		k := t.ku
		var prev float64
		if k > t.lo {
			prev = t.pu * t.ratioDown(k)
		}
		stay := float64(t.n-t.k-s+k) / ns
		gain := float64(t.k-k+1) / ns
		add := prev * gain
		t.tu += add
		t.eu += add*(t.ru+7*unitRound) + unitRound*t.tu
		t.pu = t.pu*stay + add
		t.ru += 10 * unitRound
	}
	t.h.Draws++
	t.lo, t.hi = t.h.Support()
	t.mode = t.h.Mode()
	if t.setL && (t.kl < t.lo || t.kl > t.hi) {
		t.setL = false
	}
	if t.setU && (t.ku < t.lo || t.ku > t.hi) {
		t.setU = false
	}
}

// ratioDown returns P(X = j-1)/P(X = j) = j (N-n1-s+j) / ((n1-j+1)(s-j+1))
// for lo < j <= hi; ratioUp returns P(X = j+1)/P(X = j) for lo <= j < hi.
// The factors are integers, exact in float64.
func (t *hyperTrack) ratioDown(j int64) float64 {
	return float64(j) * float64(t.n-t.k-t.h.Draws+j) / (float64(t.k-j+1) * float64(t.h.Draws-j+1))
}

func (t *hyperTrack) ratioUp(j int64) float64 {
	return float64(t.k-j) * float64(t.h.Draws-j) / (float64(j+1) * float64(t.n-t.k-t.h.Draws+j+1))
}

// libErr is the relative error bound of exp(lv), lv a log-probability
// from binom.Hyper.
func libErr(lv float64) float64 { return hyperLibErr*math.Max(1, math.Abs(lv)) + 2*unitRound }

// setLow sets the lower anchor at k (lo <= k <= hi) from binom.Hyper.
func (t *hyperTrack) setLow(k int64) {
	t.resets++
	lp, lc := t.h.LogProb(k), t.h.LogCDF(k)
	t.kl, t.pl, t.tl = k, math.Exp(lp), math.Exp(lc)
	t.rl, t.el = libErr(lp), math.Exp(lc)*libErr(lc)
	t.bl = max(t.rl, libErr(lc))
	t.setL = true
}

// setHigh sets the upper anchor at k (lo <= k <= hi) from binom.Hyper.
func (t *hyperTrack) setHigh(k int64) {
	t.resets++
	lp, ls := t.h.LogProb(k), t.h.LogSurvival(k-1)
	t.ku, t.pu, t.tu = k, math.Exp(lp), math.Exp(ls)
	t.ru, t.eu = libErr(lp), math.Exp(ls)*libErr(ls)
	t.bu = max(t.ru, libErr(ls))
	t.setU = true
}

// low moves the lower anchor to k in lo..hi and reports P(X = k) with its
// relative error bound and P(X <= k) with its absolute error bound; ok is
// false when the point probability is too small to use.
func (t *hyperTrack) low(k int64) (p, rp, tail, et float64, ok bool) {
	if !t.setL || k-t.kl > anchorJump || t.kl-k > anchorJump || t.rl > t.bl+refreshErr ||
		t.pl < tinyProb || t.el > (t.bl+refreshErr)*max(t.tl, t.floor) {
		t.setLow(k)
	}
	for t.kl < k {
		t.pl *= t.ratioUp(t.kl)
		t.rl += 5 * unitRound
		t.kl++
		t.tl += t.pl
		t.el += t.pl*t.rl + unitRound*t.tl
	}
	for t.kl > k {
		tl := t.tl - t.pl
		t.el += t.pl*t.rl + unitRound*math.Abs(tl)
		t.tl = max(tl, 0)
		t.pl *= t.ratioDown(t.kl)
		t.rl += 5 * unitRound
		t.kl--
	}
	return t.pl, t.rl, t.tl, t.el, t.pl >= tinyProb
}

// high moves the upper anchor to k in lo..hi and reports P(X = k) and
// P(X >= k) with their error bounds, as low does.
func (t *hyperTrack) high(k int64) (p, rp, tail, et float64, ok bool) {
	if !t.setU || k-t.ku > anchorJump || t.ku-k > anchorJump || t.ru > t.bu+refreshErr ||
		t.pu < tinyProb || t.eu > (t.bu+refreshErr)*max(t.tu, t.floor) {
		t.setHigh(k)
	}
	for t.ku > k {
		t.pu *= t.ratioDown(t.ku)
		t.ru += 5 * unitRound
		t.ku--
		t.tu += t.pu
		t.eu += t.pu*t.ru + unitRound*t.tu
	}
	for t.ku < k {
		tu := t.tu - t.pu
		t.eu += t.pu*t.ru + unitRound*math.Abs(tu)
		t.tu = max(tu, 0)
		t.pu *= t.ratioUp(t.ku)
		t.ru += 5 * unitRound
		t.ku++
	}
	return t.pu, t.ru, t.tu, t.eu, t.pu >= tinyProb
}

// point returns P(X = k) with its relative error bound, by the PMF ratios
// from the anchor on k's side of the mode, which stays where it is.
func (t *hyperTrack) point(k int64) (p, rp float64, ok bool) {
	if k < t.mode {
		if !t.setL || k-t.kl > anchorJump || t.kl-k > anchorJump || t.pl < tinyProb {
			t.low(k)
		}
		p, rp = t.pl, t.rl
		for j := t.kl; j < k; j++ {
			p *= t.ratioUp(j)
		}
		for j := t.kl; j > k; j-- {
			p *= t.ratioDown(j)
		}
		rp += 5 * unitRound * float64(max(k-t.kl, t.kl-k))
	} else {
		if !t.setU || k-t.ku > anchorJump || t.ku-k > anchorJump || t.pu < tinyProb {
			t.high(k)
		}
		p, rp = t.pu, t.ru
		for j := t.ku; j < k; j++ {
			p *= t.ratioUp(j)
		}
		for j := t.ku; j > k; j-- {
			p *= t.ratioDown(j)
		}
		rp += 5 * unitRound * float64(max(k-t.ku, t.ku-k))
	}
	return p, rp, p >= tinyProb
}

// orderKey returns P(X = k), which orders the outcomes as ln P(X = k)
// does, for certifyInterval (from binom.Hyper when the anchors cannot give
// it; -Inf outside the support).
func (t *hyperTrack) orderKey(k int64) float64 {
	if k < t.lo || k > t.hi {
		return math.Inf(-1)
	}
	if p, _, ok := t.point(k); ok {
		return p
	}
	return math.Exp(t.h.LogProb(k))
}

// hcur is a cursor on the PMF: P(X = j) = p with relative error bound r.
type hcur struct {
	j    int64
	p, r float64
}

// cursor returns a cursor at j from the anchors (ok false when P(X = j)
// is too small to use).
func (t *hyperTrack) cursor(j int64) (hcur, bool) {
	p, r, ok := t.point(j)
	return hcur{j, p, r}, ok
}

// up and down move a cursor by one outcome (inside the support).
func (t *hyperTrack) up(c *hcur) {
	c.p *= t.ratioUp(c.j)
	c.r += 5 * unitRound
	c.j++
}

func (t *hyperTrack) down(c *hcur) {
	c.p *= t.ratioDown(c.j)
	c.r += 5 * unitRound
	c.j--
}

// cmp compares P(X = c.j) with thr = P(X = x)(1 + RelTol) = px (1 +
// RelTol), the limit of the outcomes as or more extreme than x: +1 when
// P(X = c.j) is certainly above it, -1 when certainly at or below it, 0
// when the two are within decideGap plus the error bounds (or c's
// probability is too small to use).
func (t *hyperTrack) cmp(c hcur, px, rx float64) int {
	if c.p < tinyProb {
		return 0
	}
	rho := c.p / (px * (1 + onesample.RelTol))
	g := decideGap + c.r + rx + 4*unitRound
	switch {
	case rho > 1+g:
		return 1
	case rho < 1-g:
		return -1
	}
	return 0
}

// mirror returns where the search for the outcome on the other side of
// the mode as likely as x starts: the anchor k when it is set and within
// eight outcomes of the normal approximation's mirror image 2 mean - x,
// that mirror image otherwise; clamped to lo..hi.
func (t *hyperTrack) mirror(x, k int64, set bool, lo, hi int64) int64 {
	mean := float64(t.h.Draws) * float64(t.k) / float64(t.n)
	m := int64(math.Round(2*mean - float64(x)))
	if set && k-m <= 8 && m-k <= 8 {
		m = k
	}
	return min(max(m, lo), hi)
}

// walkLimitTrack bounds the walks of decide; a longer one leaves the
// decision to the test package.
const walkLimitTrack = 64

// decide returns Fisher's decision on x1 = x at the current margin
// (accept: the p-value is at least alpha) under alternative alt, and
// whether it is certain (see hyperTrack). The p-value is onesample's:
// P(X >= x) (Higher), P(X <= x) (Lower), or for the two-sided
// point-probability test P(X < a) + P(X > b), [a, b] the outcomes whose
// probability exceeds P(X = x)(1 + RelTol), a searched below the mode and
// b from the mode up, as onesample.LogPValueOf searches them.
func (t *hyperTrack) decide(x int64, alpha float64, alt test.Alternative) (accept, certain bool) {
	var p, e float64
	switch alt {
	case test.Higher:
		if x <= t.lo {
			return true, true
		}
		_, _, tail, et, ok := t.high(x)
		if !ok {
			return false, false
		}
		p, e = tail, et
	case test.Lower:
		if x >= t.hi {
			return true, true
		}
		_, _, tail, et, ok := t.low(x)
		if !ok {
			return false, false
		}
		p, e = tail, et
	default:
		px, rx, ok := t.point(x)
		if !ok {
			// An outcome this unlikely: its p-value sums at most hi-lo+1
			// outcomes no more likely than it (within the tolerance).
			lp := t.h.LogProb(x) + math.Log(float64(t.hi-t.lo+1)) + 2*onesample.RelTol
			if lp+libErr(lp) < math.Log(alpha)-decideGap {
				return false, true
			}
			return false, false
		}
		// a: the smallest j in lo..mode-1 above the limit (mode if none).
		// Walks step a cursor by the PMF ratios.
		a := t.mode
		if x < t.mode {
			// Below x every outcome is less likely than x; search up from x+1.
			c := hcur{x, px, rx}
			for c.j+1 < t.mode {
				if c.j-x >= walkLimitTrack {
					return false, false
				}
				t.up(&c)
				v := t.cmp(c, px, rx)
				if v == 0 {
					return false, false
				}
				if v > 0 {
					a = c.j
					break
				}
			}
		} else if t.lo < t.mode {
			c, ok := t.cursor(t.mirror(x, t.kl, t.setL, t.lo, t.mode-1))
			if !ok {
				return false, false
			}
			v := t.cmp(c, px, rx)
			if v == 0 {
				return false, false
			}
			if v > 0 { // walk down while the next one is above too
				for steps := 0; c.j > t.lo; steps++ {
					if steps > walkLimitTrack {
						return false, false
					}
					d := c
					t.down(&d)
					v := t.cmp(d, px, rx)
					if v == 0 {
						return false, false
					}
					if v < 0 {
						break
					}
					c = d
				}
				a = c.j
			} else { // walk up to the first one above
				for steps := 0; ; steps++ {
					if steps > walkLimitTrack {
						return false, false
					}
					if c.j+1 >= t.mode {
						c.j = t.mode
						break
					}
					t.up(&c)
					v := t.cmp(c, px, rx)
					if v == 0 {
						return false, false
					}
					if v > 0 {
						break
					}
				}
				a = c.j
			}
		}
		// b + 1: the smallest j in mode..hi at or below the limit (hi + 1
		// if none).
		var b1 int64
		if x >= t.mode {
			// From x on every outcome is at most as likely as x; search
			// down from x-1.
			c := hcur{x, px, rx}
			for c.j-1 >= t.mode {
				if x-c.j > walkLimitTrack {
					return false, false
				}
				d := c
				t.down(&d)
				v := t.cmp(d, px, rx)
				if v == 0 {
					return false, false
				}
				if v > 0 {
					break
				}
				c = d
			}
			b1 = c.j
		} else {
			c, ok := t.cursor(t.mirror(x, t.ku, t.setU, t.mode, t.hi))
			if !ok {
				return false, false
			}
			v := t.cmp(c, px, rx)
			if v == 0 {
				return false, false
			}
			if v < 0 { // at or below: walk down while the previous one is too
				for steps := 0; c.j > t.mode; steps++ {
					if steps > walkLimitTrack {
						return false, false
					}
					d := c
					t.down(&d)
					v := t.cmp(d, px, rx)
					if v == 0 {
						return false, false
					}
					if v > 0 {
						break
					}
					c = d
				}
				b1 = c.j
			} else { // above: walk up to the first one at or below
				for steps := 0; ; steps++ {
					if steps > walkLimitTrack {
						return false, false
					}
					if c.j+1 > t.hi {
						c.j = t.hi + 1
						break
					}
					t.up(&c)
					v := t.cmp(c, px, rx)
					if v == 0 {
						return false, false
					}
					if v < 0 {
						break
					}
				}
				b1 = c.j
			}
		}
		if a > b1-1 {
			return true, true // every outcome is as extreme: p = 1
		}
		if a > t.lo {
			_, _, tail, et, ok := t.low(a - 1)
			if !ok {
				return false, false
			}
			p, e = p+tail, e+et
		}
		if b1 <= t.hi {
			_, _, tail, et, ok := t.high(b1)
			if !ok {
				return false, false
			}
			p, e = p+tail, e+et
		}
		e += 2 * unitRound * p
	}
	g := decideGap*alpha + 2*e
	switch {
	case p >= alpha+g:
		return true, true
	case p <= alpha-g:
		return false, true
	}
	return false, false
}

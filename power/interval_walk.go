package power

import "github.com/kofnlab/kofn/internal/root"

// acceptInterval returns the acceptance interval [a, b] of a test whose
// p-value is unimodal over the support lo..hi (accepted outcomes form an
// interval), given the decision ok(k) (the test's own p-value against
// alpha) and a guess [ga, gb] (the previous interval of a neighbouring
// problem). Each end is certified by the decisions on both sides of it;
// the walk from the guess is bounded and falls back to a bisection from an
// accepted outcome at peak or next to it, where the caller knows the
// p-value is largest. It returns a > b when nothing is accepted there.
func acceptInterval(ok func(int64) bool, lo, hi, peak, ga, gb int64) (a, b int64) {
	if ga >= lo && gb <= hi && ga <= gb {
		if a, okA := walkEdge(ok, ga, lo, hi, -1); okA {
			if b, okB := walkEdge(ok, gb, lo, hi, +1); okB && a <= b {
				return a, b
			}
		}
	}
	m := int64(-1)
	for _, c := range []int64{peak, peak - 1, peak + 1} {
		if c >= lo && c <= hi && ok(c) {
			m = c
			break
		}
	}
	if m < 0 { // the p-value peaks at peak (within one): nothing is accepted
		return lo, lo - 1
	}
	a = root.SmallestInt(ok, lo, m)
	b = root.SmallestInt(func(k int64) bool { return !ok(k) }, m, hi) - 1
	return a, b
}

// walkEdge finds the accepted end of the interval in direction dir (-1:
// lower end, +1: upper end) starting from the guess g, certified by an
// accepted outcome at the end and a rejected one (or the support's end)
// beyond it; at most walkLimit steps.
func walkEdge(ok func(int64) bool, g, lo, hi, dir int64) (int64, bool) {
	inside := func(k int64) bool { return k >= lo && k <= hi }
	c := g
	if ok(c) {
		for i := 0; i <= walkLimit; i++ {
			nx := c + dir
			if !inside(nx) || !ok(nx) {
				return c, true
			}
			c = nx
		}
		return 0, false
	}
	for i := 0; i < walkLimit; i++ {
		c -= dir
		if !inside(c) {
			return 0, false
		}
		if ok(c) {
			return c, true
		}
	}
	return 0, false
}

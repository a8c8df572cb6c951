package test

import (
	"math"

	"github.com/kofnlab/kofn/internal/root"
)

// invertGrid is the number of grid points per side on which invert looks
// for the first accepted null value of a test whose p-value is not
// monotone in the null value.
const invertGrid = 100

// invert returns the confidence set {p : lp(p) >= la} of a one-parameter
// test with log p-value lp, as its hull [lo, hi] within [0, 1], given the
// estimate phat (where the p-value is largest). For alternative Lower only
// the upper end is searched (lo = 0), for Higher only the lower (hi = 1).
//
// With scan false the p-value must be monotone on each side of phat, and
// each end is found by bisection to 1e-12 relative. With scan true (tests
// whose p-value jumps in the null value: the point-probability and Blaker
// tests) each side is first scanned from the outside in on a grid of
// invertGrid points equally spaced in arcsin(sqrt(p)), and the first
// accepted grid point is refined by bisection against its rejected
// neighbour; an accepted island narrower than the grid spacing lying
// outside the first accepted grid point can be missed; gaps reports a
// rejected grid point inside [lo, hi]. ok is false when no null value is
// accepted (possible only for mid-p tests at large alpha).
func invert(lp func(float64) float64, la, phat float64, alt Alternative, scan bool) (lo, hi float64, gaps, ok bool) {
	acc := func(p float64) bool { return lp(p) >= la }
	if alt != TwoSided {
		return invertOneSided(acc, phat, alt)
	}
	if !acc(phat) {
		scan = true
	}
	lo, hi, ok = 0, 1, true
	var g1, g2 bool
	if !acc(0) {
		lo, g1, ok = end(acc, 0, phat, scan)
	}
	if ok && !acc(1) {
		hi, g2, ok = end(acc, 1, phat, scan)
	}
	if !ok {
		return math.NaN(), math.NaN(), false, false
	}
	return lo, hi, g1 || g2, true
}

// invertOneSided is invert for a one-sided alternative, whose p-value is
// monotone in the null value over all of [0, 1]: increasing for Higher
// (the lower bound), decreasing for Lower (the upper bound). The bound is
// found by bisection between the rejected end and an accepted point: the
// estimate when it is accepted, otherwise the opposite end (at a level
// below 1/2 the bound lies beyond the estimate); ok is false when not even
// that end is accepted (a mid-p test at a level below 1/2 with k at the
// end of its range).
func invertOneSided(acc func(float64) bool, phat float64, alt Alternative) (lo, hi float64, gaps, ok bool) {
	out, in := 1.0, 0.0 // Lower: the upper bound, between accepted 0 and rejected 1
	if alt == Higher {
		out, in = 0, 1
	}
	if acc(out) {
		return 0, 1, false, true
	}
	if acc(phat) {
		in = phat
	} else if !acc(in) {
		return math.NaN(), math.NaN(), false, false
	}
	b, _, _ := end(acc, out, in, false)
	if alt == Higher {
		return b, 1, false, true
	}
	return 0, b, false, true
}

// end returns the end of the accepted set between the rejected outer point
// out (0 or 1) and the estimate phat, as described on invert.
func end(acc func(float64) bool, out, phat float64, scan bool) (float64, bool, bool) {
	const rel, abs = 1e-12, 1e-300
	boundary := func(a, b float64) float64 { // a rejected, b accepted
		if out == 0 {
			return root.Bisect(acc, a, b, rel, abs)
		}
		return root.Bisect(func(p float64) bool { return !acc(p) }, b, a, rel, abs)
	}
	if !scan {
		return boundary(out, phat), false, true
	}
	t0, t1 := math.Asin(math.Sqrt(out)), math.Asin(math.Sqrt(phat))
	prev, at, found := out, 0.0, false
	for i := 1; i <= invertGrid; i++ {
		s := math.Sin(t0 + (t1-t0)*float64(i)/invertGrid)
		g := s * s
		if i == invertGrid {
			g = phat
		}
		switch a := acc(g); {
		case !found && a:
			at, found = boundary(prev, g), true
		case found && !a:
			return at, true, true
		}
		prev = g
	}
	return at, false, found
}

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
// estimate phat (where the p-value is largest). For alternative Less only
// the upper end is searched (lo = 0), for Greater only the lower (hi = 1).
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
	rej := func(p float64) bool { return lp(p) < la }
	if !acc(phat) {
		scan = true
	}
	const rel, abs = 1e-12, 1e-300
	lo, hi = 0, 1
	if alt != Less && !acc(0) {
		if !scan {
			lo = root.Bisect(acc, 0, phat, rel, abs)
		} else {
			t1 := math.Asin(math.Sqrt(phat))
			prev := 0.0
			found := false
			for i := 1; i <= invertGrid; i++ {
				s := math.Sin(t1 * float64(i) / invertGrid)
				g := s * s
				if i == invertGrid {
					g = phat
				}
				if !found && acc(g) {
					lo = root.Bisect(acc, prev, g, rel, abs)
					found = true
				} else if found && !acc(g) {
					gaps = true
					break
				}
				prev = g
			}
			if !found {
				return math.NaN(), math.NaN(), false, false
			}
		}
	}
	if alt != Greater && !acc(1) {
		if !scan {
			hi = root.Bisect(rej, phat, 1, rel, abs)
		} else {
			t0 := math.Asin(math.Sqrt(phat))
			prev := 1.0
			found := false
			for i := 1; i <= invertGrid; i++ {
				s := math.Sin(math.Pi/2 - (math.Pi/2-t0)*float64(i)/invertGrid)
				g := s * s
				if i == invertGrid {
					g = phat
				}
				if !found && acc(g) {
					hi = root.Bisect(rej, g, prev, rel, abs)
					found = true
				} else if found && !acc(g) {
					gaps = true
					break
				}
				prev = g
			}
			if !found {
				return math.NaN(), math.NaN(), false, false
			}
		}
	}
	return lo, hi, gaps, true
}

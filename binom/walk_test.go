package binom

import (
	"math"
	"testing"

	"github.com/kofnlab/kofn/internal/xmath"
)

// quantileTargets returns the four targets at k: the lower tail (plain,
// log) and the upper tail (plain, log), as Quantile, LogQuantile,
// UpperQuantile and LogUpperQuantile build them, each with the function
// that computes the tail it inverts.
func quantileTargets(d Dist, k int64) []quantileTarget {
	c, lc := d.CDF(k), d.LogCDF(k)
	s, ls := d.Survival(k), d.LogSurvival(k)
	return []quantileTarget{
		{plain: true, q: c, lq: lqUnset},
		{q: math.Exp(lc), lq: lc},
		{upper: true, plain: true, q: s, lq: lqUnset},
		{upper: true, q: math.Exp(ls), lq: ls},
	}
}

// searched returns the answer of the secant search alone, the quantile
// method before the walk, for the same target: an independent reference.
func searched(d Dist, t quantileTarget) int64 {
	if t.lq == lqUnset {
		t.lq = xmath.Log(t.q)
	}
	return d.search(&t, d.N/2)
}

// TestWalkAgainstSearch checks the walk from a start (the PMF-ratio steps
// with their rounding bound, the exact evaluations where a step is too
// close to call, the walk on the complement for targets above 1/2, the
// hand-over to the search) against the secant search over every k for
// small N and across the support for large N, on targets that are tail
// values themselves (the hardest case: a tie at the answer) and the next
// doubles on either side, from starts 0, 1, 5, 23, 24, 25 and 200 away
// on both sides. Every answer must be the search's, and satisfy the
// definition: ok at the answer, not ok one below.
func TestWalkAgainstSearch(t *testing.T) {
	t.Parallel()
	dists := []Dist{{10, 0.3}, {20, 0.5}, {100, 0.3}, {1000, 0.02}, {1000, 0.7}, {60, 1e-9}, {60, 1 - 1e-9}, {1e6, 0.3}, {1e12, 0.5}, {1e9, 1e-8}}
	offsets := []int64{0, 1, -1, 5, -5, 23, -23, 24, -24, 25, -25, 200, -200}
	checked := 0
	for _, d := range dists {
		var ks []int64
		if d.N <= 100 {
			for k := int64(0); k <= d.N; k++ {
				ks = append(ks, k)
			}
		} else {
			ks = propertyKs(d)
		}
		for _, k := range ks {
			for _, t0 := range quantileTargets(d, k) {
				for _, nudge := range []int{0, 1, -1} {
					tq := t0
					switch {
					case nudge != 0 && tq.plain:
						tq.q = math.Nextafter(tq.q, float64(nudge)*2)
					case nudge != 0:
						tq.lq = math.Nextafter(tq.lq, float64(nudge)*2)
						tq.q = math.Exp(tq.lq)
					}
					if tq.plain && !(tq.q > 0 && tq.q < 1) || !tq.plain && !(tq.lq < 0 && !math.IsInf(tq.lq, -1)) {
						continue // the targets 0 and 1 have their own definitions
					}
					want := searched(d, tq)
					for _, off := range offsets {
						g := min(max(want+off, 0), d.N)
						tt := tq
						got := d.locate(&tt, g)
						checked++
						if got != want {
							t.Errorf("%v target %+v from %d: walk %d, search %d", d, tq, g, got, want)
						}
					}
				}
			}
		}
	}
	if checked < 20000 {
		t.Errorf("only %d walks checked", checked)
	}
}

// TestQuantileInvertsSmallN checks Quantile(CDF(k)) == k and the other
// three inversions at every k for small N, where the tails come from the
// term sums and, from N = 100, the uniform expansion; and that the next
// double past each tail value (short of the targets 0 and 1, which have
// their own definitions) moves to the neighbour.
func TestQuantileInvertsSmallN(t *testing.T) {
	t.Parallel()
	for _, n := range []int64{1, 2, 10, 20, 37, 100, 257, 1000} {
		for _, p := range []float64{1e-10, 0.01, 0.3, 0.5, 0.8, 0.999, 1 - 1e-10} {
			d := Dist{N: n, P: p}
			for k := int64(0); k <= n; k++ {
				if c := d.CDF(k); c < 1 && d.CDF(k-1) < c {
					if got := d.Quantile(c); got != k {
						t.Errorf("%v: Quantile(CDF(%d) = %v) = %d", d, k, c, got)
					}
					if up := math.Nextafter(c, 2); up < 1 && d.CDF(k+1) >= up && d.Quantile(up) != k+1 {
						got := d.Quantile(up)
						t.Errorf("%v: Quantile(just above CDF(%d)) = %d", d, k, got)
					}
				}
				if l := d.LogCDF(k); l < 0 && d.LogCDF(k-1) < l {
					if got := d.LogQuantile(l); got != k {
						t.Errorf("%v: LogQuantile(LogCDF(%d) = %v) = %d", d, k, l, got)
					}
				}
				if s := d.Survival(k); s > 0 && s < d.Survival(k-1) {
					if got := d.UpperQuantile(s); got != k {
						t.Errorf("%v: UpperQuantile(Survival(%d) = %v) = %d", d, k, s, got)
					}
					if dn := math.Nextafter(s, 0); dn > 0 && d.Survival(k+1) <= dn && d.UpperQuantile(dn) != k+1 {
						got := d.UpperQuantile(dn)
						t.Errorf("%v: UpperQuantile(just below Survival(%d)) = %d", d, k, got)
					}
				}
				if l := d.LogSurvival(k); !math.IsInf(l, -1) && l < d.LogSurvival(k-1) {
					if got := d.LogUpperQuantile(l); got != k {
						t.Errorf("%v: LogUpperQuantile(LogSurvival(%d) = %v) = %d", d, k, l, got)
					}
				}
			}
		}
	}
}

// TestNormalTail checks the normal quantile start below erfinvMin
// against math.Erfc (ln Phi(z) = lu to 1e-9 where no step is skipped, and
// to the stated bound with a coarse need) and, below z = -37, where
// erfc underflows, against the asymptotic Mills ratio (millsRatio) at
// 1e-9; and math.Erfinv above it, continuous at the switch.
func TestNormalTail(t *testing.T) {
	t.Parallel()
	lnPhi := func(z float64) float64 {
		if z < -30 {
			return -0.5*z*z - 0.5*ln2pi + math.Log(millsRatio(-z))
		}
		return math.Log(0.5 * math.Erfc(-z/math.Sqrt2))
	}
	for _, lu := range []float64{-20.8, -21, -25, -40, -80, -200, -650, -700, -746, -2000, -1e4, -1e5} {
		z := normalTail(math.NaN(), lu, 0)
		if e := math.Abs(lnPhi(z)-lu) / -lu; e > 1e-9 {
			t.Errorf("normalTail(ln u = %v) = %v: ln Phi there %v", lu, z, lnPhi(z))
		}
		zc := normalTail(math.NaN(), lu, 0.01)
		if math.Abs(zc-z) > 0.01 {
			t.Errorf("normalTail(ln u = %v, need 0.01) = %v, full %v", lu, zc, z)
		}
	}
	lo := normalTail(math.Nextafter(erfinvMin, 0), math.NaN(), 0)
	hi := normalTail(erfinvMin, math.NaN(), 0)
	if math.Abs(hi-lo) > 3e-8 { // math.Erfinv's input 2u - 1 is rounded: 2e-8 in z
		t.Errorf("normalTail jumps at erfinvMin: %v below, %v at", lo, hi)
	}
}

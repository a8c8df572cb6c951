package binom

import (
	"math"
	"testing"
)

// TestFarStartLandsOnAnswer checks the far-tail start against the exact
// search (whose inversion TestQuantileInverts and the math/big tests
// check): for every N <= smallN sampled, P across (0, 1) and every k whose
// log tail is a far target, a start taken on a tail value itself must be
// that k (a start one off costs a second tail evaluation), on both tails
// and from a log target as from a plain one; elsewhere (subnormal plain
// tails, complements of plain targets near 1) within one. Property check
// (DESIGN.md section 4).
func TestFarStartLandsOnAnswer(t *testing.T) {
	t.Parallel()
	used := 0
	for _, n := range []int64{2, 5, 10, 20, 64, 100, 333, 1000, smallN} {
		for _, p := range []float64{1e-9, 0.001, 0.05, 0.3, 0.5, 0.7, 0.95, 0.999, 1 - 1e-9} {
			d := Dist{N: n, P: p}
			for k := int64(0); k < n; k++ {
				check := func(name string, start int64, ok bool, want int64, exact bool) {
					if !ok {
						return
					}
					used++
					if off := start - want; off != 0 && (exact || off < -1 || off > 1) {
						t.Errorf("%v k=%d: %s start %d, answer %d", d, k, name, start, want)
					}
				}
				if lq := d.LogCDF(k); lq < -1e-300 && lq > -1e4 {
					s, ok := d.farFromLog(lq, true)
					check("LogQuantile", s, ok, d.LogQuantile(lq), true)
				}
				if ls := d.LogSurvival(k); ls < -1e-300 && ls > -1e4 {
					s, ok := d.farFromLog(ls, false)
					check("LogUpperQuantile", s, ok, d.LogUpperQuantile(ls), true)
				}
				if q := d.CDF(k); q > 0 && q < 1 {
					s, ok := d.farFromProb(min(q, 1-q), q <= 0.5, q > 0.5)
					check("Quantile", s, ok, d.Quantile(q), q <= 0.5 && q >= 1e-300)
				}
				if q := d.Survival(k); q > 0 && q < 1 {
					s, ok := d.farFromProb(min(q, 1-q), q > 0.5, q > 0.5)
					check("UpperQuantile", s, ok, d.UpperQuantile(q), q <= 0.5 && q >= 1e-300)
				}
			}
		}
	}
	if used < 10000 {
		t.Errorf("the far start answered %d times, want it used on the far tails (>= 10000)", used)
	}
	// Where it must not answer.
	for _, c := range []struct {
		d     Dist
		lt    float64
		lower bool
	}{
		{Dist{N: smallN + 1, P: 0.3}, -50, true}, // N beyond the tables
		{Dist{N: 100, P: 0.3}, -7.9, true},       // nearer the bulk than farMinLog
		{Dist{N: 100, P: 0.3}, math.NaN(), false},
	} {
		if k, ok := c.d.farStart(c.lt, c.lower, 0); ok {
			t.Errorf("%v: farStart(%v, %v) = %d, want no start", c.d, c.lt, c.lower, k)
		}
	}
}

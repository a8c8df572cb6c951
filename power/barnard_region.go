package power

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/root"
	"github.com/kofnlab/kofn/internal/xmath"
	"github.com/kofnlab/kofn/test"
)

// pooledZ returns the pooled score statistic of the table (x1 of n1, x2
// of n2), 0 when every observation is a success or every one a failure.
// It is used only to order the tables for the search below; every
// rejection decision comes from test.Barnard.
func pooledZ(x1, n1, x2, n2 int64) float64 {
	s, N := float64(x1+x2), float64(n1+n2)
	if s == 0 || s == N {
		return 0
	}
	num := float64(x1*n2 - x2*n1)
	return num * math.Sqrt(N) / (math.Sqrt(float64(n1)*float64(n2)) * math.Sqrt(s*(N-s)))
}

// barnardRegion builds the rejection region of Barnard's test at alpha.
// Barnard's p-value is the supremum over the nuisance proportion of the
// probability of the tables at least as extreme (by the pooled z) as the
// observed one, so it is monotone in the extremity of z and the region is
// {tables at least as extreme as z*}: key(table) >= k*, with key = z
// (test.Higher), -z (test.Lower) or |z| (two-sided). k* is found by bisection on the
// key's value, each probe a call of test.Barnard on the least extreme
// table at or above the midpoint (or the most extreme below it), until no
// table's key lies between the largest accepted and the smallest rejected
// one (keys within 1e-12 relative count as tied: their p-values are
// equal). Within a row x1 the pooled z falls as x2 grows (Barnard's
// convexity of the pooled score ordering), so each probe's table and the
// final region come from binary searches per row: O(n1 log n2) per probe,
// O(n1) memory, and some 20 to 40 probes.
func barnardRegion(ctx context.Context, fn string, n1, n2 int64, alpha float64, alt test.Alternative) (*twoRegion, error) {
	return barnardRegionFrom(ctx, fn, n1, n2, alpha, alt, nil)
}

// barnardHint carries the critical key of one group size to the next in a
// sample-size search: the search starts there instead of at the normal
// critical value. The region found does not depend on where it starts
// (it is the set of tables at least as extreme as the least extreme
// rejected one, and the search ends only when no table's key lies between
// the largest accepted and the smallest rejected key); the start only
// changes how many tables are decided on the way.
type barnardHint struct {
	kr     float64 // the last region's smallest rejected key, less the tie
	ok     bool
	probes int // test.Barnard calls so far, for the benchmarks
}

// barnardRegionFrom is barnardRegion started at hint's key when hint holds
// one; it leaves the new critical key in hint.
func barnardRegionFrom(ctx context.Context, fn string, n1, n2 int64, alpha float64, alt test.Alternative, hint *barnardHint) (*twoRegion, error) {
	key := func(x1, x2 int64) float64 {
		z := pooledZ(x1, n1, x2, n2)
		switch alt {
		case test.Lower:
			return -z
		case test.TwoSided:
			return math.Abs(z)
		}
		return z
	}
	// cuts returns, for row x1, the last x2 with z >= c (-1 if none) and
	// the first x2 with z <= -c (n2+1 if none); with the key, the row's
	// tables with key >= c are [0, p] for test.Higher, [q, n2] for test.Lower, both
	// for two-sided (c > 0 there, so the two do not meet).
	cuts := func(x1 int64, c float64) (p, q int64) {
		p, q = -1, n2+1
		if alt != test.Lower {
			p = root.SmallestInt(func(x2 int64) bool { return pooledZ(x1, n1, x2, n2) < c }, 0, n2) - 1
		}
		if alt != test.Higher {
			q = root.SmallestInt(func(x2 int64) bool { return pooledZ(x1, n1, x2, n2) <= -c }, 0, n2)
		}
		return p, q
	}
	tie := func(k float64) float64 { return 1e-12 * math.Abs(k) }
	// nearest returns the table with the smallest key >= c and below hi
	// (above), or with the largest key < c and above lo (below).
	nearest := func(c, lo, hi float64) (t [2]int64, kt float64, ok bool, above bool) {
		best, bestB := math.Inf(1), math.Inf(-1)
		var tb [2]int64
		okB := false
		for x1 := int64(0); x1 <= n1; x1++ {
			if x1%4096 == 0 && ctx.Err() != nil {
				return t, 0, false, false // the caller reports the error
			}
			p, q := cuts(x1, c)
			for _, x2 := range []int64{p, q} { // at or above c
				if x2 >= 0 && x2 <= n2 {
					if k := key(x1, x2); k >= c && k < hi && k < best {
						best, t, ok = k, [2]int64{x1, x2}, true
					}
				}
			}
			for _, x2 := range []int64{p + 1, q - 1} { // below c
				if x2 >= 0 && x2 <= n2 {
					if k := key(x1, x2); k < c && k > lo && k > bestB {
						bestB, tb, okB = k, [2]int64{x1, x2}, true
					}
				}
			}
		}
		if ok {
			return t, best, true, true
		}
		return tb, bestB, okB, false
	}
	la := xmath.Log(alpha)
	opt := test.UnconditionalOptions{Alternative: alt}
	zc := -zq(alpha) // the normal critical value: the first probe
	if alt == test.TwoSided {
		zc = -zq(alpha / 2)
	}
	ka, kr := math.Inf(-1), math.Inf(1) // keys <= ka accepted, keys >= kr rejected
	c := zc
	// From a hint, the neighbours of the first decided table come next
	// (the critical key moves little from one group size to the next),
	// then steps that grow fourfold from 1e-4 (relative) until both sides
	// are bracketed; then bisection.
	warm := hint != nil && hint.ok && !math.IsInf(hint.kr, 0) && !math.IsNaN(hint.kr)
	step, near := 0.0, 0
	if warm {
		c = hint.kr
		step = 1e-4 * math.Max(1, math.Abs(c))
	}
	for iter := 0; ; iter++ {
		if err := argerr.Canceled(fn, ctx); err != nil {
			return nil, err
		}
		t, kt, ok, _ := nearest(c, ka, kr)
		if !ok || iter > 400 {
			break
		}
		if hint != nil {
			hint.probes++
		}
		res, err := test.Barnard(ctx, t[0], n1, t[1], n2, opt)
		if err != nil {
			return nil, &argerr.Error{Func: fn, Reason: "Barnard's test failed: " + err.Error(), Err: err}
		}
		if res.LogPValue < la {
			kr = kt - tie(kt)
		} else {
			ka = kt + tie(kt)
		}
		switch {
		case warm && math.IsInf(kr, 1) && near < 2:
			c, near = ka, near+1 // the smallest key above ka
		case warm && math.IsInf(ka, -1) && near < 2:
			c, near = kr, near+1 // the largest key below kr
		case warm && math.IsInf(kr, 1):
			c, step = ka+step, 4*step
		case warm && math.IsInf(ka, -1):
			c, step = kr-step, 4*step
		case math.IsInf(kr, 1):
			c = ka + math.Max(1, math.Abs(ka))
		case math.IsInf(ka, -1):
			c = kr - math.Max(1, math.Abs(kr))
		default:
			c = ka + (kr-ka)/2
		}
	}
	if err := argerr.Canceled(fn, ctx); err != nil {
		return nil, err
	}
	if hint != nil {
		hint.kr, hint.ok = kr, true
	}
	r := &twoRegion{n1: n1, n2: n2, a: make([]int64, n1+1), b: make([]int64, n1+1)}
	for x1 := int64(0); x1 <= n1; x1++ {
		if x1%4096 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return nil, err
			}
		}
		if math.IsInf(kr, 1) {
			r.a[x1], r.b[x1] = 0, n2 // nothing rejected
			continue
		}
		p, q := cuts(x1, kr)
		r.a[x1], r.b[x1] = p+1, q-1
	}
	return r, nil
}

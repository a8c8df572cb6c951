package power

import (
	"context"
	"math"
	"slices"
	"testing"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/xmath"
	"github.com/kofnlab/kofn/test"
)

// This file keeps the Barnard rejection-region search that sorted every
// table by its pooled z (O(n1 n2) memory) before the search by value with
// per-row binary searches, unchanged but for its name, as the reference
// oracle of TestBarnardRegionAgainstOracle.

// barnardRegion builds the rejection region of Barnard's test at alpha.
// Barnard's p-value is the supremum over the nuisance proportion of the
// probability of the tables at least as extreme (by the pooled z) as the
// observed one, so it is monotone in the extremity of z and the region is
// {tables at least as extreme as z*}. The tables are sorted by extremity
// (ties, equal z within 1e-12 relative, share one rank as their p-values
// are equal), and z* is found by bisection over the ranks with test.Barnard
// deciding each probe: O(log(n1 n2)) Barnard p-values, each O(n1 n2).
func oldBarnardRegion(ctx context.Context, fn string, n1, n2 int64, alpha float64, alt test.Alternative) (*twoRegion, error) {
	type tab struct {
		x1, x2 int64
		key    float64 // larger is more extreme
	}
	tabs := make([]tab, 0, (n1+1)*(n2+1))
	for x1 := int64(0); x1 <= n1; x1++ {
		for x2 := int64(0); x2 <= n2; x2++ {
			z := pooledZ(x1, n1, x2, n2)
			switch alt {
			case test.Lower:
				z = -z
			case test.TwoSided:
				z = math.Abs(z)
			}
			tabs = append(tabs, tab{x1, x2, z})
		}
	}
	slices.SortFunc(tabs, func(a, b tab) int {
		switch {
		case a.key > b.key:
			return -1
		case a.key < b.key:
			return 1
		}
		return 0
	})
	// Group starts: rank boundaries where the key changes beyond the tolerance.
	var starts []int
	for i := range tabs {
		if i == 0 || tabs[i-1].key-tabs[i].key > 1e-12*math.Abs(tabs[i-1].key) {
			starts = append(starts, i)
		}
	}
	la := xmath.Log(alpha)
	opt := test.UnconditionalOptions{Alternative: alt}
	var probeErr error
	rejected := func(g int) bool { // group g and all more extreme groups are rejected
		if probeErr != nil {
			return false
		}
		t := tabs[starts[g]]
		res, err := test.Barnard(ctx, t.x1, n1, t.x2, n2, opt)
		if err != nil {
			probeErr = err
			return false
		}
		return res.LogPValue < la
	}
	// rejected is true for g = 0..G-1 and false after: find G.
	lo, hi := -1, len(starts) // rejected(lo) true (or lo = -1), rejected(hi) false (or hi = len)
	for hi-lo > 1 {
		mid := lo + (hi-lo)/2
		if rejected(mid) {
			lo = mid
		} else {
			hi = mid
		}
		if probeErr != nil {
			return nil, &argerr.Error{Func: fn, Reason: "Barnard's test failed: " + probeErr.Error(), Err: probeErr}
		}
	}
	nrej := 0
	if hi < len(starts) {
		nrej = starts[hi]
	} else {
		nrej = len(tabs)
	}
	r := &twoRegion{n1: n1, n2: n2, a: make([]int64, n1+1), b: make([]int64, n1+1)}
	rej := make([]bool, (n1+1)*(n2+1))
	for _, t := range tabs[:nrej] {
		rej[t.x1*(n2+1)+t.x2] = true
	}
	// Barnard's convexity: in each row the accepted x2 form an interval.
	for x1 := int64(0); x1 <= n1; x1++ {
		a, b := int64(0), int64(-1)
		row := rej[x1*(n2+1) : (x1+1)*(n2+1)]
		for x2 := int64(0); x2 <= n2; x2++ {
			if !row[x2] {
				if b < a {
					a = x2
				}
				b = x2
			}
		}
		for x2 := a; x2 <= b; x2++ {
			if row[x2] {
				return nil, argerr.NoSolution(fn, "the Barnard rejection region is not convex in a row; cannot enumerate")
			}
		}
		r.a[x1], r.b[x1] = a, b
	}
	return r, nil
}

// TestBarnardRegionAgainstOracle: the rejection region of Barnard's test
// found by the search by value is the one the sorting search found, table
// for table, for every shape up to 30 x 30 (12 x 12 under -short; every
// third n2), every alternative, at alpha 0.05 and 0.01. Regression oracle,
// common practice.
func TestBarnardRegionAgainstOracle(t *testing.T) {
	t.Parallel()
	top := int64(30)
	if testing.Short() {
		top = 12
	}
	ctx := context.Background()
	for n1 := int64(1); n1 <= top; n1++ {
		for n2 := int64(1); n2 <= top; n2 += 3 {
			for _, alt := range []test.Alternative{test.TwoSided, test.Lower, test.Higher} {
				for _, alpha := range []float64{0.05, 0.01} {
					got, err := barnardRegion(ctx, "t", n1, n2, alpha, alt)
					if err != nil {
						t.Fatal(err)
					}
					want, err := oldBarnardRegion(ctx, "t", n1, n2, alpha, alt)
					if err != nil {
						t.Fatal(err)
					}
					for x1 := int64(0); x1 <= n1; x1++ {
						for x2 := int64(0); x2 <= n2; x2++ {
							if g, w := got.rejects(x1, x2), want.rejects(x1, x2); g != w {
								t.Fatalf("n = %d, %d, %v, alpha %v: table (%d, %d) rejected %v, sorting search %v", n1, n2, alt, alpha, x1, x2, g, w)
							}
						}
					}
				}
			}
		}
	}
}

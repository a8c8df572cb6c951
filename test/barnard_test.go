package test

import (
	"context"
	"math"
	"testing"
)

// TestBarnardMehtaSenchaudhuri: Mehta CR, Senchaudhuri P (2003),
// Conditional versus unconditional exact tests for comparing two binomials,
// Table 1 (read): vaccine 7/15 infected, placebo 12/15, one-sided (vaccine
// lower) Barnard P = 0.0341. One table has the same pooled z as the
// observed one in exact arithmetic; counting it gives 0.034109, dropping it
// (floating-point comparison without tolerance) 0.034077 (shared
// REFERENCES.md). The integer comparison keeps it.
func TestBarnardMehtaSenchaudhuri(t *testing.T) {
	t.Parallel()
	r, err := Barnard(context.Background(), 7, 15, 12, 15, UnconditionalOptions{Alternative: Lower})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(r.PValue-0.034109) > 0.0000005 {
		t.Errorf("p = %v (at pi = %v), want 0.034109", r.PValue, r.Nuisance.At)
	}
}

// TestBarnardConvexity checks Barnard's convexity condition for the pooled
// score ordering, for every n1 <= 25, n2 = 1, 4, ..., 25 (n1 <= 12 under
// -short) and every observed table: the
// one-sided (Lower) rejection region is closed under decreasing x1 and under
// increasing x2, and every row of every region built is a prefix and/or a
// suffix (no interior runs), so the O(n1 + n2) evaluation applies.
func TestBarnardConvexity(t *testing.T) {
	t.Parallel()
	top := 25
	if testing.Short() {
		top = 12
	}
	for n1 := 1; n1 <= top; n1++ {
		for n2 := 1; n2 <= 25; n2 += 3 {
			for k1 := 0; k1 <= n1; k1++ {
				for k2 := 0; k2 <= n2; k2++ {
					obs := newZKey(k1, k2, n1, n2)
					in := func(x1, x2 int) bool { return newZKey(x1, x2, n1, n2).le(obs) }
					for x1 := 0; x1 <= n1; x1++ {
						for x2 := 0; x2 <= n2; x2++ {
							if !in(x1, x2) {
								continue
							}
							if x1 > 0 && !in(x1-1, x2) || x2 < n2 && !in(x1, x2+1) {
								t.Fatalf("n1=%d n2=%d obs=(%d,%d): (%d,%d) in, neighbour out", n1, n2, k1, k2, x1, x2)
							}
						}
					}
					for _, f := range []func(x1, x2 int) bool{in, func(x1, x2 int) bool { return cmpAbs(newZKey(x1, x2, n1, n2), obs) >= 0 }} {
						r, _ := newRegion(context.Background(), "t", n1, n2, f)
						if len(r.inner) != 0 {
							t.Fatalf("n1=%d n2=%d obs=(%d,%d): interior runs %v", n1, n2, k1, k2, r.inner)
						}
					}
				}
			}
		}
	}
}

func BenchmarkBarnard100(b *testing.B) {
	for b.Loop() {
		_, _ = Barnard(context.Background(), 40, 100, 55, 100, UnconditionalOptions{})
	}
}

func BenchmarkBarnard500(b *testing.B) {
	for b.Loop() {
		_, _ = Barnard(context.Background(), 200, 500, 235, 500, UnconditionalOptions{})
	}
}

// TestSupremumDense: the supremum over the nuisance parameter is at least
// the largest value on a dense grid of 20001 points, for tables with one
// and with several peaks (two-sided regions), so the coarse grid plus
// refinement misses none.
func TestSupremumDense(t *testing.T) {
	t.Parallel()
	cases := [][4]int{{40, 100, 55, 100}, {7, 15, 12, 15}, {2, 7, 16, 20}, {0, 30, 15, 25}, {18, 30, 10, 25}, {3, 60, 1, 9}}
	for _, c := range cases {
		n1, n2 := c[1], c[3]
		obs := newZKey(c[0], c[2], n1, n2)
		reg, _ := newRegion(context.Background(), "t", n1, n2, func(x1, x2 int) bool { return cmpAbs(newZKey(x1, x2, n1, n2), obs) >= 0 })
		got, at, err := reg.supremum(context.Background(), "t", 0, 1)
		if err != nil {
			t.Fatal(err)
		}
		w := newScratch(n1, n2)
		best, bestAt := math.Inf(-1), 0.0
		for i := 0; i <= 20000; i++ {
			if v := reg.logProb(w, float64(i)/20000); v > best {
				best, bestAt = v, float64(i)/20000
			}
		}
		if got < best-1e-12 {
			t.Errorf("%v: supremum %v at %v below the dense grid's %v at %v", c, got, at, best, bestAt)
		}
	}
}

package test

import (
	"context"
	"errors"
	"math"
	"testing"
)

// pmf2 returns the probability of table (x1, x2) when both samples have
// success probability pi.
func pmf2(x1, n1, x2, n2 int64, pi float64) float64 {
	return math.Exp(lbinom(x1, n1, pi) + lbinom(x2, n2, pi))
}

// twoSampleP is a two-sample test under property checks.
type twoSampleP struct {
	name string
	p    func(k1, n1, k2, n2 int64, a Alternative) float64
	mid  bool // mid-p or asymptotic: the size is not checked
	// notMonotone: the Berger-Boos p-value takes its supremum over an
	// interval that moves with the pooled count, so it need not be
	// monotone in the counts (it is checked for size only).
	notMonotone bool
}

func twoSampleTests() []twoSampleP {
	ctx := context.Background()
	return []twoSampleP{
		{"Fisher point", func(k1, n1, k2, n2 int64, a Alternative) float64 {
			r, _ := Fisher(k1, n1, k2, n2, FisherOptions{Alternative: a})
			return r.PValue
		}, false, false},
		{"Fisher central", func(k1, n1, k2, n2 int64, a Alternative) float64 {
			r, _ := Fisher(k1, n1, k2, n2, FisherOptions{Alternative: a, Rule: Central})
			return r.PValue
		}, false, false},
		{"Fisher mid-p", func(k1, n1, k2, n2 int64, a Alternative) float64 {
			r, _ := Fisher(k1, n1, k2, n2, FisherOptions{Alternative: a, MidP: true})
			return r.PValue
		}, true, false},
		{"Barnard", func(k1, n1, k2, n2 int64, a Alternative) float64 {
			r, _ := Barnard(ctx, k1, n1, k2, n2, UnconditionalOptions{Alternative: a})
			return r.PValue
		}, false, false},
		{"Barnard Berger-Boos", func(k1, n1, k2, n2 int64, a Alternative) float64 {
			r, _ := Barnard(ctx, k1, n1, k2, n2, UnconditionalOptions{Alternative: a, BergerBoos: 0.001})
			return r.PValue
		}, false, true},
		{"Boschloo", func(k1, n1, k2, n2 int64, a Alternative) float64 {
			r, _ := Boschloo(ctx, k1, n1, k2, n2, UnconditionalOptions{Alternative: a})
			return r.PValue
		}, false, false},
		{"z pooled", func(k1, n1, k2, n2 int64, a Alternative) float64 {
			r, _ := TwoSample(k1, n1, k2, n2, TwoSampleOptions{Alternative: a})
			return r.PValue
		}, true, false},
	}
}

// TestTwoSampleExactSize computes the true size of each exact two-sample
// test exactly, over every table, as a function of the common proportion
// (on a grid of 41 values): it never exceeds alpha. The mid-p and
// asymptotic tests are only checked for p-values in [0, 1] and
// monotonicity.
func TestTwoSampleExactSize(t *testing.T) {
	t.Parallel()
	sizes := [][2]int64{{4, 6}, {9, 9}, {12, 7}}
	if testing.Short() {
		sizes = sizes[:1]
	}
	for _, tc := range twoSampleTests() {
		for _, sz := range sizes {
			n1, n2 := sz[0], sz[1]
			for _, a := range []Alternative{TwoSided, Lower, Higher} {
				p := make([][]float64, n1+1)
				for k1 := int64(0); k1 <= n1; k1++ {
					p[k1] = make([]float64, n2+1)
					for k2 := int64(0); k2 <= n2; k2++ {
						v := tc.p(k1, n1, k2, n2, a)
						if !(v >= 0 && v <= 1) {
							t.Fatalf("%s %v (%d/%d, %d/%d): p = %v", tc.name, a, k1, n1, k2, n2, v)
						}
						p[k1][k2] = v
						// One-sided p-values are monotone in the counts; a
						// table with a zero margin (one possible table) has
						// p-value 1 by convention, also for mid-p, where the
						// neighbours' mid-p values are below 1.
						if tc.notMonotone || tc.mid && (k1+k2 <= 1 || k1+k2 >= n1+n2-1) {
							continue
						}
						if k1 > 0 && (a == Lower && v < p[k1-1][k2]*(1-1e-9) || a == Higher && v > p[k1-1][k2]*(1+1e-9)) {
							t.Errorf("%s %v: p(%d, %d) = %v against p(%d, %d) = %v", tc.name, a, k1, k2, v, k1-1, k2, p[k1-1][k2])
						}
						if k2 > 0 && (a == Lower && v > p[k1][k2-1]*(1+1e-9) || a == Higher && v < p[k1][k2-1]*(1-1e-9)) {
							t.Errorf("%s %v: p(%d, %d) = %v against p(%d, %d) = %v", tc.name, a, k1, k2, v, k1, k2-1, p[k1][k2-1])
						}
					}
				}
				if tc.mid {
					continue
				}
				for _, alpha := range []float64{0.01, 0.05, 0.1} {
					for i := 1; i < 41; i++ {
						pi := float64(i) / 41
						size := 0.0
						for k1 := int64(0); k1 <= n1; k1++ {
							for k2 := int64(0); k2 <= n2; k2++ {
								if p[k1][k2] < alpha {
									size += pmf2(k1, n1, k2, n2, pi)
								}
							}
						}
						if size > alpha*(1+1e-9) {
							t.Errorf("%s %v n=(%d, %d) alpha=%v pi=%v: size %v", tc.name, a, n1, n2, alpha, pi, size)
						}
					}
				}
			}
		}
	}
}

// TestUnconditionalTinyP: 0/1000 against 1000/1000, two-sided: the
// rejection region holds only this table and its mirror image, so the
// p-value is max over pi of 2 pi^1000 (1-pi)^1000 = 2^-1999, far below the
// smallest double; the log p-value must be -1999 ln 2 (the log-space path
// of the region sums).
func TestUnconditionalTinyP(t *testing.T) {
	if testing.Short() {
		t.Skip("1e6 tables")
	}
	t.Parallel()
	r, err := Barnard(context.Background(), 0, 1000, 1000, 1000, UnconditionalOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if want := -1999 * math.Ln2; math.Abs(r.LogPValue-want) > 1e-9*math.Abs(want) || r.PValue != 0 || math.Abs(r.Nuisance.At-0.5) > 1e-6 {
		t.Errorf("log p = %v at %v, want %v at 0.5", r.LogPValue, r.Nuisance.At, want)
	}
}

// TestRegionSumsAgree: the windowed linear-space sum and the full
// log-space sum of a region's probability agree where the window's bound
// says it is exact, and the window's value bounds the full sum from above
// elsewhere.
func TestRegionSumsAgree(t *testing.T) {
	t.Parallel()
	for _, c := range [][4]int{{12, 40, 20, 33}, {400, 1000, 470, 1000}, {3, 5000, 1, 20}} {
		n1, n2 := c[1], c[3]
		reg, _ := newRegion(context.Background(), "t", n1, n2, barnardCut(n1, n2, newZKey(c[0], c[2], n1, n2), TwoSided))
		for _, pi := range []float64{1e-6, 0.01, 0.2, 0.47, 0.5, 0.77, 0.999} {
			a := reg.logProbFull(pi)
			b, exact := reg.logProbBound(pi)
			if exact && math.Abs(a-b) > 1e-12*math.Max(1, math.Abs(a)) || !exact && b < a {
				t.Errorf("%v, pi = %v: full %v, window %v (exact %v)", c, pi, a, b, exact)
			}
		}
	}
}

func TestUnconditionalLimits(t *testing.T) {
	t.Parallel()
	_, err := Barnard(context.Background(), 1, MaxUnconditionalTotal/2+1, 1, MaxUnconditionalTotal/2, UnconditionalOptions{})
	if !errors.Is(err, ErrTooLarge) {
		t.Errorf("n1 + n2 = MaxUnconditionalTotal + 1: %v", err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	for _, f := range []func(context.Context, int64, int64, int64, int64, UnconditionalOptions) (Result, error){Barnard, Boschloo} {
		_, err = f(ctx, 10, 300, 20, 300, UnconditionalOptions{})
		if !errors.Is(err, context.Canceled) {
			t.Errorf("cancelled: %v", err)
		}
	}
	_, err = Barnard(context.Background(), 1, 3, 1, 3, UnconditionalOptions{BergerBoos: 0.6})
	if err == nil || err.Error() != "test.Barnard: BergerBoos = 0.6 must be 0 (no restriction) or lie in (0, 0.5); 0.001 is usual" {
		t.Errorf("BergerBoos 0.6: %v", err)
	}
}

// TestBergerBoosBounds: the Berger-Boos p-value lies between gamma and the
// unrestricted p-value plus gamma (Berger and Boos 1994), and its
// supremum is attained inside the Clopper-Pearson interval.
func TestBergerBoosBounds(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	for _, c := range [][4]int64{{7, 15, 12, 15}, {0, 30, 15, 25}, {40, 100, 55, 100}, {3, 10, 3, 10}} {
		for _, a := range []Alternative{TwoSided, Lower, Higher} {
			full, _ := Barnard(ctx, c[0], c[1], c[2], c[3], UnconditionalOptions{Alternative: a})
			bb, err := Barnard(ctx, c[0], c[1], c[2], c[3], UnconditionalOptions{Alternative: a, BergerBoos: 0.001})
			if err != nil {
				t.Fatal(err)
			}
			if bb.PValue < 0.001 || bb.PValue > math.Min(1, full.PValue+0.001)*(1+1e-12) {
				t.Errorf("%v %v: Berger-Boos p = %v, unrestricted %v", c, a, bb.PValue, full.PValue)
			}
		}
	}
}

package binom

import (
	"math"
	"testing"
)

// TestQuantileInverts checks that each quantile inverts its tail exactly
// (Quantile(CDF(k)) == k wherever CDF(k-1) < CDF(k) < 1, and the same for
// the other three), and that a target just past a tail value moves to the
// next k: property check (DESIGN.md section 4) over N up to 1e12, P from
// 1e-15 to 1-1e-15, bulk and far tails.
func TestQuantileInverts(t *testing.T) {
	t.Parallel()
	for _, d := range propertyDists() {
		for _, k := range propertyKs(d) {
			if c, cPrev := d.CDF(k), d.CDF(k-1); c < 1 && cPrev < c {
				if got := d.Quantile(c); got != k {
					t.Errorf("%v: Quantile(CDF(%d) = %v) = %d", d, k, c, got)
				}
				if up := math.Nextafter(c, 2); d.CDF(k+1) >= up {
					if got := d.Quantile(up); got != k+1 {
						t.Errorf("%v: Quantile(just above CDF(%d)) = %d, want %d", d, k, got, k+1)
					}
				}
			}
			if l, lPrev := d.LogCDF(k), d.LogCDF(k-1); l < 0 && lPrev < l {
				if got := d.LogQuantile(l); got != k {
					t.Errorf("%v: LogQuantile(LogCDF(%d) = %v) = %d", d, k, l, got)
				}
			}
			if s, sPrev := d.Survival(k), d.Survival(k-1); s > 0 && s < sPrev {
				if got := d.UpperQuantile(s); got != k {
					t.Errorf("%v: UpperQuantile(Survival(%d) = %v) = %d", d, k, s, got)
				}
				if dn := math.Nextafter(s, 0); d.Survival(k-1) > dn && k > 0 {
					if got := d.UpperQuantile(dn); got != k && d.Survival(k) <= dn {
						t.Errorf("%v: UpperQuantile(just below Survival(%d)) = %d", d, k, got)
					}
				}
			}
			if l, lPrev := d.LogSurvival(k), d.LogSurvival(k-1); !math.IsInf(l, -1) && l < lPrev {
				if got := d.LogUpperQuantile(l); got != k {
					t.Errorf("%v: LogUpperQuantile(LogSurvival(%d) = %v) = %d", d, k, l, got)
				}
			}
		}
	}
}

// TestQuantileScan compares the quantiles with a linear scan of the tails
// for small N over a grid of targets.
func TestQuantileScan(t *testing.T) {
	t.Parallel()
	for _, n := range []int64{1, 2, 9, 40} {
		for _, p := range []float64{1e-12, 0.05, 0.5, 0.93, 1 - 1e-12} {
			d := Dist{N: n, P: p}
			for _, q := range []float64{1e-300, 1e-20, 1e-6, 0.01, 0.2, 0.5, 0.7, 0.99, 1 - 1e-9, 1 - 1e-16} {
				want := d.N
				for k := int64(0); k <= d.N; k++ {
					if d.CDF(k) >= q {
						want = k
						break
					}
				}
				if got := d.Quantile(q); got != want {
					t.Errorf("%v: Quantile(%v) = %d, scan %d", d, q, got, want)
				}
				want = d.N
				for k := int64(0); k <= d.N; k++ {
					if d.Survival(k) <= q {
						want = k
						break
					}
				}
				if got := d.UpperQuantile(q); got != want {
					t.Errorf("%v: UpperQuantile(%v) = %d, scan %d", d, q, got, want)
				}
			}
		}
	}
}

// TestQuantileExtremes checks targets at the smallest double and far
// beyond it, in log space, at N = 1e12.
func TestQuantileExtremes(t *testing.T) {
	t.Parallel()
	for _, d := range []Dist{{1e12, 0.5}, {1e12, 1e-9}, {1e12, 1 - 1e-9}, {50, 0.3}} {
		q := math.SmallestNonzeroFloat64
		if k := d.UpperQuantile(q); !(d.Survival(k) <= q && (k == 0 || d.Survival(k-1) > q)) {
			t.Errorf("%v: UpperQuantile(%v) = %d: Survival there %v, before %v", d, q, k, d.Survival(k), d.Survival(k-1))
		}
		if k := d.Quantile(q); !(d.CDF(k) >= q && (k == 0 || d.CDF(k-1) < q)) {
			t.Errorf("%v: Quantile(%v) = %d", d, q, k)
		}
		for _, lq := range []float64{-1e5, -2000, -746} {
			if k := d.LogQuantile(lq); !(d.LogCDF(k) >= lq && (k == 0 || d.LogCDF(k-1) < lq)) {
				t.Errorf("%v: LogQuantile(%v) = %d: LogCDF there %v, before %v", d, lq, k, d.LogCDF(k), d.LogCDF(k-1))
			}
			if k := d.LogUpperQuantile(lq); !(d.LogSurvival(k) <= lq && (k == 0 || d.LogSurvival(k-1) > lq)) {
				t.Errorf("%v: LogUpperQuantile(%v) = %d: LogSurvival there %v, before %v", d, lq, k, d.LogSurvival(k), d.LogSurvival(k-1))
			}
		}
	}
}

// TestQuantileSpecialCases pins the documented answers outside (0, 1) and
// at degenerate distributions.
func TestQuantileSpecialCases(t *testing.T) {
	t.Parallel()
	nan, inf := math.NaN(), math.Inf(1)
	d := Dist{N: 20, P: 0.4}
	tests := []struct {
		name string
		got  int64
		want int64
	}{
		{"Quantile(0)", d.Quantile(0), 0},
		{"Quantile(-1)", d.Quantile(-1), 0},
		{"Quantile(1)", d.Quantile(1), 20},
		{"Quantile(1.5)", d.Quantile(1.5), -1},
		{"Quantile(NaN)", d.Quantile(nan), -1},
		{"UpperQuantile(1)", d.UpperQuantile(1), 0},
		{"UpperQuantile(2)", d.UpperQuantile(2), 0},
		{"UpperQuantile(0)", d.UpperQuantile(0), 20},
		{"UpperQuantile(-0.1)", d.UpperQuantile(-0.1), -1},
		{"UpperQuantile(NaN)", d.UpperQuantile(nan), -1},
		{"LogQuantile(-Inf)", d.LogQuantile(-inf), 0},
		{"LogQuantile(0)", d.LogQuantile(0), 20},
		{"LogQuantile(0.1)", d.LogQuantile(0.1), -1},
		{"LogQuantile(NaN)", d.LogQuantile(nan), -1},
		{"LogUpperQuantile(0)", d.LogUpperQuantile(0), 0},
		{"LogUpperQuantile(-Inf)", d.LogUpperQuantile(-inf), 20},
		{"LogUpperQuantile(0.1)", d.LogUpperQuantile(0.1), -1},
		{"P=0 Quantile(0.5)", Dist{20, 0}.Quantile(0.5), 0},
		{"P=0 Quantile(1)", Dist{20, 0}.Quantile(1), 0},
		{"P=0 UpperQuantile(0)", Dist{20, 0}.UpperQuantile(0), 0},
		{"P=1 Quantile(1e-9)", Dist{20, 1}.Quantile(1e-9), 20},
		{"P=1 UpperQuantile(0.5)", Dist{20, 1}.UpperQuantile(0.5), 20},
		{"P=1 LogUpperQuantile(-Inf)", Dist{20, 1}.LogUpperQuantile(-inf), 20},
		{"N=0 Quantile(0.5)", Dist{0, 0.5}.Quantile(0.5), 0},
		{"N=0 UpperQuantile(0)", Dist{0, 0.5}.UpperQuantile(0), 0},
		{"invalid Quantile", Dist{-1, 0.5}.Quantile(0.5), -1},
		{"invalid LogUpperQuantile", Dist{5, 2}.LogUpperQuantile(-1), -1},
	}
	for _, tc := range tests {
		if tc.got != tc.want {
			t.Errorf("%s = %d, want %d", tc.name, tc.got, tc.want)
		}
	}
}

package binom

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/xmath"
)

// propertyDists spans the domain of the accuracy bar: N from 1 to 1e12 and
// P from 1e-15 to 1-1e-15, with the standard deviation small and large.
func propertyDists() []Dist {
	var ds []Dist
	for _, n := range []int64{1, 7, 60, 1000, 123457, 1e8, 999999999989, 1e12} {
		for _, p := range []float64{1e-15, 1e-9, 3e-4, 0.02, 0.3, 0.5, 0.77, 0.999, 1 - 1e-9, 1 - 1e-15} {
			ds = append(ds, Dist{N: n, P: p})
		}
	}
	return ds
}

// propertyKs returns points across the support: the ends, the bulk at
// fractions of a standard deviation, the shoulders where the methods
// switch, and far tails.
func propertyKs(d Dist) []int64 {
	mean, sd := d.Mean(), d.StdDev()
	ks := []int64{0, 1, 2, d.N - 2, d.N - 1, d.N}
	for _, z := range []float64{-300, -40, -12, -7, -4, -2.5, -1, -0.2, 0, 0.2, 1, 2.5, 4, 7, 12, 40, 300} {
		ks = append(ks, int64(math.Floor(mean+z*sd)))
	}
	out := ks[:0]
	for _, k := range ks {
		if k >= 0 && k <= d.N {
			out = append(out, k)
		}
	}
	return out
}

// TestComplement checks P(X <= k) + P(X > k) = 1 in log space, from both
// sides: ln(e^LogCDF + e^LogSurvival) = 0 within 1e-15, and, where both
// tails are at least 1e-3 (so the complement is well conditioned), each is
// the log1mexp of the other within 1e-13.
// Property check (DESIGN.md section 4).
func TestComplement(t *testing.T) {
	t.Parallel()
	for _, d := range propertyDists() {
		for _, k := range propertyKs(d) {
			lc, ls := d.LogCDF(k), d.LogSurvival(k)
			if s := xmath.LogAddExp(lc, ls); math.Abs(s) > 1e-15 {
				t.Errorf("%v k=%d: ln(CDF + Survival) = %.3g", d, k, s)
			}
			if ls > math.Log(1e-3) && lc > math.Log(1e-3) {
				if e := logErr(xmath.Log1mExp(ls), lc); e > 1e-13 {
					t.Errorf("%v k=%d: LogCDF %v vs xmath.Log1mExp(LogSurvival) %v", d, k, lc, xmath.Log1mExp(ls))
				}
				if e := logErr(xmath.Log1mExp(lc), ls); e > 1e-13 {
					t.Errorf("%v k=%d: LogSurvival %v vs xmath.Log1mExp(LogCDF) %v", d, k, ls, xmath.Log1mExp(lc))
				}
			}
		}
	}
}

// TestMonotone checks that LogCDF never decreases and LogSurvival never
// increases in k, on runs of consecutive k around the points where the
// methods switch (uniform expansion, continued fraction, term sums).
func TestMonotone(t *testing.T) {
	t.Parallel()
	for _, d := range propertyDists() {
		for _, k0 := range propertyKs(d) {
			prevC, prevS := d.LogCDF(k0-1), d.LogSurvival(k0-1)
			for k := k0; k <= min(k0+12, d.N+1); k++ {
				c, s := d.LogCDF(k), d.LogSurvival(k)
				if c < prevC || s > prevS {
					t.Errorf("%v: not monotone at k=%d: LogCDF %v -> %v, LogSurvival %v -> %v", d, k, prevC, c, prevS, s)
				}
				prevC, prevS = c, s
			}
		}
	}
}

// TestMethodsAgree compares the uniform expansion with the continued
// fraction or term sum at points where both apply and the latter is well
// conditioned: the fraction's rounding grows like its value, about
// 1/(1 - rho) for the ratio rho of successive PMF terms, so the points sit
// where rho <= 0.9 (at least 0.1 standard deviations times the standard
// deviation out, and 3 standard deviations), inside the expansion's range
// z^2 <= min(k+1, N-k)/2. Two independent methods agreeing to 1e-14.
func TestMethodsAgree(t *testing.T) {
	t.Parallel()
	checked := 0
	for _, n := range []int64{2000, 1e5, 1e7, 1e9, 1e12} {
		for _, p := range []float64{1e-4, 0.01, 0.3, 0.5, 0.8, 0.999} {
			d := Dist{N: n, P: p}
			sd := d.StdDev()
			if sd < 6 {
				continue
			}
			for _, z := range []float64{-2 * max(3, 0.1*sd), -max(3, 0.1*sd), max(3, 0.1*sd), 2 * max(3, 0.1*sd)} {
				k := int64(math.Floor(d.Mean() + z*sd))
				m := math.Min(float64(k+1), float64(n-k))
				if k < 0 || k >= n || z*z > 0.4*m {
					continue
				}
				tem, _, lower, ok := d.temmeTail(k)
				if !ok {
					t.Errorf("%v k=%d: uniform expansion did not converge", d, k)
					continue
				}
				var other float64
				if lower {
					other = d.logLower(k)
				} else {
					other = d.logUpper(k)
				}
				if e := logErr(tem, other); e > 1e-14 {
					t.Errorf("%v k=%d (z=%.4g): expansion %v, continued fraction or sum %v (error %.3g)", d, k, z, tem, other, e)
				}
				checked++
			}
		}
	}
	if checked < 80 {
		t.Errorf("only %d points checked", checked)
	}
}

// TestTailSpecialCases pins the values at the edges of the domain, which
// follow from the definitions.
func TestTailSpecialCases(t *testing.T) {
	t.Parallel()
	inf := math.Inf(1)
	tests := []struct {
		d      Dist
		k      int64
		lc, ls float64
	}{
		{Dist{10, 0.3}, -1, -inf, 0},
		{Dist{10, 0.3}, 10, 0, -inf},
		{Dist{10, 0.3}, 11, 0, -inf},
		{Dist{10, 0}, 0, 0, -inf},
		{Dist{10, 1}, 9, -inf, 0},
		{Dist{0, 0.5}, 0, 0, -inf},
		{Dist{0, 0.5}, -1, -inf, 0},
		// k = 0: P(X <= 0) = (1-P)^N; k = N-1: P(X > N-1) = P^N.
		{Dist{1e12, 1e-12}, 0, 1e12 * math.Log1p(-1e-12), xmath.Log1mExp(1e12 * math.Log1p(-1e-12))},
		{Dist{40, 0.5}, 39, xmath.Log1mExp(40 * math.Log(0.5)), 40 * math.Log(0.5)},
	}
	for _, tc := range tests {
		got := []float64{tc.d.LogCDF(tc.k), tc.d.LogSurvival(tc.k)}
		want := []float64{tc.lc, tc.ls}
		if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-14, 0)); diff != "" {
			t.Errorf("%v at k=%d: LogCDF, LogSurvival (-want +got):\n%s", tc.d, tc.k, diff)
		}
	}
	// Invalid distributions report NaN.
	for _, d := range []Dist{{-1, 0.5}, {5, -0.1}, {5, math.NaN()}, {MaxN + 1, 0.5}} {
		for _, v := range []float64{d.LogCDF(1), d.LogSurvival(1), d.CDF(1), d.Survival(1), d.LogProbRange(0, 1)} {
			if !math.IsNaN(v) {
				t.Errorf("%v: got %v, want NaN", d, v)
			}
		}
	}
}

// TestFarTails checks tails far beyond the smallest double stay finite and
// directly computed: a survival of about 1e-42 is not 1 - CDF = 0, and
// log tails near -1e5 and -1e10 are finite and match the leading
// large-deviation term N KL(k/N || P) to its O(ln N) error.
func TestFarTails(t *testing.T) {
	t.Parallel()
	// P(X > 250) for N = 1000, P = 0.1 is about 1.1e-42 while CDF(250)
	// rounds to 1: 1 - CDF would return 0.
	d := Dist{N: 1000, P: 0.1}
	if s, c := d.Survival(250), d.CDF(250); !(s > 1e-43 && s < 1e-41) || c != 1 || logErr(math.Log(s), d.LogSurvival(250)) > 1e-15 {
		t.Errorf("Survival(250) = %v (CDF %v), want about 1.1e-42 with CDF 1", s, c)
	}
	for _, c := range []struct {
		d Dist
		k int64
	}{{Dist{1e6, 0.5}, 100000}, {Dist{1e12, 0.3}, 1e11}, {Dist{1e12, 0.3}, 9e11}} {
		x := float64(c.k) / float64(c.d.N)
		kl := float64(c.d.N) * (x*math.Log(x/c.d.P) + (1-x)*math.Log((1-x)/(1-c.d.P)))
		var l float64
		if x < c.d.P {
			l = c.d.LogCDF(c.k)
		} else {
			l = c.d.LogSurvival(c.k)
		}
		if math.IsInf(l, 0) || math.Abs(l+kl) > 2*math.Log(float64(c.d.N)) {
			t.Errorf("%v k=%d: log tail %v, large-deviation estimate %v", c.d, c.k, l, -kl)
		}
	}
}

// TestProbRange compares ranges with sums of independently computed PMF
// values (each LogProb on its own, no recurrence): narrow and wide ranges
// in the bulk of wide distributions, where a difference of tails would
// cancel, ranges in the tails and across the mean, and the edge cases.
func TestProbRange(t *testing.T) {
	t.Parallel()
	for _, d := range []Dist{{1e12, 0.3}, {1e9, 0.5}, {123457, 0.02}, {60, 0.5}, {1e12, 1e-9}} {
		mean, sd := d.Mean(), d.StdDev()
		c := int64(mean)
		for _, r := range [][2]int64{
			{c, c + 1}, {c - 3, c + 3}, {c - 300, c + 700}, {c + int64(3*sd), c + int64(3*sd) + 40},
			{c - int64(5*sd) - 10, c - int64(5*sd)}, {c - int64(sd), c + int64(sd)},
		} {
			lo, hi := max(r[0], 0), min(r[1], d.N)
			if hi-lo > 5000 {
				continue
			}
			want := math.Inf(-1)
			for j := lo; j <= hi; j++ {
				want = xmath.LogAddExp(want, d.LogProb(j))
			}
			got := d.LogProbRange(lo, hi)
			if e := logErr(got, want); e > 1e-14 {
				t.Errorf("%v.LogProbRange(%d, %d) = %v, sum of PMF %v (error %.3g)", d, lo, hi, got, want, e)
			}
			if p, w := d.ProbRange(lo, hi), math.Exp(want); math.Abs(p-w) > 1e-14*w {
				t.Errorf("%v.ProbRange(%d, %d) = %v, sum of PMF exp(%v)", d, lo, hi, p, want)
			}
		}
	}
	d := Dist{100, 0.3}
	tests := []struct {
		name string
		got  float64
		want float64
	}{
		{"whole support", d.LogProbRange(0, 100), 0},
		{"clamped whole", d.LogProbRange(-5, 500), 0},
		{"empty", d.LogProbRange(10, 9), math.Inf(-1)},
		{"outside", d.LogProbRange(101, 200), math.Inf(-1)},
		{"lower tail", d.LogProbRange(-3, 20), d.LogCDF(20)},
		{"upper tail", d.LogProbRange(41, 100), d.LogSurvival(40)},
		{"single", d.LogProbRange(30, 30), d.LogProb(30)},
		{"P = 0 inside", Dist{10, 0}.LogProbRange(1, 5), math.Inf(-1)},
		{"P = 1 at N", Dist{10, 1}.LogProbRange(5, 10), 0},
	}
	for _, tc := range tests {
		if tc.got != tc.want && logErr(tc.got, tc.want) > 1e-15 {
			t.Errorf("%s: %v, want %v", tc.name, tc.got, tc.want)
		}
	}
}

// TestExactSweep compares both log tails at every k with the exact
// math/big oracle for N from 64 to 257, where all three tail methods meet
// (the uniform expansion at its smallest parameters, the continued
// fraction and the term sums): within 1e-14 (measured worst 3.2e-15).
func TestExactSweep(t *testing.T) {
	t.Parallel()
	for _, n := range []int64{64, 70, 81, 100, 128, 150, 200, 257} {
		for _, p := range []float64{0.07, 0.12, 0.2, 0.31, 0.5, 0.66, 0.8, 0.93} {
			d := Dist{N: n, P: p}
			_, cdf, sf := exactLogs(n, p)
			for k := int64(0); k < n; k++ {
				if e := logErr(d.LogCDF(k), cdf[k]); e > 1e-14 {
					t.Errorf("%v.LogCDF(%d) = %v, exact %v (error %.3g)", d, k, d.LogCDF(k), cdf[k], e)
				}
				if e := logErr(d.LogSurvival(k), sf[k]); e > 1e-14 {
					t.Errorf("%v.LogSurvival(%d) = %v, exact %v (error %.3g)", d, k, d.LogSurvival(k), sf[k], e)
				}
			}
		}
	}
}

// TestMaxN checks that the largest accepted N gives finite answers (N+1 is
// not a double there) and no NaN anywhere.
func TestMaxN(t *testing.T) {
	t.Parallel()
	for _, d := range []Dist{{MaxN, 0.5}, {MaxN, 1e-15}, {MaxN, 1 - 1e-15}} {
		m := int64(d.Mean())
		for _, k := range []int64{0, 1, m, m + 100000000, MaxN - 1} {
			for _, v := range []float64{d.LogCDF(k), d.LogSurvival(k), d.LogProb(k), d.LogProbRange(k, k+5)} {
				if math.IsNaN(v) || v > 0 {
					t.Errorf("%v at k=%d: %v", d, k, v)
				}
			}
		}
		for _, k := range []int64{d.Quantile(0.3), d.UpperQuantile(1e-300), d.LogQuantile(-1e5)} {
			if k < 0 || k > MaxN {
				t.Errorf("%v: quantile %d out of range", d, k)
			}
		}
	}
}

// TestExpansionEdge samples distributions at random (fixed seed; N
// log-uniform up to 1e13, P log-uniform down to 1e-15 from either end) and
// points near the outer edge of the expansion's range (z^2 between 0.4 and
// 0.5 of min(N P, N (1-P))), where its terms fall slowest: the expansion
// must converge and agree with the continued fraction or term sum, which
// are well conditioned there, to 1e-14.
func TestExpansionEdge(t *testing.T) {
	t.Parallel()
	r := rand.New(rand.NewPCG(1, 2))
	tried, bad := 0, 0
	for range 20000 {
		n := int64(math.Exp(r.Float64() * math.Log(1e13)))
		p := math.Exp(-r.Float64() * 35)
		if r.IntN(2) == 0 {
			p = 1 - p
		}
		d := Dist{N: n, P: p}
		v := d.Variance()
		if n < 1 || p <= 0 || p >= 1 || v < temmeMinVar {
			continue
		}
		mm := math.Min(d.Mean(), float64(n)*(1-p))
		z := math.Sqrt((0.8 + 0.2*r.Float64()) * 0.5 * mm * (1 - math.Sqrt(0.5/mm)))
		if r.IntN(2) == 0 {
			z = -z
		}
		k := int64(d.Mean() + z*math.Sqrt(v))
		fk, fn := float64(k), float64(n)
		dz := fk + 0.5 - fn*p
		if k < 0 || k >= n || math.Min(fk+1, fn-fk) < temmeMinAB || dz*dz > temmeZ2*math.Min(fk+1, fn-fk)*v {
			continue
		}
		tried++
		ls, _, lower, ok := d.temmeTail(k)
		ref := d.logUpper(k)
		if lower {
			ref = d.logLower(k)
		}
		if e := logErr(ls, ref); !ok || e > 1e-14 {
			bad++
			if bad <= 5 {
				t.Errorf("%v k=%d: expansion %v (converged %v), fraction or sum %v (error %.3g)", d, k, ls, ok, ref, e)
			}
		}
	}
	if tried < 2000 {
		t.Errorf("only %d points tried", tried)
	}
}

package test

import (
	"errors"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

// TestBinomialIntervalsNewcombe checks that the intervals attached to the
// tests are the published intervals these tests invert: Newcombe RG (1998),
// Two-sided confidence intervals for the single proportion: comparison of
// seven methods, Statistics in Medicine 17:857-872, Table II (recalled,
// recomputed; shared REFERENCES.md), printed to 4 decimals.
func TestBinomialIntervalsNewcombe(t *testing.T) {
	t.Parallel()
	tests := []struct {
		k, n   int64
		m      BinomialOptions
		lo, hi float64
	}{
		{81, 263, optScore, 0.2553, 0.3662},
		{81, 263, optScoreCC, 0.2535, 0.3682},
		{81, 263, optCentral, 0.2527, 0.3676},
		{81, 263, optCentralMidP, 0.2544, 0.3658},
		{81, 263, optLR, 0.2542, 0.3655},
		{0, 20, optScore, 0, 0.1611},
		{0, 20, optScoreCC, 0, 0.2005},
		{0, 20, optCentral, 0, 0.1684},
		{0, 20, optCentralMidP, 0, 0.1391},
		{0, 20, optLR, 0, 0.0916},
	}
	for _, tc := range tests {
		r, err := Binomial(tc.k, tc.n, 0.5, tc.m)
		if err != nil {
			t.Fatal(err)
		}
		got := []float64{r.Interval.Lower, r.Interval.Upper}
		if diff := cmp.Diff([]float64{tc.lo, tc.hi}, got, cmpopts.EquateApprox(0, 0.00005)); diff != "" {
			t.Errorf("%d/%d %v interval (-want +got):\n%s", tc.k, tc.n, tc.m, diff)
		}
	}
}

// TestBinomialClopperPearsonNIST: NIST/SEMATECH e-Handbook of Statistical
// Methods, section 7.2.4: 4 defectives in 20, 90% two-sided Clopper-Pearson
// limits 0.0714 and 0.4010 (limits recalled, recomputed).
func TestBinomialClopperPearsonNIST(t *testing.T) {
	t.Parallel()
	r, err := Binomial(4, 20, 0.2, BinomialOptions{Rule: Central, Level: 0.90})
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff([]float64{0.0714, 0.4010}, []float64{r.Interval.Lower, r.Interval.Upper}, cmpopts.EquateApprox(0, 0.00005)); diff != "" {
		t.Errorf("(-want +got):\n%s", diff)
	}
}

// TestBinomialIntervalAgreesWithTest: p < alpha exactly when the interval
// excludes p0, for the methods whose p-value is monotone in p0 on each side
// of k/n; for the point-probability and Blaker tests (whose accepted sets
// may have gaps) a p0 outside the hull is always rejected.
func TestBinomialIntervalAgreesWithTest(t *testing.T) {
	t.Parallel()
	p0s := []float64{0.01, 0.1, 0.3, 0.5, 0.62, 0.9, 0.99}
	ns := []int64{1, 5, 17, 40, 101}
	if testing.Short() {
		ns = ns[:3]
	}
	for _, m := range allOneSample {
		for _, alt := range []Alternative{TwoSided, Lower, Higher} {
			for _, n := range ns {
				for k := int64(0); k <= n; k += 1 + n/9 {
					for _, p0 := range p0s {
						r, err := Binomial(k, n, p0, with(m, alt))
						if err != nil {
							t.Fatal(err)
						}
						if math.Abs(r.PValue-0.05) < 1e-9 {
							continue // p0 on the boundary: decided by the bisection tolerance
						}
						rej := r.PValue < 0.05
						out := !r.Interval.Contains(p0)
						ex := m.Method == Exact
						gaps := ex && m.Rule != Central && alt == TwoSided
						if out && !rej || !gaps && rej != out {
							t.Errorf("%v %v %d/%d p0=%v: p=%v interval %+v", m, alt, k, n, p0, r.PValue, *r.Interval)
						}
					}
				}
			}
		}
	}
}

// TestBinomialOneSidedMonotone: one-sided p-values are monotone in k.
func TestBinomialOneSidedMonotone(t *testing.T) {
	t.Parallel()
	for _, m := range allOneSample {
		for _, n := range []int64{7, 50, 333} {
			prevL, prevG := -1.0, 2.0
			for k := int64(0); k <= n; k++ {
				l, _ := Binomial(k, n, 0.3, skipIv(with(m, Lower)))
				g, _ := Binomial(k, n, 0.3, skipIv(with(m, Higher)))
				if l.PValue < prevL || g.PValue > prevG {
					t.Errorf("%v n=%d k=%d: less %v after %v, greater %v after %v", m, n, k, l.PValue, prevL, g.PValue, prevG)
				}
				prevL, prevG = l.PValue, g.PValue
			}
		}
	}
}

// TestBinomialExactSize: the true size of each exact (non mid-p) test,
// P(p(X) < alpha) under p0 summed over every outcome, is at most alpha.
func TestBinomialExactSize(t *testing.T) {
	t.Parallel()
	for _, m := range []BinomialOptions{optPoint, optCentral, optBlaker} {
		for _, alt := range []Alternative{TwoSided, Lower, Higher} {
			for n := int64(1); n <= 60; n += 3 {
				for _, p0 := range []float64{0.05, 0.2, 0.5, 0.73} {
					for _, alpha := range []float64{0.01, 0.05, 0.1} {
						size := 0.0
						for k := int64(0); k <= n; k++ {
							r, _ := Binomial(k, n, p0, skipIv(with(m, alt)))
							if r.PValue < alpha {
								size += math.Exp(lbinom(k, n, p0))
							}
						}
						if size > alpha*(1+1e-12) {
							t.Errorf("%v %v n=%d p0=%v: size %v > alpha %v", m, alt, n, p0, size, alpha)
						}
					}
				}
			}
		}
	}
}

// lbinom is ln of the binomial PMF from lgamma, adequate at small n.
func lbinom(k, n int64, p float64) float64 {
	a, _ := math.Lgamma(float64(n + 1))
	b, _ := math.Lgamma(float64(k + 1))
	c, _ := math.Lgamma(float64(n - k + 1))
	return a - b - c + float64(k)*math.Log(p) + float64(n-k)*math.Log1p(-p)
}

// TestBinomialUnderflow: at n = 1e6 the p-value of a modest effect is below
// the smallest double, the log p-value finite; at p0 = 1/2 the two-sided
// point-probability p-value is exactly twice the tail (symmetry), checked
// here against the one-sided log p-value.
func TestBinomialUnderflow(t *testing.T) {
	t.Parallel()
	two, err := Binomial(480000, 1000000, 0.5, BinomialOptions{SkipInterval: true})
	if err != nil {
		t.Fatal(err)
	}
	one, _ := Binomial(480000, 1000000, 0.5, BinomialOptions{Alternative: Lower, SkipInterval: true})
	if two.PValue != 0 || math.IsInf(two.LogPValue, 0) || math.Abs(two.LogPValue-(one.LogPValue+math.Ln2)) > 1e-12*math.Abs(two.LogPValue) {
		t.Errorf("two-sided %v (log %v), one-sided log %v", two.PValue, two.LogPValue, one.LogPValue)
	}
	// The log tail agrees with the normal-tail leading order: ln p ~ -z^2/2 ... within 1%.
	if z := 40.0; math.Abs(one.LogPValue-logPhi(-z)) > 0.01*math.Abs(logPhi(-z)) {
		t.Errorf("log tail %v far from the normal value %v", one.LogPValue, logPhi(-z))
	}
}

func TestBinomialErrors(t *testing.T) {
	t.Parallel()
	tests := []struct {
		k, n int64
		p0   float64
		opt  BinomialOptions
		want string
	}{
		{5, 4, 0.5, BinomialOptions{}, "test.Binomial: k = 5 exceeds n = 4"},
		{-1, 4, 0.5, BinomialOptions{}, "test.Binomial: k = -1 is negative; counts are 0 or more"},
		{1, -4, 0.5, BinomialOptions{}, "test.Binomial: n = -4 is negative; counts are 0 or more"},
		{1, 4, 0, BinomialOptions{}, "test.Binomial: p0 = 0 must lie strictly between 0 and 1"},
		{1, 4, math.NaN(), BinomialOptions{}, "test.Binomial: p0 = NaN must lie strictly between 0 and 1"},
		{1, 4, 0.5, BinomialOptions{Method: 99}, "test.Binomial: Method = 99 is not a test.BinomialMethod; use one of exact, score, score-cc, likelihood-ratio"},
		{1, 4, 0.5, BinomialOptions{Alternative: 3}, "test.Binomial: Alternative = 3 is not a test.Alternative; use one of two-sided, lower, higher"},
		{1, 4, 0.5, BinomialOptions{Level: 1}, "test.Binomial: level = 1 must lie strictly between 0 and 1 (0 means 0.95)"},
	}
	for _, tc := range tests {
		_, err := Binomial(tc.k, tc.n, tc.p0, tc.opt)
		if err == nil || err.Error() != tc.want || !errors.Is(err, ErrInvalidArgument) {
			t.Errorf("got %v, want %q", err, tc.want)
		}
	}
}

func TestParseBinomialMethod(t *testing.T) {
	t.Parallel()
	for _, m := range BinomialMethodValues() {
		got, err := ParseBinomialMethod(m.String())
		if err != nil || got != m {
			t.Errorf("ParseBinomialMethod(%q) = %v, %v", m.String(), got, err)
		}
	}
	if _, err := ParseBinomialMethod("wald"); err == nil {
		t.Error("ParseBinomialMethod(wald): no error")
	}
}

func BenchmarkBinomialPoint1e6(b *testing.B) {
	for b.Loop() {
		_, _ = Binomial(500900, 1000000, 0.5, BinomialOptions{SkipInterval: true})
	}
}

func BenchmarkBinomialPointSkewed1e6(b *testing.B) {
	for b.Loop() {
		_, _ = Binomial(100500, 1000000, 0.1, BinomialOptions{SkipInterval: true})
	}
}

// BenchmarkBinomialPointWithInterval1e6: the point-probability test with
// its Sterne interval at n = 1e6, CPU time per call beside the wall clock.
func BenchmarkBinomialPointWithInterval1e6(b *testing.B) {
	c0, n := cpuTime(), 0
	for b.Loop() {
		_, _ = Binomial(100500, 1000000, 0.1, BinomialOptions{})
		n++
	}
	b.ReportMetric(float64(cpuTime()-c0)/float64(n), "cpu-ns/op")
}

// TestBinomialLowLevelBounds checks the one-sided bounds at levels below
// 1/2, where the bound lies beyond the estimate (it was NaN): each bound is
// finite, on the far side of k/n, and inverts its test (the p-value at the
// bound equals 1 - Level, to the bisection's 1e-12; checked in log space).
func TestBinomialLowLevelBounds(t *testing.T) {
	t.Parallel()
	const k, n = 40, 1000
	for _, c := range []struct {
		m     BinomialOptions
		alt   Alternative
		level float64
	}{
		{optCentral, Lower, 1e-300}, {optCentral, Higher, 1e-300}, {optPoint, Lower, 1e-300},
		{optCentral, Lower, 0.3}, {optCentralMidP, Higher, 0.5}, {optCentralMidP, Lower, 0.2}, {optScore, Lower, 0.1},
	} {
		o := with(c.m, c.alt)
		o.Level = c.level
		r, err := Binomial(k, n, 0.01, o)
		if err != nil {
			t.Fatalf("%v %v %g: %v", c.m, c.alt, c.level, err)
		}
		iv := r.Interval
		b := iv.Upper
		if c.alt == Higher {
			b = iv.Lower
		}
		if math.IsNaN(b) || (c.alt == Lower && !(b < 0.04)) || (c.alt == Higher && !(b > 0.04)) {
			t.Errorf("%v %v %g: interval [%g, %g], want a finite bound beyond k/n = 0.04", c.m, c.alt, c.level, iv.Lower, iv.Upper)
			continue
		}
		lp := binomialLogP(o, k, n, b)
		if want := math.Log1p(-c.level); math.Abs(lp-want) > 1e-9*math.Max(1e-300, math.Abs(want)) && math.Abs(lp-want) > 1e-9 {
			t.Errorf("%v %v %g: log p-value at the bound %g = %g, want %g", c.m, c.alt, c.level, b, lp, want)
		}
	}
}

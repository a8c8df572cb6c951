package onesample

import (
	"errors"
	"math"
	"testing"

	"github.com/kofnlab/kofn/internal/argerr"
)

// allTests lists every combination of method, mid-p and alternative.
func allTests(p0 float64) []Test {
	var ts []Test
	for _, alt := range []Alternative{TwoSided, Lower, Higher} {
		for _, m := range []Rule{PointProbability, Central, Blaker} {
			if alt != TwoSided && m != PointProbability {
				continue
			}
			for _, mid := range []bool{false, true} {
				ts = append(ts, Test{P0: p0, Rule: m, MidP: mid, Alternative: alt})
			}
		}
	}
	return ts
}

// TestAgainstRationalOracle compares every p-value with the exact rational
// computation of its definition (oracle_test.go) for n up to 40 and several
// rational p0, ties included (p0 = 1/2 makes every outcome tie with its
// mirror image).
func TestAgainstRationalOracle(t *testing.T) {
	t.Parallel()
	ps := [][2]int64{{1, 2}, {1, 3}, {1, 10}, {3, 7}, {9, 10}, {1, 50}}
	ns := []int64{0, 1, 2, 3, 5, 8, 13, 20, 31, 40}
	for _, pr := range ps {
		p0 := float64(pr[0]) / float64(pr[1])
		for _, n := range ns {
			o := newRatOracle(n, pr[0], pr[1])
			for _, tt := range allTests(p0) {
				for k := int64(0); k <= n; k++ {
					got, err := LogPValue(k, n, tt)
					if err != nil {
						t.Fatal(err)
					}
					w, _ := o.p(k, tt).Float64()
					want := math.Log(w)
					if math.Abs(got-want) > 1e-11*math.Max(1, math.Abs(want)) {
						t.Errorf("LogPValue(%d, %d, %+v) = %v, want %v (p %v vs %v)", k, n, tt, got, want, math.Exp(got), w)
					}
				}
			}
		}
	}
}

// TestAcceptanceAgainstScan checks the acceptance region against the
// definition {k : p(k) >= alpha} evaluated at every k, and that it is an
// interval, for n = 1..120 and several p0 and alpha.
func TestAcceptanceAgainstScan(t *testing.T) {
	t.Parallel()
	for _, p0 := range []float64{0.5, 0.3, 0.01, 0.97, 1.0 / 3} {
		for n := int64(1); n <= 120; n += 7 {
			for _, alpha := range []float64{0.01, 0.05, 0.1, 0.5} {
				for _, tt := range allTests(p0) {
					lo, hi, err := Acceptance(n, alpha, tt)
					if err != nil {
						t.Fatal(err)
					}
					for k := int64(0); k <= n; k++ {
						lp, _ := LogPValue(k, n, tt)
						acc := lp >= math.Log(alpha)
						if acc != (k >= lo && k <= hi) {
							t.Errorf("n=%d alpha=%v %+v: k=%d p=%v but region [%d, %d]", n, alpha, tt, k, math.Exp(lp), lo, hi)
						}
					}
				}
			}
		}
	}
}

// TestLargeN checks the log-space p-values far below the smallest double
// against the tails they are made of (n = 1e6, k far from n p0): the
// point-probability p-value is the observed tail plus the opposite tail
// beyond the outcome of equal probability.
func TestLargeN(t *testing.T) {
	t.Parallel()
	const n = 1000000
	k := int64(495000) // z = -10
	lp, err := LogPValue(k, n, Test{P0: 0.5})
	if err != nil {
		t.Fatal(err)
	}
	// At p0 = 1/2 the PMF is symmetric: the p-value is exactly twice the lower tail.
	d := newDist(n, 0.5)
	want := math.Ln2 + d.LogCDF(k)
	if math.Abs(lp-want) > 1e-12*math.Abs(want) {
		t.Errorf("LogPValue(495000, 1e6) = %v, want %v", lp, want)
	}
	k = 400000
	for _, m := range []Rule{PointProbability, Central, Blaker} {
		lp, err = LogPValue(k, n, Test{P0: 0.5, Rule: m})
		if err != nil || math.IsInf(lp, 0) || lp > -1000 || math.Abs(lp-(math.Ln2+d.LogCDF(k))) > 1e-10*math.Abs(lp) {
			t.Errorf("%v: LogPValue(400000, 1e6) = %v, %v; want finite %v", m, lp, err, math.Ln2+d.LogCDF(k))
		}
	}
}

func TestErrors(t *testing.T) {
	t.Parallel()
	tests := []struct {
		k, n int64
		t    Test
		want string
	}{
		{3, 2, Test{P0: 0.5}, "onesample.LogPValue: k = 3 exceeds n = 2"},
		{-1, 2, Test{P0: 0.5}, "onesample.LogPValue: k = -1 is negative; counts are 0 or more"},
		{1, 2, Test{P0: math.NaN()}, "onesample.LogPValue: p0 = NaN is not a probability in [0, 1]"},
		{1, 2, Test{P0: 0.5, Rule: 7}, "onesample.LogPValue: rule = 7 is not a test.TwoSidedRule; use one of point-probability, central, Blaker"},
		{1, 2, Test{P0: 0.5, Alternative: -1}, "onesample.LogPValue: alternative = -1 is not a test.Alternative; use one of two-sided, lower, higher"},
	}
	for _, tc := range tests {
		_, err := LogPValue(tc.k, tc.n, tc.t)
		if err == nil || err.Error() != tc.want || !errors.Is(err, argerr.ErrInvalidArgument) {
			t.Errorf("got %v, want %q", err, tc.want)
		}
	}
	if _, _, err := Acceptance(10, 1, Test{P0: 0.5}); err == nil {
		t.Errorf("Acceptance with alpha = 1: no error")
	}
}

func BenchmarkLogPValuePoint1e6(b *testing.B) {
	for b.Loop() {
		_, _ = LogPValue(500800, 1000000, Test{P0: 0.5})
	}
}

func BenchmarkAcceptance2000(b *testing.B) {
	for b.Loop() {
		_, _, _ = Acceptance(2000, 0.05, Test{P0: 0.3})
	}
}

package binom

import (
	"math"
	"math/rand/v2"
	"testing"
)

// plainTermSum is termSum one term at a time with its own division, the
// form the paired loop replaces: a reference for the pairing.
func plainTermSum(j, m, c float64) float64 {
	sum, t := 1.0, 1.0
	for i := j; i >= 1; i-- {
		t *= i * c / (m - i)
		s1 := sum + t
		if s1 == sum {
			break
		}
		sum = s1
	}
	return sum
}

// fractionTail returns ln of the tail on the side lower at k by the
// continued fraction alone (DiDonato and Morris 1992), for points where it
// converges (lowerDirect for the lower tail, its failure for the upper).
func fractionTail(d Dist, k int64, lower bool) float64 {
	if lower {
		return d.LogProb(k) + math.Log(d.P) + math.Log(betaFrac(float64(d.N-k), float64(k+1), 1-d.P))
	}
	return d.LogProb(k+1) + math.Log1p(-d.P) + math.Log(betaFrac(float64(k+1), float64(d.N-k), d.P))
}

// TestSumAgainstFraction compares the positive-term sum of the smaller
// tail, wherever smallTail takes it, with the continued fraction on the
// same side: two independent methods (a sum of PMF ratios, the
// convergents of the incomplete beta's fraction), over a sweep of N from
// 10 to 1e12, P from 1e-9 to 1 - 1e-9 and every k (or a grid of k) where
// the sum is used. The fraction is well conditioned there except where
// its argument is above 1/2 (it sees 1-P rounded near 1: at N = 1000,
// P = 0.003, k = 1 that costs it 7e-14, while the sum agrees with an exact
// sum to 1e-16); those points are compared to the exact oracle instead
// for N <= 300, and skipped beyond. Agreement within 2e-14.
func TestSumAgainstFraction(t *testing.T) {
	t.Parallel()
	checked, worst := 0, 0.0
	for _, n := range []int64{10, 20, 57, 100, 300, 1000, 10000, 1e6, 1e9, 1e12} {
		for _, p := range []float64{1e-9, 0.003, 0.05, 0.3, 0.5, 0.62, 0.9, 0.999, 1 - 1e-9} {
			d := Dist{N: n, P: p}
			var ks []int64
			if n <= 1000 {
				for k := int64(0); k < n; k++ {
					ks = append(ks, k)
				}
			} else {
				mean, sd := d.Mean(), d.StdDev()
				for _, z := range []float64{-300, -60, -30, -20, -12, -8, -6, 6, 8, 12, 20, 30, 60, 300} {
					if k := int64(math.Floor(mean + z*math.Max(sd, 1))); k >= 0 && k < n {
						ks = append(ks, k)
					}
				}
				ks = append(ks, 0, 1, 2, n-3, n-2, n-1)
			}
			var cdf, sf []float64
			if n <= 300 {
				_, cdf, sf = exactLogs(n, p)
			}
			for _, k := range ks {
				lower := d.lowerDirect(k)
				if short := d.shortSum(k, lower); short != (d.sumTerms(k, lower) <= sumMaxTerms) {
					t.Errorf("%v k=%d lower=%v: shortSum %v, sumTerms %v", d, k, lower, short, d.sumTerms(k, lower))
				}
				if !d.shortSum(k, lower) {
					continue
				}
				tv := d.sumTail(k, lower)
				got := tv.logSmall()
				// The fraction's argument: 1-P for the lower tail, P for the upper.
				arg := d.P
				if lower {
					arg = 1 - d.P
				}
				var want float64
				switch {
				case arg <= 0.5:
					want = fractionTail(d, k, lower)
				case cdf != nil:
					want = sf[k]
					if lower {
						want = cdf[k]
					}
				default:
					continue
				}
				e := logErr(got, want)
				worst = math.Max(worst, e)
				if e > 2e-14 {
					t.Errorf("%v k=%d lower=%v: sum %v, fraction %v (error %.3g)", d, k, lower, got, want, e)
				}
				checked++
			}
		}
	}
	if checked < 3000 {
		t.Errorf("only %d points checked", checked)
	}
	t.Logf("%d points, worst disagreement %.3g", checked, worst)
}

// TestTermSumPairs checks the paired loop of termSum against the plain
// one-term-at-a-time sum on random arguments (ratios below 1 that fall):
// the same series, so within a few units in the last place.
func TestTermSumPairs(t *testing.T) {
	t.Parallel()
	r := rand.New(rand.NewPCG(3, 4))
	for range 20000 {
		m := math.Floor(math.Exp(r.Float64() * math.Log(1e12)))
		j := math.Floor(r.Float64() * m)
		if j < 0 || m-j < 1 {
			continue
		}
		// c such that the first ratio j c / (m - j) is below 1.
		c := r.Float64() * (m - j) / math.Max(j, 1)
		if j*c/(m-j) > 0.97 {
			continue
		}
		got, want := termSum(j, m, c), plainTermSum(j, m, c)
		if math.Abs(got-want) > 64*0x1p-53*want {
			t.Fatalf("termSum(%v, %v, %v) = %v, plain sum %v", j, m, c, got, want)
		}
	}
}

// TestExactSmallN compares every function with the exact math/big oracle
// at every k for small N, where the tables of stirlerr and ln i and the
// term sums serve all of them: within the accuracy bar.
func TestExactSmallN(t *testing.T) {
	t.Parallel()
	for _, n := range []int64{1, 2, 3, 5, 10, 16, 17, 20, 31, 50, 100} {
		for _, p := range []float64{1e-12, 0.001, 0.1, 0.3, 0.5, 0.7, 0.95, 1 - 1e-12} {
			d := Dist{N: n, P: p}
			pmf, cdf, sf := exactLogs(n, p)
			for k := int64(0); k <= n; k++ {
				for _, c := range []struct {
					name      string
					got, want float64
					plain     bool
				}{
					{"LogProb", d.LogProb(k), pmf[k], false},
					{"LogCDF", d.LogCDF(k), cdf[k], false},
					{"LogSurvival", d.LogSurvival(k), sf[k], false},
					{"Prob", d.Prob(k), pmf[k], true},
					{"CDF", d.CDF(k), cdf[k], true},
					{"Survival", d.Survival(k), sf[k], true},
				} {
					e := logErr(c.got, c.want)
					if c.plain {
						e = plainErr(c.got, c.want)
					}
					if e > regressionBar {
						t.Errorf("%v.%s(%d) = %v, exact %v (error %.3g)", d, c.name, k, c.got, c.want, e)
					}
				}
			}
		}
	}
}

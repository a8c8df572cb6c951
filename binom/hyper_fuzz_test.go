package binom

import (
	"math"
	"math/big"
	"math/rand/v2"
	"testing"
)

// exactHyperTail returns sum_{x=a..b} C(K,x) C(N-K,n-x) / C(N,n) exactly.
func exactHyperTail(N, K, n, a, b int64) float64 {
	num := new(big.Int)
	var c1, c2 big.Int
	for x := a; x <= b; x++ {
		c1.Binomial(K, x)
		c2.Binomial(N-K, n-x)
		num.Add(num, c1.Mul(&c1, &c2))
	}
	return ratFloat(num, new(big.Int).Binomial(N, n))
}

// FuzzHyper: NewHyper never panics and rejects exactly the invalid
// arguments; for valid ones no method returns NaN (Skewness and ExKurtosis
// excepted at a single-point support, as documented), and for totals up to
// 60 the PMF and both tails match an exact math/big oracle.
func FuzzHyper(f *testing.F) {
	f.Add(int64(8), int64(4), int64(4), int64(3), 0.3)
	f.Add(int64(60), int64(1), int64(59), int64(0), 0.999)
	f.Add(int64(1000000), int64(500000), int64(3), int64(2), 1e-300)
	f.Add(int64(-1), int64(0), int64(0), int64(0), 0.5)
	f.Add(int64(1)<<60, int64(5), int64(5), int64(1), 0.5)
	f.Fuzz(func(t *testing.T, N, K, n, x int64, q float64) {
		h, err := NewHyper(N, K, n)
		valid := N >= 0 && N <= MaxN && K >= 0 && K <= N && n >= 0 && n <= N
		if (err == nil) != valid {
			t.Fatalf("NewHyper(%d, %d, %d) error = %v, valid = %v", N, K, n, err, valid)
		}
		if err != nil {
			return
		}
		if N > 1e7 && n > 1e6 && K > 1e6 && N-K > 1e6 {
			return // spread above ~500: sums too long for a fuzz iteration
		}
		lo, hi := h.Support()
		vals := []float64{h.LogProb(x), h.LogCDF(x), h.LogSurvival(x), h.Prob(x), h.CDF(x), h.Survival(x),
			h.LogProbRange(x, x+3), h.Mean(), h.Variance(), h.Entropy()}
		for i, v := range vals {
			if math.IsNaN(v) {
				t.Fatalf("%v: value %d at x = %d is NaN", h, i, x)
			}
		}
		if lo < hi && (math.IsNaN(h.Skewness()) || math.IsNaN(h.ExKurtosis())) {
			t.Fatalf("%v: NaN skewness or kurtosis", h)
		}
		if k := h.Quantile(q); (q >= 0 && q <= 1) && (k < lo || k > hi) {
			t.Fatalf("%v: Quantile(%v) = %d outside support", h, q, k)
		}
		if k := h.UpperQuantile(q); (q >= 0 && q <= 1) && (k < lo || k > hi) {
			t.Fatalf("%v: UpperQuantile(%v) = %d outside support", h, q, k)
		}
		r := rand.New(rand.NewPCG(uint64(N), uint64(x)))
		if v := h.Rand(r); v < lo || v > hi {
			t.Fatalf("%v: Rand = %d outside support", h, v)
		}
		if N > 60 || x < lo || x > hi {
			return
		}
		want := []float64{exactHyperTail(N, K, n, x, x), exactHyperTail(N, K, n, lo, x), exactHyperTail(N, K, n, x+1, hi)}
		got := []float64{h.Prob(x), h.CDF(x), h.Survival(x)}
		for i := range want {
			tol := 1e-13 * math.Max(1, -math.Log(want[i]))
			if math.Abs(got[i]-want[i]) > tol*want[i] {
				t.Fatalf("%v x = %d: value %d = %.17g, exact %.17g", h, x, i, got[i], want[i])
			}
		}
	})
}

// FuzzNoncentralHyper: no panic, errors exactly for invalid arguments, no
// NaN for valid ones, probabilities in [0, 1] and the mean in the support.
func FuzzNoncentralHyper(f *testing.F) {
	f.Add(int64(30), int64(19), int64(15), 2.5, int64(10))
	f.Add(int64(100), int64(3), int64(50), 1e300, int64(3))
	f.Add(int64(100), int64(3), int64(50), 0.0, int64(0))
	f.Add(int64(100), int64(3), int64(50), math.NaN(), int64(0))
	f.Add(int64(307), int64(30), int64(32), 0.0765625, int64(28))  // once a CDF of 1 + 4e-16
	f.Add(int64(1000), int64(300), int64(200), 1e-310, int64(100)) // once NaN (subnormal p1)
	f.Fuzz(func(t *testing.T, N, K, n int64, psi float64, x int64) {
		d, err := NewNoncentralHyper(N, K, n, psi)
		valid := N >= 0 && N <= MaxN && K >= 0 && K <= N && n >= 0 && n <= N && psi >= 0
		if (err == nil) != valid {
			t.Fatalf("NewNoncentralHyper(%d, %d, %d, %v) error = %v", N, K, n, psi, err)
		}
		if err != nil || (N > 1e7 && n > 1e6 && K > 1e6 && N-K > 1e6) {
			return
		}
		lo, hi := d.Support()
		for i, v := range []float64{d.Prob(x), d.CDF(x), d.Survival(x), d.LogProb(x), d.LogCDF(x), d.LogSurvival(x)} {
			if math.IsNaN(v) || (i < 3 && (v < 0 || v > 1)) || (i >= 3 && v > 0) {
				t.Fatalf("%v: value %d at x = %d is %v", d, i, x, v)
			}
		}
		if m, v := d.Mean(), d.Variance(); math.IsNaN(m) || m < float64(lo) || m > float64(hi) || !(v >= 0) {
			t.Fatalf("%v: Mean %v Variance %v", d, m, v)
		}
	})
}

// FuzzProportionWithin: no panic and no NaN for valid arguments, and the
// value is a probability that does not decrease with eps.
func FuzzProportionWithin(f *testing.F) {
	f.Add(int64(50), 0.3, 0.1)
	f.Add(int64(1)<<52, 1e-15, 1e-16)
	f.Add(int64(7), 1.0, 0.0)
	f.Fuzz(func(t *testing.T, n int64, p, eps float64) {
		d, err := New(n, p)
		if err != nil || math.IsNaN(eps) {
			return
		}
		v := d.ProportionWithin(eps)
		if math.IsNaN(v) || v < 0 || v > 1 {
			t.Fatalf("%v.ProportionWithin(%v) = %v", d, eps, v)
		}
		if w := d.ProportionWithin(2 * eps); eps > 0 && w < v*(1-1e-12) {
			t.Fatalf("%v: ProportionWithin(%v) = %v > ProportionWithin(%v) = %v", d, eps, v, 2*eps, w)
		}
	})
}

// FuzzRand: Dist.Rand stays in 0..N for any valid parameters.
func FuzzRand(f *testing.F) {
	f.Add(int64(1e9), 0.3, uint64(1))
	f.Add(int64(33), 0.5, uint64(2))
	f.Add(int64(1)<<53, 1e-300, uint64(3))
	f.Fuzz(func(t *testing.T, n int64, p float64, seed uint64) {
		d, err := New(n, p)
		if err != nil {
			return
		}
		r := rand.New(rand.NewPCG(seed, 7))
		for range 5 {
			if k := d.Rand(r); k < 0 || k > n {
				t.Fatalf("%v.Rand = %d", d, k)
			}
		}
	})
}

// TestInvalidAndSpecial pins the documented values for hand-built invalid
// distributions and for the special arguments of the quantiles.
func TestInvalidAndSpecial(t *testing.T) {
	t.Parallel()
	bad := Hyper{10, 11, 3}
	for i, v := range []float64{bad.LogProb(1), bad.LogCDF(1), bad.LogSurvival(1), bad.LogProbRange(0, 2), bad.Mean(),
		bad.Variance(), bad.Skewness(), bad.ExKurtosis(), bad.Entropy()} {
		if !math.IsNaN(v) {
			t.Errorf("invalid Hyper: value %d = %v, want NaN", i, v)
		}
	}
	r := rand.New(rand.NewPCG(1, 1))
	if lo, hi := bad.Support(); lo != -1 || hi != -1 || bad.Mode() != -1 || bad.Quantile(0.5) != -1 ||
		bad.UpperQuantile(0.5) != -1 || bad.LogQuantile(-1) != -1 || bad.LogUpperQuantile(-1) != -1 || bad.Rand(r) != -1 {
		t.Errorf("invalid Hyper: integer results not -1")
	}
	nb := NoncentralHyper{10, 3, 3, -1}
	for i, v := range []float64{nb.LogProb(1), nb.LogCDF(1), nb.LogSurvival(1), nb.ProbRange(0, 2), nb.Mean(), nb.Variance()} {
		if !math.IsNaN(v) {
			t.Errorf("invalid NoncentralHyper: value %d = %v, want NaN", i, v)
		}
	}
	if lo, hi := nb.Support(); lo != -1 || hi != -1 || nb.Mode() != -1 {
		t.Errorf("invalid NoncentralHyper: support or mode not -1")
	}
	if (Dist{-1, 0.5}).Rand(r) != -1 || (Dist{5, 0}).Rand(r) != 0 || (Dist{5, 1}).Rand(r) != 5 || (Dist{0, 0.5}).Rand(r) != 0 {
		t.Errorf("Dist.Rand special cases")
	}
	h := Hyper{30, 19, 15} // support 4..15
	got := []int64{h.Quantile(0), h.Quantile(-1), h.Quantile(1), h.Quantile(1.5), h.Quantile(math.NaN()),
		h.UpperQuantile(1), h.UpperQuantile(2), h.UpperQuantile(0), h.UpperQuantile(-0.5),
		h.LogQuantile(math.Inf(-1)), h.LogQuantile(0), h.LogQuantile(0.1),
		h.LogUpperQuantile(0), h.LogUpperQuantile(math.Inf(-1)), h.LogUpperQuantile(0.1)}
	want := []int64{4, 4, 15, -1, -1, 4, 4, 15, -1, 4, 15, -1, 4, 15, -1}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("special quantile %d = %d, want %d", i, got[i], want[i])
		}
	}
	if v := h.LogSurvival(math.MaxInt64); !math.IsInf(v, -1) {
		t.Errorf("LogSurvival(MaxInt64) = %v", v)
	}
	if v := (NoncentralHyper{30, 19, 15, 2}).LogSurvival(math.MaxInt64); !math.IsInf(v, -1) {
		t.Errorf("noncentral LogSurvival(MaxInt64) = %v", v)
	}
}

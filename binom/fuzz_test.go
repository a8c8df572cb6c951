package binom

import (
	"math"
	"math/big"
	"testing"

	"github.com/kofnlab/kofn/internal/xmath"
)

// exactLogs returns ln P(X = j), ln P(X <= j) and ln P(X > j) for
// j = 0..n by exact rational-free big.Float sums at 400 bits, with p taken
// as the exact binary value of the double and 1-p formed exactly: the
// oracle for small n (independent of every formula in the package).
func exactLogs(n int64, p float64) (pmf, cdf, sf []float64) {
	const prec = 400
	newF := func() *big.Float { return new(big.Float).SetPrec(prec) }
	bp := newF().SetFloat64(p)
	bq := newF().Sub(newF().SetInt64(1), bp)
	terms := make([]*big.Float, n+1)
	binom := newF().SetInt64(1) // C(n, j)
	for j := int64(0); j <= n; j++ {
		t := newF().Set(binom)
		for range j {
			t.Mul(t, bp)
		}
		for range n - j {
			t.Mul(t, bq)
		}
		terms[j] = t
		binom.Mul(binom, newF().SetInt64(n-j))
		binom.Quo(binom, newF().SetInt64(j+1))
	}
	logOf := func(x *big.Float) float64 {
		if x.Sign() == 0 {
			return math.Inf(-1)
		}
		m := newF()
		e := x.MantExp(m)
		f, _ := m.Float64()
		return math.Log(f) + float64(e)*math.Ln2
	}
	pmf = make([]float64, n+1)
	cdf = make([]float64, n+1)
	sf = make([]float64, n+1)
	acc := newF()
	for j := int64(0); j <= n; j++ {
		pmf[j] = logOf(terms[j])
		acc.Add(acc, terms[j])
		cdf[j] = logOf(acc)
	}
	acc = newF()
	for j := n; j >= 0; j-- {
		sf[j] = logOf(acc)
		acc.Add(acc, terms[j])
	}
	return pmf, cdf, sf
}

// FuzzAgainstExact compares every method with the exact oracle for
// n <= 80 and any p in [0, 1] (the fuzzer's float is folded into [0, 1];
// tiny p and p near 1 included), and checks that invalid parameters give
// NaN or -1 rather than a panic.
func FuzzAgainstExact(f *testing.F) {
	f.Add(int64(10), 0.3, int64(3), 0.5)
	f.Add(int64(80), 1e-15, int64(2), 1e-300)
	f.Add(int64(79), 1-1e-15, int64(78), 0.999)
	f.Add(int64(0), 0.0, int64(0), 0.0)
	f.Add(int64(1), 1.0, int64(1), 1.0)
	f.Add(int64(50), 0.5, int64(-7), math.NaN())
	f.Add(int64(-3), math.NaN(), int64(2), 2.0)
	f.Fuzz(func(t *testing.T, n int64, p float64, k int64, q float64) {
		d := Dist{N: n, P: p}
		if _, err := New(n, p); err != nil {
			// Invalid: documented NaN and -1, and no panic.
			for _, v := range []float64{d.LogProb(k), d.CDF(k), d.LogSurvival(k), d.ProbRange(k, k+3)} {
				if !math.IsNaN(v) {
					t.Fatalf("invalid Dist{%d, %v} gave %v, want NaN", n, p, v)
				}
			}
			if d.Quantile(q) != -1 || d.UpperQuantile(q) != -1 || d.LogQuantile(q) != -1 {
				t.Fatalf("invalid Dist{%d, %v}: quantile not -1", n, p)
			}
			// Fold into the valid domain and go on.
			if math.IsNaN(p) || math.IsInf(p, 0) {
				return
			}
			n = max(n%1000, -n%1000)
			p = math.Mod(math.Abs(p), 1)
			d = Dist{N: n, P: p}
			if !d.valid() {
				return
			}
		}
		// Exercise the quantiles on arbitrary q: no panic, in range or -1.
		for _, v := range []int64{d.Quantile(q), d.UpperQuantile(q), d.LogQuantile(q), d.LogUpperQuantile(q)} {
			if v < -1 || v > n {
				t.Fatalf("Dist{%d, %v} quantile at %v = %d out of range", n, p, q, v)
			}
		}
		if n > 80 {
			return
		}
		// The quantiles against a scan of the tails they invert.
		if qq := math.Mod(math.Abs(q), 1); !math.IsNaN(qq) && qq > 0 {
			wantQ, wantU := n, n
			for j := n; j >= 0; j-- {
				if d.CDF(j) >= qq {
					wantQ = j
				}
				if d.Survival(j) <= qq {
					wantU = j
				}
			}
			if got := d.Quantile(qq); got != wantQ {
				t.Errorf("Dist{%d, %v}.Quantile(%v) = %d, scan %d", n, p, qq, got, wantQ)
			}
			if got := d.UpperQuantile(qq); got != wantU {
				t.Errorf("Dist{%d, %v}.UpperQuantile(%v) = %d, scan %d", n, p, qq, got, wantU)
			}
		}
		pmf, cdf, sf := exactLogs(n, p)
		k = ((k % (n + 3)) + n + 3) % (n + 3) // 0..n+2
		k--                                   // -1..n+1
		want := [3]float64{math.Inf(-1), math.Inf(-1), 0}
		switch {
		case k > n:
			want = [3]float64{math.Inf(-1), 0, math.Inf(-1)}
		case k >= 0:
			want = [3]float64{pmf[k], cdf[k], sf[k]}
		}
		got := [3]float64{d.LogProb(k), d.LogCDF(k), d.LogSurvival(k)}
		for i, name := range []string{"LogProb", "LogCDF", "LogSurvival"} {
			if e := logErr(got[i], want[i]); e > accuracyBar {
				t.Errorf("Dist{%d, %v}.%s(%d) = %v, exact %v (error %.3g)", n, p, name, k, got[i], want[i], e)
			}
		}
		for i, v := range []float64{d.Prob(k), d.CDF(k), d.Survival(k)} {
			if e := plainErr(v, want[i]); e > accuracyBar {
				t.Errorf("Dist{%d, %v} plain value %d at k=%d: %v vs exp(%v) (error %.3g)", n, p, i, k, v, want[i], e)
			}
		}
		// A range ending at k, starting a few terms below.
		if k >= 0 && k <= n {
			lo := max(0, k-3)
			w := math.Inf(-1)
			for j := lo; j <= k; j++ {
				w = xmath.LogAddExp(w, pmf[j])
			}
			if e := logErr(d.LogProbRange(lo, k), w); e > 1e-13 {
				t.Errorf("Dist{%d, %v}.LogProbRange(%d, %d) = %v, exact %v", n, p, lo, k, d.LogProbRange(lo, k), w)
			}
		}
	})
}

package binom_test

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/golden"
)

// TestBetaBinomGolden compares the log PMF and both log tails with
// testdata/betabinom_golden.tsv: full sums at 60 digits in mpmath 1.2.1
// (testdata/gen/betabinom_golden.py), to 1e-13 relative to max(1, |ln P|)
// (the binomial's bar; see bbLogErr).
func TestBetaBinomGolden(t *testing.T) {
	t.Parallel()
	worstAll := 0.0
	defer func() { t.Logf("worst error %.2g", worstAll) }()
	for _, r := range golden.Read(t, "../testdata/betabinom_golden.tsv") {
		n, a, b, k := r.Int(0), r.Float(1), r.Float(2), r.Int(3)
		if testing.Short() && n > 100000 {
			continue
		}
		d, err := binom.NewBetaBinom(n, a, b)
		if err != nil {
			t.Fatalf("%s: %v", r.Pos(), err)
		}
		want := []float64{r.Float(4), r.Float(5), r.Float(6)}
		got := []float64{d.LogProb(k), d.LogCDF(k), d.LogSurvival(k)}
		worst := bbLogErr(want, got)
		worstAll = max(worstAll, worst)
		if worst > 1e-13 {
			t.Errorf("%s: BetaBinom{%d, %g, %g} at k = %d: error %.2g; log PMF, CDF, survival (-want +got):\n%s", r.Pos(), n, a, b, k, worst, cmp.Diff(want, got))
		}
	}
}

// bbLogErr returns the largest error of the log-probabilities got under the
// package's bar: |got - want| / max(1, |want|), and for a log tail near 0
// (want > -ln 2) the same measure on ln(1 - e^x), the complementary tail,
// which is the number the log near 0 carries; 0 where both are -Inf.
func bbLogErr(want, got []float64) float64 {
	worst := 0.0
	for i := range want {
		w, g := want[i], got[i]
		if w == g {
			continue
		}
		if math.IsInf(w, 0) || math.IsInf(g, 0) || math.IsNaN(g) {
			return math.Inf(1)
		}
		if i > 0 && w > -math.Ln2 {
			w, g = math.Log(-math.Expm1(w)), math.Log(-math.Expm1(g))
		}
		worst = math.Max(worst, math.Abs(g-w)/math.Max(1, math.Abs(w)))
	}
	return worst
}

// TestBetaBinomClosedForms checks values derivable by hand. Beta(1, 1)
// mixing gives the discrete uniform law P(X = k) = 1/(N+1) (Johnson, Kemp
// and Kotz (2005), Univariate Discrete Distributions, 3rd ed., section 6.7.2,
// recalled; it is the integral of C(N, k) p^k (1-p)^(N-k) over p); B(2, 3)
// mixing at N = 10 gives P(X = 0) = B(2, 13)/B(2, 3) = 12/182 exactly.
func TestBetaBinomClosedForms(t *testing.T) {
	t.Parallel()
	opt := cmpopts.EquateApprox(1e-14, 0)
	u, _ := binom.NewBetaBinom(1000, 1, 1)
	for _, k := range []int64{0, 1, 17, 500, 999, 1000} {
		if diff := cmp.Diff(1.0/1001, u.Prob(k), opt); diff != "" {
			t.Errorf("uniform Prob(%d) (-want +got):\n%s", k, diff)
		}
		if k < 1000 {
			want := []float64{float64(k+1) / 1001, float64(1000-k) / 1001}
			if diff := cmp.Diff(want, []float64{u.CDF(k), u.Survival(k)}, opt); diff != "" {
				t.Errorf("uniform CDF, Survival(%d) (-want +got):\n%s", k, diff)
			}
		}
	}
	d, _ := binom.NewBetaBinom(10, 2, 3)
	if diff := cmp.Diff(12.0/182, d.Prob(0), opt); diff != "" {
		t.Errorf("Prob(0) (-want +got):\n%s", diff)
	}
}

// TestBetaBinomMoments checks Mean, Variance and Skewness against the sums
// over the support (the moments' defining sums; small N).
func TestBetaBinomMoments(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		n    int64
		a, b float64
	}{{10, 2, 3}, {37, 0.5, 0.75}, {200, 7.25, 1.5}, {1, 3, 0.2}} {
		d, _ := binom.NewBetaBinom(c.n, c.a, c.b)
		var m1, m2, m3 float64
		for k := int64(0); k <= c.n; k++ {
			m1 += float64(k) * d.Prob(k)
		}
		for k := int64(0); k <= c.n; k++ {
			x := float64(k) - m1
			m2 += x * x * d.Prob(k)
			m3 += x * x * x * d.Prob(k)
		}
		want := []float64{m1, m2, m3 / math.Pow(m2, 1.5)}
		got := []float64{d.Mean(), d.Variance(), d.Skewness()}
		if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-11, 0)); diff != "" {
			t.Errorf("%+v: mean, variance, skewness (-want +got):\n%s", c, diff)
		}
	}
}

// TestBetaBinomTailsAndQuantiles is a property sweep: CDF + Survival = 1
// from both sides in log space, and the quantiles invert the tails.
func TestBetaBinomTailsAndQuantiles(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		n    int64
		a, b float64
	}{{10, 2, 3}, {40, 0.6, 0.4}, {300, 0.05, 0.05}, {1000, 38.5, 963.5}, {5000, 3, 1e4}} {
		d, _ := binom.NewBetaBinom(c.n, c.a, c.b)
		for k := int64(0); k < c.n; k += 1 + c.n/37 {
			lc, ls := d.LogCDF(k), d.LogSurvival(k)
			if s := math.Exp(lc) + math.Exp(ls); math.Abs(s-1) > 1e-14 {
				t.Errorf("%+v k=%d: CDF + Survival = %v", c, k, s)
			}
			if d.Prob(k) > 1e-300 && d.LogQuantile(lc) != k {
				t.Errorf("%+v: LogQuantile(LogCDF(%d)) = %d", c, k, d.LogQuantile(lc))
			}
			if d.Prob(k+1) > 1e-300 && d.LogUpperQuantile(ls) != k {
				t.Errorf("%+v: LogUpperQuantile(LogSurvival(%d)) = %d", c, k, d.LogUpperQuantile(ls))
			}
		}
		if d.Quantile(0) != 0 || d.Quantile(1) != c.n || d.UpperQuantile(0) != c.n || d.UpperQuantile(1) != 0 {
			t.Errorf("%+v: quantiles at 0 and 1 wrong", c)
		}
	}
}

// TestBetaBinomRand checks the sample mean and variance of 40000 draws
// against Mean and Variance (4.5 standard errors; seeded, deterministic).
func TestBetaBinomRand(t *testing.T) {
	t.Parallel()
	r := rand.New(rand.NewPCG(1, 2))
	for _, c := range []struct {
		n    int64
		a, b float64
	}{{20, 0.3, 0.7}, {1000, 5, 2}, {100000, 0.01, 0.02}} {
		d, _ := binom.NewBetaBinom(c.n, c.a, c.b)
		const m = 40000
		var s, s2 float64
		for i := 0; i < m; i++ {
			x := float64(d.Rand(r))
			s += x
			s2 += x * x
		}
		mean := s / m
		v := s2/m - mean*mean
		if se := math.Sqrt(d.Variance() / m); math.Abs(mean-d.Mean()) > 4.5*se {
			t.Errorf("%+v: sample mean %v, want %v +- %v", c, mean, d.Mean(), 4.5*se)
		}
		if math.Abs(v/d.Variance()-1) > 0.1 {
			t.Errorf("%+v: sample variance %v, want %v", c, v, d.Variance())
		}
	}
}

func TestNewBetaBinomErrors(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		n    int64
		a, b float64
		arg  string
		want error
	}{
		{-1, 1, 1, "n", binom.ErrInvalidArgument},
		{binom.MaxBetaBinomN + 1, 1, 1, "n", binom.ErrTooLarge},
		{5, 0, 1, "a", binom.ErrInvalidArgument},
		{5, math.NaN(), 1, "a", binom.ErrInvalidArgument},
		{5, 1, math.Inf(1), "b", binom.ErrInvalidArgument},
	} {
		_, err := binom.NewBetaBinom(c.n, c.a, c.b)
		var e *binom.Error
		if !errors.Is(err, c.want) || !errors.As(err, &e) || e.Arg != c.arg {
			t.Errorf("NewBetaBinom(%d, %g, %g) = %v, want %v naming %s", c.n, c.a, c.b, err, c.want, c.arg)
		}
	}
	var bad binom.BetaBinom
	if !math.IsNaN(bad.LogProb(0)) || bad.Quantile(0.5) != -1 {
		t.Error("an invalid BetaBinom must give NaN and -1")
	}
}

func BenchmarkBetaBinomLogCDF(b *testing.B) {
	d, _ := binom.NewBetaBinom(100000, 250.5, 9750.5)
	for b.Loop() {
		d.LogCDF(2000)
	}
}

func BenchmarkBetaBinomLogProb(b *testing.B) {
	d, _ := binom.NewBetaBinom(100000, 250.5, 9750.5)
	for b.Loop() {
		d.LogProb(2000)
	}
}

// ExampleBetaBinom shows the predictive distribution of the successes in
// 20 further trials after 7 of 30 under a uniform Beta(1, 1) prior (an
// invented pilot study): BetaBinom{20, 1 + 7, 1 + 23}. The printed values
// agree with SciPy 1.10's scipy.stats.betabinom(20, 8, 24).
func ExampleBetaBinom() {
	d, err := binom.NewBetaBinom(20, 8, 24)
	if err != nil {
		panic(err)
	}
	fmt.Printf("mean %.4f, sd %.4f\n", d.Mean(), d.StdDev())
	fmt.Printf("P(at least 8 more) = %.6f\n", d.Survival(7))
	fmt.Printf("90%% predictive upper bound: %d\n", d.Quantile(0.9))
	// Output:
	// mean 5.0000, sd 2.4309
	// P(at least 8 more) = 0.154357
	// 90% predictive upper bound: 8
}

// FuzzBetaBinom checks that construction either fails with a typed error or
// gives finite log-probabilities in [-Inf, 0] and quantiles in 0..N.
func FuzzBetaBinom(f *testing.F) {
	f.Add(int64(10), 2.0, 3.0, int64(4), 0.3)
	f.Add(int64(5000), 0.01, 1e4, int64(0), 1e-300)
	f.Add(int64(1), 1e300, 1e-300, int64(1), 0.999)
	f.Fuzz(func(t *testing.T, n int64, a, b float64, k int64, q float64) {
		if n > 20000 {
			n %= 20000
		}
		d, err := binom.NewBetaBinom(n, a, b)
		if err != nil {
			var e *binom.Error
			if !errors.As(err, &e) || e.Arg == "" {
				t.Fatalf("untyped error %v", err)
			}
			return
		}
		for _, v := range []float64{d.LogProb(k), d.LogCDF(k), d.LogSurvival(k)} {
			if math.IsNaN(v) || v > 0 {
				t.Fatalf("%+v at k = %d: log value %v", d, k, v)
			}
		}
		if !math.IsNaN(q) {
			if x := d.Quantile(q); x < 0 || x > d.N {
				t.Fatalf("%+v: Quantile(%v) = %d", d, q, x)
			}
		}
	})
}

// TestBetaBinomTinyShapes: as both shapes tend to 0 the Beta mixing
// distribution tends to point masses of 1/2 at 0 and at 1 (derivable by
// hand: B(a, n+b)/B(a, b) -> b/(a+b)), so P(X = 0) -> 1/2 and the
// quantiles sit at 0 and N; checked down to MinShape at N = 10 and 2^21.
func TestBetaBinomTinyShapes(t *testing.T) {
	t.Parallel()
	for _, a := range []float64{1e-12, 1e-100, binom.MinShape} {
		for _, n := range []int64{10, binom.MaxBetaBinomN} {
			d, err := binom.NewBetaBinom(n, a, a)
			if err != nil {
				t.Fatal(err)
			}
			if lp := d.LogProb(0); math.Abs(lp+math.Ln2) > 1e-9 {
				t.Errorf("a = b = %g, n = %d: ln P(X = 0) = %v, want -ln 2", a, n, lp)
			}
			if q1, q6 := d.Quantile(0.01), d.Quantile(0.6); q1 != 0 || q6 != n {
				t.Errorf("a = b = %g, n = %d: quantiles %d, %d, want 0 and %d", a, n, q1, q6, n)
			}
		}
	}
	if _, err := binom.NewBetaBinom(10, 1e-160, 1); err == nil {
		t.Error("a shape below MinShape was accepted")
	}
}

// BenchmarkBetaBinomWide times the widest distributions BetaBinom accepts
// (N = MaxBetaBinomN with shapes of order 1 or below, where the terms that
// matter span the whole range and no geometric bound ends a sum early):
// the CDF at the median and both quantiles in the bulk and near the ends.
func BenchmarkBetaBinomWide(b *testing.B) {
	for _, c := range []struct {
		name string
		a, b float64
	}{{"3,5", 3, 5}, {"0.5,0.5", 0.5, 0.5}, {"0.01,0.8", 0.01, 0.8}, {"0.99,0.05", 0.99, 0.05}} {
		d, _ := binom.NewBetaBinom(binom.MaxBetaBinomN, c.a, c.b)
		med := d.Quantile(0.5)
		b.Run("LogCDF/"+c.name, func(b *testing.B) {
			for b.Loop() {
				d.LogCDF(med)
			}
		})
		for _, q := range []float64{0.05, 0.5, 0.95} {
			b.Run(fmt.Sprintf("Quantile/%s/q=%g", c.name, q), func(b *testing.B) {
				for b.Loop() {
					d.Quantile(q)
				}
			})
			b.Run(fmt.Sprintf("UpperQuantile/%s/q=%g", c.name, q), func(b *testing.B) {
				for b.Loop() {
					d.UpperQuantile(q)
				}
			})
		}
	}
}

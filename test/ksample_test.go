package test

import (
	"context"
	"errors"
	"math"
	"math/big"
	"strings"
	"testing"
	"time"

	"github.com/kofnlab/kofn/internal/golden"
)

// TestKSampleGoldenR compares with the "chisq", "gtest" and "exact" rows of
// testdata/test_karms_r.tsv (R 4.2.2 stats: the chi-square test of a 2 x k
// table without correction, the G statistic referred to pchisq, and the
// exact test of the 2 x k table by the network algorithm, which orders
// tables by probability with the relative tolerance 1e-7).
func TestKSampleGoldenR(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	n := 0
	for _, r := range golden.Read(t, "../testdata/test_karms_r.tsv") {
		var m KSampleMethod
		switch r.Str(0) {
		case "chisq":
			m = PearsonChiSquare
		case "gtest":
			m = LikelihoodRatioG
		case "exact":
			m = FreemanHalton
		default:
			continue
		}
		n++
		x, sz := ints(t, r.Str(1)), ints(t, r.Str(2))
		got, err := EqualProportions(ctx, x, sz, KSampleOptions{Method: m})
		if err != nil {
			t.Fatalf("%s: %v", r.Pos(), err)
		}
		wantP := r.Float(r.Len() - 1)
		// R's network algorithm reports about 12 digits.
		if !relClose(got.PValue, wantP, 1e-10) {
			t.Errorf("%s: %v p = %.17g, want %.17g", r.Pos(), m, got.PValue, wantP)
		}
		if m != FreemanHalton && !relClose(got.Statistic.Value, r.Float(3), 1e-12) {
			t.Errorf("%s: %v statistic = %.17g, want %.17g", r.Pos(), m, got.Statistic.Value, r.Float(3))
		}
	}
	if n < 27 {
		t.Errorf("only %d rows", n)
	}
}

func ints(t *testing.T, s string) []int64 {
	t.Helper()
	var v []int64
	for _, f := range floatList(t, s) {
		v = append(v, int64(f))
	}
	return v
}

// tables calls visit with every 2 x k table (successes per arm) with arm
// sizes n.
func tables(n []int64, visit func(x []int64)) {
	x := make([]int64, len(n))
	var rec func(j int)
	rec = func(j int) {
		if j == len(n) {
			visit(x)
			return
		}
		for v := int64(0); v <= n[j]; v++ {
			x[j] = v
			rec(j + 1)
		}
	}
	rec(0)
}

// weight returns prod_j C(n_j, x_j) exactly.
func weight(x, n []int64) *big.Int {
	w := big.NewInt(1)
	for j := range x {
		w.Mul(w, new(big.Int).Binomial(n[j], x[j]))
	}
	return w
}

// exactFH returns the Freeman-Halton p-value and mid-p of x by listing
// every table with the same total in exact rational arithmetic, "no more
// probable" meaning weight <= (1 + 1e-7) times the observed weight.
func exactFH(x, n []int64) (p, mid float64) {
	var S int64
	for _, v := range x {
		S += v
	}
	obs := new(big.Rat).SetInt(weight(x, n))
	hi := new(big.Rat).Mul(obs, big.NewRat(10000001, 10000000))
	lo := new(big.Rat).Mul(obs, big.NewRat(9999999, 10000000))
	tot, le, lt := new(big.Int), new(big.Int), new(big.Int)
	count := 0
	tables(n, func(y []int64) {
		var s int64
		for _, v := range y {
			s += v
		}
		if s != S {
			return
		}
		w := weight(y, n)
		tot.Add(tot, w)
		count++
		wr := new(big.Rat).SetInt(w)
		if wr.Cmp(hi) <= 0 {
			le.Add(le, w)
		}
		if wr.Cmp(lo) < 0 {
			lt.Add(lt, w)
		}
	})
	p, _ = new(big.Rat).SetFrac(le, tot).Float64()
	if count == 1 {
		return 1, 1 // one possible table: the package reports 1, as Fisher does
	}
	m := new(big.Rat).SetFrac(new(big.Int).Add(le, lt), new(big.Int).Mul(tot, big.NewInt(2)))
	mid, _ = m.Float64()
	return p, mid
}

// TestFreemanHaltonEnumeration compares the exact test with a listing of
// all tables in exact rational arithmetic, for every table of several
// small shapes (2 to 5 arms), p-value and mid-p.
func TestFreemanHaltonEnumeration(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	shapes := [][]int64{{3, 4}, {1, 1}, {5, 5, 5}, {2, 7, 4}, {1, 2, 3, 4}, {3, 3, 3, 3}, {6, 1, 2}, {2, 2, 3, 1, 2}, {4, 9}}
	if testing.Short() {
		shapes = shapes[:4]
	}
	for _, n := range shapes {
		tables(n, func(x []int64) {
			want, wantMid := exactFH(x, n)
			xs := append([]int64(nil), x...)
			got, err := EqualProportions(ctx, xs, n, KSampleOptions{})
			if err != nil {
				t.Fatalf("%v/%v: %v", x, n, err)
			}
			gm, err := EqualProportions(ctx, xs, n, KSampleOptions{MidP: true})
			if err != nil {
				t.Fatalf("%v/%v: %v", x, n, err)
			}
			if !relClose(got.PValue, want, 1e-12) || !relClose(gm.PValue, wantMid, 1e-12) {
				t.Errorf("x=%v n=%v: p %.17g mid %.17g, want %.17g %.17g", x, n, got.PValue, gm.PValue, want, wantMid)
			}
		})
	}
}

// TestFreemanHaltonSize: the exact size of the conditional test over all
// tables of small shapes. For each total of successes S and each alpha,
// the null probability (given the margins, in exact rationals) of the
// tables whose p-value is at most alpha must not exceed alpha; the test is
// then exact unconditionally too.
func TestFreemanHaltonSize(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	for _, n := range [][]int64{{4, 5, 6}, {2, 3, 3, 4}, {10, 10}, {1, 8, 3}} {
		var N int64
		for _, v := range n {
			N += v
		}
		for S := int64(0); S <= N; S++ {
			tot := new(big.Int)
			rej := map[float64]*big.Int{0.01: new(big.Int), 0.05: new(big.Int), 0.1: new(big.Int)}
			tables(n, func(x []int64) {
				var s int64
				for _, v := range x {
					s += v
				}
				if s != S {
					return
				}
				w := weight(x, n)
				tot.Add(tot, w)
				r, err := EqualProportions(ctx, append([]int64(nil), x...), n, KSampleOptions{})
				if err != nil {
					t.Fatal(err)
				}
				for a, acc := range rej {
					if r.PValue <= a {
						acc.Add(acc, w)
					}
				}
			})
			for a, acc := range rej {
				size, _ := new(big.Rat).SetFrac(acc, tot).Float64()
				if size > a*(1+1e-12) {
					t.Errorf("n=%v S=%d alpha=%v: size %v", n, S, a, size)
				}
			}
		}
	}
}

// TestFreemanHaltonTwoArms: with two arms the test is Fisher's two-sided
// point-probability test (the same definition and tolerance).
func TestFreemanHaltonTwoArms(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	for _, c := range [][4]int64{{3, 10, 7, 12}, {0, 5, 5, 5}, {120, 1000, 150, 1000}, {10, 4000, 2, 4000}, {1, 20000, 30, 20000}} {
		f, _ := Fisher(c[0], c[1], c[2], c[3], FisherOptions{})
		r, err := EqualProportions(ctx, []int64{c[0], c[2]}, []int64{c[1], c[3]}, KSampleOptions{})
		if err != nil || !relClose(r.LogPValue, f.LogPValue, 1e-10) {
			t.Errorf("%v: log p %v (%v), Fisher %v", c, r.LogPValue, err, f.LogPValue)
		}
	}
}

// TestFreemanHaltonLarge: at large totals the exact p-value lies near the
// chi-square approximation (common practice expectation, within 15%
// relative at p near 0.05 with expected counts in the hundreds), the test
// is symmetric in successes and failures and in the order of the arms.
func TestFreemanHaltonLarge(t *testing.T) {
	t.Parallel()
	if testing.Short() {
		t.Skip("large exact tables")
	}
	ctx := context.Background()
	x := []int64{1010, 1050, 980, 1075, 1020}
	n := []int64{2000, 2000, 2000, 2000, 2000}
	ex, err := EqualProportions(ctx, x, n, KSampleOptions{})
	if err != nil {
		t.Fatal(err)
	}
	ch, _ := EqualProportions(ctx, x, n, KSampleOptions{Method: PearsonChiSquare})
	if math.Abs(ex.PValue/ch.PValue-1) > 0.15 {
		t.Errorf("exact %v, chi-square %v", ex.PValue, ch.PValue)
	}
	y := []int64{2000 - 1075, 2000 - 980, 2000 - 1010, 2000 - 1020, 2000 - 1050}
	ey, err := EqualProportions(ctx, y, n, KSampleOptions{})
	if err != nil || !relClose(ey.PValue, ex.PValue, 1e-10) {
		t.Errorf("flipped and permuted: %v (%v), want %v", ey.PValue, err, ex.PValue)
	}
	// A tiny p-value stays finite in log space.
	z, err := EqualProportions(ctx, []int64{300, 420, 380}, []int64{1000, 1000, 1000}, KSampleOptions{})
	zc, _ := EqualProportions(ctx, []int64{300, 420, 380}, []int64{1000, 1000, 1000}, KSampleOptions{Method: PearsonChiSquare})
	if err != nil || !(z.LogPValue < -15) || math.Abs(z.LogPValue/zc.LogPValue-1) > 0.1 {
		t.Errorf("strong effect: log p %v (%v), chi-square %v", z.LogPValue, err, zc.LogPValue)
	}
}

func TestKSampleErrors(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	for _, c := range []struct {
		x, n []int64
		opt  KSampleOptions
		want string
	}{
		{[]int64{1}, []int64{2}, KSampleOptions{}, "at least 2"},
		{[]int64{1, 2}, []int64{2}, KSampleOptions{}, "one of each"},
		{[]int64{3, 2}, []int64{2, 2}, KSampleOptions{}, "successes[0] = 3 exceeds sizes[0] = 2"},
		{[]int64{0, 0}, []int64{2, 0}, KSampleOptions{}, "sizes[1] = 0"},
		{[]int64{1, 1}, []int64{2, 2}, KSampleOptions{Method: 7}, "method = 7"},
		{[]int64{1, 1}, []int64{2, 2}, KSampleOptions{Method: PearsonChiSquare, MidP: true}, "mid-p"},
	} {
		_, err := EqualProportions(ctx, c.x, c.n, c.opt)
		if !errors.Is(err, ErrInvalidArgument) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%v/%v: %v, want %q", c.x, c.n, err, c.want)
		}
	}
	if _, err := EqualProportions(ctx, []int64{1, 1}, []int64{1 << 24, 2}, KSampleOptions{}); !errors.Is(err, ErrTooLarge) {
		t.Errorf("huge: %v", err)
	}
	cctx, cancel := context.WithCancel(ctx)
	cancel()
	if _, err := EqualProportions(cctx, []int64{1010, 1050, 980, 1075, 1020}, []int64{2000, 2000, 2000, 2000, 2000}, KSampleOptions{}); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: %v", err)
	}
	r, err := EqualProportions(ctx, []int64{0, 0, 0}, []int64{3, 4, 5}, KSampleOptions{})
	if err != nil || r.PValue != 1 || len(r.Warnings) == 0 {
		t.Errorf("degenerate: %+v %v", r, err)
	}
}

func BenchmarkFreemanHalton(b *testing.B) {
	ctx := context.Background()
	for _, c := range []struct {
		name string
		x, n []int64
	}{
		// Total 10,000 in five arms: a p-value near 0.07 and one near 1e-4.
		{"N=1e4/k=5/p=0.07", []int64{1010, 1050, 980, 1075, 1020}, []int64{2000, 2000, 2000, 2000, 2000}},
		{"N=1e4/k=5/p=1e-4", []int64{200, 240, 190, 260, 205}, []int64{2000, 2000, 2000, 2000, 2000}},
		{"N=1e4/k=5/unequal", []int64{412, 95, 88, 120, 101}, []int64{6000, 1000, 1000, 1000, 1000}},
	} {
		b.Run(c.name, func(b *testing.B) {
			c0, n := cpuTime(), 0
			for b.Loop() {
				if _, err := EqualProportions(ctx, c.x, c.n, KSampleOptions{}); err != nil {
					b.Fatal(err)
				}
				n++
			}
			b.ReportMetric(float64(cpuTime()-c0)/float64(n), "cpu-ns/op")
		})
	}
}

// TestFreemanHaltonCancel: a large exact table stops soon after its
// context is cancelled, also in the three-arm path that tabulates no pair.
func TestFreemanHaltonCancel(t *testing.T) {
	t.Parallel()
	for _, c := range []struct{ x, n []int64 }{
		{[]int64{1010, 1050, 980, 1075, 1020}, []int64{2000, 2000, 2000, 2000, 2000}},
		{[]int64{20000, 20500, 19800, 20100}, []int64{100000, 100000, 100000, 100000}},
	} {
		ctx, cancel := context.WithTimeout(context.Background(), 5*time.Millisecond)
		start := time.Now()
		_, err := EqualProportions(ctx, c.x, c.n, KSampleOptions{})
		cancel()
		if err != nil && !errors.Is(err, context.DeadlineExceeded) && !errors.Is(err, ErrTooLarge) {
			t.Errorf("%v: %v", c.n, err)
		}
		if d := time.Since(start); d > 2*time.Second {
			t.Errorf("%v: returned after %v", c.n, d)
		}
	}
}

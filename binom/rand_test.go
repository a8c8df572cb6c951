package binom

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/stat/distuv"
)

// chiSquareGOF draws n variates with draw, bins the range lo..hi into
// consecutive cells of expected count at least max(20, n/40) under pmf (the remainder
// merged into the last cell), and returns Pearson's statistic and its
// degrees of freedom; bad is a variate outside lo..hi (0 if none), which
// the caller's range makes a practical impossibility.
func chiSquareGOF(n int, lo, hi int64, pmf func(int64) float64, draw func() int64) (stat float64, df int, bad int64) {
	counts := map[int64]float64{}
	for range n {
		x := draw()
		if x < lo || x > hi {
			return 0, 0, x
		}
		counts[x]++
	}
	// Cells of expected count >= n/40 (and >= 20): about 40 cells, few
	// enough for power against smooth distortions at any spread.
	cellMin := max(20, float64(n)/40)
	var exps, obss []float64
	var e, o float64
	for x := lo; x <= hi; x++ {
		e += float64(n) * pmf(x)
		o += counts[x]
		if e >= cellMin {
			exps, obss = append(exps, e), append(obss, o)
			e, o = 0, 0
		}
	}
	if len(exps) == 0 {
		return 0, 0, 0
	}
	exps[len(exps)-1] += e
	obss[len(obss)-1] += o
	for i := range exps {
		stat += (obss[i] - exps[i]) * (obss[i] - exps[i]) / exps[i]
	}
	return stat, len(exps) - 1, 0
}

// TestRandGoodnessOfFit checks the samplers by Pearson's chi-square test
// with fixed seeds (deterministic), at significance 1e-4 (common practice
// for a generous but meaningful test; critical values from gonum's
// chi-squared quantile). Both the inversion and the BTRS branch are
// covered, n = 1e9 included.
func TestRandGoodnessOfFit(t *testing.T) {
	t.Parallel()
	const draws = 200000
	type tc struct {
		name   string
		lo, hi int64
		pmf    func(int64) float64
		draw   func(r *rand.Rand) int64
		center int64
		sd     float64
	}
	var cases []tc
	for _, p := range []struct {
		n int64
		p float64
	}{{10, 0.3}, {20, 0.05}, {1000, 0.4}, {1000, 0.995}, {100, 0.9}, {1e9, 0.3}, {1e9, 4e-9}, {1e9, 1e-7}, {60, 0.5}} {
		d, _ := New(p.n, p.p)
		cases = append(cases, tc{fmt.Sprint(d), 0, d.N, d.Prob, d.Rand, d.Mode(), d.StdDev()})
	}
	for _, p := range [][3]int64{{8, 4, 4}, {1000, 300, 200}, {1000000, 500000, 500000}, {1e12, 3e11, 1e4}} {
		h, _ := NewHyper(p[0], p[1], p[2])
		lo, hi := h.Support()
		cases = append(cases, tc{fmt.Sprint(h), lo, hi, h.Prob, h.Rand, h.Mode(), h.StdDev()})
	}
	for i, c := range cases {
		r := rand.New(rand.NewPCG(uint64(i)+1, 0x6b6f666e))
		// Restrict the scanned support to +-12 sd around the mode; the
		// variates outside it would show as out of range.
		lo := max(c.lo, c.center-int64(12*c.sd)-12)
		hi := min(c.hi, c.center+int64(12*c.sd)+12)
		stat, df, bad := chiSquareGOF(draws, lo, hi, c.pmf, func() int64 { return c.draw(r) })
		if bad != 0 || df < 1 {
			t.Errorf("%s: variate %d outside %d..%d (df %d)", c.name, bad, lo, hi, df)
			continue
		}
		crit := distuv.ChiSquared{K: float64(df)}.Quantile(1 - 1e-4)
		if stat > crit || math.IsNaN(stat) {
			t.Errorf("%s: chi-square %.1f on %d df exceeds %.1f", c.name, stat, df, crit)
		}
		if testing.Verbose() {
			t.Logf("%s: chi-square %.1f on %d df (critical %.1f)", c.name, stat, df, crit)
		}
	}
}

func BenchmarkRand(b *testing.B) {
	for _, n := range []int64{10, 1000, 1e9} {
		d := Dist{n, 0.3}
		r := rand.New(rand.NewPCG(1, 2))
		b.Run(fmt.Sprintf("n=%d", n), func(b *testing.B) {
			for b.Loop() {
				benchSink = float64(d.Rand(r))
			}
		})
	}
}

// TestRandNilSource checks that a nil generator draws from the default
// one: variates in range, and a sample mean within 6 standard errors of
// N P and of the hypergeometric mean (common practice for a smoke check).
func TestRandNilSource(t *testing.T) {
	t.Parallel()
	d := Dist{N: 1000, P: 0.3}
	h := Hyper{Total: 1000, Successes: 300, Draws: 100}
	const draws = 2000
	var sd, sh float64
	for range draws {
		x, y := d.Rand(nil), h.Rand(nil)
		if x < 0 || x > 1000 || y < 0 || y > 100 {
			t.Fatalf("Rand(nil) = %d, %d: out of range", x, y)
		}
		sd += float64(x)
		sh += float64(y)
	}
	if m, se := sd/draws, math.Sqrt(d.Variance()/draws); math.Abs(m-d.Mean()) > 6*se {
		t.Errorf("Dist.Rand(nil) mean %g, want %g +- %g", m, d.Mean(), 6*se)
	}
	if m, se := sh/draws, math.Sqrt(h.Variance()/draws); math.Abs(m-h.Mean()) > 6*se {
		t.Errorf("Hyper.Rand(nil) mean %g, want %g +- %g", m, h.Mean(), 6*se)
	}
}

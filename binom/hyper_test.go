package binom

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/golden"
	"github.com/kofnlab/kofn/internal/xmath"
)

func TestNewHyperRejects(t *testing.T) {
	t.Parallel()
	tests := []struct {
		N, K, n int64
		want    string
		is      error
	}{
		{-1, 0, 0, "binom.NewHyper: total = -1 is negative; counts are 0 or more", ErrInvalidArgument},
		{10, -2, 3, "binom.NewHyper: successes = -2 is negative; counts are 0 or more", ErrInvalidArgument},
		{10, 11, 3, "binom.NewHyper: successes = 11 exceeds total = 10", ErrInvalidArgument},
		{10, 3, -1, "binom.NewHyper: draws = -1 is negative; counts are 0 or more", ErrInvalidArgument},
		{10, 3, 12, "binom.NewHyper: draws = 12 exceeds total = 10", ErrInvalidArgument},
		{MaxN + 1, 3, 12, "binom.NewHyper: total = 9007199254740993 exceeds 2^53, the largest count held exactly in float64", ErrTooLarge},
	}
	for _, tc := range tests {
		_, err := NewHyper(tc.N, tc.K, tc.n)
		var e *Error
		if err == nil || err.Error() != tc.want || !errors.Is(err, tc.is) || !errors.As(err, &e) {
			t.Errorf("NewHyper(%d, %d, %d) error = %v, want %q", tc.N, tc.K, tc.n, err, tc.want)
		}
	}
}

// TestHyperTeaTasting pins Fisher's tea-tasting design: Fisher RA (1935),
// The Design of Experiments, as analysed in Agresti A (2002), Categorical
// Data Analysis, 2nd ed., section 3.5 (recalled, recomputed; values in
// shared REFERENCES.md): table [[3,1],[1,3]], one-sided P = 17/70,
// P(4 correct) = 1/70.
func TestHyperTeaTasting(t *testing.T) {
	t.Parallel()
	h, err := NewHyper(8, 4, 4)
	if err != nil {
		t.Fatal(err)
	}
	got := []float64{h.Survival(2), h.Prob(4), h.Prob(3), h.CDF(3), h.ProbRange(1, 3)}
	want := []float64{17.0 / 70, 1.0 / 70, 16.0 / 70, 69.0 / 70, 68.0 / 70}
	if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-14, 0)); diff != "" {
		t.Errorf("tea tasting (-want +got):\n%s", diff)
	}
}

type hyperRow struct {
	N, K, n, x     int64
	lp, lcdf, lsur float64
}

func readHyperGolden(t *testing.T) []hyperRow {
	t.Helper()
	var rows []hyperRow
	for _, fs := range golden.Read(t, "../testdata/hyper_golden.tsv") {
		if fs.Len() != 7 {
			t.Fatalf("%s: bad golden line %q", fs.Pos(), fs.Fields)
		}
		v := fs.Floats(0)
		rows = append(rows, hyperRow{int64(v[0]), int64(v[1]), int64(v[2]), int64(v[3]), v[4], v[5], v[6]})
	}
	return rows
}

// logClose reports whether got is within tol of want relative to
// max(1, |want|), the log-space bar of the package.
func logClose(want, got, tol float64) bool {
	if math.IsInf(want, 0) || math.IsInf(got, 0) {
		return want == got
	}
	return math.Abs(got-want) <= tol*math.Max(1, math.Abs(want))
}

// probClose reports whether exp(got) matches exp(want) to relative
// tol*max(1, |want|) where exp(want) >= 1e-300 (exactly 0 below the
// smallest subnormal), the linear-space bar.
func probClose(lwant, got, tol float64) bool {
	w := math.Exp(lwant)
	if lwant < -690 {
		return w == 0 || got <= 1e-290
	}
	return math.Abs(got-w) <= tol*math.Max(1, math.Abs(lwant))*w
}

// TestHyperGolden checks against testdata/hyper_golden.tsv (totals up to
// 2^53; mpmath 1.2.1,
// exact rational sums for N <= 400 and 50-digit sums beyond; generator
// testdata/gen/hyper_golden.py).
func TestHyperGolden(t *testing.T) {
	t.Parallel()
	const tol = 1e-13
	rows := readHyperGolden(t)
	if len(rows) < 2000 {
		t.Fatalf("only %d golden rows", len(rows))
	}
	bad := 0
	for _, r := range rows {
		h, err := NewHyper(r.N, r.K, r.n)
		if err != nil {
			t.Fatal(err)
		}
		checks := []struct {
			name      string
			want, got float64
			lin       float64
		}{
			{"LogProb", r.lp, h.LogProb(r.x), h.Prob(r.x)},
			{"LogCDF", r.lcdf, h.LogCDF(r.x), h.CDF(r.x)},
			{"LogSurvival", r.lsur, h.LogSurvival(r.x), h.Survival(r.x)},
		}
		for _, c := range checks {
			if !logClose(c.want, c.got, tol) || !probClose(c.want, c.lin, tol) {
				if bad++; bad <= 20 {
					t.Errorf("Hyper%v.%s(%d) = %.17g (lin %.17g), want %.17g (rel err %.2g)",
						h, c.name, r.x, c.got, c.lin, c.want, (c.got-c.want)/math.Max(1, math.Abs(c.want)))
				}
			}
		}
	}
	if bad > 0 {
		t.Errorf("%d of %d golden checks failed", bad, 3*len(rows))
	}
}

// TestHyperProperties checks, over a grid of populations (common practice
// property checks of DESIGN.md section 4): CDF + Survival = 1 with each
// side computed directly, ProbRange against the tail difference, moments
// against sums of the PMF, and that the quantiles invert the tails.
func TestHyperProperties(t *testing.T) {
	t.Parallel()
	params := [][3]int64{{8, 4, 4}, {30, 19, 15}, {1000, 300, 200}, {100000, 5000, 40000}, {1000000, 500000, 500000}, {1e12, 3e11, 1e6}}
	for _, p := range params {
		h, err := NewHyper(p[0], p[1], p[2])
		if err != nil {
			t.Fatal(err)
		}
		lo, hi := h.Support()
		sd := h.StdDev()
		step := max(1, int64(sd/8))
		from, to := max(lo, int64(h.Mean()-12*sd)), min(hi, int64(h.Mean()+12*sd))
		for k := from; k <= to; k += step {
			c, s := h.CDF(k), h.Survival(k)
			if math.Abs(c+s-1) > 1e-15 { // a few units in the last place
				t.Errorf("%v: CDF(%d) + Survival = %.17g", h, k, c+s)
			}
			// Quantile(CDF(k)) is k, or below it where the CDF is flat
			// in floating point (values within an ulp of 1).
			if q := h.Quantile(c); q > k || h.CDF(q) != c || (q > lo && h.CDF(q-1) >= c) {
				t.Errorf("%v: Quantile(CDF(%d) = %g) = %d", h, k, c, q)
			}
			if q := h.UpperQuantile(s); q > k || h.Survival(q) != s || (q > lo && h.Survival(q-1) <= s) {
				t.Errorf("%v: UpperQuantile(Survival(%d) = %g) = %d", h, k, s, q)
			}
			if q := h.LogQuantile(h.LogCDF(k)); q != k {
				t.Errorf("%v: LogQuantile(LogCDF(%d)) = %d", h, k, q)
			}
			if q := h.LogUpperQuantile(h.LogSurvival(k)); q != k && k < hi {
				t.Errorf("%v: LogUpperQuantile(LogSurvival(%d)) = %d", h, k, q)
			}
			a, b := k, k+3*step
			want := math.Exp(xmath.LogDiffExp(h.LogCDF(b), h.LogCDF(a-1)))
			if s := math.Exp(xmath.LogDiffExp(h.LogSurvival(a-1), h.LogSurvival(b))); s < want {
				want = s // the difference of the smaller pair of tails
			}
			if got := h.ProbRange(a, b); math.Abs(got-want) > 1e-12*want {
				t.Errorf("%v: ProbRange(%d, %d) = %.17g, want %.17g", h, a, b, got, want)
			}
		}
	}
}

// TestHyperFarQuantiles checks that the log-space quantiles invert the
// tails far below the smallest double (ln P down to about -1800).
func TestHyperFarQuantiles(t *testing.T) {
	t.Parallel()
	for _, h := range []Hyper{{1000000, 500000, 500000}, {1000, 300, 200}, {1e12, 3e11, 1e6}} {
		lo, hi := h.Support()
		for _, z := range []float64{-60, -40, -25, 25, 40, 60} {
			k := min(hi-1, max(lo+1, int64(h.Mean()+z*h.StdDev())))
			if lc := h.LogCDF(k); lc < -700 || z < 0 {
				if q := h.LogQuantile(lc); q != k {
					t.Errorf("%v: LogQuantile(LogCDF(%d) = %g) = %d", h, k, lc, q)
				}
			}
			if ls := h.LogSurvival(k); ls < -700 || z > 0 {
				if q := h.LogUpperQuantile(ls); q != k {
					t.Errorf("%v: LogUpperQuantile(LogSurvival(%d) = %g) = %d", h, k, ls, q)
				}
			}
		}
	}
}

// TestHyperMoments compares the closed-form moments with direct sums of
// the PMF (the sums are the definition; the formulas are textbook, e.g.
// Johnson NL, Kemp AW, Kotz S (2005), Univariate Discrete Distributions,
// 3rd ed., section 6.3, recalled, recomputed here).
func TestHyperMoments(t *testing.T) {
	t.Parallel()
	for _, p := range [][3]int64{{2, 1, 1}, {3, 1, 2}, {3, 2, 2}, {4, 2, 2}, {8, 4, 4}, {30, 19, 15}, {50, 7, 40}, {200, 150, 31}} {
		h, _ := NewHyper(p[0], p[1], p[2])
		lo, hi := h.Support()
		var m [5]float64
		for x := lo; x <= hi; x++ {
			m[1] += float64(x) * h.Prob(x)
		}
		for x := lo; x <= hi; x++ {
			d := float64(x) - m[1]
			m[2] += d * d * h.Prob(x)
			m[3] += d * d * d * h.Prob(x)
			m[4] += d * d * d * d * h.Prob(x)
		}
		want := []float64{m[1], m[2], m[3] / math.Pow(m[2], 1.5), m[4]/(m[2]*m[2]) - 3}
		got := []float64{h.Mean(), h.Variance(), h.Skewness(), h.ExKurtosis()}
		if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-12, 1e-12)); diff != "" {
			t.Errorf("%v moments (-want +got):\n%s", h, diff)
		}
	}
	if h := (Hyper{10, 0, 5}); !math.IsNaN(h.Skewness()) || !math.IsNaN(h.ExKurtosis()) || h.Variance() != 0 {
		t.Errorf("point mass: skewness %g, kurtosis %g, variance %g", h.Skewness(), h.ExKurtosis(), h.Variance())
	}
}

// TestHyperSpreadBound checks the MaxHyperStdDev bound: the constructors
// refuse wider distributions with ErrTooLarge, hand-built ones answer NaN
// at once (Support still answers), and just inside the bound the summing
// methods agree with the normal limit to O(1/sd) (the distribution is then
// nearly normal: common practice).
func TestHyperSpreadBound(t *testing.T) {
	t.Parallel()
	const n53, n52, n51 = int64(1) << 53, int64(1) << 52, int64(1) << 51
	if _, err := NewHyper(n53, n51, n51); !errors.Is(err, ErrTooLarge) {
		t.Errorf("NewHyper(2^53, 2^51, 2^51) error = %v, want ErrTooLarge", err)
	}
	if _, err := NewNoncentralHyper(n53, n52, n52, 3); !errors.Is(err, ErrTooLarge) {
		t.Errorf("NewNoncentralHyper(2^53, 2^52, 2^52, 3) error = %v, want ErrTooLarge", err)
	}
	wide := Hyper{Total: n53, Successes: n51, Draws: n51}
	if v := wide.CDF(n51 / 4); !math.IsNaN(v) {
		t.Errorf("hand-built wide Hyper CDF = %g, want NaN", v)
	}
	if v := wide.Entropy(); !math.IsNaN(v) {
		t.Errorf("hand-built wide Hyper Entropy = %g, want NaN", v)
	}
	if q := wide.Quantile(0.5); q != -1 {
		t.Errorf("hand-built wide Hyper Quantile = %d, want -1", q)
	}
	if lo, hi := wide.Support(); lo != 0 || hi != n51 {
		t.Errorf("hand-built wide Hyper Support = %d, %d, want 0, 2^51", lo, hi)
	}
	if v := (NoncentralHyper{Total: n53, Successes: n52, Draws: n52, OddsRatio: 3}).Mean(); !math.IsNaN(v) {
		t.Errorf("hand-built wide NoncentralHyper Mean = %g, want NaN", v)
	}
	// Balanced margins: a variance of about N/16 puts the bound near N = 2^34.
	h, err := NewHyper(1<<34-1000, 1<<33, 1<<33)
	if err != nil {
		t.Fatalf("NewHyper just inside the bound: %v", err)
	}
	sd := h.StdDev()
	if c := h.CDF(h.Mode()); math.Abs(c-0.5) > 1/sd {
		t.Errorf("CDF at the mode = %g, want 0.5 within 1/sd", c)
	}
	// Entropy of a nearly normal law: 0.5 ln(2 pi e sigma^2) + O(1/sigma^2).
	if e, want := h.Entropy(), 0.5*math.Log(2*math.Pi*math.E*sd*sd); math.Abs(e-want) > 1e-6 {
		t.Errorf("Entropy = %.15g, want %.15g (normal limit)", e, want)
	}
}

// TestHyperEntropyStrided compares the strided sum of Entropy (sd >= 64)
// with the full sum over every term, on 40 seeded populations with
// standard deviations from 64 to about 3000 (the golden file holds the
// mpmath values at a few points; this covers the range between).
func TestHyperEntropyStrided(t *testing.T) {
	t.Parallel()
	r := rand.New(rand.NewPCG(7, 11))
	checked := 0
	for checked < 40 {
		N := int64(1000 + r.IntN(50_000_000))
		K := 1 + r.Int64N(N-1)
		n := 1 + r.Int64N(N-1)
		h := Hyper{N, K, n}
		sd := h.StdDev()
		if !(sd >= entropyStrideMinSD && sd < 3000) {
			continue
		}
		checked++
		var s, sl float64
		w := h.centralWeights()
		lo, hi := h.Support()
		w.logRangeAtMode(lo, hi, func(j int64, t float64) {
			if j != w.mode && t > 0 {
				s += t
				sl += t * math.Log(t)
			}
		})
		full := math.Log1p(s) - sl/(1+s)
		if got := h.Entropy(); math.Abs(got-full) > 2e-14*full {
			t.Errorf("%v (sd %.1f): strided entropy %.17g, full sum %.17g", h, sd, got, full)
		}
	}
}

package interval

import (
	"context"
	"errors"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/golden"
)

func goldenMixture(t *testing.T, r golden.Row) Mixture {
	t.Helper()
	switch r.Str(1) {
	case "centred":
		return Mixture{Centered: true, Concentration: r.Float(2)}
	case "fixed":
		return Mixture{A: r.Float(3), B: r.Float(4)}
	}
	t.Fatalf("%s: unknown kind %q", r.Pos(), r.Str(1))
	return Mixture{}
}

// Source: testdata/sequential_golden.tsv from testdata/gen/sequential_golden.py:
// limits by mpmath 1.2.1 bisection at 40 digits, and the time-uniform error
// by a recursion over the full range of k with SciPy 1.10.1's betaln.
func TestSequenceGolden(t *testing.T) {
	t.Parallel()
	var nl, ne int
	for _, r := range golden.Read(t, "../testdata/sequential_golden.tsv") {
		switch r.Str(0) {
		case "cs":
			mx := goldenMixture(t, r)
			iv := SequenceInterval(r.Int(6), r.Int(7), r.Float(5), mx)
			want := []float64{r.Float(8), r.Float(9)}
			// 1e-11: the documented accuracy (log-gamma terms of size n ln n)
			if diff := cmp.Diff(want, []float64{iv.Lower, iv.Upper}, cmpopts.EquateApprox(1e-11, 0)); diff != "" {
				t.Errorf("%s: limits (-want +got)\n%s", r.Pos(), diff)
			}
			nl++
		case "cserr":
			mx := goldenMixture(t, r)
			opt := SequenceOptions{Concentration: mx.Concentration, PriorA: mx.A, PriorB: mx.B}
			got, err := SequenceErrorProb(context.Background(), r.Float(6), r.Int(7), r.Float(5), opt)
			if err != nil {
				t.Fatalf("%s: %v", r.Pos(), err)
			}
			if diff := cmp.Diff(r.Float(8), got, cmpopts.EquateApprox(1e-10, 0)); diff != "" {
				t.Errorf("%s: error probability (-want +got)\n%s", r.Pos(), diff)
			}
			ne++
		}
	}
	if nl < 8 || ne < 5 {
		t.Fatalf("only %d limit and %d error rows", nl, ne)
	}
}

// The time-uniform guarantee (Ville's inequality): the exact probability of
// ever excluding p, up to the horizon, is at most 1 - level, for several
// priors, levels and proportions.
func TestSequenceErrorBound(t *testing.T) {
	t.Parallel()
	horizon := int64(1000)
	if !testing.Short() {
		horizon = 10000
	}
	opts := []SequenceOptions{{}, {PlannedN: 100}, {PlannedN: 100000}, {PriorA: 1, PriorB: 1}, {PriorA: 0.5, PriorB: 0.5}, {Concentration: 2}}
	for _, opt := range opts {
		for _, level := range []float64{0.9, 0.95, 0.99} {
			for _, p := range []float64{0.001, 0.02, 0.2, 0.5, 0.93} {
				e, err := SequenceErrorProb(context.Background(), p, horizon, level, opt)
				if err != nil {
					t.Fatal(err)
				}
				if !(e >= 0 && e <= 1-level) {
					t.Errorf("%+v level %g p %g: error %g exceeds %g", opt, level, p, e, 1-level)
				}
			}
		}
	}
}

// The limits and the error recursion describe the same set: the recursion
// run with membership read off the computed limits gives the same error as
// the one comparing ln M_n with the threshold (a check that the limits are
// the outermost crossings, i.e. that the set is an interval).
func TestSequenceLimitsMatchSet(t *testing.T) {
	t.Parallel()
	for _, opt := range []SequenceOptions{{}, {Concentration: 0.3}, {Concentration: 3000}, {PriorA: 2, PriorB: 0.7}} {
		for _, p := range []float64{0.003, 0.1, 0.5, 0.77} {
			mx, err := SequenceMixture(0.95, opt)
			if err != nil {
				t.Fatal(err)
			}
			byLimits, err := sequenceErrorProb(context.Background(), "t", p, 400, func(k, n int64) bool {
				return SequenceInterval(k, n, 0.95, mx).Contains(p)
			})
			if err != nil {
				t.Fatal(err)
			}
			bySet, err := SequenceErrorProb(context.Background(), p, 400, 0.95, opt)
			if err != nil {
				t.Fatal(err)
			}
			if diff := cmp.Diff(bySet, byLimits, cmpopts.EquateApprox(1e-12, 0)); diff != "" {
				t.Errorf("%+v p %g (-set +limits)\n%s", opt, p, diff)
			}
		}
	}
}

// Each limit inverts the martingale: ln M_n(limit) equals ln(1/(1-level)).
func TestSequenceLimitsInvert(t *testing.T) {
	t.Parallel()
	for _, mx := range []Mixture{{Centered: true, Concentration: 122}, {Centered: true, Concentration: 0.05}, {A: 1, B: 1}, {A: 3, B: 40}} {
		for _, kn := range [][2]int64{{1, 1}, {0, 7}, {3, 10}, {50, 100}, {999, 1000}, {17, 1000000}, {400000, 1000000}} {
			k, n := kn[0], kn[1]
			iv := SequenceInterval(k, n, 0.95, mx)
			tt := -math.Log(0.05)
			for _, x := range []float64{iv.Lower, iv.Upper} {
				if x <= 0 || x >= 1 {
					continue
				}
				got := mx.logM(float64(k), float64(n), x)
				if math.Abs(got-tt) > 1e-8*math.Max(1, tt) {
					t.Errorf("%+v k %d n %d: ln M at limit %g = %g, want %g", mx, k, n, x, got, tt)
				}
			}
			if !(iv.Lower <= iv.Estimate && iv.Estimate <= iv.Upper) {
				t.Errorf("%+v k %d n %d: %v does not surround the estimate", mx, k, n, iv)
			}
		}
	}
}

// The centred prior's ln M_n is unimodal in p (checked here on a fine logit
// grid: no interior peak; the fixed prior's is convex by construction), so
// the limits found by walking out from k/n, which is always inside, are the
// ends of the set.
func TestSequenceCentredUnimodal(t *testing.T) {
	t.Parallel()
	for _, r := range []float64{0.01, 0.3, 5, 122, 1e4, 1e6} {
		for _, n := range []int64{3, 20, 500, 20000} {
			for _, k := range []int64{0, 1, n / 3, n - 1, n} {
				mx := Mixture{Centered: true, Concentration: r}
				var vs []float64
				for x := -27.0; x <= 27; x += 0.05 {
					vs = append(vs, mx.logM(float64(k), float64(n), 1/(1+math.Exp(-x))))
				}
				// once ln M has risen clearly it must not fall clearly again
				// (changes within 1e-8 of the scale are rounding)
				lo := vs[0]
				rising := false
				for i := 1; i < len(vs); i++ {
					tol := 1e-8 * math.Max(1, math.Abs(vs[i]))
					if vs[i] > lo+tol {
						rising = true
					}
					if rising && vs[i] < vs[i-1]-tol {
						t.Errorf("r %g k %d n %d: ln M has a peak near logit %g", r, k, n, -27+0.05*float64(i))
						break
					}
					lo = math.Min(lo, vs[i])
					if !rising {
						lo = vs[i]
					}
				}
			}
		}
	}
}

func TestSequenceErrors(t *testing.T) {
	t.Parallel()
	cases := []struct {
		name string
		err  error
		f    func() error
	}{
		{"k>n", ErrInvalidArgument, func() error { _, e := ConfidenceSequence(5, 4, 0.95, SequenceOptions{}); return e }},
		{"level", ErrInvalidArgument, func() error { _, e := ConfidenceSequence(1, 4, 1, SequenceOptions{}); return e }},
		{"prior", ErrInvalidArgument, func() error { _, e := ConfidenceSequence(1, 4, 0.9, SequenceOptions{PriorA: 1}); return e }},
		{"both", ErrInvalidArgument, func() error {
			_, e := ConfidenceSequence(1, 4, 0.9, SequenceOptions{PriorA: 1, PriorB: 1, Concentration: 3})
			return e
		}},
		{"conc", ErrInvalidArgument, func() error {
			_, e := ConfidenceSequence(1, 4, 0.9, SequenceOptions{Concentration: math.NaN()})
			return e
		}},
		{"plannedP", ErrInvalidArgument, func() error { _, e := ConfidenceSequence(1, 4, 0.9, SequenceOptions{PlannedP: 1}); return e }},
		{"horizon", ErrTooLarge, func() error {
			_, e := SequenceErrorProb(context.Background(), 0.5, MaxSequenceHorizon+1, 0.95, SequenceOptions{})
			return e
		}},
		{"p", ErrInvalidArgument, func() error {
			_, e := SequenceErrorProb(context.Background(), 0, 10, 0.95, SequenceOptions{})
			return e
		}},
		{"cancel", context.Canceled, func() error {
			ctx, c := context.WithCancel(context.Background())
			c()
			_, e := SequenceErrorProb(ctx, 0.5, 10000, 0.95, SequenceOptions{})
			return e
		}},
		{"martingale", ErrInvalidArgument, func() error { _, e := SequenceLogMartingale(1, 2, 0.5, Mixture{}); return e }},
	}
	for _, c := range cases {
		if err := c.f(); !errors.Is(err, c.err) {
			t.Errorf("%s: err = %v, want %v", c.name, err, c.err)
		}
	}
}

func FuzzConfidenceSequence(f *testing.F) {
	f.Add(int64(3), int64(10), 0.95, 0.0, 0.0, 0.0)
	f.Add(int64(0), int64(0), 0.5, 7.0, 0.0, 0.0)
	f.Add(int64(1000000), int64(1000000), 0.999, 0.0, 1.0, 1.0)
	f.Fuzz(func(t *testing.T, k, n int64, level, conc, a, b float64) {
		iv, err := ConfidenceSequence(k, n, level, SequenceOptions{Concentration: conc, PriorA: a, PriorB: b})
		if err != nil {
			var e *Error
			if !errors.As(err, &e) {
				t.Fatalf("untyped error %v", err)
			}
			return
		}
		if math.IsNaN(iv.Lower) || math.IsNaN(iv.Upper) || iv.Lower < 0 || iv.Upper > 1 || iv.Lower > iv.Upper {
			t.Fatalf("k %d n %d: bad limits %v", k, n, iv)
		}
		if n > 0 && !(iv.Lower <= iv.Estimate && iv.Estimate <= iv.Upper) {
			t.Fatalf("k %d n %d: %v does not surround the estimate", k, n, iv)
		}
	})
}

func BenchmarkConfidenceSequence(b *testing.B) {
	mx, _ := SequenceMixture(0.95, SequenceOptions{})
	b.Run("look", func(b *testing.B) {
		for b.Loop() {
			SequenceInterval(123, 1000, 0.95, mx)
		}
	})
	b.Run("look1e9", func(b *testing.B) {
		for b.Loop() {
			SequenceInterval(1234567, 1000000000, 0.95, mx)
		}
	})
	b.Run("error10000", func(b *testing.B) {
		for b.Loop() {
			if _, err := SequenceErrorProb(context.Background(), 0.5, 10000, 0.95, SequenceOptions{}); err != nil {
				b.Fatal(err)
			}
		}
	})
}

// BenchmarkTunedConcentration times an uncached tuning at the cases that
// were slowest (n = 1 and m within 1e-15 of 0), and at n = 1000, m = 0.3.
func BenchmarkTunedConcentration(b *testing.B) {
	for _, c := range []struct {
		name string
		n, m float64
	}{{"n=1", 1, 0.5}, {"n=10,m=1e-15", 10, 1e-15}, {"n=1000", 1000, 0.3}} {
		b.Run(c.name, func(b *testing.B) {
			for b.Loop() {
				tuneMu.Lock()
				clear(tuneCache)
				tuneMu.Unlock()
				tunedConcentration(0.95, c.n, c.m)
			}
		})
	}
}

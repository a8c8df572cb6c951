package binom

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"github.com/kofnlab/kofn/internal/golden"
)

func TestNewNoncentralHyperRejects(t *testing.T) {
	t.Parallel()
	tests := []struct {
		N, K, n int64
		psi     float64
		want    string
	}{
		{10, 11, 3, 1, "binom.NewNoncentralHyper: successes = 11 exceeds total = 10"},
		{10, 3, 3, math.NaN(), "binom.NewNoncentralHyper: oddsRatio = NaN is not an odds ratio in [0, +Inf]"},
		{10, 3, 3, -0.5, "binom.NewNoncentralHyper: oddsRatio = -0.5 is not an odds ratio in [0, +Inf]"},
	}
	for _, tc := range tests {
		_, err := NewNoncentralHyper(tc.N, tc.K, tc.n, tc.psi)
		if err == nil || err.Error() != tc.want || !errors.Is(err, ErrInvalidArgument) {
			t.Errorf("NewNoncentralHyper(%d, %d, %d, %v) error = %v, want %q", tc.N, tc.K, tc.n, tc.psi, err, tc.want)
		}
	}
	for _, psi := range []float64{0, 1, math.Inf(1)} {
		if _, err := NewNoncentralHyper(10, 3, 3, psi); err != nil {
			t.Errorf("psi = %v rejected: %v", psi, err)
		}
	}
}

// TestNoncentralGolden checks against testdata/binom_extra_noncentral.tsv
// (mpmath 1.2.1, 50-digit sums over the whole support; generator
// testdata/gen/hyper_golden.py).
func TestNoncentralGolden(t *testing.T) {
	t.Parallel()
	const tol = 2e-14
	rows := 0
	for _, fs := range golden.Read(t, "../testdata/binom_extra_noncentral.tsv") {
		num := fs.Floats(1)
		d, err := NewNoncentralHyper(int64(num[0]), int64(num[1]), int64(num[2]), num[3])
		if err != nil {
			t.Fatal(err)
		}
		rows++
		switch fs.Fields[0] {
		case "mom":
			if got := d.Mean(); math.Abs(got-num[4]) > 1e-14*num[4] {
				t.Errorf("%v.Mean() = %.17g, want %.17g", d, got, num[4])
			}
			if got := d.Variance(); math.Abs(got-num[5]) > 1e-13*num[5] {
				t.Errorf("%v.Variance() = %.17g, want %.17g", d, got, num[5])
			}
		case "pmf":
			x := int64(num[4])
			checks := []struct {
				name      string
				want, got float64
				lin       float64
			}{
				{"LogProb", num[5], d.LogProb(x), d.Prob(x)},
				{"LogCDF", num[6], d.LogCDF(x), d.CDF(x)},
				{"LogSurvival", num[7], d.LogSurvival(x), d.Survival(x)},
			}
			for _, c := range checks {
				if !logClose(c.want, c.got, tol) || !probClose(c.want, c.lin, tol) {
					t.Errorf("%v.%s(%d) = %.17g (lin %.17g), want %.17g", d, c.name, x, c.got, c.lin, c.want)
				}
			}
		}
	}
	if rows < 400 {
		t.Errorf("only %d golden rows", rows)
	}
}

// TestNoncentralLimits checks the documented limits psi = 0 and +Inf, and
// that psi = 1 is the central distribution.
func TestNoncentralLimits(t *testing.T) {
	t.Parallel()
	d := NoncentralHyper{30, 19, 15, 0}
	if d.Prob(4) != 1 || d.Mean() != 4 || d.Variance() != 0 || d.Survival(4) != 0 {
		t.Errorf("psi = 0: Prob(4) %g Mean %g Var %g", d.Prob(4), d.Mean(), d.Variance())
	}
	d.OddsRatio = math.Inf(1)
	if d.Prob(15) != 1 || d.Mean() != 15 || d.CDF(14) != 0 {
		t.Errorf("psi = Inf: Prob(15) %g Mean %g", d.Prob(15), d.Mean())
	}
	d.OddsRatio = 1
	h := Hyper{30, 19, 15}
	if d.LogProb(9) != h.LogProb(9) || d.Mean() != h.Mean() {
		t.Errorf("psi = 1 differs from Hyper")
	}
	// Mean increases with psi (monotonicity the conditional MLE relies on).
	prev := math.Inf(-1)
	for _, psi := range []float64{5e-324, 1e-310, 1e-300, 1e-10, 0.01, 0.5, 0.99, 1, 1.01, 3, 1e5, 1e300, math.MaxFloat64} {
		d.OddsRatio = psi
		m := d.Mean()
		for _, v := range []float64{d.LogProb(10), d.LogCDF(10), d.LogSurvival(10), d.Variance()} {
			if math.IsNaN(v) {
				t.Errorf("psi = %g: NaN", psi)
			}
		}
		if !(m >= prev) || m < 4 || m > 15 { // increasing; ties where m rounds to an end
			t.Errorf("Mean(psi = %g) = %g after %g", psi, m, prev)
		}
		prev = m
	}
}

// TestLogOddsResidual compares the double-double residual with the
// big.Float one over random odds ratios and probabilities (internal
// consistency; both are exact to far below the residual's size).
func TestLogOddsResidual(t *testing.T) {
	t.Parallel()
	r := rand.New(rand.NewPCG(3, 4))
	for range 20000 {
		psi := math.Exp(r.NormFloat64() * 30)
		p1 := math.Exp(-r.ExpFloat64() * 20)
		if r.IntN(2) == 0 {
			p1 = 1 - p1/2
		}
		p2 := p1 / (p1 + psi*(1-p1))
		if !(p2 > 0 && p2 < 1 && p1 < 1) {
			continue
		}
		got, want := logOddsResidual(psi, p1, p2), logOddsResidualBig(psi, p1, p2)
		if math.Abs(got-want) > 1e-30+1e-12*math.Abs(want) {
			t.Fatalf("psi %g p1 %g p2 %g: residual %g, big.Float %g", psi, p1, p2, got, want)
		}
	}
}

package test_test

import (
	"errors"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/golden"
	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

// TestCompareWorked checks closed forms derivable by hand.
// 1000/1000 against 999/1000 under uniform priors: posteriors Beta(1001, 1)
// and Beta(1000, 2), P(p1 > p2) = 1 - E[p2^1001] = 1 - 1000*1001/(2001*2002)
// = 0.750124937531234 (REFERENCES.md, derivable by hand). 0/0 against 0/0:
// equal posteriors give 1/2 each and equal losses. 1/1 against 0/1 under
// uniform priors: Beta(2, 1) against Beta(1, 2), P(p1 > p2) = 5/6
// (integral of 2x * (1 - (1-x)^2)... = 1 - integral 2(1-x) x^2 dx = 5/6).
func TestCompareWorked(t *testing.T) {
	t.Parallel()
	u := test.CompareOptions{Prior1: interval.UniformPrior(), Prior2: interval.UniformPrior()}
	for _, c := range []struct {
		k1, n1, k2, n2 int64
		opt            test.CompareOptions
		p12            float64
	}{
		{1000, 1000, 999, 1000, u, 0.750124937531234},
		{0, 0, 0, 0, u, 0.5},
		{1, 1, 0, 1, u, 5.0 / 6},
		{5, 10, 5, 10, test.CompareOptions{}, 0.5},
	} {
		r, err := test.Compare(c.k1, c.n1, c.k2, c.n2, c.opt)
		if err != nil {
			t.Fatal(err)
		}
		want := []float64{c.p12, 1 - c.p12}
		got := []float64{r.ProbFirstBetter, r.ProbSecondBetter}
		if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-13, 0)); diff != "" {
			t.Errorf("%d/%d vs %d/%d %s (-want +got):\n%s", c.k1, c.n1, c.k2, c.n2, r.Method, diff)
		}
		if d := r.LossFirst - r.LossSecond - (r.B1/(r.A1+r.B1) - r.B2/(r.A2+r.B2)); math.Abs(d) > 1e-13 {
			t.Errorf("%d/%d vs %d/%d: loss difference off by %v", c.k1, c.n1, c.k2, c.n2, d)
		}
	}
}

// TestCompareIdentities: P(p1 > p2) + P(p2 > p1) = 1 with both summed
// directly (uniform priors), swapping the arms swaps the answers, and the
// quadrature (non-integer shapes) agrees with the closed form when the
// same posterior is reached with integer shapes.
func TestCompareIdentities(t *testing.T) {
	t.Parallel()
	u := test.CompareOptions{Prior1: interval.UniformPrior(), Prior2: interval.UniformPrior()}
	for _, c := range [][4]int64{{3, 10, 7, 12}, {50, 100, 40, 100}, {0, 1000, 5, 1000}, {9000, 10000, 8900, 10000}, {3, 1e6, 30, 1e6}, {4999000, 1e7, 5001000, 1e7}} {
		r, err := test.Compare(c[0], c[1], c[2], c[3], u)
		if err != nil {
			t.Fatal(err)
		}
		if s := r.ProbFirstBetter + r.ProbSecondBetter; math.Abs(s-1) > 1e-13 {
			t.Errorf("%v: P12 + P21 = %v", c, s)
		}
		s, _ := test.Compare(c[2], c[3], c[0], c[1], u)
		if diff := cmp.Diff([]float64{r.LogProbFirstBetter, r.LossFirst}, []float64{s.LogProbSecondBetter, s.LossSecond}, cmpopts.EquateApprox(1e-12, 0)); diff != "" {
			t.Errorf("%v: swap (-want +got):\n%s", c, diff)
		}
		// The same posteriors reached through informative priors with
		// non-integer shapes: Beta(0.5, 0.5) + (k + 0.5, n - k + 0.5 trials)
		// is not representable by counts, so shift the prior instead.
		q := test.CompareOptions{Prior1: interval.BetaPrior(1.25, 0.75), Prior2: interval.BetaPrior(0.75, 1.25)}
		qr, err := test.Compare(c[0], c[1], c[2], c[3], q)
		if c[1]+c[3] > test.MaxQuadratureShapes {
			if !errors.Is(err, test.ErrTooLarge) {
				t.Errorf("%v: quadrature beyond the limit gave %v", c, err)
			}
			continue
		}
		if err != nil {
			t.Fatal(err)
		}
		if s := qr.ProbFirstBetter + qr.ProbSecondBetter; qr.Method != "trapezoidal rule in the log-odds" || !(math.Abs(s-1) <= 2*qr.ErrorBound+0x1p-52) || !(qr.ErrorBound < 1e-12) {
			t.Errorf("%v: %s sums to 1 + %.3g, bound %.3g", c, qr.Method, s-1, qr.ErrorBound)
		}
	}
}

func BenchmarkCompare1e4(b *testing.B) {
	u := test.CompareOptions{Prior1: interval.UniformPrior(), Prior2: interval.UniformPrior()}
	for b.Loop() {
		test.Compare(4900, 10000, 5100, 10000, u)
	}
}

func BenchmarkCompare1e7(b *testing.B) {
	u := test.CompareOptions{Prior1: interval.UniformPrior(), Prior2: interval.UniformPrior()}
	for b.Loop() {
		test.Compare(4999000, 1e7, 5001000, 1e7, u)
	}
}

func BenchmarkCompareQuadrature1e4(b *testing.B) {
	for b.Loop() {
		test.Compare(4900, 10000, 5100, 10000, test.CompareOptions{})
	}
}

// BenchmarkCompareTrapezoidSmall: Jeffreys posteriors after 3 of 20 and 0
// of 20 (shapes 3.5, 17.5 and 0.5, 20.5).
func BenchmarkCompareTrapezoidSmall(b *testing.B) {
	if r, err := test.Compare(3, 20, 0, 20, test.CompareOptions{}); err != nil || r.Method == "closed-form sum" {
		b.Fatal(r.Method, err)
	}
	for b.Loop() {
		test.Compare(3, 20, 0, 20, test.CompareOptions{})
	}
}

// BenchmarkCompareTrapezoidRare: Jeffreys posteriors after 50 and 70 of
// 49,999 each (rare events at the size limit).
func BenchmarkCompareTrapezoidRare(b *testing.B) {
	if r, err := test.Compare(50, 49999, 70, 49999, test.CompareOptions{}); err != nil || r.Method == "closed-form sum" {
		b.Fatal(r.Method, err)
	}
	for b.Loop() {
		test.Compare(50, 49999, 70, 49999, test.CompareOptions{})
	}
}

// BenchmarkCompareTrapezoidLimit: Beta(0.1, 0.1) priors, 0 of 75,000
// against no trials (posterior shapes 0.1, 75000.1 and 0.1, 0.1): a window
// of about 12,150 steps, near MaxTrapezoidSteps.
func BenchmarkCompareTrapezoidLimit(b *testing.B) {
	p := interval.BetaPrior(0.1, 0.1)
	o := test.CompareOptions{Prior1: p, Prior2: p}
	if r, err := test.Compare(0, 75000, 0, 0, o); err != nil || r.Method == "closed-form sum" {
		b.Fatal(r.Method, err)
	}
	for b.Loop() {
		test.Compare(0, 75000, 0, 0, o)
	}
}

// BenchmarkCompareTrapezoidWide: Jeffreys posteriors after 0 of 49,999 each
// (shapes 0.5 and 49999.5, broad in the log-odds: a long walk).
func BenchmarkCompareTrapezoidWide(b *testing.B) {
	if r, err := test.Compare(0, 49999, 0, 49999, test.CompareOptions{}); err != nil || r.Method == "closed-form sum" {
		b.Fatal(r.Method, err)
	}
	for b.Loop() {
		test.Compare(0, 49999, 0, 49999, test.CompareOptions{})
	}
}

// TestCompareLossesDirect checks the closed form of the expected loss
// against its definition through shifted posteriors: E[max(p2 - p1, 0)] =
// m2 P(p2' > p1) - m1 P(p2 > p1') with p2' ~ Beta(a2+1, b2), p1' ~
// Beta(a1+1, b1), each probability computed by Compare itself with the
// prior shifted by one success.
func TestCompareLossesDirect(t *testing.T) {
	t.Parallel()
	u := interval.UniformPrior()
	for _, c := range [][4]int64{{3, 10, 7, 12}, {50, 100, 40, 100}, {0, 1000, 5, 1000}, {9000, 10000, 8900, 10000}} {
		r, err := test.Compare(c[0], c[1], c[2], c[3], test.CompareOptions{Prior1: u, Prior2: u})
		if err != nil {
			t.Fatal(err)
		}
		m1, m2 := r.A1/(r.A1+r.B1), r.A2/(r.A2+r.B2)
		s2, _ := test.Compare(c[0], c[1], c[2], c[3], test.CompareOptions{Prior1: u, Prior2: interval.BetaPrior(2, 1)})
		s1, _ := test.Compare(c[0], c[1], c[2], c[3], test.CompareOptions{Prior1: interval.BetaPrior(2, 1), Prior2: u})
		want := m2*s2.ProbSecondBetter - m1*s1.ProbSecondBetter
		if diff := cmp.Diff(want, r.LossFirst, cmpopts.EquateApprox(1e-9, 0)); diff != "" {
			t.Errorf("%v: LossFirst (-want +got):\n%s", c, diff)
		}
	}
}

// TestCompareGolden compares Compare (closed-form sums for integer shapes,
// the trapezoidal rule otherwise) with testdata/test_bayes.tsv: mpmath 1.2.1
// at 40 digits, each probability and loss integrated directly by tanh-sinh
// quadrature (testdata/gen/test_bayes.py). Log probabilities to 1e-12
// relative to max(1, |ln P|), each probability within ErrorBound (which
// for the trapezoidal rule is a certified bound; TestTrapezoidGolden checks
// it over a wider range), losses to 1e-10.
func TestCompareGolden(t *testing.T) {
	t.Parallel()
	for _, r := range golden.Read(t, "../testdata/test_bayes.tsv") {
		a1, b1, a2, b2 := r.Float(0), r.Float(1), r.Float(2), r.Float(3)
		// Posterior shapes as informative priors on empty arms.
		c, err := test.Compare(0, 0, 0, 0, test.CompareOptions{Prior1: interval.BetaPrior(a1, b1), Prior2: interval.BetaPrior(a2, b2)})
		if err != nil {
			t.Fatalf("%s: %v", r.Pos(), err)
		}
		tol := 1e-12
		slack := 1e-15 // the closed-form sums' bound covers the sums, not the last rounding
		if c.Method != "closed-form sum" {
			slack = 0
		}
		for i, pair := range [][2]float64{{r.Float(4), c.LogProbFirstBetter}, {r.Float(5), c.LogProbSecondBetter}} {
			if e := math.Abs(pair[1]-pair[0]) / math.Max(1, math.Abs(pair[0])); !(e <= tol) {
				t.Errorf("%s: %s probability %d: got %v, want %v (error %.2g)", r.Pos(), c.Method, i, pair[1], pair[0], e)
			}
			if d := math.Abs(math.Exp(pair[1]) - math.Exp(pair[0])); !(d <= c.ErrorBound+slack) {
				t.Errorf("%s: error %.3g exceeds the bound %.3g", r.Pos(), d, c.ErrorBound)
			}
		}
		if diff := cmp.Diff([]float64{r.Float(6), r.Float(7)}, []float64{c.LossFirst, c.LossSecond}, cmpopts.EquateApprox(1e-10, 0)); diff != "" {
			t.Errorf("%s: losses (-want +got):\n%s", r.Pos(), diff)
		}
	}
}

// TestCredibleTwoArmAtZero checks interval's quadrature for p1 - p2 and
// p1 / p2 against Compare's exact sums: P(p1 - p2 <= 0) = P(p1/p2 <= 1) =
// P(p2 > p1), so the one-sided lower bound at level 1 - P(p2 > p1) must be
// 0 for the difference and 1 for the ratio.
func TestCredibleTwoArmAtZero(t *testing.T) {
	t.Parallel()
	u := interval.UniformPrior()
	for _, c := range [][4]int64{{25, 90, 12, 80}, {60, 100, 50, 100}, {7, 12, 3, 10}} {
		r, err := test.Compare(c[0], c[1], c[2], c[3], test.CompareOptions{Prior1: u, Prior2: u})
		if err != nil {
			t.Fatal(err)
		}
		o := interval.CredibleOptions{Prior: u, Side: interval.LowerBound, Level: 1 - r.ProbSecondBetter}
		d, err := interval.CredibleDifference(c[0], c[1], c[2], c[3], o)
		if err != nil {
			t.Fatal(err)
		}
		q, err := interval.CredibleRatio(c[0], c[1], c[2], c[3], o)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(d.Lower) > 1e-10 || math.Abs(q.Lower-1) > 1e-10 {
			t.Errorf("%v: lower bounds %v (want 0) and %v (want 1)", c, d.Lower, q.Lower)
		}
	}
}

package test_test

import (
	"context"
	"errors"
	"math"
	"testing"

	"github.com/kofnlab/kofn/internal/golden"
	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

// boundRow is one row of testdata/test_bayes_bound.tsv: the posterior
// shapes of k arms and ln P(arm j best) for each.
type boundRow struct {
	pos       string
	a, b, lnP []float64
}

func readBoundRows(t *testing.T) []boundRow {
	var out []boundRow
	for _, r := range golden.Read(t, "../testdata/test_bayes_bound.tsv") {
		k := int(r.Int(0))
		if r.Len() != 1+3*k {
			t.Fatalf("%s: %d fields for %d arms", r.Pos(), r.Len(), k)
		}
		row := boundRow{pos: r.Pos()}
		for j := 0; j < k; j++ {
			row.a = append(row.a, r.Float(1+2*j))
			row.b = append(row.b, r.Float(2+2*j))
			row.lnP = append(row.lnP, r.Float(1+2*k+j))
		}
		out = append(out, row)
	}
	return out
}

// checkBound checks computed probabilities against the golden logarithms:
// each within ErrorBound absolutely and within eps = ErrorBound / max(p)
// of itself, its logarithm within about eps; it returns the largest ratio
// of actual error to ErrorBound and eps.
func checkBound(t *testing.T, what string, p, lnP, want []float64, bound float64) (ratio, eps float64) {
	t.Helper()
	pmax := 0.0
	for _, v := range p {
		pmax = math.Max(pmax, v)
	}
	eps = bound / pmax
	for j := range p {
		g := math.Exp(want[j])
		d := math.Abs(p[j] - g)
		ratio = math.Max(ratio, d/bound)
		if !(d <= bound) || !(d <= eps*p[j]) {
			t.Errorf("%s arm %d: P = %v, golden %v: error %.3g beyond the bound %.3g (relative %.3g, eps %.3g)", what, j+1, p[j], g, d, bound, d/g, eps)
		}
		// ln P within eps (plus the rounding of a logarithm near |ln P|);
		// ProbBest gives no logarithm, and its values below the doubles are 0.
		if math.IsInf(lnP[j], -1) && want[j] < -740 {
			continue
		}
		if e := math.Abs(lnP[j] - want[j]); !(e <= 1.01*eps+4e-16*math.Abs(want[j])) {
			t.Errorf("%s arm %d: ln P = %v, golden %v: error %.3g beyond eps %.3g", what, j+1, lnP[j], want[j], e, eps)
		}
	}
	return ratio, eps
}

// TestTrapezoidGolden checks Compare and ProbBest, both by the trapezoidal
// rule here (no integer shape), against testdata/test_bayes_bound.tsv:
// mpmath 1.2.1 at 40 digits, tanh-sinh quadrature of each probability with
// the incomplete beta from its hypergeometric series (testdata/gen/
// test_bayes.py bound), for invented posteriors with shapes from 0.1 to
// totals of 1e5 and probabilities down to e^-1522 (Compare refuses a total
// beyond MaxQuadratureShapes, which ProbBest accepts). Every value must lie
// within ErrorBound of the reference, and within the relative bound eps =
// ErrorBound / max P of itself; eps must stay below 1e-12 where every
// |ln P| is below 50 and below 3e-14 |ln P| beyond (the incomplete beta
// functions are accurate to about 1e-14 of their logarithms). Also the
// identities: P(p1 > p2) + P(p2 > p1) = 1 and the k probabilities sum to 1
// within their bounds, exchanging the arms exchanges the answers, and the
// mirror p -> 1 - p (Beta(a, b) -> Beta(b, a), arms exchanged) keeps them.
func TestTrapezoidGolden(t *testing.T) {
	t.Parallel()
	worst, worstEps, sumEps, count := 0.0, 0.0, 0.0, 0
	for _, r := range readBoundRows(t) {
		k := len(r.a)
		priors := make([]interval.Prior, k)
		for j := range priors {
			priors[j] = interval.BetaPrior(r.a[j], r.b[j])
		}
		maxLn := 0.0
		for _, v := range r.lnP {
			maxLn = math.Max(maxLn, math.Abs(v))
		}
		epsLimit := math.Max(1e-12, 3e-14*maxLn)
		note := func(what string, ratio, eps float64) {
			t.Logf("%s %s: error/ErrorBound %.3g, relative bound %.3g", r.pos, what, ratio, eps)
			worst = math.Max(worst, ratio)
			worstEps = math.Max(worstEps, eps)
			sumEps += eps
			count++
			if !(eps <= epsLimit) {
				t.Errorf("%s: %s relative bound %.3g above %.3g", r.pos, what, eps, epsLimit)
			}
		}
		total := 0.0
		for j := range r.a {
			total += r.a[j] + r.b[j]
		}
		if k == 2 && total > test.MaxQuadratureShapes {
			if _, err := test.Compare(0, 0, 0, 0, test.CompareOptions{Prior1: priors[0], Prior2: priors[1]}); !errors.Is(err, test.ErrTooLarge) {
				t.Errorf("%s: total shapes %v beyond MaxQuadratureShapes gave %v", r.pos, total, err)
			}
		} else if k == 2 {
			c, err := test.Compare(0, 0, 0, 0, test.CompareOptions{Prior1: priors[0], Prior2: priors[1]})
			if err != nil {
				t.Fatalf("%s: %v", r.pos, err)
			}
			if c.Method != "trapezoidal rule in the log-odds" {
				t.Errorf("%s: method %q", r.pos, c.Method)
			}
			p := []float64{c.ProbFirstBetter, c.ProbSecondBetter}
			ratio, eps := checkBound(t, r.pos+" Compare", p, []float64{c.LogProbFirstBetter, c.LogProbSecondBetter}, r.lnP, c.ErrorBound)
			note("Compare", ratio, eps)
			if s := p[0] + p[1]; !(math.Abs(s-1) <= 2*c.ErrorBound+0x1p-52) {
				t.Errorf("%s: P12 + P21 = 1 + %.3g, bound %.3g", r.pos, s-1, c.ErrorBound)
			}
			s, err := test.Compare(0, 0, 0, 0, test.CompareOptions{Prior1: priors[1], Prior2: priors[0]})
			if err != nil {
				t.Fatal(err)
			}
			m, err := test.Compare(0, 0, 0, 0, test.CompareOptions{Prior1: interval.BetaPrior(r.b[1], r.a[1]), Prior2: interval.BetaPrior(r.b[0], r.a[0])})
			if err != nil {
				t.Fatal(err)
			}
			for _, o := range []struct {
				name string
				got  []float64
				eb   float64
			}{{"swap", []float64{s.ProbSecondBetter, s.ProbFirstBetter}, s.ErrorBound}, {"mirror", []float64{m.ProbFirstBetter, m.ProbSecondBetter}, m.ErrorBound}} {
				for j := range p {
					if d := math.Abs(o.got[j] - p[j]); !(d <= c.ErrorBound+o.eb) {
						t.Errorf("%s: %s arm %d: %v against %v, beyond the bounds %.3g + %.3g", r.pos, o.name, j+1, o.got[j], p[j], c.ErrorBound, o.eb)
					}
				}
			}
		}
		b, err := test.ProbBest(context.Background(), make([]int64, k), make([]int64, k), priors)
		if err != nil {
			t.Fatalf("%s: %v", r.pos, err)
		}
		lnP := make([]float64, k)
		sum := 0.0
		for j, v := range b.ProbBest {
			lnP[j] = math.Log(v)
			sum += v
		}
		ratio, eps := checkBound(t, r.pos+" ProbBest", b.ProbBest, lnP, r.lnP, b.ErrorBound)
		note("ProbBest", ratio, eps)
		if !(math.Abs(sum-1) <= float64(k)*b.ErrorBound+0x1p-52) {
			t.Errorf("%s: ProbBest sums to 1 + %.3g, bound %.3g", r.pos, sum-1, b.ErrorBound)
		}
	}
	t.Logf("largest ratio of actual error to ErrorBound %.3g; relative bound eps: largest %.3g, mean %.3g over %d results", worst, worstEps, sumEps/float64(count), count)
}

// TestCompareTrapezoidLimit: Compare refuses, naming n1, a window wider
// than MaxTrapezoidSteps (Beta(0.1, 0.1) priors, 0 of 99,999 against no
// trials: about 13,600 steps) and serves one just inside (0 of 75,000:
// about 12,150) with probabilities that sum to 1 within their bounds.
func TestCompareTrapezoidLimit(t *testing.T) {
	t.Parallel()
	p := interval.BetaPrior(0.1, 0.1)
	o := test.CompareOptions{Prior1: p, Prior2: p}
	_, err := test.Compare(0, 99999, 0, 0, o)
	var e *test.Error
	if !errors.Is(err, test.ErrTooLarge) || !errors.As(err, &e) || e.Arg != "n1" {
		t.Errorf("window beyond the limit: %v", err)
	}
	r, err := test.Compare(0, 75000, 0, 0, o)
	if err != nil {
		t.Fatal(err)
	}
	if s := r.ProbFirstBetter + r.ProbSecondBetter; !(math.Abs(s-1) <= 2*r.ErrorBound+0x1p-52) || !(r.ErrorBound < 1e-12) {
		t.Errorf("inside the limit: sum 1 + %.3g, bound %.3g", s-1, r.ErrorBound)
	}
}

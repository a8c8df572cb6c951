package interval_test

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/interval"
)

// TestCredibleHPDEqualDensity checks the defining properties of the HPD
// interval over a sweep: posterior probability Level inside and equal
// density at both limits (1e-12 relative), and that it is no longer than
// the equal-tailed interval.
func TestCredibleHPDEqualDensity(t *testing.T) {
	t.Parallel()
	for _, n := range []int64{2, 5, 30, 1000, 1e6} {
		for _, k := range []int64{1, n / 7, n / 2, n - 1} {
			for _, lev := range []float64{0.5, 0.9, 0.95, 0.999999} {
				o := interval.CredibleOptions{Level: lev, Kind: interval.HighestDensity, Prior: interval.UniformPrior()}
				iv, err := interval.Credible(k, n, o)
				if err != nil {
					t.Fatal(err)
				}
				a, b := 1+float64(k), 1+float64(n-k)
				if k == 0 || k == n {
					continue
				}
				// The limits are doubles: moving x by one relative ulp changes
				// the log density by about ((a-1) + (b-1) x/(1-x)) 2^-52 and a
				// tail by f(x) x 2^-52, which bounds what can be checked.
				g := func(x float64) float64 { return (a-1)*math.Log(x) + (b-1)*math.Log1p(-x) }
				sens := func(x float64) float64 { return ((a - 1) + (b-1)*x/(1-x)) * 0x1p-52 }
				lg, _ := math.Lgamma(a + b)
				la, _ := math.Lgamma(a)
				lb, _ := math.Lgamma(b)
				f := func(x float64) float64 { return math.Exp(g(x) + lg - la - lb) }
				if d := math.Abs(g(iv.Lower) - g(iv.Upper)); d > 1e-12*math.Max(1, math.Abs(g(iv.Lower)))+4*(sens(iv.Lower)+sens(iv.Upper)) {
					t.Errorf("%d/%d level %v: log densities differ by %.3g", k, n, lev, d)
				}
				post, _ := interval.NewPosterior(k, n, interval.UniformPrior())
				pl, _, _ := post.ProbBelow(iv.Lower)
				pu, _, _ := post.ProbAbove(iv.Upper)
				tol := 1e-13*(1-lev) + 2e-15 + 4*0x1p-52*(f(iv.Lower)*iv.Lower+f(iv.Upper)*iv.Upper)
				if e := math.Abs(pl + pu - (1 - lev)); e > tol {
					t.Errorf("%d/%d level %v: outside probability %v, want %v", k, n, lev, pl+pu, 1-lev)
				}
				o.Kind = interval.EqualTailed
				et, _ := interval.Credible(k, n, o)
				if iv.Width() > et.Width()*(1+1e-12)+4e-16 {
					t.Errorf("%d/%d level %v: HPD width %v exceeds equal-tailed %v", k, n, lev, iv.Width(), et.Width())
				}
			}
		}
	}
}

// TestCredibleMatchesJeffreysInterval: under the Jeffreys prior the
// equal-tailed credible interval is the Jeffreys confidence interval of
// Brown, Cai and DasGupta (2001, Statistical Science 16:101-133, section
// 4.1.2) for 0 < k < n, computed in this package by a different solver.
func TestCredibleMatchesJeffreysInterval(t *testing.T) {
	t.Parallel()
	for _, c := range [][2]int64{{1, 10}, {7, 30}, {81, 263}, {37, 1000}, {3, 1e9}} {
		ci, err := interval.Proportion(c[0], c[1], interval.Options{Method: interval.Jeffreys})
		if err != nil {
			t.Fatal(err)
		}
		cr, err := interval.Credible(c[0], c[1], interval.CredibleOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if diff := cmp.Diff([]float64{ci.Lower, ci.Upper}, []float64{cr.Lower, cr.Upper}, cmpopts.EquateApprox(1e-12, 0)); diff != "" {
			t.Errorf("%d/%d: Jeffreys interval vs credible (-want +got):\n%s", c[0], c[1], diff)
		}
		if cr.Prior == nil || cr.Prior.Kind != interval.PriorJeffreys || cr.Prior.A != 0.5 {
			t.Errorf("%d/%d: prior not stated: %+v", c[0], c[1], cr.Prior)
		}
	}
}

// TestPosteriorClosedForms: under the uniform prior, 0 successes in n give
// the Beta(1, n+1) posterior with P(p > c) = (1-c)^(n+1) and median
// 1 - 2^(-1/(n+1)), density (n+1)(1-x)^n and quantile 1 - (1-q)^(1/(n+1))
// (closed forms of the Beta(1, m) distribution function 1 - (1-x)^m).
func TestPosteriorClosedForms(t *testing.T) {
	t.Parallel()
	p, err := interval.NewPosterior(0, 9, interval.UniformPrior())
	if err != nil {
		t.Fatal(err)
	}
	pa, _, _ := p.ProbAbove(0.2)
	want := []float64{math.Pow(0.8, 10), -math.Expm1(-math.Ln2 / 10), 1.0 / 11, 0, 10 * math.Pow(0.8, 9), -math.Expm1(math.Log(0.1) / 10), p.Median}
	got := []float64{pa, p.Median, p.Mean, p.Mode, p.Density(0.2), p.Quantile(0.9), p.Quantile(0.5)}
	if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-14, 0)); diff != "" {
		t.Errorf("(-want +got):\n%s", diff)
	}
	b, err := json.Marshal(p)
	if err != nil {
		t.Fatal(err)
	}
	var back interval.Posterior
	if err := json.Unmarshal(b, &back); err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(p, back); diff != "" {
		t.Errorf("JSON round trip of %s (-want +got):\n%s", b, diff)
	}
	iv, _ := interval.Credible(3, 9, interval.CredibleOptions{Prior: interval.BetaPrior(2, 8)})
	b, _ = json.Marshal(iv)
	var ivBack interval.Interval
	if err := json.Unmarshal(b, &ivBack); err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(iv, ivBack); diff != "" {
		t.Errorf("JSON round trip of %s (-want +got):\n%s", b, diff)
	}
}

func TestCredibleErrors(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		k, n int64
		o    interval.CredibleOptions
		arg  string
		want error
	}{
		{5, 3, interval.CredibleOptions{}, "k", interval.ErrInvalidArgument},
		{1, 3, interval.CredibleOptions{Level: 1}, "Level", interval.ErrInvalidArgument},
		{1, 3, interval.CredibleOptions{Prior: interval.BetaPrior(0, 1)}, "Prior.A", interval.ErrInvalidArgument},
		{1, 3, interval.CredibleOptions{Prior: interval.Prior{Kind: interval.PriorUniform, A: 2}}, "Prior.A", interval.ErrInvalidArgument},
		{1, 3, interval.CredibleOptions{Kind: interval.HighestDensity, Side: interval.UpperBound}, "Side", interval.ErrInvalidArgument},
		{0, 0, interval.CredibleOptions{Kind: interval.HighestDensity}, "", interval.ErrNoSolution},
		{1, 3, interval.CredibleOptions{Kind: 7}, "Kind", interval.ErrInvalidArgument},
	} {
		_, err := interval.Credible(c.k, c.n, c.o)
		var e *interval.Error
		if !errors.Is(err, c.want) || !errors.As(err, &e) || e.Arg != c.arg {
			t.Errorf("Credible(%d, %d, %+v) = %v, want %v naming %q", c.k, c.n, c.o, err, c.want, c.arg)
		}
	}
}

func BenchmarkCredibleHPD(b *testing.B) {
	o := interval.CredibleOptions{Kind: interval.HighestDensity}
	for b.Loop() {
		interval.Credible(37, 1000, o)
	}
}

func BenchmarkCredibleEqualTailed(b *testing.B) {
	for b.Loop() {
		interval.Credible(37, 1000, interval.CredibleOptions{})
	}
}

// ExampleCredible: an invented usability study in which 7 of 30 testers
// failed a task; the 95% equal-tailed and highest density intervals for
// the failure rate under the Jeffreys prior.
func ExampleCredible() {
	for _, kind := range interval.CredibleKindValues() {
		iv, err := interval.Credible(7, 30, interval.CredibleOptions{Kind: kind})
		if err != nil {
			panic(err)
		}
		fmt.Printf("%-24s [%.4f, %.4f] mean %.4f, prior %v\n", iv.Method, iv.Lower, iv.Upper, iv.Estimate, iv.Prior)
	}
	// Output:
	// equal-tailed credible    [0.1109, 0.4044] mean 0.2419, prior Jeffreys Beta(0.5, 0.5)
	// highest density credible [0.1016, 0.3917] mean 0.2419, prior Jeffreys Beta(0.5, 0.5)
}

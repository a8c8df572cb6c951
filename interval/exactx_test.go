package interval_test

import (
	"fmt"
	"math"
	"testing"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/onesample"
	"github.com/kofnlab/kofn/interval"
	"gonum.org/v1/gonum/mathext"
)

// cases used by the inversion checks: small, moderate and huge n, both
// ends, the middle.
var inversionCases = []struct{ k, n int64 }{
	{1, 1}, {1, 2}, {3, 10}, {81, 263}, {500, 1000}, {999, 1000}, {5, 1e9}, {5, 1e12},
	{1, 1e12}, {123456, 1e12}, {4, 20}, {2, 1e6}, {0, 20}, {20, 20},
}

// logMidGE returns ln(P(X > k) + P(X = k)/2).
func logMidGE(d binom.Dist, k int64) float64 {
	return logAdd(d.LogSurvival(k), d.LogProb(k)-math.Ln2)
}

func logMidLE(d binom.Dist, k int64) float64 {
	return logAdd(d.LogCDF(k-1), d.LogProb(k)-math.Ln2)
}

func logAdd(a, b float64) float64 {
	if a < b {
		a, b = b, a
	}
	if math.IsInf(b, -1) {
		return a
	}
	return a + math.Log1p(math.Exp(b-a))
}

func TestMidPLikelihoodInversion(t *testing.T) {
	t.Parallel()
	// Mid-p limits: P(X > k; L) + P(X = k; L)/2 = a (Berry and Armitage
	// 1995); likelihood-ratio limits: 2[l(k/n) - l(L)] = z^2. Limits are
	// checked on whichever of p, 1-p is at most 1/2 (see the Clopper-Pearson
	// inversion test).
	for _, c := range inversionCases {
		for _, lev := range []float64{0.5, 0.95, 0.999, 0.999999} {
			a := (1 - lev) / 2
			iv, err := interval.Proportion(c.k, c.n, interval.Options{Method: interval.MidP, Level: lev})
			if err != nil {
				t.Fatal(err)
			}
			what := fmt.Sprintf("mid-p %d/%d level %v", c.k, c.n, lev)
			if c.k > 0 && iv.Lower <= 0.5 {
				d, _ := binom.New(c.n, iv.Lower)
				inverts(t, what+" lower", logMidGE(d, c.k), a)
			}
			if c.k < c.n && iv.Upper <= 0.5 {
				d, _ := binom.New(c.n, iv.Upper)
				inverts(t, what+" upper", logMidLE(d, c.k), a)
			}
			lr, err := interval.Proportion(c.k, c.n, interval.Options{Method: interval.LikelihoodRatio, Level: lev})
			if err != nil {
				t.Fatal(err)
			}
			z2 := math.Pow(-normalQuantile(a), 2)
			for _, p := range []float64{lr.Lower, lr.Upper} {
				// The plain deviance formula below cancels terms of size k,
				// so it checks to 1e-10 only for k < 1e4; larger k are
				// checked against mpmath in TestGoldenMpmath.
				if p == 0 || p == 1 || p > 0.5 || c.k >= 1e4 {
					continue
				}
				if dev := deviance(c.k, c.n, p); math.Abs(dev/z2-1) > 1e-10 {
					t.Errorf("likelihood ratio %d/%d level %v: deviance at %v is %v, want %v", c.k, c.n, lev, p, dev, z2)
				}
			}
		}
	}
}

// deviance returns 2[l(k/n) - l(p)] computed with log1p.
func deviance(k, n int64, p float64) float64 {
	fk, fn := float64(k), float64(n)
	d := 0.0
	if k > 0 {
		d += fk * math.Log(fk/(fn*p))
	}
	if k < n {
		d += (fn - fk) * (math.Log1p(-fk/fn) - math.Log1p(-p))
	}
	return 2 * d
}

func TestBlakerInversion(t *testing.T) {
	t.Parallel()
	// Blaker (2000): the limit is where the acceptability crosses alpha;
	// it may jump there, so the check is that it is below alpha just
	// outside the limit and at least alpha (to 1e-10) just inside.
	for _, c := range inversionCases {
		if c.n > 1e6 {
			continue
		}
		for _, lev := range []float64{0.8, 0.95, 0.99} {
			alpha := 1 - lev
			iv, err := interval.Proportion(c.k, c.n, interval.Options{Method: interval.Blaker, Level: lev})
			if err != nil {
				t.Fatal(err)
			}
			cp, _ := interval.Proportion(c.k, c.n, interval.Options{Method: interval.ClopperPearson, Level: lev})
			if iv.Lower < cp.Lower || iv.Upper > cp.Upper {
				t.Errorf("Blaker %d/%d %v = [%v, %v] not inside Clopper-Pearson [%v, %v]", c.k, c.n, lev, iv.Lower, iv.Upper, cp.Lower, cp.Upper)
			}
			acc := func(p float64) float64 {
				v, err := onesample.LogAcceptability(c.k, c.n, p, false)
				if err != nil {
					t.Fatal(err)
				}
				return math.Exp(v)
			}
			for i, p := range []float64{iv.Lower, iv.Upper} {
				if p == 0 || p == 1 {
					continue
				}
				out, in := p*(1-1e-9), p*(1+1e-9)
				if i == 1 {
					out, in = in, out
				}
				if acc(out) >= alpha*(1+1e-10) || acc(in) < alpha*(1-1e-10) {
					t.Errorf("Blaker %d/%d level %v limit %v: acceptability %v outside, %v inside, alpha %v", c.k, c.n, lev, p, acc(out), acc(in), alpha)
				}
			}
		}
	}
}

func normalQuantile(p float64) float64 { return mathext.NormalQuantile(p) }

func TestJeffreysInversion(t *testing.T) {
	t.Parallel()
	// Jeffreys limits are Beta(k+1/2, n-k+1/2) quantiles (Brown, Cai and
	// DasGupta 2001): checked against gonum's regularized incomplete beta,
	// whose lgamma-based prefactor is accurate to 1e-10 only for n up to
	// about 1e4, on the smaller tail; larger n are checked against mpmath
	// in TestGoldenMpmath. The level 0.999999 reaches far tails at small n
	// (where the upper tail of the incomplete beta must not be formed as a
	// complement). A limit within 1e-6 of 0 or 1 on the side where float64
	// holds only its distance to the other end (U = 1 - 7.6e-8 for 999/1000
	// is held to 1.5e-9 relative in 1 - U) is not checked through that
	// distance.
	for _, c := range inversionCases {
		if c.n > 1e4 {
			continue
		}
		for _, lev := range []float64{0.5, 0.95, 0.999, 0.999999} {
			a := (1 - lev) / 2
			iv, err := interval.Proportion(c.k, c.n, interval.Options{Method: interval.Jeffreys, Level: lev})
			if err != nil {
				t.Fatal(err)
			}
			aa, bb := float64(c.k)+0.5, float64(c.n-c.k)+0.5
			if c.k > 0 && iv.Lower < 1-1e-6 {
				inverts(t, fmt.Sprintf("Jeffreys %d/%d %v lower", c.k, c.n, lev), math.Log(mathext.RegIncBeta(aa, bb, iv.Lower)), a)
			}
			if c.k < c.n && iv.Upper < 1-1e-6 {
				inverts(t, fmt.Sprintf("Jeffreys %d/%d %v upper", c.k, c.n, lev), math.Log(mathext.RegIncBeta(bb, aa, 1-iv.Upper)), a)
			}
		}
	}
}

func TestBlakerHull(t *testing.T) {
	if testing.Short() {
		t.Skip("acceptability scan")
	}
	t.Parallel()
	// Blaker (2000): the confidence set {p : acceptability >= alpha} need
	// not be an interval (for 18 of 19 at level 0.5 it has a gap); the
	// reported limits are those of its hull, so no p between the
	// Clopper-Pearson lower limit and the Blaker lower limit is accepted
	// (checked on a grid; the upper limit is the mirror image).
	for n := int64(1); n <= 30; n++ {
		for k := int64(1); k <= n; k++ {
			for _, lev := range []float64{0.5, 0.8, 0.95, 0.99} {
				iv, err := interval.Proportion(k, n, interval.Options{Method: interval.Blaker, Level: lev})
				if err != nil {
					t.Fatal(err)
				}
				cp, _ := interval.Proportion(k, n, interval.Options{Method: interval.ClopperPearson, Level: lev})
				if !(iv.Lower*(1-1e-9) > cp.Lower) {
					continue // nothing between
				}
				for i := 1; i < 50; i++ {
					p := cp.Lower + (iv.Lower*(1-1e-9)-cp.Lower)*float64(i)/50
					v, err := onesample.LogAcceptability(k, n, p, false)
					if err != nil {
						t.Fatal(err)
					}
					if v >= math.Log(1-lev) {
						t.Errorf("Blaker %d/%d level %v: lower limit %v, but p = %v below it is accepted", k, n, lev, iv.Lower, p)
						break
					}
				}
			}
		}
	}
}

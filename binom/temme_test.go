package binom

import (
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

// TestTemmeCoefficients pins the first coefficients of the amplitude
// H(eta) = sum g_j eta^j, derived by hand from the series of the phase
// (temme.go): g_1 = -omega/3, g_2 = omega^2/12 + 1/4; and at omega = 0
// (P = 1/2) the phase is ln(1-u^2)/2, whose inversion gives H = 1 + eta^2/4
// + ..., so the odd coefficients vanish there.
func TestTemmeCoefficients(t *testing.T) {
	t.Parallel()
	temmeOnce.Do(temmeInit)
	got := [][]float64{temmeG[1], temmeG[2]}
	want := [][]float64{{-1.0 / 3}, {1.0 / 12, 1.0 / 4}}
	if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-15, 0)); diff != "" {
		t.Errorf("g_1, g_2 by powers of omega (-want +got):\n%s", diff)
	}
	for j := 1; j <= temmeOrder; j += 2 {
		// Odd j: every power of omega is odd, so g_j(0) = 0 by layout;
		// check the layout length instead.
		if len(temmeG[j]) != j/2+1 {
			t.Errorf("g_%d has %d coefficients, want %d", j, len(temmeG[j]), j/2+1)
		}
	}
}

// TestTemmeNormalisation checks the even coefficients against an exact
// identity: integrated over the whole line, the expansion must give the
// complete beta integral, sum_{j even} g_j(omega) (j-1)!! mu^(-j/2) =
// Gamma*(a) Gamma*(b) / Gamma*(a+b), the ratio of Stirling corrections,
// which the code otherwise uses in closed form.
func TestTemmeNormalisation(t *testing.T) {
	t.Parallel()
	temmeOnce.Do(temmeInit)
	for _, ab := range [][2]float64{{40, 40}, {60, 2000}, {1000, 3}, {1e6, 17}, {5e3, 5e3}} {
		a, b := ab[0], ab[1]
		if a < 25 || b < 25 {
			continue // the identity is asymptotic; use parameters the code uses
		}
		mu := a + b
		omega := (b - a) / math.Sqrt(a*b)
		var sum float64
		dfact := 1.0 // (j-1)!!
		for j := 0; j <= temmeOrder; j += 2 {
			if j > 0 {
				dfact *= float64(j - 1)
			}
			var g float64
			for l, c := range temmeG[j] {
				g += c * math.Pow(omega, float64(j-2*l))
			}
			term := g * dfact * math.Pow(mu, -float64(j)/2)
			sum += term
			if math.Abs(term) < 1e-18 {
				break
			}
		}
		want := math.Exp(stirlerr(a) + stirlerr(b) - stirlerr(mu))
		if math.Abs(sum-want) > 1e-15 {
			t.Errorf("a=%v b=%v: series %v, Stirling ratio %v", a, b, sum, want)
		}
	}
}

// TestTemmePMF checks the PMF the expansion's parts give (for the quantile
// walk) against LogProb, Loader's form: two assemblies of the same
// Stirling and deviance terms, within 4e-15 max(1, |ln b|) relative (the
// exponential of a deviance of size |ln b| carries that much rounding).
func TestTemmePMF(t *testing.T) {
	t.Parallel()
	checked := 0
	for _, n := range []int64{100, 1000, 12345, 1e6, 1e9, 1e12} {
		for _, p := range []float64{0.01, 0.3, 0.5, 0.8} {
			d := Dist{N: n, P: p}
			for _, z := range []float64{-8, -3, -1, 0, 0.5, 2, 6} {
				k := int64(d.Mean() + z*d.StdDev())
				if k < 0 || k >= n {
					continue
				}
				_, _, pmf, _, ok := d.temmeSmall(k, true)
				if !ok || pmf == 0 {
					continue
				}
				lw := d.LogProb(k)
				want := math.Exp(lw)
				if math.Abs(pmf-want) > 4e-15*math.Max(1, -lw)*want {
					t.Errorf("%v k=%d: expansion's PMF %v, Prob %v", d, k, pmf, want)
				}
				checked++
			}
		}
	}
	if checked < 60 {
		t.Errorf("only %d points checked", checked)
	}
}

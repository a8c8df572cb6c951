package main

import (
	"fmt"
	"math"
	"math/big"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/kofnlab/kofn/examples/internal/check"
)

// Normal quantiles (Abramowitz and Stegun 1964, Table 26.5: 1.644854,
// 0.841621).
const (
	z95 = 1.6448536269514722
	z80 = 0.8416212335729143
)

// TestRun runs the program and checks its key numbers against independent
// computations in exact rational arithmetic (the rates 0.20 and 0.40 are
// 1/5 and 2/5): the rejection rule, size and power for every n of the table,
// the first and stable n, the precision probabilities and sample sizes, and
// the p-value; the normal formulas in closed form; the Clopper-Pearson limits
// from gonum's beta quantiles and the Wilson limits in closed form.
func TestRun(t *testing.T) {
	t.Parallel()
	out := check.Output(t, run)
	if !strings.Contains(out, "qualified statistician") || !strings.Contains(out, "regulations") {
		t.Errorf("output lacks the caution about studies on people:\n%s", out)
	}
	printed := cmpopts.EquateApprox(0, 5.01e-5)

	// Exact power of the one-sided test that rejects when P(X >= k; n, 1/5)
	// < 0.05, for n = 1, ..., 200.
	const horizon = 200
	powers, sizes := make([]float64, horizon+1), make([]float64, horizon+1)
	crits := make([]int64, horizon+1)
	alts := make([]tail, horizon+1) // Binomial(n, 2/5)
	for n := int64(1); n <= horizon; n++ {
		null := newTail(n, 1)
		alts[n] = newTail(n, 2)
		crits[n] = null.critical()
		sizes[n], powers[n] = null.prob(crits[n], n), alts[n].prob(crits[n], n)
	}
	first := int64(0)
	for n := int64(1); n <= horizon && first == 0; n++ {
		if powers[n] >= target {
			first = n
		}
	}
	stable := int64(horizon)
	for stable > 1 && powers[stable-1] >= target {
		stable--
	}
	if first != 35 || stable != 38 {
		t.Fatalf("independent first and stable n = %d, %d; this scenario was written for 35 and 38", first, stable)
	}
	if diff := cmp.Diff([]float64{target, float64(first), powers[first]}, check.Values(t, out, "first n reaching"), printed); diff != "" {
		t.Errorf("first n (-want +got):\n%s", diff)
	}
	if got := check.Values(t, out, "stable n "); got[0] != float64(stable) {
		t.Errorf("stable n = %g, want %d", got[0], stable)
	}
	for n := first - 5; n <= stable+3; n++ {
		label := fmt.Sprintf("n = %d ", n)
		want := []float64{float64(crits[n]), sizes[n], powers[n]}
		if diff := cmp.Diff(want, check.Values(t, out, label), printed); diff != "" {
			t.Errorf("row %s(-want +got):\n%s", label, diff)
		}
	}
	// Fleiss, Levin and Paik (2003, section 2.5.1): the one-sample normal n.
	normal := math.Ceil(math.Pow(z95*math.Sqrt(0.2*0.8)+z80*math.Sqrt(0.4*0.6), 2) / (0.2 * 0.2))
	if got := check.Values(t, out, "normal approximation"); got[0] != normal {
		t.Errorf("normal approximation n = %g, want %g", got[0], normal)
	}
	if got := check.Values(t, out, "planned n"); got[0] != float64(stable) || got[1] != float64(crits[stable]) {
		t.Errorf("planned n and rule %v, want %d and %d", got, stable, crits[stable])
	}

	// Precision: P(|X/n - 2/5| <= eps) in exact arithmetic.
	for _, c := range []struct {
		label    string
		num, den int64
	}{{"eps = 0.15", 3, 20}, {"eps = 0.10", 1, 10}} {
		within := make([]float64, horizon+1)
		for n := int64(1); n <= horizon; n++ {
			within[n] = alts[n].within(c.num, c.den)
		}
		first := int64(1)
		for first < horizon && within[first] < precProb {
			first++
		}
		stable := int64(horizon)
		for within[stable-1] >= precProb {
			stable--
		}
		e := float64(c.num) / float64(c.den)
		formula := math.Ceil(z95 * z95 * 0.4 * 0.6 / (e * e))
		if diff := cmp.Diff([]float64{float64(first), float64(stable), formula}, check.Values(t, out, c.label)); diff != "" {
			t.Errorf("precision %s (-want +got):\n%s", c.label, diff)
		}
		label := "at n = 38, " + c.label
		if diff := cmp.Diff([]float64{alts[38].within(c.num, c.den)}, check.Values(t, out, label), printed); diff != "" {
			t.Errorf("%s (-want +got):\n%s", label, diff)
		}
	}

	// The reported outcome: 14 of 38.
	const k, n = responders, 38
	cp := []float64{
		distuv.Beta{Alpha: k, Beta: n - k + 1}.Quantile(0.025),
		distuv.Beta{Alpha: k + 1, Beta: n - k}.Quantile(0.975),
	}
	wlo, whi := check.Wilson(k, n)
	lower := distuv.Beta{Alpha: k, Beta: n - k + 1}.Quantile(0.05)
	for _, c := range []struct {
		label string
		want  []float64
	}{
		{"observed response rate", []float64{k / float64(n)}},
		{"exact binomial test", []float64{newTail(n, 1).prob(k, n), alpha, nullRate}},
		{"one-sided 95% lower bound", []float64{lower}},
		{"Clopper-Pearson, 95% two-sided", cp},
		{"Wilson, 95% two-sided", []float64{wlo, whi}},
	} {
		got := check.Values(t, out, c.label)
		if c.label == "exact binomial test" {
			got = got[len(got)-3:] // after "one-sided"
		}
		if diff := cmp.Diff(c.want, got, printed); diff != "" {
			t.Errorf("%s (-want +got):\n%s", c.label, diff)
		}
	}
}

// tail holds the binomial probabilities of 0, ..., n successes at the rate
// a/5 as integers over the common denominator 5^n, exactly.
type tail struct {
	terms []*big.Int // terms[j] = C(n, j) a^j (5-a)^(n-j)
	denom *big.Int   // 5^n
}

func newTail(n, a int64) tail {
	tl := tail{denom: new(big.Int).Exp(big.NewInt(5), big.NewInt(n), nil)}
	for j := int64(0); j <= n; j++ {
		term := new(big.Int).Binomial(n, j)
		term.Mul(term, new(big.Int).Exp(big.NewInt(a), big.NewInt(j), nil))
		term.Mul(term, new(big.Int).Exp(big.NewInt(5-a), big.NewInt(n-j), nil))
		tl.terms = append(tl.terms, term)
	}
	return tl
}

// sum is P(lo <= X <= hi) times 5^n.
func (tl tail) sum(lo, hi int64) *big.Int {
	s := new(big.Int)
	for j := max(lo, 0); j <= min(hi, int64(len(tl.terms))-1); j++ {
		s.Add(s, tl.terms[j])
	}
	return s
}

// prob is P(lo <= X <= hi) as the nearest float64.
func (tl tail) prob(lo, hi int64) float64 {
	f, _ := new(big.Rat).SetFrac(tl.sum(lo, hi), tl.denom).Float64()
	return f
}

// critical is the smallest count k with P(X >= k) < alpha = 1/20 under this
// distribution (the null), exactly: 20 P(X >= k) 5^n < 5^n.
func (tl tail) critical() int64 {
	n := int64(len(tl.terms)) - 1
	k, upper := n+1, new(big.Int)
	for k > 0 {
		next := new(big.Int).Add(upper, tl.terms[k-1])
		if new(big.Int).Mul(next, big.NewInt(20)).Cmp(tl.denom) >= 0 {
			break
		}
		k, upper = k-1, next
	}
	return k
}

// within is P(|X/n - 2/5| <= num/den) under this distribution, deciding the
// boundary in integers: |5j - 2n| den <= 5 n num.
func (tl tail) within(num, den int64) float64 {
	n := int64(len(tl.terms)) - 1
	lo, hi := int64(-1), int64(-1)
	for j := int64(0); j <= n; j++ {
		dev := 5*j - 2*n
		if dev < 0 {
			dev = -dev
		}
		if dev*den <= 5*n*num {
			if lo < 0 {
				lo = j
			}
			hi = j
		}
	}
	if lo < 0 {
		return 0
	}
	return tl.prob(lo, hi)
}

// TestRunWriteError checks that a failing output is reported, not ignored.
func TestRunWriteError(t *testing.T) {
	t.Parallel()
	if err := run(check.FailWriter{}); err == nil {
		t.Error("run ignored a failing writer")
	}
}

package main

import (
	"context"
	"math"
	"math/big"
	"strconv"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/kofnlab/kofn/examples/internal/check"
	"github.com/kofnlab/kofn/power"
	"github.com/kofnlab/kofn/test"
)

// printed is the absolute tolerance of a value printed with 4 decimals.
var printed = cmpopts.EquateApprox(0, 5.01e-5)

// TestRun runs the program and checks its key numbers against independent
// computations: closed forms for Wilson and Newcombe, gonum's beta quantiles
// for Clopper-Pearson, exact rational sums for Fisher, the Fleiss formula;
// SciPy 1.10 (its Barnard and Fisher tests and an enumeration of Fisher's exact
// power) and an mpmath inversion of the Miettinen-Nurminen score from
// ../testdata/reference.tsv; Boschloo's two-sided p-value, for which SciPy
// uses another definition, against the public API (and its one-sided value
// against SciPy in TestBoschlooReference).
func TestRun(t *testing.T) {
	t.Parallel()
	out := check.Output(t, run)

	lA, uA := check.Wilson(signupsA, visitorsA)
	lB, uB := check.Wilson(signupsB, visitorsB)
	pA, pB := float64(signupsA)/visitorsA, float64(signupsB)/visitorsB
	d := pB - pA
	newcombe := []float64{d, d - math.Hypot(pB-lB, uA-pA), d + math.Hypot(uB-pB, pA-lA)}
	ref := check.Reference(t)
	ctx := context.Background()
	bos, err := test.Boschloo(ctx, signupsB, visitorsB, signupsA, visitorsA, test.UnconditionalOptions{})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		label string
		want  []float64
	}{
		{"A, Wilson", []float64{pA, lA, uA}},
		{"B, Wilson", []float64{pB, lB, uB}},
		{"A, Clopper-Pearson", append([]float64{pA}, clopperPearson(signupsA, visitorsA)...)},
		{"B, Clopper-Pearson", append([]float64{pB}, clopperPearson(signupsB, visitorsB)...)},
		{"Newcombe hybrid score", append(newcombe, 0)},
		{"Miettinen-Nurminen", []float64{d, ref["signup.mn.lower"], ref["signup.mn.upper"], 0}},
		{"Fisher point-probability", []float64{fisherTwoSided(signupsB, visitorsB, signupsA, visitorsA), 0.05}},
		{"Boschloo", []float64{bos.PValue, 0.05}},
		{"Barnard", []float64{ref["signup.barnard.two-sided"], 0.05}},
		{"normal approximation", []float64{fleissCPS(planA, planB)}},
	} {
		if diff := cmp.Diff(c.want, check.Values(t, out, c.label), printed); diff != "" {
			t.Errorf("%s (-want +got):\n%s", c.label, diff)
		}
	}
	// Boschloo's test orders tables by Fisher's p-value and so never gives a
	// larger p-value than Fisher's test (Boschloo 1970).
	if bos.PValue > fisherTwoSided(signupsB, visitorsB, signupsA, visitorsA) {
		t.Errorf("Boschloo p = %g exceeds Fisher's", bos.PValue)
	}

	if diff := cmp.Diff(ref["signup.fisher.two-sided"], fisherTwoSided(signupsB, visitorsB, signupsA, visitorsA),
		cmpopts.EquateApprox(1e-12, 0)); diff != "" {
		t.Errorf("exact rational Fisher against SciPy (-want +got):\n%s", diff)
	}

	// Exact power rows: Fisher's against SciPy's enumeration, Barnard's
	// (too slow to enumerate in SciPy) against the public API.
	for _, n := range []int64{220, 240, 260} {
		opt := power.TwoSampleOptions{Alpha: planAlpha, Power: planPower, Test: power.BarnardExactTest}
		b, err := power.TwoSamplePower(ctx, n, n, planA, planB, opt)
		if err != nil {
			t.Fatal(err)
		}
		label := "n = " + strconv.FormatInt(n, 10)
		want := []float64{ref["signup.fisher.power."+strconv.FormatInt(n, 10)], b.Power}
		if diff := cmp.Diff(want, check.Values(t, out, label), printed); diff != "" {
			t.Errorf("%s (-want +got):\n%s", label, diff)
		}
	}
}

// TestFleissReference pins the normal-approximation size the program uses to
// Fleiss JL (1981), Statistical Methods for Rates and Proportions, 2nd ed.,
// Table A.3 with the Casagrande-Pike-Smith correction: p1 = 0.05, p2 = 0.10,
// two-sided 0.05, power 0.80 needs 474 per group (recalled, recomputed), and
// checks the test's own closed form against the same value.
func TestFleissReference(t *testing.T) {
	t.Parallel()
	got, err := power.TwoSampleNormalN(0.05, 0.10, power.TwoSampleOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if got.N != 474 || fleissCPS(0.05, 0.10) != 474 {
		t.Errorf("n = %d (closed form %g), want 474", got.N, fleissCPS(0.05, 0.10))
	}
}

// TestBoschlooReference checks the one-sided version of the Boschloo test the
// program uses against SciPy 1.10's Boschloo test (../testdata/reference.tsv).
func TestBoschlooReference(t *testing.T) {
	t.Parallel()
	got, err := test.Boschloo(context.Background(), signupsB, visitorsB, signupsA, visitorsA,
		test.UnconditionalOptions{Alternative: test.Higher})
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(check.Reference(t)["signup.boschloo.greater"], got.PValue, cmpopts.EquateApprox(1e-6, 0)); diff != "" {
		t.Errorf("one-sided Boschloo p (-want +got):\n%s", diff)
	}
}

// clopperPearson is the exact interval of Clopper and Pearson (1934) from the
// beta quantiles (gonum's incomplete beta inverse), for 0 < k < n.
func clopperPearson(k, n int64) []float64 {
	lo := distuv.Beta{Alpha: float64(k), Beta: float64(n - k + 1)}.Quantile(0.025)
	hi := distuv.Beta{Alpha: float64(k + 1), Beta: float64(n - k)}.Quantile(0.975)
	return []float64{lo, hi}
}

// fisherTwoSided is Fisher's two-sided point-probability p-value, summed in
// exact rational arithmetic over the hypergeometric tables no more probable
// than the observed one (relative tolerance 1e-7, as the test package uses).
func fisherTwoSided(k1, n1, k2, n2 int64) float64 {
	s := k1 + k2
	prob := func(x int64) *big.Rat {
		num := new(big.Int).Mul(new(big.Int).Binomial(n1, x), new(big.Int).Binomial(n2, s-x))
		return new(big.Rat).SetFrac(num, new(big.Int).Binomial(n1+n2, s))
	}
	obs := prob(k1)
	limit := new(big.Rat).Mul(obs, new(big.Rat).SetFloat64(1+1e-7))
	sum := new(big.Rat)
	for x := max(0, s-n2); x <= min(s, n1); x++ {
		if px := prob(x); px.Cmp(limit) <= 0 {
			sum.Add(sum, px)
		}
	}
	f, _ := sum.Float64()
	return f
}

// fleissCPS is the per-group size of Fleiss (1981, eq. 3.14) with the
// Casagrande, Pike and Smith (1978) correction, two-sided 5%, power 80%;
// z = 0.841621 is the 0.80 normal quantile (Abramowitz and Stegun, Table 26.5).
func fleissCPS(p1, p2 float64) float64 {
	const zb = 0.8416212335729143
	pbar := (p1 + p2) / 2
	d := math.Abs(p1 - p2)
	n := math.Pow(check.Z975*math.Sqrt(2*pbar*(1-pbar))+zb*math.Sqrt(p1*(1-p1)+p2*(1-p2)), 2) / (d * d)
	return math.Ceil(n / 4 * math.Pow(1+math.Sqrt(1+4/(n*d)), 2))
}

// TestRunWriteError checks that a failing output is reported, not ignored.
func TestRunWriteError(t *testing.T) {
	t.Parallel()
	if err := run(check.FailWriter{}); err == nil {
		t.Error("run ignored a failing writer")
	}
}

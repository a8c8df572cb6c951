package main

import (
	"math"
	"math/big"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"

	"github.com/kofnlab/kofn/examples/internal/check"
	"github.com/kofnlab/kofn/test"
)

// printed is the absolute tolerance of a value printed with 4 decimals.
var printed = cmpopts.EquateApprox(0, 5.01e-5)

// TestRun runs the program and checks its key numbers against independent
// computations: the Wilson and Newcombe closed forms, McNemar's exact and
// mid-p values as exact rational binomial sums, and Tango's interval from an
// mpmath inversion of his score statistic (../testdata/reference.tsv).
func TestRun(t *testing.T) {
	t.Parallel()
	out := check.Output(t, run)

	n := float64(messages)
	pA, pB := (bothRight+onlyA)/n, (bothRight+onlyB)/n
	lA, uA := check.Wilson(bothRight+onlyA, n)
	lB, uB := check.Wilson(bothRight+onlyB, n)
	d := pA - pB
	// Newcombe (1998, paired data, method 10): the Wilson limits combined
	// with the phi coefficient of the paired table.
	phi := (bothRight*bothWrong - onlyA*onlyB) /
		math.Sqrt(float64((bothRight+onlyA)*(onlyB+bothWrong)*(bothRight+onlyB)*(onlyA+bothWrong)))
	dl1, du1, dl2, du2 := pA-lA, uA-pA, pB-lB, uB-pB
	paired := []float64{d,
		d - math.Sqrt(dl1*dl1-2*phi*dl1*du2+du2*du2),
		d + math.Sqrt(du1*du1-2*phi*du1*dl2+dl2*dl2), 0}
	unpaired := []float64{d, d - math.Hypot(dl1, du2), d + math.Hypot(du1, dl2), 0}
	ref := check.Reference(t)
	exact, mid := mcnemar(onlyA, onlyB)
	for _, c := range []struct {
		label string
		want  []float64
	}{
		{"model A, Wilson", []float64{pA, lA, uA}},
		{"model B, Wilson", []float64{pB, lB, uB}},
		{"McNemar exact", []float64{exact, 0.05}},
		{"McNemar mid-p", []float64{mid, 0.05}},
		{"Newcombe paired hybrid score", paired},
		{"Tango score", []float64{d, ref["classifiers.tango.lower"], ref["classifiers.tango.upper"], 0}},
		{"unpaired Newcombe hybrid score", unpaired},
	} {
		if diff := cmp.Diff(c.want, check.Values(t, out, c.label), printed); diff != "" {
			t.Errorf("%s (-want +got):\n%s", c.label, diff)
		}
	}
}

// TestMcNemarReference pins the two McNemar versions the program uses to the
// worked example of Fagerland, Lydersen and Laake (2013), BMC Medical
// Research Methodology 13:91: discordant pairs 1 and 7 give the exact
// conditional P = 18/256 and the mid-p 10/256 (p-values recalled, recomputed
// here in exact arithmetic).
func TestMcNemarReference(t *testing.T) {
	t.Parallel()
	wantExact, wantMid := mcnemar(1, 7)
	if diff := cmp.Diff([]float64{18.0 / 256, 10.0 / 256}, []float64{wantExact, wantMid}, cmpopts.EquateApprox(1e-15, 0)); diff != "" {
		t.Fatalf("exact rational McNemar (-want +got):\n%s", diff)
	}
	for _, c := range []struct {
		midP bool
		want float64
	}{{false, 18.0 / 256}, {true, 10.0 / 256}} {
		res, err := test.McNemar(1, 7, test.McNemarOptions{MidP: c.midP})
		if err != nil {
			t.Fatal(err)
		}
		if diff := cmp.Diff(c.want, res.PValue, cmpopts.EquateApprox(1e-12, 0)); diff != "" {
			t.Errorf("mid-p %v (-want +got):\n%s", c.midP, diff)
		}
	}
}

// mcnemar returns the two-sided exact conditional McNemar p-value
// min(1, 2 P(X <= m)) and its mid-p version 2 P(X < m) + P(X = m), m the
// smaller discordant count and X ~ Binomial(n12 + n21, 1/2), in exact
// rational arithmetic.
func mcnemar(n12, n21 int64) (exact, mid float64) {
	nd, m := n12+n21, min(n12, n21)
	below := new(big.Int)
	for j := int64(0); j < m; j++ {
		below.Add(below, new(big.Int).Binomial(nd, j))
	}
	at := new(big.Int).Binomial(nd, m)
	denom := new(big.Int).Lsh(big.NewInt(1), uint(nd))
	e := new(big.Rat).SetFrac(new(big.Int).Lsh(new(big.Int).Add(below, at), 1), denom)
	if e.Cmp(big.NewRat(1, 1)) > 0 {
		e.SetInt64(1)
	}
	md := new(big.Rat).SetFrac(new(big.Int).Add(new(big.Int).Lsh(below, 1), at), denom)
	exact, _ = e.Float64()
	mid, _ = md.Float64()
	return exact, mid
}

// TestRunWriteError checks that a failing output is reported, not ignored.
func TestRunWriteError(t *testing.T) {
	t.Parallel()
	if err := run(check.FailWriter{}); err == nil {
		t.Error("run ignored a failing writer")
	}
}

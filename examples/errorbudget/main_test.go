package main

import (
	"math"
	"strconv"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/kofnlab/kofn/examples/internal/check"
	"github.com/kofnlab/kofn/power"
)

// printed is the absolute tolerance of a value printed with 6 decimals.
var printed = cmpopts.EquateApprox(0, 5.01e-7)

// TestRun runs the program and checks its key numbers against independent
// computations: gonum's beta quantile for the Clopper-Pearson bound, binomial
// tails summed term by term from log-gamma for the test and the plans, and the
// success-run formula.
func TestRun(t *testing.T) {
	t.Parallel()
	out := check.Output(t, run)

	// Clopper and Pearson (1934): the one-sided upper bound is the
	// confidence quantile of Beta(k+1, n-k).
	upper := distuv.Beta{Alpha: failures + 1, Beta: requests - failures}.Quantile(confidence)
	pLess := check.BinomCDF(failures, requests, 1-objective)
	for _, c := range []struct {
		label string
		want  []float64
	}{
		{"error budget of window", []float64{48, 65}},
		{"Clopper-Pearson upper bound", []float64{upper, 0.001}},
		{"demonstrated success rate", []float64{1 - upper, 95}},
		{"exact binomial, one-sided (lower)", []float64{pLess, 0.05}},
	} {
		if diff := cmp.Diff(c.want, check.Values(t, out, c.label), printed); diff != "" {
			t.Errorf("%s (-want +got):\n%s", c.label, diff)
		}
	}

	// Each plan is the smallest n with P(X <= c; n, 1 - R) <= 1 - C. For
	// c = 0 that is the success-run formula n = ceil(ln(1-C)/ln R) (common
	// practice): 2995 for R = 0.999, C = 0.95.
	if got := check.Values(t, out, "c = 0")[0]; got != math.Ceil(math.Log(1-confidence)/math.Log1p(-(1-objective))) || got != 2995 {
		t.Errorf("zero-failure plan: %g requests, want 2995", got)
	}
	for _, c := range allowed {
		row := check.Values(t, out, "c = "+strconv.FormatInt(c, 10))
		n := int64(row[0])
		now, before := 1-check.BinomCDF(c, n, 1-objective), 1-check.BinomCDF(c, n-1, 1-objective)
		if !(now >= confidence && before < confidence) {
			t.Errorf("c = %d: n = %d reaches %g and n-1 %g; want the first n reaching %g", c, n, now, before, confidence)
		}
		if diff := cmp.Diff([]float64{float64(n), now, before}, row, printed); diff != "" {
			t.Errorf("c = %d row (-want +got):\n%s", c, diff)
		}
	}
}

// TestSuccessRun pins the zero-failure plan the program relies on to the
// common-practice reference value: R = 0.99 at C = 0.95 needs 299 trials,
// and 298 give only 0.94996 (success-run formula n = ln(1-C)/ln R, common practice).
func TestSuccessRun(t *testing.T) {
	t.Parallel()
	d, err := power.DemonstrationTrials(0, 0.99, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	if d.Trials != 299 {
		t.Errorf("trials = %d, want 299", d.Trials)
	}
	if diff := cmp.Diff(0.94996, d.PreviousLevel, cmpopts.EquateApprox(0, 5e-6)); diff != "" {
		t.Errorf("confidence of 298 trials (-want +got):\n%s", diff)
	}
}

// TestRunWriteError checks that a failing output is reported, not ignored.
func TestRunWriteError(t *testing.T) {
	t.Parallel()
	if err := run(check.FailWriter{}); err == nil {
		t.Error("run ignored a failing writer")
	}
}

package repl

import (
	"context"
	"errors"
	"strings"
	"testing"

	"github.com/kofnlab/kofn/power"
	"github.com/kofnlab/kofn/test"
)

func TestPlanningValues(t *testing.T) {
	t.Parallel()
	tests := []valueCase{
		// Fleiss JL (1981), Table A.3, with the Casagrande, Pike and Smith (1978) correction
		// (recalled, recomputed): 0.05 against 0.10, alpha 0.05 two-sided, power 0.80: 474 per
		// group; uncorrected 434.43, corrected 473.59.
		{"size p1=0.05 p2=0.10", "normal.n", 474, 0, "Fleiss 1981 A.3"},
		{"size p1=0.05 p2=0.10", "normal.real", 473.59, 1e-4, "Fleiss 1981 A.3"},
		{"size p1=0.05 p2=0.10", "normal.uncorrected", 434.43, 1e-4, "Fleiss 1981 A.3"},
		// Margin of error, common practice: p = 0.5, d = 0.03, 95%: 1068.
		{"margin d=0.03", "n", 1068, 0, "common practice"},
		// Success-run formula, common practice: R = 0.99 at C = 0.95: 299 trials, 298 give 0.94996.
		{"prove rel=0.99 level=0.95", "trials", 299, 0, "success run"},
		{"prove rel=0.99 level=0.95", "previous_level", 0.94996, 1e-5, "success run"},
		// 30 units, no failures, 90%: 0.10^(1/30) = 0.9261 (common practice).
		{"prove n=30 level=0.9", "reliability", 0.9261, 1e-4, "success run"},
		// Hanley and Lippman-Hand (1983): n = 14, exact one-sided 95% upper limit 1 - 0.05^(1/14) = 0.1926.
		{"prove n=14 level=95%", "reliability", 1 - 0.1926, 1e-4, "Hanley 1983"},
		// Montgomery, single sampling plan n = 89, c = 2 (read in a reproduced exercise):
		// P(accept) at 0.01, 0.02, 0.05 = 0.93969, 0.736578, 0.172077; ATI at N = 10000, p = 0.01: 687.
		{"accept n=89 c=2 at=0.01", "at.0.y", 0.93969, 1e-5, "Montgomery"},
		{"accept n=89 c=2 at=0.02", "at.0.y", 0.736578, 1e-6, "Montgomery"},
		{"accept n=89 c=2 at=0.05", "at.0.y", 0.172077, 1e-6, "Montgomery"},
		{"accept n=89 c=2 at=0.01 lot=10000", "rectifying.0.ati", 687, 1e-3, "Montgomery"},
	}
	checkValues(t, tests)
}

// TestPlanningMatchesPackage checks that the shell passes options through:
// its numbers equal the power package's for the same call.
func TestPlanningMatchesPackage(t *testing.T) {
	t.Parallel()
	ex, err := power.OneSamplePower(40, 0.3, 0.5, power.OneSampleOptions{Alpha: 0.05, Rule: test.Central})
	if err != nil {
		t.Fatal(err)
	}
	if got := num(t, runJSON(t, "detect n=40 p=0.3 truth=0.5 rule=central"), "power"); got != ex.Power {
		t.Errorf("detect: %v, package %v", got, ex.Power)
	}
	sz, err := power.OneSampleN(context.Background(), 0.3, 0.5, power.OneSampleOptions{Alpha: 0.1, Power: 0.9, Alternative: test.Higher})
	if err != nil {
		t.Fatal(err)
	}
	obj := runJSON(t, "size p=0.3 truth=0.5 power=0.9 alpha=0.1 alt=higher")
	if got := num(t, obj, "exact.first"); got != float64(sz.First) {
		t.Errorf("size first: %v, package %v", got, sz.First)
	}
	if got := num(t, obj, "exact.stable"); got != float64(sz.Stable) {
		t.Errorf("size stable: %v, package %v", got, sz.Stable)
	}
	pw, err := power.PairedNormalPower(100, 0.15, 0.05, power.PairedOptions{Alpha: 0.05})
	if err != nil {
		t.Fatal(err)
	}
	if got := num(t, runJSON(t, "detect n=100 p12=0.15 p21=0.05 method=asymptotic"), "power"); got != pw {
		t.Errorf("paired detect: %v, package %v", got, pw)
	}
	pe, err := power.PairedPower(context.Background(), 100, 0.15, 0.05, power.PairedOptions{Alpha: 0.05})
	if err != nil {
		t.Fatal(err)
	}
	if got := num(t, runJSON(t, "detect n=100 p12=0.15 p21=0.05"), "power"); got != pe.Power {
		t.Errorf("paired exact detect: %v, package %v", got, pe.Power)
	}
	te, err := power.TwoSamplePower(context.Background(), 60, 60, 0.2, 0.5, power.TwoSampleOptions{Alpha: 0.05, Test: power.FisherExactTest})
	if err != nil {
		t.Fatal(err)
	}
	if got := num(t, runJSON(t, "detect n=60 p1=0.2 p2=0.5 method=fisher"), "power"); got != te.Power {
		t.Errorf("two-group exact detect: %v, package %v", got, te.Power)
	}
	curve, err := power.OneSampleCurve(context.Background(), 0.3, 0.5, 60, power.OneSampleOptions{Alpha: 0.05})
	if err != nil {
		t.Fatal(err)
	}
	obj = runJSON(t, "detect n=20..60 p=0.3 truth=0.5")
	if got := num(t, obj, "power"); got != curve[59].Power {
		t.Errorf("curve end: %v, package %v", got, curve[59].Power)
	}
}

func TestMarginExactMatchesPackage(t *testing.T) {
	t.Parallel()
	want, err := power.PrecisionN(context.Background(), 0.3, 0.05, power.PrecisionOptions{Level: 0.95})
	if err != nil {
		t.Fatal(err)
	}
	obj := runJSON(t, "margin d=0.05 p=0.3 by=chance")
	if got := num(t, obj, "exact.first"); got != float64(want.First) {
		t.Errorf("first n %v, package %d", got, want.First)
	}
	if got := num(t, obj, "exact.stable"); got != float64(want.Stable) {
		t.Errorf("safe n %v, package %d", got, want.Stable)
	}
	w, err := power.ExpectedWidthN(context.Background(), 0.2, 0.05, power.WidthOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if got := num(t, runJSON(t, "margin d=0.05 p=0.2 by=width"), "n"); got != float64(w.N) {
		t.Errorf("width n %v, package %d", got, w.N)
	}
}

// TestCancel runs a long search with a cancelled context: the command
// fails with the interruption message and the session goes on.
func TestCancel(t *testing.T) {
	t.Parallel()
	s, out, errw := testSession()
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	err := s.Run(ctx, "size p=0.3 truth=0.3001 upto=10000000")
	if !errors.Is(err, context.Canceled) || !strings.Contains(errw.String(), "stopped (interrupted)") {
		t.Fatalf("err = %v, stderr %q", err, errw.String())
	}
	if err := s.Run(context.Background(), "margin d=0.03"); err != nil || !strings.Contains(out.String(), "1068") {
		t.Errorf("session after cancel: %v %q", err, out.String())
	}
}

func TestMarginDesignsMatchPackage(t *testing.T) {
	t.Parallel()
	for line, h := range map[string]power.Hypothesis{
		"size p1=0.85 p2=0.85 hypothesis=non-inferiority margin=0.1": power.NonInferiority,
		"size p1=0.85 p2=0.85 hypothesis=equivalence margin=0.1":     power.Equivalence,
	} {
		want, err := power.TwoSampleNormalN(0.85, 0.85, power.TwoSampleOptions{Alpha: 0.05, Hypothesis: h, Margin: 0.1})
		if err != nil {
			t.Fatal(err)
		}
		if got := num(t, runJSON(t, line), "normal.n"); got != float64(want.N) {
			t.Errorf("%s: n %v, package %d", line, got, want.N)
		}
	}
}

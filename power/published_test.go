package power

import (
	"context"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

// Fleiss JL (1981), Statistical Methods for Rates and Proportions, 2nd ed.,
// Table A.3, with the continuity correction of Casagrande, Pike, Smith (1978),
// Biometrics 34:483-486 (shared REFERENCES.md; recalled, recomputed): 474
// per group, 434.43 uncorrected, 473.59 corrected. The second row, p = 0.10
// against 0.20 (219 per group), is recalled from the
// same table; the unrounded sizes are our recomputation.
func TestFleissTable(t *testing.T) {
	t.Parallel()
	tests := []struct {
		p1, p2       float64
		uncorr, corr float64
		n            int64
	}{
		{0.05, 0.10, 434.43, 473.59, 474},
		{0.10, 0.20, 198.963, 218.506, 219},
	}
	for _, tc := range tests {
		got, err := TwoSampleNormalN(tc.p1, tc.p2, TwoSampleOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if got.N != tc.n || got.N2 != tc.n {
			t.Errorf("TwoSampleNormalN(%v, %v) = %d, %d; want %d", tc.p1, tc.p2, got.N, got.N2, tc.n)
		}
		if diff := cmp.Diff([]float64{tc.uncorr, tc.corr}, []float64{got.Uncorrected, got.Real}, cmpopts.EquateApprox(2e-5, 0)); diff != "" {
			t.Errorf("TwoSampleNormalN(%v, %v) sizes (-want +got):\n%s", tc.p1, tc.p2, diff)
		}
	}
}

// Margin of error, common practice: p = 0.5, d = 0.03, 95% gives 1068.
func TestMarginOfError(t *testing.T) {
	t.Parallel()
	n, err := MarginOfErrorN(0.5, 0.03, 0.95)
	if err != nil || n != 1068 {
		t.Errorf("MarginOfErrorN(0.5, 0.03, 0.95) = %d, %v; want 1068", n, err)
	}
}

// Success-run formula (common practice, shared REFERENCES.md): R = 0.99 at
// C = 0.95 with no failures needs 299 trials; 298 achieve only 0.94996.
func TestSuccessRun(t *testing.T) {
	t.Parallel()
	got, err := DemonstrationTrials(0, 0.99, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	if got.Trials != 299 {
		t.Errorf("DemonstrationTrials(0, 0.99, 0.95).Trials = %d, want 299", got.Trials)
	}
	if diff := cmp.Diff(0.94996, got.PreviousLevel, cmpopts.EquateApprox(1e-5, 0)); diff != "" {
		t.Errorf("confidence of 298 trials (-want +got):\n%s", diff)
	}
	if got.AchievedLevel < 0.95 {
		t.Errorf("achieved confidence %v below 0.95", got.AchievedLevel)
	}
}

// Zero-failure bound (common practice, shared REFERENCES.md): 30 units, no
// failures, 90%: 0.10^(1/30) = 0.9261. Rule of three: Hanley JA,
// Lippman-Hand A (1983), JAMA 249:1743-1745: exact one-sided 95% upper limit
// 1 - 0.05^(1/14) = 0.1926 against 3/14 = 0.2143.
func TestZeroFailureBounds(t *testing.T) {
	t.Parallel()
	r, err := DemonstratedReliability(30, 0, 0.90)
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(0.9261, r, cmpopts.EquateApprox(5e-5, 0)); diff != "" {
		t.Errorf("DemonstratedReliability(30, 0, 0.90) (-want +got):\n%s", diff)
	}
	r, err = DemonstratedReliability(14, 0, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(0.1926, 1-r, cmpopts.EquateApprox(5e-4, 0)); diff != "" {
		t.Errorf("rule of three, n = 14 (-want +got):\n%s", diff)
	}
	if 1-r >= 3.0/14 {
		t.Errorf("exact limit %v not below 3/n", 1-r)
	}
}

// Montgomery DC, Introduction to Statistical Quality Control, single
// sampling plans (shared REFERENCES.md): plan n = 89, c = 2; acceptance
// probabilities and, for lots of 10000 at p = 0.01, ATI 687.
func TestMontgomeryPlan(t *testing.T) {
	t.Parallel()
	pl := Plan{SampleSize: 89, AcceptNumber: 2}
	want := []float64{0.93969, 0.736578, 0.498483, 0.304158, 0.172077}
	var got []float64
	for _, p := range []float64{0.01, 0.02, 0.03, 0.04, 0.05} {
		pa, err := AcceptProb(pl, p)
		if err != nil {
			t.Fatal(err)
		}
		got = append(got, pa)
	}
	if diff := cmp.Diff(want, got, cmpopts.EquateApprox(5e-6, 0)); diff != "" {
		t.Errorf("OC of n = 89, c = 2 (-want +got):\n%s", diff)
	}
	r, err := Rectify(pl, 10000, 0.01)
	if err != nil {
		t.Fatal(err)
	}
	if math.Round(r.ATI) != 687 {
		t.Errorf("ATI = %v, want 687", r.ATI)
	}
}

// The design search is exact: every published plan check is that the plan
// meets both risks and that no smaller plan does (checked by brute force).
func TestDesignPlanMinimal(t *testing.T) {
	t.Parallel()
	cases := []struct{ aql, rql, alpha, beta float64 }{
		{0.01, 0.06, 0.05, 0.10},
		{0.02, 0.08, 0.05, 0.10},
		{0.005, 0.03, 0.05, 0.10},
		{0.01, 0.02, 0.05, 0.05},
		{0.1, 0.3, 0.01, 0.01},
	}
	for _, tc := range cases {
		d, err := DesignPlan(context.Background(), tc.aql, tc.rql, DesignOptions{ProducerRisk: tc.alpha, ConsumerRisk: tc.beta})
		if err != nil {
			t.Fatal(err)
		}
		pl := d.Plan
		if pr := 1 - pl.pa(tc.aql); pr > tc.alpha+1e-12 {
			t.Errorf("%+v: producer's risk %v > %v", tc, pr, tc.alpha)
		}
		if cr := pl.pa(tc.rql); cr > tc.beta {
			t.Errorf("%+v: consumer's risk %v > %v", tc, cr, tc.beta)
		}
		for n := int64(1); n < pl.SampleSize; n++ {
			for c := int64(0); c < n; c++ {
				q := Plan{SampleSize: n, AcceptNumber: c}
				if q.pa(tc.rql) <= tc.beta && 1-q.pa(tc.aql) <= tc.alpha {
					t.Fatalf("%+v: smaller plan %+v meets both risks; design gave %+v", tc, q, pl)
				}
			}
		}
	}
}

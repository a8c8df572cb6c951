package test

import (
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

// TestMcNemarFagerland: Fagerland MW, Lydersen S, Laake P (2013), The
// McNemar test for binary matched-pairs data: mid-p and asymptotic are
// better than exact conditional, BMC Medical Research Methodology 13:91:
// pairs n12 = 1, n21 = 7 (data read; p-values recalled, recomputed):
// exact 18/256, mid-p 10/256, asymptotic 0.034 (chi-square 4.5), with
// continuity correction 0.077 (chi-square 3.125).
func TestMcNemarFagerland(t *testing.T) {
	t.Parallel()
	tests := []struct {
		m       McNemarMethod
		mid     bool
		p, stat float64
		rel     float64
	}{
		{McNemarExact, false, 18.0 / 256, 1, 1e-12},
		{McNemarExact, true, 10.0 / 256, 1, 1e-12},
		{McNemarAsymptotic, false, 0.0338948535246892729, 4.5, 1e-12},     // 2 Phi(-sqrt(4.5)), mpmath
		{McNemarAsymptoticCC, false, 0.0770998717435417699, 3.125, 1e-12}, // 2 Phi(-sqrt(3.125)), mpmath
	}
	for _, tc := range tests {
		r, err := McNemar(1, 7, McNemarOptions{Method: tc.m, MidP: tc.mid})
		if err != nil {
			t.Fatal(err)
		}
		if diff := cmp.Diff([]float64{tc.p, tc.stat}, []float64{r.PValue, r.Statistic.Value}, cmpopts.EquateApprox(tc.rel, 0)); diff != "" {
			t.Errorf("%v mid-p %v (-want +got):\n%s", tc.m, tc.mid, diff)
		}
	}
}

func TestMcNemarEdges(t *testing.T) {
	t.Parallel()
	for _, m := range McNemarMethodValues() {
		r, err := McNemar(0, 0, McNemarOptions{Method: m})
		if err != nil || r.PValue != 1 || len(r.Warnings) == 0 {
			t.Errorf("%v (0, 0): %+v, %v", m, r, err)
		}
		r, _ = McNemar(5, 5, McNemarOptions{Method: m})
		if math.Abs(r.PValue-1) > 1e-14 {
			t.Errorf("%v (5, 5): p = %v, want 1", m, r.PValue)
		}
		got, err := ParseMcNemarMethod(m.String())
		if err != nil || got != m {
			t.Errorf("ParseMcNemarMethod(%q) = %v, %v", m, got, err)
		}
	}
	if _, err := McNemar(-1, 3, McNemarOptions{}); err == nil || err.Error() != "test.McNemar: n12 = -1 is negative; counts are 0 or more" {
		t.Errorf("McNemar(-1, 3): %v", err)
	}
}

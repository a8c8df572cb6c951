package binom

import (
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

// TestTinyP checks success probabilities below 1e-200, subnormal ones
// included, where N*P underflows inside the saddle-point form. Reference
// values: mpmath at 60 digits, testdata/gen/binom_tinyp.py (rows pasted as
// printed).
func TestTinyP(t *testing.T) {
	t.Parallel()
	tests := []struct {
		n          int64
		p          float64
		k          int64
		logProb    float64
		logSurvive float64
	}{
		{300, 4e-311, 1, -709.01388708537216851, -1418.724260252569797},
		{300, 4e-311, 2, -1418.724260252569797, -2128.8434486147608718},
		{300, 4e-311, 101, -71997.866941516059525, -72711.916279064647673},
		{300, 4e-311, 299, -213694.8794159738263, -214415.30086800851087},
		{300, 5e-324, 1, -738.73628944672506125, -1478.1690649752755825},
		{300, 5e-324, 2, -1478.1690649752755825, -2218.01065569881955},
		{300, 5e-324, 299, -222581.87772201834123, -223332.02157641437869},
		{1000000000000000, 1e-250, 1, -541.10749685360073569, -1082.9081408877614177},
		{1000000000000000, 1e-250, 5, -2710.3249760107857344, -3253.2242323336145301},
		{1000000000000000, 1e-250, 999999999999999, -575646273248510810.77, -575646273248511420.95},
		{9007199254740992, 1e-201, 1, -426.08280312212608114, -852.85875342481210771},
		{9007199254740992, 1e-201, 3, -1280.0401688356062988, -1707.5092663188522709},
		{9007199254740992, 1e-201, 9007199254740991, -4168708389452330395.9, -4168708389452330895.5},
	}
	opt := cmpopts.EquateApprox(1e-13, 0)
	for _, tc := range tests {
		d, err := New(tc.n, tc.p)
		if err != nil {
			t.Fatal(err)
		}
		got := []float64{d.LogProb(tc.k), d.LogSurvival(tc.k)}
		want := []float64{tc.logProb, tc.logSurvive}
		if diff := cmp.Diff(want, got, opt); diff != "" {
			t.Errorf("n = %d, p = %g, k = %d: LogProb, LogSurvival (-want +got):\n%s", tc.n, tc.p, tc.k, diff)
		}
		for _, v := range []float64{d.Prob(tc.k), d.CDF(tc.k), d.Survival(tc.k), d.LogCDF(tc.k)} {
			if math.IsNaN(v) {
				t.Errorf("n = %d, p = %g, k = %d: NaN", tc.n, tc.p, tc.k)
			}
		}
		if c := d.LogCDF(tc.k); c > 0 || c < -1e-300 {
			t.Errorf("n = %d, p = %g, k = %d: LogCDF = %g, want a tiny non-positive value", tc.n, tc.p, tc.k, c)
		}
		if q := d.Quantile(0.5); q != 0 {
			t.Errorf("n = %d, p = %g: median %d, want 0", tc.n, tc.p, q)
		}
		if q := d.LogUpperQuantile(tc.logSurvive); q != tc.k {
			t.Errorf("n = %d, p = %g: LogUpperQuantile(%g) = %d, want %d", tc.n, tc.p, tc.logSurvive, q, tc.k)
		}
	}
}

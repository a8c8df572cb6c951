package power

import (
	"context"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

// TestTinyProbabilities runs the exact power functions with probabilities
// and alpha at 1e-300 and below (down to the smallest subnormal double):
// no NaN, no error, and closed forms where the answer has one.
func TestTinyProbabilities(t *testing.T) {
	t.Parallel()
	for _, p := range []float64{5e-324, 4e-310, 1e-300} {
		// Closed form: at p0 = p, n = 20, any k >= 1 has p-value
		// P(X >= 1) = 1 - (1-p)^20, about 20 p, far below alpha/2, and k = 0
		// has p-value 1: the test rejects exactly when k >= 1, so the size is
		// 1 - (1-p)^20 = -expm1(20 log1p(-p)) and the power at p1 = 0.3 is
		// 1 - 0.7^20.
		r, err := OneSamplePower(20, p, 0.3, OneSampleOptions{})
		if err != nil {
			t.Fatalf("OneSamplePower(20, %g, 0.3): %v", p, err)
		}
		if diff := cmp.Diff(-math.Expm1(20*math.Log(0.7)), r.Power, cmpopts.EquateApprox(1e-14, 0)); diff != "" {
			t.Errorf("p0 = %g: power (-want +got):\n%s", p, diff)
		}
		wantSize := -math.Expm1(20 * math.Log1p(-p))
		if p < 1e-320 { // a few-bit subnormal: allow one unit in the last place
			if math.Abs(r.Size-wantSize) > 0x1p-1074 {
				t.Errorf("p0 = %g: size %g, want %g", p, r.Size, wantSize)
			}
		} else if diff := cmp.Diff(wantSize, r.Size, cmpopts.EquateApprox(1e-12, 0)); diff != "" {
			t.Errorf("p0 = %g: size (-want +got):\n%s", p, diff)
		}
		// Closed form: with alpha = p no outcome of 20 trials at p0 = 0.3 is
		// extreme enough (the smallest p-value is 0.3^20 = 3.5e-11), so
		// power and size are both 0.
		r, err = OneSamplePower(20, 0.3, 0.6, OneSampleOptions{Alpha: p})
		if err != nil || r.Power != 0 || r.Size != 0 {
			t.Errorf("OneSamplePower(20, 0.3, 0.6, alpha %g) = %+v, %v; want power and size 0", p, r, err)
		}
		// No closed form: the answers must be finite, in [0, 1], and those at
		// a tiny proportion must agree with those at 1e-300 (the limit p -> 0
		// is continuous and 1e-300 is already there to 1e-14).
		checks := []struct {
			name string
			f    func(q float64) (ExactPower, error)
		}{
			{"TwoSamplePower", func(q float64) (ExactPower, error) {
				return TwoSamplePower(context.Background(), 10, 10, q, 0.5, TwoSampleOptions{})
			}},
			{"TwoSamplePower alpha", func(q float64) (ExactPower, error) {
				return TwoSamplePower(context.Background(), 10, 10, 0.2, 0.7, TwoSampleOptions{Alpha: q})
			}},
			{"PairedPower", func(q float64) (ExactPower, error) {
				return PairedPower(context.Background(), 20, q, 0.3, PairedOptions{})
			}},
			{"PairedPower alpha", func(q float64) (ExactPower, error) {
				return PairedPower(context.Background(), 20, 0.1, 0.3, PairedOptions{Alpha: q})
			}},
		}
		for _, c := range checks {
			got, err := c.f(p)
			ref, err2 := c.f(1e-300)
			if err != nil || err2 != nil {
				t.Errorf("%s(%g): %v, %v", c.name, p, err, err2)
				continue
			}
			if !(got.Power >= 0 && got.Power <= 1 && got.Size >= 0 && got.Size <= 1) {
				t.Errorf("%s(%g) = %+v: power or size outside [0, 1] or NaN", c.name, p, got)
			}
			if diff := cmp.Diff([]float64{ref.Power, ref.Size}, []float64{got.Power, got.Size}, cmpopts.EquateApprox(1e-12, 0)); diff != "" {
				t.Errorf("%s(%g) vs (1e-300) (-want +got):\n%s", c.name, p, diff)
			}
		}
		for _, f := range []func() (float64, error){
			func() (float64, error) { return OneSampleNormalPower(20, p, 0.3, OneSampleOptions{}) },
			func() (float64, error) { return TwoSampleNormalPower(20, 20, p, 0.3, TwoSampleOptions{}) },
		} {
			if v, err := f(); err != nil || !(v >= 0 && v <= 1) {
				t.Errorf("normal-approximation power at %g = %v, %v", p, v, err)
			}
		}
	}
}

package repl

import (
	"context"
	"math"
	"testing"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/power"
	"github.com/kofnlab/kofn/test"
)

// TestMarginCommandsMatchPackage checks that noninf, equiv and the
// large-sample versus methods pass their options through unchanged.
func TestMarginCommandsMatchPackage(t *testing.T) {
	t.Parallel()
	mn := test.MarginOptions{Alternative: test.Higher}
	r1, _ := test.DifferenceMargin(170, 200, 178, 200, -0.1, mn)
	r2, _ := test.RatioMargin(170, 200, 178, 200, 0.9, test.MarginOptions{Alternative: test.Lower, Method: test.MarginMethod(1)})
	r3, _ := test.DifferenceEquivalence(170, 200, 178, 200, -0.1, 0.1, test.MarginOptions{})
	r4, _ := test.TwoSample(17, 40, 9, 38, test.TwoSampleOptions{Method: test.ChiSquareYates, Alternative: test.Higher})
	for line, want := range map[string]float64{
		"noninf 170/200 178/200 diff=-0.1":                                     r1.PValue,
		"noninf 170/200 178/200 ratio=0.9 alt=lower method=farrington-manning": r2.PValue,
		"equiv 170/200 178/200 diff=-0.1..0.1":                                 r3.PValue,
		"versus 17/40 9/38 method=pearson-chi-square-yates alt=higher":         r4.PValue,
	} {
		if got := num(t, runJSON(t, line), "p_value"); got != want {
			t.Errorf("%s: p-value %v, package %v", line, got, want)
		}
	}
	// The pooled z is the signed root of Pearson's chi-square (identity).
	z := num(t, runJSON(t, "versus 17/40 9/38 method=z-pooled"), "statistic.value")
	x2 := num(t, runJSON(t, "versus 17/40 9/38 method=pearson-chi-square"), "statistic.value")
	if math.Abs(z*z-x2) > 1e-12*x2 {
		t.Errorf("z^2 = %v, chi-square %v", z*z, x2)
	}
}

func TestOddsAndDesignMatchPackage(t *testing.T) {
	t.Parallel()
	iv, err := interval.OddsRatio(3, 4, 1, 4, interval.OddsOptions{Method: interval.OddsCornfield})
	if err != nil {
		t.Fatal(err)
	}
	obj := runJSON(t, "odds 3/4 1/4 method=cornfield")
	for path, want := range map[string]float64{"lower": iv.Lower, "upper": iv.Upper, "estimate": iv.Estimate} {
		if got := num(t, obj, path); got != want {
			t.Errorf("Cornfield %s %v, package %v", path, got, want)
		}
	}
	d, err := power.DesignPlan(context.Background(), 0.01, 0.05, power.DesignOptions{Lot: 400})
	if err != nil {
		t.Fatal(err)
	}
	obj = runJSON(t, "accept aql=0.01 rql=0.05 lot=400")
	if got := num(t, obj, "plan.n"); got != float64(d.Plan.SampleSize) {
		t.Errorf("finite-lot design n %v, package %d", got, d.Plan.SampleSize)
	}
}

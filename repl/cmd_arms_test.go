package repl

import (
	"context"
	"testing"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

// TestArmsCommandsMatchPackages pins the numbers of arms, split, shares and
// family to the test and interval packages.
func TestArmsCommandsMatchPackages(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	x, n := []int64{48, 61, 39, 70}, []int64{400, 410, 395, 405}
	ks, _ := test.EqualProportions(ctx, x, n, test.KSampleOptions{})
	obj := runJSON(t, "arms 48/400 61/410 39/395 70/405 control=1")
	if got := num(t, obj, "test.p_value"); got != ks.PValue {
		t.Errorf("arms p %v, package %v", got, ks.PValue)
	}
	vc, _ := test.VersusControl(ctx, x, n, 0, test.ComparisonOptions{})
	if got := num(t, obj, "comparisons.comparisons.2.adjusted_p_value"); got != vc.Comparisons[2].AdjustedPValue {
		t.Errorf("arms adjusted %v, package %v", got, vc.Comparisons[2].AdjustedPValue)
	}
	fam, _ := interval.VersusControl(x, n, 0, interval.ControlOptions{})
	if got := num(t, obj, "intervals.intervals.0.upper"); got != fam.Intervals[0].Upper {
		t.Errorf("arms interval %v, package %v", got, fam.Intervals[0].Upper)
	}
	pe, _ := test.EqualProportions(ctx, []int64{12, 9, 20}, []int64{60, 58, 61}, test.KSampleOptions{Method: test.PearsonChiSquare})
	if got := num(t, runJSON(t, "arms 12/60 9/58 20/61 method=pearson"), "test.p_value"); got != pe.PValue {
		t.Errorf("arms pearson %v, package %v", got, pe.PValue)
	}
	sr, _ := test.SampleRatio(ctx, []int64{20310, 10125, 9904}, []float64{2, 1, 1}, test.SampleRatioOptions{})
	if got := num(t, runJSON(t, "split 20310 10125 9904 weights=2,1,1"), "p_value"); got != sr.PValue {
		t.Errorf("split %v, package %v", got, sr.PValue)
	}
	sh, _ := interval.Multinomial([]int64{41, 27, 19, 8, 5}, interval.MultinomialOptions{})
	if got := num(t, runJSON(t, "shares 41 27 19 8 5"), "intervals.0.upper"); got != sh.Intervals[0].Upper {
		t.Errorf("shares %v, package %v", got, sh.Intervals[0].Upper)
	}
	ad, _ := test.AdjustPValues(ctx, []float64{0.012, 0.041, 0.003, 0.27}, test.Hommel)
	if got := num(t, runJSON(t, "family 0.012 0.041 0.003 0.27 method=hommel"), "adjusted_p_values.1"); got != ad[1] {
		t.Errorf("family %v, package %v", got, ad[1])
	}
}

package test_test

import (
	"context"
	"fmt"

	"github.com/kofnlab/kofn/test"
)

// Invented scenario: a sign-up page tested in four variants with about 400
// visitors each. Do the conversion rates differ, and which variant beats
// the current page (variant 0)?
func ExampleEqualProportions() {
	ctx := context.Background()
	x, n := []int64{48, 61, 39, 70}, []int64{400, 410, 395, 405}
	r, err := test.EqualProportions(ctx, x, n, test.KSampleOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%s: p = %.4f\n", r.Method, r.PValue)
	c, _ := test.VersusControl(ctx, x, n, 0, test.ComparisonOptions{})
	for _, cmp := range c.Comparisons {
		fmt.Printf("variant %d vs 0: difference %+.3f, adjusted p = %.3f\n", cmp.First, cmp.Difference, cmp.AdjustedPValue)
	}
	// Output:
	// Freeman-Halton: p = 0.0125
	// variant 1 vs 0: difference +0.029, adjusted p = 0.515
	// variant 2 vs 0: difference -0.021, adjusted p = 0.515
	// variant 3 vs 0: difference +0.053, adjusted p = 0.110
}

// Invented scenario: an experiment meant to split visitors 50/50 logged
// 52,300 in one arm and 47,700 in the other (X2 = 211.6; SciPy 1.10 gives
// the same p-value, 6.15e-48).
func ExampleSampleRatio() {
	r, err := test.SampleRatio(context.Background(), []int64{52300, 47700}, []float64{1, 1}, test.SampleRatioOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("p = %.3g, mismatch: %v, observed share %.3f\n", r.PValue, r.Mismatch, r.Arms[0].Share)
	// Output:
	// p = 6.15e-48, mismatch: true, observed share 0.523
}

// Invented scenario: a batch of error-rate checks gave these p-values;
// which survive a familywise adjustment, and which a false discovery rate
// one?
func ExampleAdjustPValues() {
	p := []float64{0.012, 0.041, 0.003, 0.27, 0.0004}
	for _, m := range []test.Adjustment{test.Holm, test.Hommel, test.BenjaminiHochberg} {
		adj, err := test.AdjustPValues(context.Background(), p, m)
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("%-18s %.4f\n", m, adj)
	}
	// Output:
	// Holm               [0.0360 0.0820 0.0120 0.2700 0.0020]
	// Hommel             [0.0360 0.0820 0.0120 0.2700 0.0020]
	// Benjamini-Hochberg [0.0200 0.0513 0.0075 0.2700 0.0020]
}

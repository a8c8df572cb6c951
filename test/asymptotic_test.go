package test

import (
	"math"
	"testing"
)

// TestTwoSampleAgresti: Agresti A (2019), An Introduction to Categorical
// Data Analysis, 3rd ed., section 2.2 (counts read; interval recalled,
// recomputed; shared REFERENCES.md): placebo 189/11034 against aspirin
// 104/11037 heart attacks, difference 0.0077 with Wald 95% interval
// (0.005, 0.011). The unpooled z is the difference over the Wald standard
// error, so estimate -+ 1.959964 estimate / z must reproduce the interval.
func TestTwoSampleAgresti(t *testing.T) {
	t.Parallel()
	r, err := TwoSample(189, 11034, 104, 11037, TwoSampleOptions{Method: ZUnpooled})
	if err != nil {
		t.Fatal(err)
	}
	se := r.Estimate / r.Statistic.Value
	lo, hi := r.Estimate-1.959964*se, r.Estimate+1.959964*se
	if math.Round(r.Estimate*1e4) != 77 || math.Round(lo*1e3) != 5 || math.Round(hi*1e3) != 11 {
		t.Errorf("estimate %v, Wald interval (%v, %v)", r.Estimate, lo, hi)
	}
	// The pooled z squared is Pearson's chi-square (identity).
	z, _ := TwoSample(189, 11034, 104, 11037, TwoSampleOptions{})
	x, _ := TwoSample(189, 11034, 104, 11037, TwoSampleOptions{Method: ChiSquare})
	if math.Abs(z.Statistic.Value*z.Statistic.Value-x.Statistic.Value) > 1e-12*x.Statistic.Value || math.Abs(z.PValue-x.PValue) > 1e-12*x.PValue {
		t.Errorf("z^2 = %v, X2 = %v; p %v, %v", z.Statistic.Value*z.Statistic.Value, x.Statistic.Value, z.PValue, x.PValue)
	}
}

func TestTwoSampleDegenerate(t *testing.T) {
	t.Parallel()
	r, _ := TwoSample(0, 5, 0, 7, TwoSampleOptions{})
	if r.PValue != 1 || len(r.Warnings) == 0 {
		t.Errorf("all failures: %+v", r)
	}
	r, _ = TwoSample(0, 5, 7, 7, TwoSampleOptions{Method: ZUnpooled})
	if r.PValue != 0 || !math.IsInf(r.Statistic.Value, -1) || len(r.Warnings) == 0 {
		t.Errorf("unpooled zero variance: %+v", r)
	}
	if _, err := TwoSample(0, 0, 1, 2, TwoSampleOptions{}); err == nil || err.Error() != "test.TwoSample: n1 = 0 is 0; each sample needs at least one trial" {
		t.Errorf("empty sample: %v", err)
	}
}

package power

import (
	"context"
	"testing"

	"github.com/kofnlab/kofn/test"
)

// Goal (issue 5): the whole exact one-sample power curve for n = 1..2000
// in under 2 ms one-sided and 10 ms two-sided.
func BenchmarkOneSampleCurve2000OneSided(b *testing.B) {
	o := OneSampleOptions{Alternative: test.Higher}
	for b.Loop() {
		if _, err := OneSampleCurve(context.Background(), 0.3, 0.35, 2000, o); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkOneSampleCurve2000TwoSided(b *testing.B) {
	for b.Loop() {
		if _, err := OneSampleCurve(context.Background(), 0.3, 0.35, 2000, OneSampleOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkOneSampleCurve2000Central(b *testing.B) {
	o := OneSampleOptions{Rule: test.Central}
	for b.Loop() {
		if _, err := OneSampleCurve(context.Background(), 0.3, 0.35, 2000, o); err != nil {
			b.Fatal(err)
		}
	}
}

// Goal (issue 5): a plan design search under 10 ms.
func BenchmarkDesignPlan(b *testing.B) {
	for b.Loop() {
		if _, err := DesignPlan(context.Background(), 0.01, 0.06, DesignOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkDesignPlanClose(b *testing.B) {
	for b.Loop() {
		if _, err := DesignPlan(context.Background(), 0.01, 0.015, DesignOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

// Goal (issue 5): exact two-sample power at n1 = n2 = 200 under 20 ms.
func BenchmarkTwoSamplePowerFisher200(b *testing.B) {
	c0, n := cpuTime(), 0
	for b.Loop() {
		if _, err := TwoSamplePower(context.Background(), 200, 200, 0.3, 0.45, TwoSampleOptions{}); err != nil {
			b.Fatal(err)
		}
		n++
	}
	b.ReportMetric(float64(cpuTime()-c0)/float64(n), "cpu-ns/op")
}

func BenchmarkTwoSamplePowerZ200(b *testing.B) {
	o := TwoSampleOptions{Test: ZPooledTest}
	c0, n := cpuTime(), 0
	for b.Loop() {
		if _, err := TwoSamplePower(context.Background(), 200, 200, 0.3, 0.45, o); err != nil {
			b.Fatal(err)
		}
		n++
	}
	b.ReportMetric(float64(cpuTime()-c0)/float64(n), "cpu-ns/op")
}

func BenchmarkTwoSamplePowerBarnard200(b *testing.B) {
	o := TwoSampleOptions{Test: BarnardExactTest}
	c0, n := cpuTime(), 0
	for b.Loop() {
		if _, err := TwoSamplePower(context.Background(), 200, 200, 0.3, 0.45, o); err != nil {
			b.Fatal(err)
		}
		n++
	}
	b.ReportMetric(float64(cpuTime()-c0)/float64(n), "cpu-ns/op")
}

func BenchmarkOneSampleNTwoSided(b *testing.B) {
	for b.Loop() {
		if _, err := OneSampleN(context.Background(), 0.3, 0.35, OneSampleOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkPairedN(b *testing.B) {
	for b.Loop() {
		if _, err := PairedN(context.Background(), 0.20, 0.08, PairedOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkPrecisionN(b *testing.B) {
	for b.Loop() {
		if _, err := PrecisionN(context.Background(), 0.3, 0.03, PrecisionOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkWorstPrecisionN05(b *testing.B) {
	for b.Loop() {
		if _, err := WorstPrecisionN(context.Background(), 0.05, PrecisionOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkTwoSampleNFisher(b *testing.B) {
	for b.Loop() {
		if _, err := TwoSampleN(context.Background(), 0.30, 0.55, TwoSampleOptions{}); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkOneSampleCurve2000Blaker(b *testing.B) {
	o := OneSampleOptions{Rule: test.Blaker}
	for b.Loop() {
		if _, err := OneSampleCurve(context.Background(), 0.3, 0.35, 2000, o); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkTwoSamplePower2000 runs the exact two-sample power of each
// exact test at an A/B-test size, 2000 per group, 45% against 50%, CPU
// time per call beside the wall clock.
func BenchmarkTwoSamplePower2000(b *testing.B) {
	for _, t := range []ExactTest{FisherExactTest, ZPooledTest, BarnardExactTest} {
		b.Run(t.String(), func(b *testing.B) {
			o := TwoSampleOptions{Test: t}
			c0, n := cpuTime(), 0
			for b.Loop() {
				if _, err := TwoSamplePower(context.Background(), 2000, 2000, 0.45, 0.50, o); err != nil {
					b.Fatal(err)
				}
				n++
			}
			b.ReportMetric(float64(cpuTime()-c0)/float64(n), "cpu-ns/op")
		})
	}
}

// BenchmarkTwoSampleNLarge runs the exact sample-size search of Fisher's
// test and the z test for 10% against 12% (about 3,800 per group by the
// normal formula; the scan starts at half of it), CPU time beside the
// wall clock.
func BenchmarkTwoSampleNLarge(b *testing.B) {
	for _, t := range []ExactTest{FisherExactTest, ZPooledTest} {
		b.Run(t.String(), func(b *testing.B) {
			o := TwoSampleOptions{Test: t, MaxN: 20000}
			c0, n := cpuTime(), 0
			for b.Loop() {
				if _, err := TwoSampleN(context.Background(), 0.10, 0.12, o); err != nil {
					b.Fatal(err)
				}
				n++
			}
			b.ReportMetric(float64(cpuTime()-c0)/float64(n), "cpu-ns/op")
		})
	}
}

// BenchmarkTwoSampleN20000 runs the exact sample-size search of Fisher's
// test and the z test for 10% against 10.9% (about 18,600 per group by
// the normal formula; the scan runs over some 14,000 group sizes from
// half of it), CPU time beside the wall clock.
func BenchmarkTwoSampleN20000(b *testing.B) {
	for _, t := range []ExactTest{FisherExactTest, ZPooledTest} {
		b.Run(t.String(), func(b *testing.B) {
			o := TwoSampleOptions{Test: t, MaxN: 40000}
			c0, n := cpuTime(), 0
			for b.Loop() {
				if _, err := TwoSampleN(context.Background(), 0.10, 0.109, o); err != nil {
					b.Fatal(err)
				}
				n++
			}
			b.ReportMetric(float64(cpuTime()-c0)/float64(n), "cpu-ns/op")
		})
	}
}

// BenchmarkTwoSampleNBarnard runs the exact sample-size search of
// Barnard's test for 20% against 35% (about 140 per group by the normal
// formula), CPU time beside the wall clock.
func BenchmarkTwoSampleNBarnard(b *testing.B) {
	o := TwoSampleOptions{Test: BarnardExactTest}
	c0, n := cpuTime(), 0
	for b.Loop() {
		if _, err := TwoSampleN(context.Background(), 0.20, 0.35, o); err != nil {
			b.Fatal(err)
		}
		n++
	}
	b.ReportMetric(float64(cpuTime()-c0)/float64(n), "cpu-ns/op")
}

package test

import (
	"context"
	"testing"
)

// BenchmarkUnconditional runs Barnard and Boschloo (two-sided, the
// default point-probability ordering) at A/B-test sizes: 2000 x 2000 and
// 20,000 x 20,000 with success rates near 45% and 48%, reporting the CPU
// time per call (cpu-ns/op) beside the wall clock.
func BenchmarkUnconditional(b *testing.B) {
	for _, c := range []struct {
		name           string
		k1, n1, k2, n2 int64
	}{
		{"2000x2000", 900, 2000, 960, 2000},
		{"20000x20000", 9000, 20000, 9600, 20000},
	} {
		for _, t := range []struct {
			name string
			f    func(context.Context, int64, int64, int64, int64, UnconditionalOptions) (Result, error)
		}{{"Barnard", Barnard}, {"Boschloo", Boschloo}} {
			b.Run(t.name+"/"+c.name, func(b *testing.B) {
				c0, n := cpuTime(), 0
				for b.Loop() {
					if _, err := t.f(context.Background(), c.k1, c.n1, c.k2, c.n2, UnconditionalOptions{}); err != nil {
						b.Fatal(err)
					}
					n++
				}
				b.ReportMetric(float64(cpuTime()-c0)/float64(n), "cpu-ns/op")
			})
		}
	}
}

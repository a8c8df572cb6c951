package test

import (
	"context"
	"math"
	"testing"
)

// TestBoschlooStatistic: the ordering statistic of the observed table,
// computed from lgamma over the whole margin, equals Fisher's p-value
// computed by Fisher through binom.Hyper; p-values lie in [0, 1]. Values
// are checked against SciPy in the golden test.
func TestBoschlooStatistic(t *testing.T) {
	t.Parallel()
	for _, c := range [][4]int64{{7, 15, 12, 15}, {3, 4, 1, 4}, {0, 10, 5, 12}, {30, 60, 20, 45}} {
		for _, alt := range []Alternative{TwoSided, Lower, Higher} {
			for _, m := range []TwoSidedRule{PointProbability, Central} {
				r, err := Boschloo(context.Background(), c[0], c[1], c[2], c[3], UnconditionalOptions{Alternative: alt, Rule: m})
				if err != nil {
					t.Fatal(err)
				}
				f, _ := Fisher(c[0], c[1], c[2], c[3], FisherOptions{Alternative: alt, Rule: m})
				if math.Abs(r.Statistic.Value-f.PValue) > 1e-10*f.PValue {
					t.Errorf("%v %v %v: statistic %v, Fisher p %v", c, alt, m, r.Statistic.Value, f.PValue)
				}
				if r.PValue < 0 || r.PValue > 1 {
					t.Errorf("%v %v: p = %v", c, alt, r.PValue)
				}
			}
		}
	}
}

func BenchmarkBoschloo100(b *testing.B) {
	c0, n := cpuTime(), 0
	for b.Loop() {
		_, _ = Boschloo(context.Background(), 40, 100, 55, 100, UnconditionalOptions{})
		n++
	}
	b.ReportMetric(float64(cpuTime()-c0)/float64(n), "cpu-ns/op")
}

func BenchmarkBoschloo500(b *testing.B) {
	c0, n := cpuTime(), 0
	for b.Loop() {
		_, _ = Boschloo(context.Background(), 200, 500, 235, 500, UnconditionalOptions{})
		n++
	}
	b.ReportMetric(float64(cpuTime()-c0)/float64(n), "cpu-ns/op")
}

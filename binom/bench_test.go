//go:build unix

package binom

import (
	"fmt"
	"math"
	"syscall"
	"testing"
	"time"
)

// cpuTime returns the CPU time the process has used. The benchmarks report
// it per operation as cpu-ns/op beside the wall-clock ns/op: on a shared
// machine the wall clock also counts time spent waiting for a core.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

// loop runs f under b.Loop and reports the CPU time per call.
func loop(b *testing.B, f func()) {
	b.ReportAllocs()
	c0 := cpuTime()
	n := 0
	for b.Loop() {
		f()
		n++
	}
	if n > 0 {
		b.ReportMetric(float64(cpuTime()-c0)/float64(n), "cpu-ns/op")
	}
}

// benchPoints are the distributions and points the benchmarks time: for
// each N, P = 0.3 at the mean ("bulk"), 1.5 standard deviations out
// ("shoulder") and about 20 standard deviations below and above ("lowtail",
// "tail"; clamped to the support for small N, where they are 1 and N-1).
// The small N (10, 20, 100, 1000) are where most calls are made.
func benchPoints() []struct {
	name string
	d    Dist
	k    int64
} {
	var out []struct {
		name string
		d    Dist
		k    int64
	}
	for _, n := range []int64{10, 20, 100, 1e3, 1e6, 1e9, 1e12} {
		d := Dist{N: n, P: 0.3}
		mean, sd := d.Mean(), d.StdDev()
		for _, pt := range []struct {
			name string
			z    float64
		}{{"bulk", 0}, {"shoulder", 1.5}, {"lowtail", -20}, {"tail", 20}} {
			k := int64(math.Round(mean + pt.z*sd))
			k = min(max(k, 1), n-1)
			out = append(out, struct {
				name string
				d    Dist
				k    int64
			}{fmt.Sprintf("n=%.0e/%s", float64(n), pt.name), d, k})
		}
	}
	return out
}

var sink float64
var sinkInt int64

func benchFloat(b *testing.B, f func(d Dist, k int64) float64) {
	for _, c := range benchPoints() {
		b.Run(c.name, func(b *testing.B) {
			loop(b, func() { sink = f(c.d, c.k) })
		})
	}
}

func BenchmarkProb(b *testing.B)    { benchFloat(b, Dist.Prob) }
func BenchmarkLogProb(b *testing.B) { benchFloat(b, Dist.LogProb) }
func BenchmarkCDF(b *testing.B)     { benchFloat(b, Dist.CDF) }
func BenchmarkLogCDF(b *testing.B)  { benchFloat(b, Dist.LogCDF) }
func BenchmarkSurvival(b *testing.B) {
	benchFloat(b, Dist.Survival)
}
func BenchmarkLogSurvival(b *testing.B) { benchFloat(b, Dist.LogSurvival) }

// BenchmarkProbRange times a range of one standard deviation on either side
// of k (a narrow range in the bulk is the hard case for cancellation).
func BenchmarkProbRange(b *testing.B) {
	benchFloat(b, func(d Dist, k int64) float64 {
		h := int64(d.StdDev())
		return d.ProbRange(k-h, k+h)
	})
}

func BenchmarkLogProbRange(b *testing.B) {
	benchFloat(b, func(d Dist, k int64) float64 {
		h := int64(d.StdDev())
		return d.LogProbRange(k-h, k+h)
	})
}

func benchQuantile(b *testing.B, at func(d Dist, k int64) float64, f func(d Dist, q float64) int64) {
	for _, c := range benchPoints() {
		q := at(c.d, c.k)
		b.Run(c.name, func(b *testing.B) {
			loop(b, func() { sinkInt = f(c.d, q) })
		})
	}
}

// The quantile benchmarks invert the tail value at each benchmark point.
func BenchmarkQuantile(b *testing.B)      { benchQuantile(b, Dist.CDF, Dist.Quantile) }
func BenchmarkUpperQuantile(b *testing.B) { benchQuantile(b, Dist.Survival, Dist.UpperQuantile) }
func BenchmarkLogQuantile(b *testing.B)   { benchQuantile(b, Dist.LogCDF, Dist.LogQuantile) }
func BenchmarkLogUpperQuantile(b *testing.B) {
	benchQuantile(b, Dist.LogSurvival, Dist.LogUpperQuantile)
}

package binom

import (
	"fmt"
	"math/rand/v2"
	"testing"
)

var benchSink float64

// benchHypers are populations at totals 1e3 and 1e6 (half successes,
// drawing 40%), with a value one sd below the mean and one 10 sd below.
var benchHypers = []struct {
	name string
	h    Hyper
}{
	{"N=1e3", Hyper{1000, 500, 400}},
	{"N=1e6", Hyper{1000000, 500000, 400000}},
}

func BenchmarkHyperLogProb(b *testing.B) {
	for _, c := range benchHypers {
		x := int64(c.h.Mean())
		b.Run(c.name, func(b *testing.B) {
			for b.Loop() {
				benchSink = c.h.LogProb(x)
			}
		})
	}
}

func BenchmarkHyperLogCDF(b *testing.B) {
	for _, c := range benchHypers {
		for _, z := range []float64{-1, -10} {
			k := int64(c.h.Mean() + z*c.h.StdDev())
			b.Run(fmt.Sprintf("%s/z=%g", c.name, z), func(b *testing.B) {
				for b.Loop() {
					benchSink = c.h.LogCDF(k)
				}
			})
		}
	}
}

func BenchmarkHyperLogSurvival(b *testing.B) {
	for _, c := range benchHypers {
		for _, z := range []float64{-1, 10} {
			k := int64(c.h.Mean() + z*c.h.StdDev())
			b.Run(fmt.Sprintf("%s/z=%g", c.name, z), func(b *testing.B) {
				for b.Loop() {
					benchSink = c.h.LogSurvival(k)
				}
			})
		}
	}
}

func BenchmarkHyperQuantile(b *testing.B) {
	for _, c := range benchHypers {
		b.Run(c.name, func(b *testing.B) {
			for b.Loop() {
				benchSink = float64(c.h.Quantile(0.025))
			}
		})
	}
}

func BenchmarkNoncentralMean(b *testing.B) {
	for _, c := range benchHypers {
		d := NoncentralHyper{c.h.Total, c.h.Successes, c.h.Draws, 2.5}
		b.Run(c.name, func(b *testing.B) {
			for b.Loop() {
				benchSink = d.Mean()
			}
		})
	}
}

func BenchmarkNoncentralLogCDF(b *testing.B) {
	for _, c := range benchHypers {
		d := NoncentralHyper{c.h.Total, c.h.Successes, c.h.Draws, 2.5}
		k := int64(d.Mean() - 3*c.h.StdDev())
		b.Run(c.name, func(b *testing.B) {
			for b.Loop() {
				benchSink = d.LogCDF(k)
			}
		})
	}
}

func BenchmarkHyperRand(b *testing.B) {
	for _, c := range benchHypers {
		r := rand.New(rand.NewPCG(1, 2))
		b.Run(c.name, func(b *testing.B) {
			for b.Loop() {
				benchSink = float64(c.h.Rand(r))
			}
		})
	}
}

func BenchmarkHyperEntropy(b *testing.B) {
	wide := Hyper{1<<34 - 7, 1<<33 + 3, 1<<33 - 5} // sd 32768, MaxHyperStdDev
	for _, c := range append(benchHypers[:len(benchHypers):len(benchHypers)], struct {
		name string
		h    Hyper
	}{"sd=32768", wide}) {
		b.Run(c.name, func(b *testing.B) {
			for b.Loop() {
				benchSink = c.h.Entropy()
			}
		})
	}
}

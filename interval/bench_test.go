package interval_test

import (
	"context"
	"testing"

	"github.com/kofnlab/kofn/interval"
)

// Benchmarks for the speed goals: closed forms under 200 ns,
// Clopper-Pearson and Jeffreys under 3 us, Blaker and the two-sample score
// intervals under 50 us at n = 1000, the exact conditional odds-ratio
// interval at a total of 1e6 under 10 ms, coverage at n = 1e4 under 100 us
// per p in a sweep.

var sink interval.Interval

func benchProportion(b *testing.B, k, n int64, m interval.Method) {
	opt := interval.Options{Method: m}
	for b.Loop() {
		sink, _ = interval.Proportion(k, n, opt)
	}
}

func BenchmarkWilson(b *testing.B)         { benchProportion(b, 37, 1000, interval.Wilson) }
func BenchmarkAgrestiCoull(b *testing.B)   { benchProportion(b, 37, 1000, interval.AgrestiCoull) }
func BenchmarkWilsonCC(b *testing.B)       { benchProportion(b, 37, 1000, interval.WilsonCC) }
func BenchmarkLogit(b *testing.B)          { benchProportion(b, 37, 1000, interval.Logit) }
func BenchmarkClopperPearson(b *testing.B) { benchProportion(b, 37, 1000, interval.ClopperPearson) }
func BenchmarkClopperPearsonN1e9(b *testing.B) {
	benchProportion(b, 5, 1e9, interval.ClopperPearson)
}
func BenchmarkJeffreys(b *testing.B)        { benchProportion(b, 37, 1000, interval.Jeffreys) }
func BenchmarkMidP(b *testing.B)            { benchProportion(b, 37, 1000, interval.MidP) }
func BenchmarkLikelihoodRatio(b *testing.B) { benchProportion(b, 37, 1000, interval.LikelihoodRatio) }
func BenchmarkBlaker(b *testing.B)          { benchProportion(b, 370, 1000, interval.Blaker) }

func BenchmarkDifferenceMN(b *testing.B) {
	for b.Loop() {
		sink, _ = interval.Difference(560, 1000, 480, 1000, interval.DiffOptions{Method: interval.DiffMiettinenNurminen})
	}
}

func BenchmarkRatioKoopman(b *testing.B) {
	for b.Loop() {
		sink, _ = interval.Ratio(560, 1000, 480, 1000, interval.RatioOptions{})
	}
}

func BenchmarkOddsMN(b *testing.B) {
	for b.Loop() {
		sink, _ = interval.OddsRatio(560, 1000, 480, 1000, interval.OddsOptions{})
	}
}

func BenchmarkPairedTango(b *testing.B) {
	for b.Loop() {
		sink, _ = interval.PairedDifference(400, 60, 40, 500, interval.PairedOptions{Method: interval.PairedTango})
	}
}

func BenchmarkCornfieldTotal1e6(b *testing.B) {
	for b.Loop() {
		sink, _ = interval.OddsRatio(2600, 500000, 2400, 500000, interval.OddsOptions{Method: interval.OddsCornfield})
	}
}

func BenchmarkCoverageCurveN1e4(b *testing.B) {
	// Per p of a 100-point sweep at n = 1e4 (Wilson); ns/op / 100 is the
	// cost per p including the one-off interval table.
	ps := make([]float64, 100)
	for i := range ps {
		ps[i] = (float64(i) + 0.5) / 100
	}
	for b.Loop() {
		_, _, _ = interval.CoverageCurve(context.Background(), 10000, ps, interval.Options{})
	}
}

func BenchmarkCoverageN1e4(b *testing.B) {
	for b.Loop() {
		_, _ = interval.Coverage(context.Background(), 10000, 0.3, interval.Options{})
	}
}

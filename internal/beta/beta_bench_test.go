package beta

import (
	"math"
	"testing"
)

func BenchmarkLogCDF(b *testing.B) {
	for b.Loop() {
		LogCDF(37.5, 963.5, 0.03, 0.97)
	}
}

func BenchmarkLogUpper(b *testing.B) {
	for b.Loop() {
		LogUpper(37.5, 963.5, 0.05, 0.95)
	}
}

func BenchmarkQuantile(b *testing.B) {
	for b.Loop() {
		Quantile(37.5, 963.5, math.Log(0.025), false)
	}
}

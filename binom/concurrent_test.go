package binom_test

import (
	"testing"

	"github.com/kofnlab/kofn/internal/hammer"

	"github.com/kofnlab/kofn/binom"
)

// TestConcurrentUse hammers shared distribution values from 16 goroutines
// and checks every answer against the one computed alone; under
// "go test -race" (run by .ci/run) it also proves the absence of data races.
func TestConcurrentUse(t *testing.T) {
	t.Parallel()
	d, _ := binom.New(1000, 0.3)
	h, _ := binom.NewHyper(500, 120, 60)
	f := d.Float(nil)
	hammer.Run(t, func() []float64 {
		_ = d.Rand(nil)
		return []float64{d.LogProb(310), d.LogCDF(250), d.LogSurvival(350), float64(d.Quantile(0.95)), h.CDF(10), f.Survival(299.5)}
	})
}

package power_test

import (
	"context"
	"testing"

	"github.com/kofnlab/kofn/internal/hammer"

	"github.com/kofnlab/kofn/power"
	"github.com/kofnlab/kofn/test"
)

// TestConcurrentUse plans from 16 goroutines with shared options and
// checks every answer against the one computed alone; under "go test
// -race" (run by .ci/run) it also proves the absence of data races.
func TestConcurrentUse(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	o := power.OneSampleOptions{Rule: test.Central}
	one := func() []float64 {
		a, _ := power.OneSampleN(ctx, 0.2, 0.4, o)
		b, _ := power.TwoSampleNormalN(0.05, 0.10, power.TwoSampleOptions{})
		c, _ := power.DemonstrationTrials(1, 0.99, 0.95)
		d, _ := power.AcceptProb(power.Plan{SampleSize: 89, AcceptNumber: 2}, 0.02)
		return []float64{float64(a.Stable), float64(b.N), float64(c.Trials), d}
	}
	hammer.Run(t, one)
}

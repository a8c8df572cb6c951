package test_test

import (
	"context"
	"testing"

	"github.com/kofnlab/kofn/internal/hammer"

	"github.com/kofnlab/kofn/test"
)

// TestConcurrentUse runs tests from 16 goroutines with shared options and
// checks every answer against the one computed alone; under "go test
// -race" (run by .ci/run) it also proves the absence of data races.
func TestConcurrentUse(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	uo := test.UnconditionalOptions{Alternative: test.Lower}
	one := func() []float64 {
		a, _ := test.Binomial(9, 200, 0.02, test.BinomialOptions{Rule: test.Blaker})
		b, _ := test.Fisher(7, 15, 12, 15, test.FisherOptions{})
		c, _ := test.Barnard(ctx, 7, 15, 12, 15, uo)
		d, _ := test.McNemar(4, 13, test.McNemarOptions{MidP: true})
		return []float64{a.PValue, a.Interval.Lower, b.PValue, c.PValue, d.PValue}
	}
	hammer.Run(t, one)
}

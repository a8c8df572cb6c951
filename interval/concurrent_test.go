package interval_test

import (
	"context"
	"testing"

	"github.com/kofnlab/kofn/internal/hammer"

	"github.com/kofnlab/kofn/interval"
)

// TestConcurrentUse calls the interval functions from 16 goroutines with
// shared options and checks every answer against the one computed alone;
// under "go test -race" (run by .ci/run) it also proves the absence of
// data races.
func TestConcurrentUse(t *testing.T) {
	t.Parallel()
	opt := interval.Options{Method: interval.Blaker, Level: 0.9}
	one := func() []float64 {
		a, _ := interval.Proportion(17, 40, opt)
		b, _ := interval.Difference(56, 70, 48, 80, interval.DiffOptions{})
		c, _ := interval.Coverage(context.Background(), 30, 0.2, opt)
		return []float64{a.Lower, a.Upper, b.Lower, b.Upper, c.Coverage}
	}
	hammer.Run(t, one)
}

package power_test

import (
	"context"
	"encoding/json"
	"strconv"
	"sync"
	"testing"

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
	hammer(t, one, one())
}

// hammer runs f from 16 goroutines, 50 times each, and reports any answer
// that differs from want (compared through JSON, so NaN equals NaN).
func hammer(t *testing.T, f func() []float64, want []float64) {
	t.Helper()
	wb, _ := json.Marshal(fmtAll(want))
	var wg sync.WaitGroup
	errs := make(chan string, 16)
	for range 16 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for range 50 {
				if gb, _ := json.Marshal(fmtAll(f())); string(gb) != string(wb) {
					errs <- string(gb)
					return
				}
			}
		}()
	}
	wg.Wait()
	close(errs)
	for e := range errs {
		t.Errorf("concurrent answer %s, alone %s", e, wb)
	}
}

// fmtAll makes floats JSON-safe for comparison.
func fmtAll(v []float64) []string {
	out := make([]string, len(v))
	for i, x := range v {
		out[i] = strconv.FormatFloat(x, 'g', -1, 64)
	}
	return out
}

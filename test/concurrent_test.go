package test_test

import (
	"context"
	"encoding/json"
	"strconv"
	"sync"
	"testing"

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

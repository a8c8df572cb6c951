package interval_test

import (
	"context"
	"encoding/json"
	"strconv"
	"sync"
	"testing"

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

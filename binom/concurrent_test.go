package binom_test

import (
	"encoding/json"
	"strconv"
	"sync"
	"testing"

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
	want := []float64{d.LogProb(310), d.LogCDF(250), d.LogSurvival(350), float64(d.Quantile(0.95)), h.CDF(10), f.Survival(299.5)}
	hammer(t, func() []float64 {
		_ = d.Rand(nil)
		return []float64{d.LogProb(310), d.LogCDF(250), d.LogSurvival(350), float64(d.Quantile(0.95)), h.CDF(10), f.Survival(299.5)}
	}, want)
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

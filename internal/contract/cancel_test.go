package contract

import (
	"context"
	"errors"
	"fmt"
	"os"
	"sort"
	"strings"
	"testing"
	"time"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/power"
)

// cancelCase is one context-taking function called at its worst documented
// size (the largest n or the finest grid its limits accept, with an effect
// or a precision that makes the search run to its limit).
type cancelCase struct {
	name string
	size string // the size, in words, for the report
	run  func(ctx context.Context) error
}

// cancelCases lists every context-taking function of interval and power
// (the unconditional tests and the exact two-sample power and search have
// their own measurements with their rewrite; binom has no context-taking
// function: its limits refuse work beyond about 10 ms instead).
func cancelCases() []cancelCase {
	blaker := interval.Options{Method: interval.Blaker}
	grid := make([]float64, 10_000)
	for i := range grid {
		grid[i] = (float64(i) + 0.5) / float64(len(grid))
	}
	err := func(_ any, err error) error { return err }
	err3 := func(_, _ any, err error) error { return err }
	return []cancelCase{
		{"interval.Coverage", "n = MaxCoverageN = 1e7, Blaker, p = 0.5", func(ctx context.Context) error {
			return err(interval.Coverage(ctx, interval.MaxCoverageN, 0.5, blaker))
		}},
		{"interval.CoverageOverN", "n = 1e7-1000..1e7, Blaker, p = 0.5", func(ctx context.Context) error {
			return err3(interval.CoverageOverN(ctx, interval.MaxCoverageN-1000, interval.MaxCoverageN, 0.5, blaker))
		}},
		{"interval.CoverageCurve", "n = MaxCurveN = 1e6, 1e4 points, Blaker", func(ctx context.Context) error {
			return err3(interval.CoverageCurve(ctx, interval.MaxCurveN, grid, blaker))
		}},
		{"power.OneSampleN", "p 0.5 vs 0.5001, MaxN = MaxSearchN = 1e7", func(ctx context.Context) error {
			return err(power.OneSampleN(ctx, 0.5, 0.5001, power.OneSampleOptions{MaxN: power.MaxSearchN}))
		}},
		{"power.OneSampleCurve", "p 0.5 vs 0.6, nMax = MaxSearchN = 1e7", func(ctx context.Context) error {
			return err(power.OneSampleCurve(ctx, 0.5, 0.6, power.MaxSearchN, power.OneSampleOptions{MaxN: power.MaxSearchN}))
		}},
		{"power.PairedN", "0.1 vs 0.1001, MaxN = MaxSearchN = 1e7", func(ctx context.Context) error {
			return err(power.PairedN(ctx, 0.1, 0.1001, power.PairedOptions{MaxN: power.MaxSearchN}))
		}},
		{"power.PairedPower", "n = MaxSearchN = 1e7 pairs, 0.3 vs 0.31", func(ctx context.Context) error {
			return err(power.PairedPower(ctx, power.MaxSearchN, 0.3, 0.31, power.PairedOptions{}))
		}},
		{"power.PrecisionN", "p = 0.5, half-width 1e-4, MaxN = MaxSearchN = 1e7", func(ctx context.Context) error {
			return err(power.PrecisionN(ctx, 0.5, 1e-4, power.PrecisionOptions{MaxN: power.MaxSearchN}))
		}},
		{"power.WorstPrecisionN", "half-width 0.002, MaxN = MaxWorstN = 2e5", func(ctx context.Context) error {
			return err(power.WorstPrecisionN(ctx, 0.002, power.PrecisionOptions{MaxN: power.MaxWorstN}))
		}},
		{"power.WorstPrecisionAt", "n = MaxWorstN = 2e5, half-width 0.001", func(ctx context.Context) error {
			return err(power.WorstPrecisionAt(ctx, power.MaxWorstN, 0.001))
		}},
		{"power.DesignPlan", "AQL 0.01, RQL 0.0101, MaxN = MaxPlanN = 2^40", func(ctx context.Context) error {
			return err(power.DesignPlan(ctx, 0.01, 0.0101, power.DesignOptions{MaxN: power.MaxPlanN}))
		}},
		{"power.ExpectedWidthN", "p = 0.5, half-width 1e-6, Blaker, MaxN = MaxWidthN = 2^40", func(ctx context.Context) error {
			return err(power.ExpectedWidthN(ctx, 0.5, 1e-6, power.WidthOptions{Interval: blaker, MaxN: power.MaxWidthN}))
		}},
		{"power.AssuranceN", "p = 0.5, half-width 1e-6, Blaker, MaxN = MaxWidthN = 2^40", func(ctx context.Context) error {
			return err(power.AssuranceN(ctx, 0.5, 1e-6, power.WidthOptions{Interval: blaker, MaxN: power.MaxWidthN}))
		}},
	}
}

// TestCancelLatency measures, for every context-taking function at its
// worst documented size, the time from cancellation to return, at several
// moments into the run, and reports the table. It fails when a call
// finishes before it can be cancelled (the case is not slow enough to
// measure anything), when it returns something other than the context's
// error, or when a return takes more than 100 ms, ten times the 10 ms the
// rule asks for (the margin absorbs a loaded two-core machine; the figures
// are in the log). Run it with KOFN_CANCEL_LATENCY=1; it takes about ten
// seconds.
func TestCancelLatency(t *testing.T) {
	if os.Getenv("KOFN_CANCEL_LATENCY") == "" {
		t.Skip("set KOFN_CANCEL_LATENCY=1 to measure cancellation latency")
	}
	var rows []string
	for _, c := range cancelCases() {
		var worst time.Duration
		for _, after := range []time.Duration{20 * time.Millisecond, 60 * time.Millisecond, 150 * time.Millisecond} {
			ctx, cancel := context.WithCancel(context.Background())
			done := make(chan error, 1)
			go func() { done <- c.run(ctx) }()
			select {
			case err := <-done:
				cancel()
				t.Errorf("%s (%s) finished after less than %v (err %v): not slow enough to measure", c.name, c.size, after, err)
				continue
			case <-time.After(after):
			}
			t0 := time.Now()
			cancel()
			err := <-done
			lat := time.Since(t0)
			if !errors.Is(err, context.Canceled) {
				t.Errorf("%s: cancelled call returned %v, want the context's error", c.name, err)
			}
			worst = max(worst, lat)
		}
		if worst > 100*time.Millisecond {
			t.Errorf("%s (%s): returned %v after cancellation", c.name, c.size, worst)
		}
		rows = append(rows, fmt.Sprintf("| %s | %s | %.2f ms |", c.name, c.size, float64(worst.Microseconds())/1000))
	}
	sort.Strings(rows)
	t.Logf("worst of three cancellations (at 20, 60, 150 ms into the run):\n| function | size | latency |\n|---|---|---|\n%s", strings.Join(rows, "\n"))
}

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
	"github.com/kofnlab/kofn/test"
)

// cancelCase is one context-taking function called at its worst documented
// size (the largest n or the finest grid its limits accept, with an effect
// or a precision that makes the search run to its limit).
type cancelCase struct {
	name string
	size string // the size, in words, for the report
	run  func(ctx context.Context) error
	at   []time.Duration // when to cancel, into the run; nil: 20, 40, 60, 100, 150 ms
}

// cancelCases lists every context-taking function of interval and power
// whose cost grows with a documented limit (the unconditional tests have
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
		}, nil},
		{"interval.CoverageOverN", "n = 1e7-1000..1e7, Blaker, p = 0.5", func(ctx context.Context) error {
			return err3(interval.CoverageOverN(ctx, interval.MaxCoverageN-1000, interval.MaxCoverageN, 0.5, blaker))
		}, nil},
		{"interval.CoverageCurve", "n = MaxCurveN = 1e6, 1e4 points, Blaker", func(ctx context.Context) error {
			return err3(interval.CoverageCurve(ctx, interval.MaxCurveN, grid, blaker))
		}, nil},
		{"interval.CommonRiskDifference", "MaxScoreStrata strata of 40 + 40, inverse-variance score weights", func(ctx context.Context) error {
			return err(interval.CommonRiskDifference(ctx, manyStrata(interval.MaxScoreStrata), interval.CommonOptions{Method: interval.CommonStratifiedScore, Weights: interval.WeightsInverseVariance}))
		}, nil},
		{"interval.CommonRiskRatio", "MaxScoreStrata strata of 40 + 40, Mantel-Haenszel weights", func(ctx context.Context) error {
			return err(interval.CommonRiskRatio(ctx, manyStrata(interval.MaxScoreStrata), interval.CommonOptions{Method: interval.CommonStratifiedScore}))
		}, nil},
		{"interval.CommonOddsRatio", "MaxScoreStrata strata of 40 + 40, inverse-variance score weights", func(ctx context.Context) error {
			return err(interval.CommonOddsRatio(ctx, manyStrata(interval.MaxScoreStrata), interval.CommonOptions{Method: interval.CommonStratifiedScore, Weights: interval.WeightsInverseVariance}))
		}, nil},
		{"power.TwoSampleN Fisher", "0.1 vs 0.109, MaxN = 1e6 (first size near 18,000 per group)", func(ctx context.Context) error {
			return err(power.TwoSampleN(ctx, 0.1, 0.109, power.TwoSampleOptions{MaxN: 1_000_000}))
		}, nil},
		{"power.TwoSampleN z", "0.1 vs 0.109, MaxN = 1e6", func(ctx context.Context) error {
			return err(power.TwoSampleN(ctx, 0.1, 0.109, power.TwoSampleOptions{MaxN: 1_000_000, Test: power.ZPooledTest}))
		}, nil},
		{"power.TwoSampleN Barnard", "0.1 vs 0.12, MaxN = 1e6 (first size near 4,000 per group)", func(ctx context.Context) error {
			return err(power.TwoSampleN(ctx, 0.1, 0.12, power.TwoSampleOptions{MaxN: 1_000_000, Test: power.BarnardExactTest}))
		}, nil},
		{"power.TwoSamplePower Barnard", "20,000 x 20,000, 0.1 vs 0.11", func(ctx context.Context) error {
			return err(power.TwoSamplePower(ctx, 20_000, 20_000, 0.1, 0.11, power.TwoSampleOptions{Test: power.BarnardExactTest}))
		}, nil},
		{"power.OneSampleN", "p 0.5 vs 0.5001, MaxN = MaxSearchN = 1e7", func(ctx context.Context) error {
			return err(power.OneSampleN(ctx, 0.5, 0.5001, power.OneSampleOptions{MaxN: power.MaxSearchN}))
		}, nil},
		{"power.OneSampleCurve", "p 0.5 vs 0.6, nMax = MaxSearchN = 1e7", func(ctx context.Context) error {
			return err(power.OneSampleCurve(ctx, 0.5, 0.6, power.MaxSearchN, power.OneSampleOptions{MaxN: power.MaxSearchN}))
		}, nil},
		{"power.PairedN", "0.1 vs 0.1001, MaxN = MaxSearchN = 1e7", func(ctx context.Context) error {
			return err(power.PairedN(ctx, 0.1, 0.1001, power.PairedOptions{MaxN: power.MaxSearchN}))
		}, nil},
		{"power.PairedPower", "n = MaxSearchN = 1e7 pairs, 0.3 vs 0.31", func(ctx context.Context) error {
			return err(power.PairedPower(ctx, power.MaxSearchN, 0.3, 0.31, power.PairedOptions{}))
		}, []time.Duration{5 * time.Millisecond, 10 * time.Millisecond, 15 * time.Millisecond, 20 * time.Millisecond, 30 * time.Millisecond}}, // the whole call takes about 70 ms
		{"power.PrecisionN", "p = 0.5, half-width 1e-4, MaxN = MaxSearchN = 1e7", func(ctx context.Context) error {
			return err(power.PrecisionN(ctx, 0.5, 1e-4, power.PrecisionOptions{MaxN: power.MaxSearchN}))
		}, nil},
		{"power.WorstPrecisionN", "half-width 0.002, MaxN = MaxWorstN = 2e5", func(ctx context.Context) error {
			return err(power.WorstPrecisionN(ctx, 0.002, power.PrecisionOptions{MaxN: power.MaxWorstN}))
		}, nil},
		{"power.WorstPrecisionAt", "n = MaxWorstN = 2e5, half-width 0.001", func(ctx context.Context) error {
			return err(power.WorstPrecisionAt(ctx, power.MaxWorstN, 0.001))
		}, nil},
		{"power.DesignPlan", "AQL 0.01, RQL 0.0101, MaxN = MaxPlanN = 2^40", func(ctx context.Context) error {
			return err(power.DesignPlan(ctx, 0.01, 0.0101, power.DesignOptions{MaxN: power.MaxPlanN}))
		}, nil},
		{"power.ExpectedWidthN", "p = 0.5, half-width 1e-6, Blaker, MaxN = MaxWidthN = 2^40", func(ctx context.Context) error {
			return err(power.ExpectedWidthN(ctx, 0.5, 1e-6, power.WidthOptions{Interval: blaker, MaxN: power.MaxWidthN}))
		}, nil},
		{"interval.SequenceErrorProb", "horizon = MaxSequenceHorizon = 1e6, p = 0.5", func(ctx context.Context) error {
			return err(interval.SequenceErrorProb(ctx, 0.5, interval.MaxSequenceHorizon, 0.95, interval.SequenceOptions{}))
		}, nil},
		{"power.SPRTOperating", "p0 0.5 vs p1 0.505, MaxN = 1e6 (4e8 of MaxSPRTWork's 4e9 updates)", func(ctx context.Context) error {
			s, e := test.NewSPRT(0.5, 0.505, 0.05, 0.1, test.SPRTOptions{MaxN: 1_000_000})
			if e != nil {
				return e
			}
			return err(power.SPRTOperating(ctx, s, 0.5))
		}, nil},
		{"power.DifferenceSequenceErrorProb", "horizon = MaxDifferenceHorizon = 5000 per group, p 0.5 and 0.5", func(ctx context.Context) error {
			s, e := test.NewDifferenceSequence(0, 0.05, test.DifferenceSequenceOptions{})
			if e != nil {
				return e
			}
			return err(power.DifferenceSequenceErrorProb(ctx, s, 0.5, 0.5, power.MaxDifferenceHorizon))
		}, nil},
		{"power.SequentialOneN", "p 0.5 vs 0.53, 5 looks, maxN = MaxStageWiseN = 2e4", func(ctx context.Context) error {
			return err(power.SequentialOneN(ctx, 0.5, 0.53, 0.05, 0.1, 5, interval.MaxStageWiseN, power.SequentialOptions{}))
		}, nil},
		{"power.Simon", "p 0.5 vs 0.56, MaxN = MaxSimonN = 1000", func(ctx context.Context) error {
			return err(power.Simon(ctx, 0.5, 0.56, 0.05, 0.2, power.SimonOptions{MaxN: power.MaxSimonN}))
		}, nil},
		{"interval.StageWise", "two looks, final N = MaxStageWiseN = 2e4", func(ctx context.Context) error {
			looks := []interval.Look{{N: 10_000, Futility: 4900, Efficacy: 5300}, {N: interval.MaxStageWiseN, Futility: 10_100, Efficacy: 10_101}}
			return err(interval.StageWise(ctx, looks, 2, 10_050, interval.StageWiseOptions{}))
		}, nil},
		{"power.SequentialOne", "p 0.5 vs 0.52, 20 looks to MaxStageWiseN = 2e4", func(ctx context.Context) error {
			return err(power.SequentialOne(ctx, 0.5, 0.52, 0.05, 0.1, power.EqualLooks(interval.MaxStageWiseN, 20), power.SequentialOptions{Futility: true}))
		}, nil},
		{"power.SpendingBounds", "MaxLooks = 50 looks", func(ctx context.Context) error {
			t := make([]float64, power.MaxLooks)
			for i := range t {
				t[i] = float64(i+1) / float64(len(t))
			}
			return err(power.SpendingBounds(ctx, t, 0.05, power.SpendingFunction{}))
		}, nil},
		{"power.PredictiveDesign.OC", "Final = MaxPredictiveN = 2000, a look after every trial, 50 rates", func(ctx context.Context) error {
			ps := make([]float64, 50)
			for i := range ps {
				ps[i] = (float64(i) + 0.5) / 50
			}
			d := power.PredictiveDesign{Final: power.MaxPredictiveN, P0: 0.2, ThetaT: 0.95, ThetaL: 0.05}
			return err(d.OC(ctx, ps))
		}, nil},
		{"power.CUSUMRunLength", "p0 0.001 to p1 0.002, h = 8 (a long chain)", func(ctx context.Context) error {
			c, e := power.NewCUSUM(0.001, 0.002, 8, power.CUSUMOptions{})
			if e != nil {
				return e
			}
			return err(power.CUSUMRunLength(ctx, c, 0.001))
		}, nil},
		{"power.AssuranceN", "p = 0.5, half-width 1e-6, Blaker, MaxN = MaxWidthN = 2^40", func(ctx context.Context) error {
			return err(power.AssuranceN(ctx, 0.5, 1e-6, power.WidthOptions{Interval: blaker, MaxN: power.MaxWidthN}))
		}, nil},
		{"test.ZelenExact", "search: 18 strata of 60 near the mode (MaxZelenWork nodes)", func(ctx context.Context) error {
			ts := make([]interval.Stratum, 18)
			for i := range ts {
				ts[i] = interval.Stratum{K1: int64(10 + i%5), N1: 30, K2: int64(10 + i%3), N2: 30}
			}
			return err(test.ZelenExact(ctx, ts))
		}, nil},
		{"test.ZelenExact tables", "30 strata of 600, 4e7 convolution steps (near MaxZelenWork)", func(ctx context.Context) error {
			ts := make([]interval.Stratum, 30)
			for i := range ts {
				ts[i] = interval.Stratum{K1: int64(150 + i%7), N1: 300, K2: int64(150 - i%5), N2: 300}
			}
			return err(test.ZelenExact(ctx, ts))
		}, nil},
	}
}

// TestCancelLatency measures, for every context-taking function at its
// worst documented size, the time from cancellation to return, at five
// moments into the run, and reports the median and the worst. It fails when a call
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
		var lats []time.Duration
		at := c.at
		if at == nil {
			at = []time.Duration{20 * time.Millisecond, 40 * time.Millisecond, 60 * time.Millisecond, 100 * time.Millisecond, 150 * time.Millisecond}
		}
		for _, after := range at {
			ctx, cancel := context.WithCancel(context.Background())
			done := make(chan error, 1)
			go func() { done <- c.run(ctx) }()
			select {
			case err := <-done:
				cancel()
				if !errors.Is(err, context.Canceled) && after == at[0] {
					// At this size the call is done before the first cancellation
					// (or refuses the size): nothing to measure, said in the table.
					rows = append(rows, fmt.Sprintf("| %s | %s | done before %v (%s) | |", c.name, c.size, after, short(err)))
				}
				continue
			case <-time.After(after):
			}
			t0 := time.Now()
			cancel()
			err := <-done
			lat := time.Since(t0)
			if err != nil && !errors.Is(err, context.Canceled) {
				// nil: the work finished just after the cancellation, which is
				// as good as stopping, provided it is prompt (timed below).
				t.Errorf("%s: cancelled call returned %v, want the context's error", c.name, err)
			}
			lats = append(lats, lat)
		}
		if len(lats) == 0 {
			continue
		}
		sort.Slice(lats, func(i, j int) bool { return lats[i] < lats[j] })
		worst, median := lats[len(lats)-1], lats[len(lats)/2]
		if why, ok := knownOpen["latency "+c.name]; ok && worst > 100*time.Millisecond {
			t.Logf("%s: known open problem, reported not failed: %s", c.name, why)
		} else if worst > 100*time.Millisecond {
			t.Errorf("%s (%s): returned %v after cancellation", c.name, c.size, worst)
		}
		ms := func(d time.Duration) float64 { return float64(d.Microseconds()) / 1000 }
		rows = append(rows, fmt.Sprintf("| %s | %s | %.2f ms | %.2f ms |", c.name, c.size, ms(median), ms(worst)))
	}
	sort.Strings(rows)
	t.Logf("cancellation latency over five cancellations at different moments of each run:\n| function | size | median | worst |\n|---|---|---|---|\n%s", strings.Join(rows, "\n"))
}

// manyStrata returns k invented strata of 40 + 40 trials with success
// counts varying from stratum to stratum.
func manyStrata(k int) []interval.Stratum {
	ts := make([]interval.Stratum, k)
	for i := range ts {
		ts[i] = interval.Stratum{K1: int64(5 + i%23), N1: 40, K2: int64(3 + i%17), N2: 40}
	}
	return ts
}

// Errorbudget checks a service's error rate against its objective. The data
// are invented for this example: no real service or traffic stands behind
// them.
//
// Scenario: an internal API promises that 99.9% of requests succeed, so its
// error rate must stay at or below 0.001. In the last window it served 48,000
// requests and 31 failed. The error budget of the window is 0.001 x 48,000 =
// 48 failed requests. Each step answers one question:
//
//  1. How high could the true error rate be? The exact one-sided 95% upper
//     bound (Clopper-Pearson): if it is below 0.001, the window shows the
//     objective is met with 95% confidence, not just that the observed rate
//     happens to be below it.
//  2. Is the evidence strong enough to claim compliance? The exact one-sided
//     binomial test of H0: rate >= 0.001 against H1: rate < 0.001 (its p-value
//     is the lower tail P(X <= 31) at rate 0.001). The same result read as a
//     demonstrated success rate is the lower bound of step 1 mirrored.
//  3. How many requests must a new release serve to demonstrate 99.9% success
//     at 95% confidence? The smallest n with P(at most c failures; n, 0.001)
//     <= 0.05, for c = 0 (the success-run formula n = ln(0.05)/ln(0.999)),
//     and for a plan that tolerates c = 1, 2 or 5 failures.
//
// Run it with
//
//	go run ./examples/errorbudget
//
// The binomial model assumes independent requests with one common failure
// probability. Real failures cluster (an outage fails many requests at once),
// which makes every figure here optimistic; a window chosen after looking at
// the data is not a test. Where a failure can hurt someone, the demonstration
// plan belongs to a qualified reliability engineer or statistician and the
// applicable standards.
package main

import (
	"fmt"
	"io"
	"os"

	"github.com/kofnlab/kofn/examples/internal/report"
	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/power"
	"github.com/kofnlab/kofn/test"
)

// The invented window and the objective.
const (
	requests   = 48_000
	failures   = 31
	objective  = 0.999 // success-rate objective
	confidence = 0.95
)

// allowed lists the failure counts a demonstration plan may tolerate.
var allowed = []int64{0, 1, 2, 5}

func main() {
	if err := run(os.Stdout); err != nil {
		fmt.Fprintln(os.Stderr, "errorbudget:", err)
		os.Exit(1)
	}
}

// run computes every step of the scenario and writes the report to w.
func run(w io.Writer) error {
	r := report.New(w)
	maxRate := 1 - objective // the objective as an error rate, 0.001

	r.Line("Invented data: a made-up request window of an imaginary service.")
	r.Line("")
	r.Line("Error-rate check against a %.1f%% success objective", 100*objective)
	r.Line("  requests in window\t%d", requests)
	r.Line("  failed requests\t%d", failures)
	r.Line("  observed error rate\t%.6f", float64(failures)/requests)
	r.Line("  error budget of window\t%.0f failures (%.0f%% used)",
		maxRate*requests, 100*failures/(maxRate*requests))

	r.Line("")
	r.Line("1. Upper bound on the error rate (one-sided %.0f%%)", 100*confidence)
	ub, err := interval.Proportion(failures, requests, interval.Options{
		Level: confidence, Method: interval.ClopperPearson, Side: interval.UpperBound,
	})
	if err != nil {
		return err
	}
	r.Line("  %s upper bound\t%.6f\t%s", ub.Method, ub.Upper, against(ub.Upper, maxRate))
	r.Warnings(ub.Warnings)
	rel, err := power.DemonstratedReliability(requests, failures, confidence)
	if err != nil {
		return err
	}
	r.Line("  demonstrated success rate\t%.6f\t(lower bound, one-sided %.0f%%)", rel, 100*confidence)

	r.Line("")
	r.Line("2. Exact test of H0: error rate >= %g against H1: below it", maxRate)
	bt, err := test.Binomial(failures, requests, maxRate, test.BinomialOptions{
		Alternative: test.Lower, Level: confidence, SkipInterval: true,
	})
	if err != nil {
		return err
	}
	r.Line("  exact binomial, one-sided (%s)\tp = %.6f\t%s", bt.Alternative, bt.PValue, decision(bt.PValue, 1-confidence))
	r.Warnings(bt.Warnings)

	r.Line("")
	r.Line("3. Requests needed to demonstrate %.1f%% success at %.0f%% confidence", 100*objective, 100*confidence)
	r.Line("  failures allowed\trequests\tconfidence reached\twith one request fewer")
	for _, c := range allowed {
		d, err := power.DemonstrationTrials(c, objective, confidence)
		if err != nil {
			return err
		}
		r.Line("  c = %d\t%d\t%.6f\t%.6f", c, d.Trials, d.AchievedLevel, d.PreviousLevel)
	}
	r.Line("  A plan passes only if the failures stay at or below c; allowing more")
	r.Line("  failures costs more requests but makes a good release less likely to fail.")
	return r.Flush()
}

// against compares an upper bound on the error rate with the objective.
func against(bound, maxRate float64) string {
	if bound < maxRate {
		return fmt.Sprintf("below %g: objective met at this confidence", maxRate)
	}
	return fmt.Sprintf("not below %g: objective not shown", maxRate)
}

// decision reads a p-value at level alpha.
func decision(p, alpha float64) string {
	if p < alpha {
		return fmt.Sprintf("below %.2f: compliance shown", alpha)
	}
	return fmt.Sprintf("not below %.2f: compliance not shown", alpha)
}

// Signup compares two variants of a sign-up flow from their conversion
// counts. The data are invented for this example: no real product, users or
// experiment stand behind them.
//
// Scenario: a low-traffic sign-up page ran an A/B experiment. Variant A (the
// current form) converted 18 of 152 visitors, variant B (a shorter form) 33 of
// 149. With counts this small the exact methods matter, and each step answers
// one question:
//
//  1. How well is each variant's sign-up rate known? Two-sided 95% Wilson
//     (the library default) and Clopper-Pearson (exact, never below 95%)
//     intervals for each rate.
//  2. How large is the lift B - A? Two-sided 95% intervals for the difference
//     by Newcombe's hybrid score method and by Miettinen-Nurminen's score
//     method (both among the recommendations of Fagerland, Lydersen and Laake
//     2015, recalled); an interval that excludes 0 says the rates differ at
//     the 5% level.
//  3. Could a difference this large arise by chance if the rates were equal?
//     Two-sided exact tests: Boschloo's and Barnard's unconditional tests,
//     which are more powerful than Fisher's conditional test at the same level,
//     beside Fisher's test itself.
//  4. How many visitors per variant would a confirmatory follow-up need?
//     The Fleiss normal-approximation size with the Casagrande-Pike-Smith
//     correction for 80% power at a planning difference fixed in advance
//     (12% against 22%, the smallest lift the team would act on), checked by
//     the exact power of Fisher's and Barnard's tests at sizes around it.
//     Exact power is a sawtooth in n; power.TwoSampleN searches it exactly
//     (first and stable n) at a cost of seconds, so this program checks a few
//     sizes only.
//
// Run it with
//
//	go run ./examples/signup
//
// Statistical output is not a decision: the tests assume independent visitors
// with a common rate per variant, and an experiment stopped when its p-value
// first looks good overstates the evidence.
package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"time"

	"github.com/kofnlab/kofn/examples/internal/report"
	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/power"
	"github.com/kofnlab/kofn/test"
)

// The invented experiment.
const (
	signupsA, visitorsA = 18, 152 // variant A, the current form
	signupsB, visitorsB = 33, 149 // variant B, the shorter form
)

// The follow-up plan: rates fixed before the data were seen, level and power.
const (
	planA, planB = 0.12, 0.22
	planAlpha    = 0.05
	planPower    = 0.80
)

func main() {
	if err := run(os.Stdout); err != nil {
		fmt.Fprintln(os.Stderr, "signup:", err)
		os.Exit(1)
	}
}

// run computes every step of the scenario and writes the report to w.
func run(w io.Writer) error {
	ctx, cancel := context.WithTimeout(context.Background(), time.Minute)
	defer cancel()
	r := report.New(w)

	r.Line("Invented data: a made-up A/B test of a sign-up flow, not real users.")
	r.Line("")
	r.Line("Sign-up experiment")
	r.Line("  variant A (current form)\t%d of %d signed up", signupsA, visitorsA)
	r.Line("  variant B (shorter form)\t%d of %d signed up", signupsB, visitorsB)

	r.Line("")
	r.Line("1. Sign-up rate of each variant (95%% two-sided)")
	for _, v := range []struct {
		name string
		k, n int64
	}{{"A", signupsA, visitorsA}, {"B", signupsB, visitorsB}} {
		for _, m := range []interval.Method{interval.Wilson, interval.ClopperPearson} {
			iv, err := interval.Proportion(v.k, v.n, interval.Options{Method: m})
			if err != nil {
				return err
			}
			r.Line("  %s, %s\t%.4f\t[%.4f, %.4f]", v.name, iv.Method, iv.Estimate, iv.Lower, iv.Upper)
			r.Warnings(iv.Warnings)
		}
	}

	r.Line("")
	r.Line("2. Lift B - A (95%% two-sided)")
	for _, m := range []interval.DiffMethod{interval.DiffNewcombe, interval.DiffMiettinenNurminen} {
		iv, err := interval.Difference(signupsB, visitorsB, signupsA, visitorsA, interval.DiffOptions{Method: m})
		if err != nil {
			return err
		}
		r.Line("  %s\t%+.4f\t[%+.4f, %+.4f]\t%s", iv.Method, iv.Estimate, iv.Lower, iv.Upper, excludes(iv, 0))
		r.Warnings(iv.Warnings)
	}

	r.Line("")
	r.Line("3. Exact tests of equal rates (two-sided)")
	bos, err := test.Boschloo(ctx, signupsB, visitorsB, signupsA, visitorsA, test.UnconditionalOptions{})
	if err != nil {
		return err
	}
	bar, err := test.Barnard(ctx, signupsB, visitorsB, signupsA, visitorsA, test.UnconditionalOptions{})
	if err != nil {
		return err
	}
	fis, err := test.Fisher(signupsB, visitorsB, signupsA, visitorsA, test.FisherOptions{})
	if err != nil {
		return err
	}
	for _, t := range []test.Result{bos, bar, fis} {
		r.Line("  %s\tp = %.4f\t%s", t.Method, t.PValue, verdict(t.PValue, planAlpha))
		r.Warnings(t.Warnings)
	}

	r.Line("")
	r.Line("4. Follow-up size: %.0f%% power to detect %.0f%% vs %.0f%%, two-sided alpha %.2f",
		100*planPower, 100*planA, 100*planB, planAlpha)
	opt := power.TwoSampleOptions{Alpha: planAlpha, Power: planPower}
	ns, err := power.TwoSampleNormalN(planA, planB, opt)
	if err != nil {
		return err
	}
	r.Line("  normal approximation\t%d per variant", ns.N)
	r.Line("    formula: %s", ns.Method)
	r.Warnings(ns.Warnings)
	r.Line("  exact power at n per variant\tFisher\tBarnard")
	for _, n := range []int64{ns.N - 20, ns.N, ns.N + 20} {
		fp, err := power.TwoSamplePower(ctx, n, n, planA, planB, opt)
		if err != nil {
			return err
		}
		opt.Test = power.BarnardExactTest
		bp, err := power.TwoSamplePower(ctx, n, n, planA, planB, opt)
		opt.Test = power.FisherExactTest
		if err != nil {
			return err
		}
		r.Line("  n = %d\t%.4f\t%.4f", n, fp.Power, bp.Power)
	}
	r.Line("  Plan on a difference fixed in advance, not on the observed lift, which")
	r.Line("  overstates the effect when the experiment was picked for looking good.")
	return r.Flush()
}

// excludes says whether the interval rules out the value x.
func excludes(iv interval.Interval, x float64) string {
	if iv.Contains(x) {
		return fmt.Sprintf("includes %g", x)
	}
	return fmt.Sprintf("excludes %g", x)
}

// verdict says what a p-value means at level alpha.
func verdict(p, alpha float64) string {
	if p < alpha {
		return fmt.Sprintf("below %.2f: evidence that the rates differ", alpha)
	}
	return fmt.Sprintf("not below %.2f: no clear difference", alpha)
}

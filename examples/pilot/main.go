// Pilot plans a small single-arm pilot study of a response rate. The study,
// its rates and its outcome are invented for this example.
//
// Planning studies on people needs a qualified statistician, the applicable
// regulations (ethics review, trial registration, the guidance that governs
// the field) and local practice. The numbers below are what such a
// discussion starts from, not a protocol.
//
// Scenario: a new treatment is tried in one group of patients, without a
// control arm. With the usual care about 20% respond; a response rate of 40%
// would justify a larger trial. Each step answers one question:
//
//  1. How many patients give the one-sided exact binomial test of H0: p = 0.20
//     (at alpha = 0.05) an 80% chance of success if the true rate is 0.40?
//     Exact power is a sawtooth in n: the rejection region can only grow by
//     whole responders, so the attained size and the power drop each time the
//     critical count steps up. The first n that reaches 80% can be followed by
//     larger n that fall short; the stable n is the smallest from which every
//     larger n keeps 80%. The table shows the rule ("at least r responders"),
//     the attained size and the exact power around them, and the
//     normal-approximation n beside them.
//  2. How precisely will the pilot estimate the rate? The n for which the
//     observed rate k/n lands within eps of a true 0.40 with probability 0.90
//     (exact, with its own sawtooth), for eps = 0.15 and 0.10, and that
//     probability at the planned n.
//  3. What would be reported? For an invented outcome at the planned n: the
//     exact one-sided test against 0.20 with the lower confidence bound that
//     inverts it, and the two-sided 95% Clopper-Pearson and Wilson intervals
//     for the response rate.
//
// Run it with
//
//	go run ./examples/pilot
package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"time"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/examples/internal/report"
	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/power"
	"github.com/kofnlab/kofn/test"
)

// The invented planning values.
const (
	nullRate   = 0.20 // response rate with the usual care
	targetRate = 0.40 // response rate worth a larger trial
	alpha      = 0.05 // one-sided
	target     = 0.80 // power
	precProb   = 0.90 // probability that k/n lands within eps
)

// epsilons are the precision goals, as half-widths around the true rate.
var epsilons = []float64{0.15, 0.10}

// The invented outcome reported in step 3, at the planned n.
const responders = 14

// caution is printed at the start and at the end of the report.
const caution = "Planning a study on people needs a qualified statistician, the applicable\n" +
	"regulations and local practice; these numbers only start that discussion."

func main() {
	if err := run(os.Stdout); err != nil {
		fmt.Fprintln(os.Stderr, "pilot:", err)
		os.Exit(1)
	}
}

// run computes every step of the scenario and writes the report to w.
func run(w io.Writer) error {
	ctx, cancel := context.WithTimeout(context.Background(), time.Minute)
	defer cancel()
	r := report.New(w)

	r.Line("Invented data: a made-up single-arm pilot; no real patients or treatment.")
	r.Line(caution)
	r.Line("")
	r.Line("1. Patients for %.0f%% power: exact binomial test of H0: p = %.2f vs %.2f, one-sided alpha %.2f",
		100*target, nullRate, targetRate, alpha)
	opt := power.OneSampleOptions{Alpha: alpha, Power: target, Alternative: test.Higher}
	size, err := power.OneSampleN(ctx, nullRate, targetRate, opt)
	if err != nil {
		return err
	}
	r.Warnings(size.Warnings)
	r.Line("  patients\treject H0 if responders >=\tattained size\texact power")
	// The test is one-sided (higher), so its acceptance region is
	// 0..AcceptHi and H0 is rejected from AcceptHi+1 responders on.
	for n := max(1, size.First-5); n <= size.Stable+3; n++ {
		pw, err := power.OneSamplePower(n, nullRate, targetRate, opt)
		if err != nil {
			return err
		}
		mark := ""
		switch {
		case n == size.First && n == size.Stable:
			mark = "first and stable n"
		case n == size.First:
			mark = "first n reaching the target"
		case n == size.Stable:
			mark = "stable n"
		case pw.Power < target && n > size.First:
			mark = "below target again"
		}
		row := fmt.Sprintf("  n = %d\t%d\t%.4f\t%.4f", n, pw.AcceptHi+1, pw.Size, pw.Power)
		if mark != "" {
			row += "\t" + mark
		}
		r.Line("%s", row)
	}
	r.Line("  sample size")
	r.Line("  first n reaching %.2f\t%d\t(power %.4f)", target, size.First, size.FirstPower)
	r.Line("  stable n\t%d\t(power %.4f, every n up to %d keeps it)", size.Stable, size.StablePower, size.Horizon)
	r.Line("  normal approximation\t%d", size.Normal.N)
	planned := size.Stable
	crit, err := power.OneSamplePower(planned, nullRate, targetRate, opt)
	if err != nil {
		return err
	}
	r.Line("  planned n\t%d\t(success if at least %d respond)", planned, crit.AcceptHi+1)

	r.Line("")
	r.Line("2. Precision: P(|k/n - %.2f| <= eps) >= %.2f", targetRate, precProb)
	for _, eps := range epsilons {
		prec, err := power.PrecisionN(ctx, targetRate, eps, power.PrecisionOptions{Level: precProb})
		if err != nil {
			return err
		}
		r.Warnings(prec.Warnings)
		r.Line("  eps = %.2f\tfirst n %d, stable n %d\t(common-practice formula %d)",
			eps, prec.First, prec.Stable, prec.Normal.N)
	}
	dist, err := binom.New(planned, targetRate)
	if err != nil {
		return err
	}
	for _, eps := range epsilons {
		r.Line("  at n = %d, eps = %.2f\tprobability %.4f", planned, eps, dist.ProportionWithin(eps))
	}

	r.Line("")
	r.Line("3. Report for an invented outcome: %d of %d responded", responders, planned)
	res, err := test.Binomial(responders, planned, nullRate, test.BinomialOptions{
		Alternative: test.Higher, Level: 1 - alpha,
	})
	if err != nil {
		return err
	}
	r.Warnings(res.Warnings)
	r.Line("  observed response rate\t%.4f", res.Estimate)
	r.Line("  exact binomial test, one-sided (%s)\tp = %.4f\t%s", res.Alternative, res.PValue, decision(res.PValue))
	if res.Interval != nil {
		r.Line("  one-sided %.0f%% lower bound\t%.4f\t(inverts the test)", 100*res.Interval.Level, res.Interval.Lower)
	}
	for _, m := range []interval.Method{interval.ClopperPearson, interval.Wilson} {
		iv, err := interval.Proportion(responders, planned, interval.Options{Method: m})
		if err != nil {
			return err
		}
		r.Line("  %s, 95%% two-sided\t[%.4f, %.4f]", iv.Method, iv.Lower, iv.Upper)
		r.Warnings(iv.Warnings)
	}
	r.Line("")
	r.Line(caution)
	return r.Flush()
}

// decision reads a one-sided p-value at level alpha.
func decision(p float64) string {
	if p < alpha {
		return fmt.Sprintf("below %.2f: rate above %.2f shown", alpha, nullRate)
	}
	return fmt.Sprintf("not below %.2f: rate above %.2f not shown", alpha, nullRate)
}

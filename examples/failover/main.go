// Failover plans and analyses a small reliability pilot of a service's
// automatic failover with planned interim looks. The service, its rates and
// the drill outcomes are invented for this example.
//
// Scenario: a team runs forced failover drills on a staging copy of a
// service. With the current mechanism about 70% of drills complete within
// the recovery-time objective; a new mechanism is worth rolling out if it
// reaches 90%. Drills are expensive (each takes an on-call engineer's
// afternoon), so the team wants to stop early when the new mechanism is
// clearly no better. Each step answers one question:
//
//  1. Simon's two-stage designs for H0: p <= 0.70 against p >= 0.90 with a
//     one-sided size of 0.05 and power 0.80: the optimal design (fewest
//     drills expected when the mechanism is no better) and the minimax design
//     (fewest drills at most), with their early-stopping chances.
//  2. A group-sequential alternative with looks after 10, 20 and 30 drills,
//     O'Brien-Fleming type alpha spending and non-binding futility bounds
//     from O'Brien-Fleming type beta spending: the exact stopping counts, the
//     alpha spent and attained at each look, the power and the expected
//     number of drills.
//  3. What would be reported after the optimal two-stage design, for an
//     invented outcome (5 of the first 6 drills within the objective, 24 of
//     all 27): the stage-wise ordering p-value and 90% interval, which
//     respect the stopping rule, beside the naive Clopper-Pearson interval
//     for 24 of 27, which does not.
//
// A reliability claim for a system people depend on needs the review that
// the organisation's change and safety processes require; these numbers
// only start that discussion.
//
// Run it with
//
//	go run ./examples/failover
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

// The invented planning values.
const (
	nullRate   = 0.70 // drills within the objective with the current mechanism
	targetRate = 0.90 // rate that justifies rolling out the new one
	alpha      = 0.05 // one-sided size
	beta       = 0.20 // 1 - power
)

// looks are the cumulative drill counts of the group-sequential design.
var looks = []int64{10, 20, 30}

// The invented outcome of step 3: successes in the first stage and in all.
const (
	stageOne = 5
	total    = 24
)

const caution = "A reliability claim for a system people depend on needs the review that the\n" +
	"organisation's change and safety processes require; these numbers only start it."

func main() {
	if err := run(os.Stdout); err != nil {
		fmt.Fprintln(os.Stderr, "failover:", err)
		os.Exit(1)
	}
}

// run computes every step of the scenario and writes the report to w.
func run(w io.Writer) error {
	ctx, cancel := context.WithTimeout(context.Background(), time.Minute)
	defer cancel()
	r := report.New(w)
	r.Line("Invented data: a made-up failover drill pilot; no real service or outage.")
	r.Line(caution)
	r.Line("")

	r.Line("1. Simon two-stage designs, H0 p <= %.2f vs p >= %.2f, one-sided alpha %.2f, power %.2f",
		nullRate, targetRate, alpha, 1-beta)
	simon, err := power.Simon(ctx, nullRate, targetRate, alpha, beta, power.SimonOptions{})
	if err != nil {
		return err
	}
	r.Warnings(simon.Warnings)
	r.Line("  design\tstage one\tin all\tearly stop\texpected drills\tsize\tpower")
	for _, d := range []struct {
		name string
		d    power.SimonDesign
	}{{"optimal", simon.Optimal}, {"minimax", simon.Minimax}} {
		r.Line("  %s\t%d/%d\t%d/%d\t%.4f\t%.2f\t%.4f\t%.4f", d.name, d.d.R1, d.d.N1, d.d.R, d.d.N,
			d.d.EarlyStop0, d.d.ExpectedN0, d.d.Alpha, d.d.Power)
	}
	r.Line("  (stop after the first stage with at most R1 successes; roll out with more than R in all)")
	r.Line("")

	r.Line("2. Group-sequential design, looks after %v drills, O'Brien-Fleming spending, non-binding futility", looks)
	gs, err := power.SequentialOne(ctx, nullRate, targetRate, alpha, beta, looks,
		power.SequentialOptions{Futility: true})
	if err != nil {
		return err
	}
	r.Warnings(gs.Warnings)
	r.Line("  look\tdrills\troll out if >=\tstop if <=\talpha spent\tattained")
	for k, l := range gs.Looks {
		r.Line("  look %d\t%d\t%s\t%d\t%.6f\t%.6f", k+1, l.N, efficacyCell(l), l.Futility, l.AlphaSpent, l.AlphaCumulative)
	}
	r.Line("  size\t%.4f\t(futility stops obeyed; %.4f if they are ignored)", gs.AttainedAlpha, gs.AlphaNonBinding)
	r.Line("  power\t%.4f", gs.Power)
	r.Line("  expected drills\t%.2f\tat p = %.2f; %.2f at p = %.2f", gs.ExpectedN0, nullRate, gs.ExpectedN1, targetRate)
	r.Line("")

	opt := simon.Optimal
	r.Line("3. After the optimal design: %d of %d in stage one, %d of %d in all", stageOne, opt.N1, total, opt.N)
	res, err := test.StageWise(ctx, opt.Looks(), 2, total, nullRate, test.StageWiseOptions{Alternative: test.Higher, SkipInterval: true})
	if err != nil {
		return err
	}
	iv, err := interval.StageWise(ctx, opt.Looks(), 2, total, interval.StageWiseOptions{Level: 0.90})
	if err != nil {
		return err
	}
	naive, err := interval.Proportion(total, opt.N, interval.Options{Level: 0.90, Method: interval.ClopperPearson})
	if err != nil {
		return err
	}
	r.Line("  stage-wise p-value\t%.5f\t(one-sided, H0 p <= %.2f)", res.PValue, nullRate)
	r.Line("  stage-wise 90%% interval\t%.4f\t%.4f", iv.Lower, iv.Upper)
	r.Line("  naive Clopper-Pearson 90%%\t%.4f\t%.4f\t(ignores the stopping rule)", naive.Lower, naive.Upper)
	r.Line("")
	r.Line(caution)
	return r.Flush()
}

// efficacyCell prints the efficacy count of a look, or "-" when no count
// stops for efficacy there.
func efficacyCell(l power.SequentialLook) string {
	if l.Efficacy > l.N {
		return "-"
	}
	return fmt.Sprint(l.Efficacy)
}

// Inspection plans and applies incoming inspection of a supplier's lots by
// attributes. The supplier, the lots and the inspection results are invented
// for this example; the plan n = 89, c = 2 is the textbook single sampling
// plan of Montgomery's Introduction to Statistical Quality Control, used so
// its published values can be compared.
//
// Scenario: a plant receives machined brackets from one supplier, in small
// lots of 500 and bulk lots of 10,000. Inspection today takes n = 89 brackets
// from a lot and accepts it when at most c = 2 are defective. Each step
// answers one question:
//
//  1. How does today's plan treat lots of each quality? Its operating
//     characteristic (OC): the probability of accepting a lot at defect rate
//     p, binomial for bulk lots (a process or a very large lot) and
//     hypergeometric for a lot of 500 holding 500 p defectives.
//  2. What quality leaves receiving when rejected lots are screened in full
//     (rectifying inspection)? The average outgoing quality AOQ, its worst
//     case over p (AOQL), and the average total inspection ATI per bulk lot.
//  3. Which plan protects both sides? The smallest single sampling plan with
//     producer's risk at most 5% at the acceptable quality level AQL = 1%
//     (good lots are rarely rejected) and consumer's risk at most 10% at the
//     rejectable quality level RQL = 5% (bad lots are rarely accepted), found
//     by an exact search over n and c.
//  4. What does the new plan decide for an invented bulk lot? The count of
//     defectives in the sample against c, and what that sample alone says
//     about the defect rate (a one-sided exact upper bound).
//
// Run it with
//
//	go run ./examples/inspection
//
// Acceptance of safety-critical parts must follow the acceptance sampling
// standard and the contract in force, reviewed by a qualified quality engineer
// or statistician; an accepted lot is not a lot shown to be good.
package main

import (
	"context"
	"fmt"
	"io"
	"math"
	"os"
	"time"

	"github.com/kofnlab/kofn/examples/internal/report"
	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/power"
)

// Today's plan and the two lot sizes.
var current = power.Plan{SampleSize: 89, AcceptNumber: 2}

const (
	smallLot = 500
	bulkLot  = 10_000
)

// ocRates are the defect rates at which the OC curve is printed; each gives
// a whole number of defectives in a lot of 500.
var ocRates = []float64{0.01, 0.02, 0.03, 0.04, 0.05, 0.08}

// The risks the new plan must meet.
const (
	aql, rql                   = 0.01, 0.05
	producerRisk, consumerRisk = 0.05, 0.10
)

// The invented bulk lot inspected with the new plan.
const (
	lotID          = "L-0412"
	foundDefective = 2
)

func main() {
	if err := run(os.Stdout); err != nil {
		fmt.Fprintln(os.Stderr, "inspection:", err)
		os.Exit(1)
	}
}

// run computes every step of the scenario and writes the report to w.
func run(w io.Writer) error {
	ctx, cancel := context.WithTimeout(context.Background(), time.Minute)
	defer cancel()
	r := report.New(w)

	r.Line("Invented data: a made-up supplier and lot; the plan n = 89, c = 2 is Montgomery's textbook plan.")
	r.Line("")
	r.Line("1. OC of today's plan: inspect n = %d, accept if at most c = %d defective",
		current.SampleSize, current.AcceptNumber)
	r.Line("  defect rate p\tP(accept), bulk lot\tP(accept), lot of %d", smallLot)
	for _, p := range ocRates {
		bulk, err := power.AcceptProb(current, p)
		if err != nil {
			return err
		}
		d := int64(math.Round(p * smallLot))
		small, err := power.AcceptProbLot(current, smallLot, d)
		if err != nil {
			return err
		}
		r.Line("  p = %.2f\t%.6f\t%.6f  (%d defective)", p, bulk, small, d)
	}

	r.Line("")
	r.Line("2. Rectifying inspection of bulk lots of %d (rejected lots screened in full)", bulkLot)
	r.Line("  defect rate p\tAOQ\tATI per lot")
	for _, p := range ocRates[:3] {
		rc, err := power.Rectify(current, bulkLot, p)
		if err != nil {
			return err
		}
		r.Line("  p = %.2f\t%.6f\t%.1f", p, rc.AOQ, rc.ATI)
	}
	lim, err := power.AOQL(current, bulkLot)
	if err != nil {
		return err
	}
	r.Line("  AOQL\t%.6f\tat p = %.4f", lim.AOQL, lim.P)

	r.Line("")
	r.Line("3. Smallest plan with producer's risk <= %.2f at AQL %.2f and consumer's risk <= %.2f at RQL %.2f",
		producerRisk, aql, consumerRisk, rql)
	design, err := power.DesignPlan(ctx, aql, rql, power.DesignOptions{ProducerRisk: producerRisk, ConsumerRisk: consumerRisk})
	if err != nil {
		return err
	}
	r.Line("  candidates (smallest n meeting the consumer's risk for each c)")
	r.Line("  plan\tproducer's risk\tconsumer's risk")
	for _, c := range design.Candidates {
		r.Line("  n = %d, c = %d\t%.4f\t%.4f", c.Plan.SampleSize, c.Plan.AcceptNumber, c.ProducerRisk, c.ConsumerRisk)
	}
	plan := design.Plan
	r.Line("  chosen plan\tn = %d, c = %d", plan.SampleSize, plan.AcceptNumber)
	r.Line("  achieved risks\tproducer's %.4f, consumer's %.4f", design.AchievedProducerRisk, design.AchievedConsumerRisk)
	newLim, err := power.AOQL(plan, bulkLot)
	if err != nil {
		return err
	}
	r.Line("  AOQL, bulk lots\t%.6f\tat p = %.4f", newLim.AOQL, newLim.P)

	r.Line("")
	r.Line("4. Decision for bulk lot %s (invented)", lotID)
	r.Line("  inspected\t%d brackets", plan.SampleSize)
	r.Line("  defective found\t%d", foundDefective)
	if foundDefective <= plan.AcceptNumber {
		r.Line("  decision\taccept the lot (%d <= c = %d)", foundDefective, plan.AcceptNumber)
	} else {
		r.Line("  decision\treject the lot (%d > c = %d): screen it or return it", foundDefective, plan.AcceptNumber)
	}
	ub, err := interval.Proportion(foundDefective, plan.SampleSize, interval.Options{
		Method: interval.ClopperPearson, Side: interval.UpperBound,
	})
	if err != nil {
		return err
	}
	r.Line("  %s upper bound\t%.4f\t(one-sided %.0f%%, on the defect rate)", ub.Method, ub.Upper, 100*ub.Level)
	r.Warnings(ub.Warnings)
	r.Line("  The plan controls the risks over many lots; one accepted sample still allows")
	r.Line("  a defect rate above the AQL, as the upper bound shows. Safety-critical parts need")
	r.Line("  the sampling standard and contract in force and a qualified quality engineer.")
	return r.Flush()
}

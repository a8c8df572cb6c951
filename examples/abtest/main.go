// Abtest reads an A/B test the Bayesian way, with the prior stated at every
// step. The counts are invented for this example.
//
// Scenario: an online shop tries a new checkout page. Of 5000 visitors shown
// the current page (A), 412 bought; of 5000 shown the new page (B), 468
// bought. The team wants to know how likely B is better, what it risks by
// switching, and how large the gain may be:
//
//  1. Each page's conversion rate: the Beta posterior under the uniform
//     prior and its 95% equal-tailed credible interval.
//  2. Which page is better: P(pB > pA | data), computed exactly (a finite
//     sum, not a simulation), and the expected loss of choosing each page,
//     the conversion rate given up on average if the choice is wrong.
//  3. How much better: 95% credible intervals for pB - pA and pB / pA.
//  4. Beside it, Fisher's exact test, the frequentist answer to a different
//     question (how surprising the data would be if the pages converted
//     alike).
//
// Run it with
//
//	go run ./examples/abtest
//
// The calculation assumes visitors were assigned to pages at random and
// convert independently; stopping the test when P(B better) first crosses a
// threshold changes what that probability means in repeated use.
package main

import (
	"fmt"
	"io"
	"os"

	"github.com/kofnlab/kofn/examples/internal/report"
	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

// The invented counts: buyers and visitors on each page.
const (
	buyA, seenA = 412, 5000
	buyB, seenB = 468, 5000
)

func main() {
	if err := run(os.Stdout); err != nil {
		fmt.Fprintln(os.Stderr, "abtest:", err)
		os.Exit(1)
	}
}

// run computes every step of the scenario and writes the report to w.
func run(w io.Writer) error {
	r := report.New(w)
	prior := interval.UniformPrior()
	r.Line("Invented data: a made-up checkout test, %d/%d bought on page A and %d/%d on page B.", buyA, seenA, buyB, seenB)
	r.Line("Prior on each page's conversion rate: %v.", prior)

	r.Line("")
	r.Line("1. Conversion rate of each page (posterior mean, 95%% equal-tailed credible interval)")
	for _, p := range []struct {
		name      string
		buy, seen int64
	}{{"page A", buyA, seenA}, {"page B", buyB, seenB}} {
		iv, err := interval.Credible(p.buy, p.seen, interval.CredibleOptions{Prior: prior})
		if err != nil {
			return err
		}
		r.Line("  %s\t%.4f\t[%.4f, %.4f]", p.name, iv.Estimate, iv.Lower, iv.Upper)
		r.Warnings(iv.Warnings)
	}

	r.Line("")
	r.Line("2. Which page is better")
	c, err := test.Compare(buyB, seenB, buyA, seenA, test.CompareOptions{Prior1: prior, Prior2: prior})
	if err != nil {
		return err
	}
	r.Line("  P(B better)\t%.4f\t(%s)", c.ProbFirstBetter, c.Method)
	r.Line("  P(A better)\t%.4f", c.ProbSecondBetter)
	r.Line("  loss if B chosen\t%.6f\tconversion rate given up on average", c.LossFirst)
	r.Line("  loss if A kept\t%.6f", c.LossSecond)
	r.Warnings(c.Warnings)

	r.Line("")
	r.Line("3. How much better (95%% equal-tailed credible intervals)")
	d, err := interval.CredibleDifference(buyB, seenB, buyA, seenA, interval.CredibleOptions{Prior: prior})
	if err != nil {
		return err
	}
	r.Line("  pB - pA\t%+.4f\t[%+.4f, %+.4f]", d.Estimate, d.Lower, d.Upper)
	q, err := interval.CredibleRatio(buyB, seenB, buyA, seenA, interval.CredibleOptions{Prior: prior})
	if err != nil {
		return err
	}
	r.Line("  pB / pA\t%.4f\t[%.4f, %.4f]", q.Estimate, q.Lower, q.Upper)

	r.Line("")
	r.Line("4. For comparison: Fisher's exact test of equal conversion (two-sided)")
	f, err := test.Fisher(buyB, seenB, buyA, seenA, test.FisherOptions{})
	if err != nil {
		return err
	}
	r.Line("  Fisher p-value\t%.4f", f.PValue)
	r.Line("  P(B better) is a statement about the pages given the data and the prior;")
	r.Line("  the p-value is about the data if the pages were alike. They answer different questions.")
	return r.Flush()
}

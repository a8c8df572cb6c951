// Classifiers compares two classifiers scored on the same labelled set. The
// labelled set and both models' results are invented for this example.
//
// Scenario: two spam classifiers, A (in production) and B (a smaller model),
// labelled the same 500 messages. Because both saw the same messages, the
// data are paired: what matters is the 2 x 2 table of right and wrong answers
// per message,
//
//	                 B right   B wrong
//	A right           412        31
//	A wrong            14        43
//
// Each step answers one question:
//
//  1. How accurate is each model? A two-sided 95% Wilson interval for each
//     accuracy. These intervals describe each model alone; their overlap says
//     nothing about the difference, because it ignores the pairing.
//  2. Do the models differ in accuracy? McNemar's test uses only the 45
//     messages on which they disagree (31 won by A, 14 by B): under equal
//     accuracy each is a coin toss. The exact conditional test keeps its size
//     at most 5%; the mid-p version is closer to the nominal size and is the
//     one Fagerland, Lydersen and Laake (2013) recommend.
//  3. By how much? A two-sided 95% interval for accuracy(A) - accuracy(B)
//     from the paired table, by Newcombe's paired hybrid score method and by
//     Tango's score method, beside the (wrong) interval that treats the two
//     accuracies as independent samples, to show what the pairing buys.
//
// Run it with
//
//	go run ./examples/classifiers
//
// The tests assume the 500 messages are independent draws from the traffic the
// models will face; a labelled set reused to tune either model no longer is.
package main

import (
	"fmt"
	"io"
	"os"

	"github.com/kofnlab/kofn/examples/internal/report"
	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

// The invented paired table: both right, only A right, only B right, both
// wrong.
const (
	bothRight, onlyA, onlyB, bothWrong = 412, 31, 14, 43
	messages                           = bothRight + onlyA + onlyB + bothWrong
)

const alpha = 0.05

func main() {
	if err := run(os.Stdout); err != nil {
		fmt.Fprintln(os.Stderr, "classifiers:", err)
		os.Exit(1)
	}
}

// run computes every step of the scenario and writes the report to w.
func run(w io.Writer) error {
	r := report.New(w)
	rightA, rightB := int64(bothRight+onlyA), int64(bothRight+onlyB)

	r.Line("Invented data: a made-up labelled set of %d messages scored by two imaginary models.", messages)
	r.Line("")
	r.Line("Paired results on the same %d messages", messages)
	r.Line("  both right\t%d", bothRight)
	r.Line("  only A right\t%d", onlyA)
	r.Line("  only B right\t%d", onlyB)
	r.Line("  both wrong\t%d", bothWrong)

	r.Line("")
	r.Line("1. Accuracy of each model (95%% two-sided)")
	for _, m := range []struct {
		name  string
		right int64
	}{{"model A", rightA}, {"model B", rightB}} {
		iv, err := interval.Proportion(m.right, messages, interval.Options{})
		if err != nil {
			return err
		}
		r.Line("  %s, %s\t%.4f\t[%.4f, %.4f]", m.name, iv.Method, iv.Estimate, iv.Lower, iv.Upper)
		r.Warnings(iv.Warnings)
	}

	r.Line("")
	r.Line("2. McNemar's test of equal accuracy (two-sided), from the %d disagreements", onlyA+onlyB)
	for _, midP := range []bool{false, true} {
		res, err := test.McNemar(onlyA, onlyB, test.McNemarOptions{MidP: midP})
		if err != nil {
			return err
		}
		r.Line("  %s\tp = %.4f\t%s", res.Method, res.PValue, decision(res.PValue))
		r.Warnings(res.Warnings)
	}

	r.Line("")
	r.Line("3. Accuracy A - B (95%% two-sided)")
	for _, m := range []interval.PairedMethod{interval.PairedNewcombe, interval.PairedTango} {
		iv, err := interval.PairedDifference(bothRight, onlyA, onlyB, bothWrong, interval.PairedOptions{Method: m})
		if err != nil {
			return err
		}
		r.Line("  %s\t%+.4f\t[%+.4f, %+.4f]\t%s", iv.Method, iv.Estimate, iv.Lower, iv.Upper, excludes(iv))
		r.Warnings(iv.Warnings)
	}
	iv, err := interval.Difference(rightA, messages, rightB, messages, interval.DiffOptions{})
	if err != nil {
		return err
	}
	r.Line("  unpaired %s (ignores pairing)\t%+.4f\t[%+.4f, %+.4f]\t%s", iv.Method, iv.Estimate, iv.Lower, iv.Upper, excludes(iv))
	r.Warnings(iv.Warnings)
	r.Line("  The paired intervals are narrower: a message both models get right (or both")
	r.Line("  wrong) moves both accuracies together and so does not blur their difference.")
	return r.Flush()
}

// excludes says whether the interval rules out no difference.
func excludes(iv interval.Interval) string {
	if iv.Contains(0) {
		return "includes 0"
	}
	return "excludes 0"
}

// decision reads a p-value at level alpha.
func decision(p float64) string {
	if p < alpha {
		return fmt.Sprintf("below %.2f: the accuracies differ", alpha)
	}
	return fmt.Sprintf("not below %.2f: no clear difference", alpha)
}

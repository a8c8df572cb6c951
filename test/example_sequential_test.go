package test_test

import (
	"fmt"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

// Invented scenario: an incoming inspection wants to tell a 2% faulty rate
// (acceptable) from 6% (not), with 5% and 10% error rates, inspecting one
// connector at a time and stopping as soon as the evidence is clear.
func ExampleNewSPRT() {
	s, err := test.NewSPRT(0.02, 0.06, 0.05, 0.10, test.SPRTOptions{MaxN: 500})
	if err != nil {
		panic(err)
	}
	fmt.Printf("reject when k >= %.3f + %.5f n; accept when k <= %.3f + %.5f n\n",
		s.Lines.Reject, s.Lines.Slope, s.Lines.Accept, s.Lines.Slope)
	for _, look := range [][2]int64{{1, 20}, {3, 40}, {5, 60}} {
		l, _ := s.Decide(look[0], look[1])
		fmt.Printf("%d of %d: %s\n", l.K, l.N, l.Decision)
	}
	// Output:
	// reject when k >= 2.535 + 0.03655 n; accept when k <= -1.974 + 0.03655 n
	// 1 of 20: continue
	// 3 of 40: continue
	// 5 of 60: reject H0
}

// Invented scenario: a sign-up page converts about 10% of visitors; a new
// version is watched daily, and the team may stop on any day. The
// always-valid p-value and confidence sequence can be read every day
// without inflating the 5% error rate.
func ExampleMixtureSequence_Look() {
	s, err := test.NewMixtureSequence(0.10, 0.05, interval.SequenceOptions{PlannedN: 2000})
	if err != nil {
		panic(err)
	}
	var prev *test.MixtureLook
	for _, day := range [][2]int64{{31, 250}, {70, 520}, {118, 800}, {160, 1050}} {
		l, err := s.Look(prev, day[0], day[1])
		if err != nil {
			panic(err)
		}
		fmt.Printf("%d of %d: p = %.4f  [%.4f, %.4f]  %s\n", l.K, l.N, l.PValue, l.Running.Lower, l.Running.Upper, l.Decision)
		prev = &l
	}
	// Output:
	// 31 of 250: p = 1.0000  [0.0627, 0.2146]  continue
	// 70 of 520: p = 0.2138  [0.0912, 0.1880]  continue
	// 118 of 800: p = 0.0022  [0.1112, 0.1880]  reject H0
	// 160 of 1050: p = 0.0000  [0.1203, 0.1880]  reject H0
}

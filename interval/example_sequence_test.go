package interval_test

import (
	"fmt"

	"github.com/kofnlab/kofn/interval"
)

// Invented scenario: a weekly check of the share of delivered parcels that
// arrive damaged; the confidence sequence may be read every week, and the
// check stopped in any week, at the price of a wider interval than the
// fixed-n Wilson interval (which is valid only for one look fixed in
// advance).
func ExampleConfidenceSequence() {
	opt := interval.SequenceOptions{PlannedN: 1000, PlannedP: 0.02}
	for _, wk := range [][2]int64{{4, 300}, {9, 610}, {13, 900}} {
		iv, err := interval.ConfidenceSequence(wk[0], wk[1], 0.95, opt)
		if err != nil {
			panic(err)
		}
		w, _ := interval.Proportion(wk[0], wk[1], interval.Options{})
		fmt.Printf("%d of %d: sequence [%.4f, %.4f], fixed-n Wilson [%.4f, %.4f]\n", wk[0], wk[1], iv.Lower, iv.Upper, w.Lower, w.Upper)
	}
	// Output:
	// 4 of 300: sequence [0.0012, 0.0468], fixed-n Wilson [0.0052, 0.0338]
	// 9 of 610: sequence [0.0040, 0.0345], fixed-n Wilson [0.0078, 0.0278]
	// 13 of 900: sequence [0.0051, 0.0296], fixed-n Wilson [0.0085, 0.0246]
}

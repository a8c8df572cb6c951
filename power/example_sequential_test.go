package power_test

import (
	"context"
	"fmt"

	"github.com/kofnlab/kofn/power"
	"github.com/kofnlab/kofn/test"
)

// Invented scenario: a service's objective is at most 1% failed requests;
// the on-call engineer wants an alert when the rate moves to 2%, with a
// false alert no more often than once in 20000 requests on average.
func ExampleCUSUMForARL() {
	c, in, err := power.CUSUMForARL(context.Background(), 0.01, 0.02, 20000, power.CUSUMOptions{})
	if err != nil {
		panic(err)
	}
	out, _ := power.CUSUMRunLength(context.Background(), c, 0.02)
	fmt.Printf("reference %d/%d, alert when the statistic reaches %d (h = %.3f)\n", c.Ref, c.Unit, c.Threshold, c.H)
	fmt.Printf("mean requests to a false alert %.0f, to an alert at 2%% %.0f\n", in.ARL, out.ARL)
	// Output:
	// reference 3/208, alert when the statistic reaches 1178 (h = 5.663)
	// mean requests to a false alert 20006, to an alert at 2% 828
}

// Invented scenario: the SPRT of 2% against 6% faulty, truncated at 500
// items: its exact error rates and expected sample numbers.
func ExampleSPRTOperating() {
	s, _ := test.NewSPRT(0.02, 0.06, 0.05, 0.10, test.SPRTOptions{MaxN: 500})
	for _, p := range []float64{0.02, 0.06} {
		r, err := power.SPRTOperating(context.Background(), s, p)
		if err != nil {
			panic(err)
		}
		fmt.Printf("p = %.2f: reject %.4f, ASN %.1f (Wald: accept %.4f, ASN %.1f)\n", p, r.Reject, r.ASN, r.WaldAccept, r.WaldASN)
	}
	// Output:
	// p = 0.02: reject 0.0350, ASN 110.6 (Wald: accept 0.9500, ASN 105.7)
	// p = 0.06: reject 0.9007, ASN 102.4 (Wald: accept 0.1000, ASN 88.8)
}

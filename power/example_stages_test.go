package power_test

import (
	"context"
	"fmt"

	"github.com/kofnlab/kofn/power"
)

// Invented scenario: a pilot of a new onboarding flow is worth pursuing
// if more than 5% of trial users convert, and clearly so at 25%. Simon's
// designs at one-sided alpha 0.05 and power 0.8 (the numbers of Simon
// 1989, Table 1).
func ExampleSimon() {
	r, err := power.Simon(context.Background(), 0.05, 0.25, 0.05, 0.2, power.SimonOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, d := range []power.SimonDesign{r.Optimal, r.Minimax} {
		fmt.Printf("%d/%d %d/%d: expected n %.2f, early stop %.3f, size %.4f, power %.4f\n",
			d.R1, d.N1, d.R, d.N, d.ExpectedN0, d.EarlyStop0, d.Alpha, d.Power)
	}
	// Output:
	// 0/9 2/17: expected n 11.96, early stop 0.630, size 0.0466, power 0.8122
	// 0/12 2/16: expected n 13.84, early stop 0.540, size 0.0427, power 0.8013
}

// Invented scenario: a feature flag is rolled out to batches of 15 users;
// the rollout continues if the success rate beats 20%, planned for 40%,
// with O'Brien-Fleming type spending and non-binding futility bounds.
func ExampleSequentialOne() {
	d, err := power.SequentialOne(context.Background(), 0.2, 0.4, 0.05, 0.2, []int64{15, 30, 45},
		power.SequentialOptions{Futility: true})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, l := range d.Looks {
		fmt.Printf("n %d: reject at %d or more, stop for futility at %d or fewer\n", l.N, l.Efficacy, l.Futility)
	}
	fmt.Printf("size %.4f, power %.4f, expected n %.1f under H0\n", d.AttainedAlpha, d.Power, d.ExpectedN0)
	// Output:
	// n 15: reject at 10 or more, stop for futility at 1 or fewer
	// n 30: reject at 12 or more, stop for futility at 8 or fewer
	// n 45: reject at 15 or more, stop for futility at 14 or fewer
	// size 0.0251, power 0.8344, expected n 29.3 under H0
}

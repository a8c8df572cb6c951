package power_test

import (
	"context"
	"fmt"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/power"
)

// Invented scenario: how many field tests put the rate of correct sensor
// readings (about 90%) within 5 points with 95% probability.
func ExamplePrecisionN() {
	r, err := power.PrecisionN(context.Background(), 0.9, 0.05, power.PrecisionOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("first %d, stable %d, formula %d\n", r.First, r.Stable, r.Normal.N)
	// Output:
	// first 120, stable 147, formula 139
}

// Invented scenario: the same without a planning value.
func ExampleWorstPrecisionN() {
	r, err := power.WorstPrecisionN(context.Background(), 0.1, power.PrecisionOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("first %d, stable %d, formula %d\n", r.First, r.Stable, r.Normal.N)
	// Output:
	// first 100, stable 100, formula 97
}

// Invented scenario: a Wilson interval no wider than +-5 points on average
// when the rate is near 30%, and with 80% assurance.
func ExampleExpectedWidthN() {
	r, err := power.ExpectedWidthN(context.Background(), 0.3, 0.05, power.WidthOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("n %d, expected half-width %.5f (n-1: %.5f)\n", r.N, r.Value, r.Previous)
	// Output:
	// n 319, expected half-width 0.04995 (n-1: 0.05003)
}

func ExampleAssuranceN() {
	o := power.WidthOptions{Interval: interval.Options{Method: interval.ClopperPearson}, Assurance: 0.8}
	r, err := power.AssuranceN(context.Background(), 0.3, 0.05, o)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("n %d, P(half-width <= 0.05) = %.3f\n", r.N, r.Value)
	// Output:
	// n 353, P(half-width <= 0.05) = 0.812
}

// Invented scenario: how badly can 385 trials miss by more than 5 points?
func ExampleWorstPrecisionAt() {
	w, err := power.WorstPrecisionAt(context.Background(), 385, 0.05)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("worst P(|k/n - p| <= 0.05) = %.4f near p = %.3f\n", w.Prob, w.WorstP)
	// Output:
	// worst P(|k/n - p| <= 0.05) = 0.9473 near p = 0.499
}

package interval_test

import (
	"fmt"

	"github.com/kofnlab/kofn/interval"
)

// Invented scenario: 100 failed parts sorted by failure mode; intervals for
// the five modes' shares that hold together at 95%.
func ExampleMultinomial() {
	f, err := interval.Multinomial([]int64{41, 27, 19, 8, 5}, interval.MultinomialOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	for i, iv := range f.Intervals {
		fmt.Printf("mode %d: %.3f to %.3f\n", i+1, iv.Lower, iv.Upper)
	}
	// Output:
	// mode 1: 0.310 to 0.511
	// mode 2: 0.170 to 0.371
	// mode 3: 0.090 to 0.291
	// mode 4: 0.000 to 0.181
	// mode 5: 0.000 to 0.151
}

package binom_test

import (
	"fmt"
	"math/rand/v2"

	"github.com/kofnlab/kofn/binom"
)

// The scenarios below are invented. Their printed values were recomputed
// independently with SciPy 1.10 (scipy.stats.binom, hypergeom) and mpmath.

// An invented help desk resolves 70% of calls at first contact. Of the next
// 20 calls, how likely is it that exactly 15 are resolved, and that at most
// 10 are?
func ExampleNew() {
	d, err := binom.New(20, 0.7)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("P(X = 15)  = %.4f\n", d.Prob(15))
	fmt.Printf("P(X <= 10) = %.4f\n", d.CDF(10))
	fmt.Printf("mean %.1f, sd %.3f\n", d.Mean(), d.StdDev())
	// Output:
	// P(X = 15)  = 0.1789
	// P(X <= 10) = 0.0480
	// mean 14.0, sd 2.049
}

// Bad arguments give a typed error naming the argument.
func ExampleNew_error() {
	_, err := binom.New(10, 1.5)
	fmt.Println(err)
	// Output:
	// binom.New: p = 1.5 is not a probability in [0, 1]
}

// An invented sampling plan inspects 50 items of a lot and accepts the lot
// when at most 2 are defective. At a true defect rate of 2%, how often is
// the lot accepted?
func ExampleDist_CDF() {
	d, _ := binom.New(50, 0.02)
	fmt.Printf("P(accept) = %.4f\n", d.CDF(2))
	// Output:
	// P(accept) = 0.9216
}

// An invented process makes 1% faulty parts. Out of 1000 parts, more than
// 40 faulty ones would be astonishing: the upper tail is computed directly,
// not as 1 - CDF (which would give 0 or rounding noise).
func ExampleDist_Survival() {
	d, _ := binom.New(1000, 0.01)
	fmt.Printf("P(X > 40) = %.4e\n", d.Survival(40))
	fmt.Printf("ln P(X > 400) = %.2f\n", d.LogSurvival(400))
	// Output:
	// P(X > 40) = 1.1006e-13
	// ln P(X > 400) = -1182.92
}

// An invented workshop serves 500 customers, each needing a spare part with
// probability 3% in a season. The smallest stock that meets the demand with
// probability at least 99%, and the median demand:
func ExampleDist_UpperQuantile() {
	d, _ := binom.New(500, 0.03)
	fmt.Println("stock:", d.UpperQuantile(0.01))
	fmt.Println("median:", d.Quantile(0.5))
	// Output:
	// stock: 25
	// median: 15
}

// An invented opinion poll asks 50 people; the true share in favour is 30%.
// How likely is the sample share to land within 10 points of it? The
// boundaries 20% and 40% (k = 10 and 20) are included as written.
func ExampleDist_ProportionWithin() {
	d, _ := binom.New(50, 0.3)
	fmt.Printf("P(|X/50 - 0.3| <= 0.1) = %.4f\n", d.ProportionWithin(0.1))
	// Output:
	// P(|X/50 - 0.3| <= 0.1) = 0.9120
}

// An invented seed bank holds 40 seeds of which 12 are of a rare variety;
// a grower takes 10 at random without replacement. The chance of 5 or more
// rare seeds, and the conditional distribution of a 2x2 table: Fisher's
// tea-tasting design, 8 cups of which 4 had milk first, taster picks 4.
func ExampleNewHyper() {
	h, err := binom.NewHyper(40, 12, 10)
	if err != nil {
		fmt.Println(err)
		return
	}
	lo, hi := h.Support()
	fmt.Printf("support %d..%d, P(X >= 5) = %.4f\n", lo, hi, h.Survival(4))
	tea, _ := binom.NewHyper(8, 4, 4)
	fmt.Printf("P(all 4 right) = %.6f, P(3 or more) = %.6f\n", tea.Prob(4), tea.Survival(2))
	// Output:
	// support 0..10, P(X >= 5) = 0.1174
	// P(all 4 right) = 0.014286, P(3 or more) = 0.242857
}

// Simulation with a seeded generator is reproducible. An invented check:
// the average of 10000 draws from a billion trials at p = 0.3.
func ExampleDist_Rand() {
	d, _ := binom.New(1_000_000_000, 0.3)
	r := rand.New(rand.NewPCG(1, 2))
	var sum float64
	for range 10000 {
		sum += float64(d.Rand(r))
	}
	fmt.Printf("average/n = %.4f\n", sum/10000/1e9)
	// Output:
	// average/n = 0.3000
}

// The seed bank of NewHyper's example again, now supposing (invented) that
// the grower's picking favours rare seeds with an odds ratio of 3: Fisher's
// noncentral hypergeometric distribution gives the conditional mean and
// the chance of 5 or more rare seeds.
func ExampleNoncentralHyper() {
	d, err := binom.NewNoncentralHyper(40, 12, 10, 3)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("E[X] = %.4f, P(X >= 5) = %.4f\n", d.Mean(), d.Survival(4))
	// Output:
	// E[X] = 4.8993, P(X >= 5) = 0.6210
}

package test_test

import (
	"context"
	"encoding/json"
	"fmt"

	"github.com/kofnlab/kofn/test"
)

// Invented scenario: a supplier claims at most 2% of its connectors are
// faulty; an incoming inspection finds 9 faulty in 200. Is that
// consistent with 2%?
func ExampleBinomial() {
	r, err := test.Binomial(9, 200, 0.02, test.BinomialOptions{Alternative: test.Higher})
	if err != nil {
		panic(err)
	}
	fmt.Printf("%s, %s: p = %.4f\n", r.Method, r.Alternative, r.PValue)
	fmt.Printf("95%% lower bound on the faulty rate: %.4f\n", r.Interval.Lower)
	// Output:
	// exact, higher: p = 0.0202
	// 95% lower bound on the faulty rate: 0.0237
}

// Invented scenario: the same inspection, two-sided, by Blaker's test and
// by the score test with its Wilson interval.
func ExampleBinomial_methods() {
	for _, opt := range []test.BinomialOptions{{Rule: test.Blaker}, {Method: test.Score}} {
		r, _ := test.Binomial(9, 200, 0.02, opt)
		fmt.Printf("%-14s p = %.4f  95%% interval [%.4f, %.4f]\n", r.Method, r.PValue, r.Interval.Lower, r.Interval.Upper)
	}
	// Output:
	// exact Blaker   p = 0.0378  95% interval [0.0226, 0.0831]
	// score          p = 0.0116  95% interval [0.0239, 0.0833]
}

// Invented scenario: 30 reviewers rate two screen layouts; 4 prefer only
// the old one, 13 only the new one.
func ExampleMcNemar() {
	r, _ := test.McNemar(4, 13, test.McNemarOptions{MidP: true})
	fmt.Printf("%s: p = %.4f\n", r.Method, r.PValue)
	// Output:
	// McNemar mid-p: p = 0.0309
}

// Invented scenario: a new onboarding e-mail; 3 of 14 recipients in the
// old version converted, 10 of 15 in the new one.
func ExampleFisher() {
	r, _ := test.Fisher(3, 14, 10, 15, test.FisherOptions{})
	fmt.Printf("%s: p = %.4f\n", r.Method, r.PValue)
	// Output:
	// Fisher point-probability: p = 0.0253
}

// Invented scenario: the same e-mail test, one-sided, by Barnard's
// unconditional test.
func ExampleBarnard() {
	r, err := test.Barnard(context.Background(), 3, 14, 10, 15, test.UnconditionalOptions{Alternative: test.Lower})
	if err != nil {
		panic(err)
	}
	fmt.Printf("%s, %s: z = %.3f, p = %.4f\n", r.Method, r.Alternative, r.Statistic.Value, r.PValue)
	// Output:
	// Barnard, lower: z = -2.448, p = 0.0084
}

// Invented scenario: the same e-mail test by Boschloo's test.
func ExampleBoschloo() {
	r, _ := test.Boschloo(context.Background(), 3, 14, 10, 15, test.UnconditionalOptions{Alternative: test.Lower})
	fmt.Printf("%s: Fisher p = %.4f, p = %.4f\n", r.Method, r.Statistic.Value, r.PValue)
	// Output:
	// Boschloo: Fisher p = 0.0180, p = 0.0084
}

// Invented scenario: two production lines, 48 rejects in 800 against 71
// in 820.
func ExampleTwoSample() {
	r, _ := test.TwoSample(48, 800, 71, 820, test.TwoSampleOptions{Method: test.ChiSquareYates})
	fmt.Printf("%s: X2 = %.3f, p = %.4f\n", r.Method, r.Statistic.Value, r.PValue)
	// Output:
	// Pearson chi-square Yates: X2 = 3.824, p = 0.0505
}

// Invented scenario: a cheaper cleaning agent must not remove fewer than
// 10 percentage points of stains less than the current one: 168 of 200
// against 176 of 200.
func ExampleDifferenceMargin() {
	r, _ := test.DifferenceMargin(168, 200, 176, 200, -0.10, test.MarginOptions{Alternative: test.Higher})
	fmt.Printf("%s: z = %.3f, p = %.4f\n", r.Method, r.Statistic.Value, r.PValue)
	// Output:
	// Miettinen-Nurminen difference: z = 1.702, p = 0.0444
}

// Invented scenario: the same comparison as a ratio, non-inferiority
// margin 0.9.
func ExampleRatioMargin() {
	r, _ := test.RatioMargin(168, 200, 176, 200, 0.9, test.MarginOptions{Alternative: test.Higher})
	fmt.Printf("ratio %.3f: p = %.4f\n", r.Estimate, r.PValue)
	// Output:
	// ratio 0.955: p = 0.0787
}

// Invented scenario: two assay kits are called equivalent when their
// detection rates differ by less than 5 points: 183 of 200 and 186 of 200.
func ExampleDifferenceEquivalence() {
	r, _ := test.DifferenceEquivalence(183, 200, 186, 200, -0.05, 0.05, test.MarginOptions{})
	fmt.Printf("TOST p = %.4f (binding bound %.2f)\n", r.PValue, r.Null)
	// Output:
	// TOST p = 0.1008 (binding bound -0.05)
}

// Invented scenario: the same kits, equivalence of the ratio within
// [0.95, 1/0.95].
func ExampleRatioEquivalence() {
	r, _ := test.RatioEquivalence(183, 200, 186, 200, 0.95, 1/0.95, test.MarginOptions{})
	fmt.Printf("TOST p = %.4f\n", r.PValue)
	// Output:
	// TOST p = 0.1207
}

func ExampleParseAlternative() {
	a, err := test.ParseAlternative("higher")
	fmt.Println(a, err)
	_, err = test.ParseAlternative("bigger")
	fmt.Println(err)
	// Output:
	// higher <nil>
	// test.ParseAlternative: s = "bigger" is not a test.Alternative; use one of two-sided, lower, higher
}

func ExampleParseBinomialMethod() {
	m, _ := test.ParseBinomialMethod("likelihood ratio")
	fmt.Println(m)
	// Output: likelihood-ratio
}

func ExampleParseMcNemarMethod() {
	m, _ := test.ParseMcNemarMethod("exact")
	fmt.Println(m)
	// Output: McNemar exact
}

func ExampleParseTwoSidedRule() {
	m, _ := test.ParseTwoSidedRule("central")
	r, _ := test.Fisher(3, 14, 10, 15, test.FisherOptions{Rule: m})
	fmt.Printf("%s: p = %.4f\n", r.Method, r.PValue)
	// Output: Fisher central: p = 0.0361
}

func ExampleParseTwoSampleMethod() {
	m, _ := test.ParseTwoSampleMethod("z unpooled")
	fmt.Println(m == test.ZUnpooled)
	// Output: true
}

func ExampleParseMarginMethod() {
	m, _ := test.ParseMarginMethod("farrington-manning")
	fmt.Println(m)
	// Output: Farrington-Manning
}

// Invented scenario: a result as JSON, in the project's schema (README,
// "JSON schema"); fields that do not apply (the interval, the nuisance
// location of an unconditional test) are left out.
func ExampleResult_MarshalJSON() {
	r, _ := test.McNemar(1, 7, test.McNemarOptions{Method: test.McNemarExact})
	b, _ := json.Marshal(r)
	fmt.Println(string(b))
	// Output:
	// {"method":"McNemar exact","alternative":"two-sided","null":0,"estimate":-0.75,"statistic":{"name":"n12","value":1},"p_value":0.07031250000000003,"log_p_value":-2.6548056865833973}
}

// Invented scenario: 4 defective parts in 20; the equal-tailed exact test
// of p = 0.5 and the 90% Clopper-Pearson interval that inverts it.
func ExampleBinomial_interval() {
	r, _ := test.Binomial(4, 20, 0.5, test.BinomialOptions{Rule: test.Central, Level: 0.90})
	fmt.Printf("[%.4f, %.4f] contains 0.5: %v\n", r.Interval.Lower, r.Interval.Upper, r.Interval.Contains(0.5))
	// Output: [0.0714, 0.4010] contains 0.5: false
}

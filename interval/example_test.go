package interval_test

import (
	"context"
	"fmt"

	"github.com/kofnlab/kofn/interval"
)

// Invented scenario: a pilot batch of 263 sensor units, 81 of which
// drifted out of tolerance within a month.
func ExampleProportion() {
	iv, err := interval.Proportion(81, 263, interval.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%s %.0f%%: %.4f [%.4f, %.4f]\n", iv.Method, 100*iv.Level, iv.Estimate, iv.Lower, iv.Upper)
	exact, _ := interval.Proportion(81, 263, interval.Options{Method: interval.ClopperPearson})
	fmt.Printf("%s: [%.4f, %.4f]\n", exact.Method, exact.Lower, exact.Upper)
	// Output:
	// Wilson 95%: 0.3080 [0.2553, 0.3662]
	// Clopper-Pearson: [0.2527, 0.3676]
}

// Invented scenario: 30 valves cycled without a single leak; how high
// could the leak rate still be, with 90% confidence?
func ExampleProportion_zeroFailures() {
	iv, _ := interval.Proportion(0, 30, interval.Options{Method: interval.ClopperPearson, Level: 0.90, Side: interval.UpperBound})
	fmt.Printf("leak rate at most %.4f (1 - 0.10^(1/30))\n", iv.Upper)
	// Output:
	// leak rate at most 0.0739 (1 - 0.10^(1/30))
}

// Invented scenario: a new checkout page converted 56 of 70 visitors, the
// old one 48 of 80.
func ExampleDifference() {
	iv, _ := interval.Difference(56, 70, 48, 80, interval.DiffOptions{})
	fmt.Printf("%s: %.4f [%.4f, %.4f]\n", iv.Method, iv.Estimate, iv.Lower, iv.Upper)
	mn, _ := interval.Difference(56, 70, 48, 80, interval.DiffOptions{Method: interval.DiffMiettinenNurminen})
	fmt.Printf("%s: [%.4f, %.4f]\n", mn.Method, mn.Lower, mn.Upper)
	// Output:
	// Newcombe hybrid score: 0.2000 [0.0524, 0.3339]
	// Miettinen-Nurminen: [0.0528, 0.3382]
}

// Invented scenario: 12 of 400 units from line A and 5 of 420 from line B
// failed burn-in.
func ExampleRatio() {
	iv, _ := interval.Ratio(12, 400, 5, 420, interval.RatioOptions{})
	fmt.Printf("%s: %.3f [%.3f, %.3f]\n", iv.Method, iv.Estimate, iv.Lower, iv.Upper)
	// Output:
	// Koopman: 2.520 [0.935, 6.810]
}

// Invented scenario: a case-control tally, 3 of 12 exposed among cases and
// 1 of 14 among controls.
func ExampleOddsRatio() {
	for _, m := range []interval.OddsMethod{interval.OddsMiettinenNurminen, interval.OddsCornfield} {
		iv, _ := interval.OddsRatio(3, 12, 1, 14, interval.OddsOptions{Method: m})
		fmt.Printf("%s: estimate %.3f [%.3f, %.3f]\n", iv.Method, iv.Estimate, iv.Lower, iv.Upper)
	}
	// Output:
	// Miettinen-Nurminen: estimate 4.333 [0.489, 35.521]
	// Cornfield exact conditional: estimate 4.099 [0.277, 244.607]
}

func ExampleOddsRatioCMLE() {
	// Invented counts: 3 of 12 against 1 of 14.
	psi, _ := interval.OddsRatioCMLE(3, 12, 1, 14)
	fmt.Printf("%.4f\n", psi)
	// Output:
	// 4.0988
}

// Invented scenario: 21 inspectors judged each part twice, before and
// after training: 1 pass/pass, 1 pass/fail, 7 fail/pass, 12 fail/fail.
func ExamplePairedDifference() {
	for _, m := range []interval.PairedMethod{interval.PairedNewcombe, interval.PairedTango} {
		iv, _ := interval.PairedDifference(1, 1, 7, 12, interval.PairedOptions{Method: m})
		fmt.Printf("%s: %.4f [%.4f, %.4f]\n", iv.Method, iv.Estimate, iv.Lower, iv.Upper)
	}
	// Output:
	// Newcombe paired hybrid score: -0.2857 [-0.5017, -0.0361]
	// Tango score: -0.2857 [-0.5172, -0.0260]
}

func ExampleDiscordantRatio() {
	// Invented matched pairs: 1 changed one way, 7 the other.
	iv, _ := interval.DiscordantRatio(1, 7, interval.Options{Method: interval.ClopperPearson})
	fmt.Printf("%.4f [%.4f, %.4f]\n", iv.Estimate, iv.Lower, iv.Upper)
	// Output:
	// 0.1429 [0.0032, 1.1120]
}

func ExampleCoverage() {
	// Brown, Cai and DasGupta (2001): the Wald interval at p = 0.005.
	for _, n := range []int64{591, 592} {
		c, _ := interval.Coverage(context.Background(), n, 0.005, interval.Options{Method: interval.Wald})
		fmt.Printf("n = %d: coverage %.3f\n", n, c.Coverage)
	}
	// Output:
	// n = 591: coverage 0.945
	// n = 592: coverage 0.792
}

func ExampleCoverageCurve() {
	// Choosing a method for an invented study of 30 subjects.
	ps := make([]float64, 99)
	for i := range ps {
		ps[i] = float64(i+1) / 100
	}
	for _, m := range []interval.Method{interval.Wald, interval.Wilson, interval.ClopperPearson} {
		_, s, _ := interval.CoverageCurve(context.Background(), 30, ps, interval.Options{Method: m})
		fmt.Printf("%-16s min %.3f at p = %.2f, mean %.3f\n", m, s.MinCoverage, s.MinAtP, s.MeanCoverage)
	}
	// Clopper-Pearson coverage is symmetric in p and 1-p: its minimum is
	// shared by p = 0.31 and 0.69, and the last bits of the sums pick one.
	// Output:
	// Wald             min 0.260 at p = 0.01, mean 0.883
	// Wilson           min 0.930 at p = 0.30, mean 0.952
	// Clopper-Pearson  min 0.954 at p = 0.69, mean 0.974
}

func ExampleCoverageOverN() {
	// The saw-tooth of coverage in n at p = 0.1 (invented design range).
	_, s, _ := interval.CoverageOverN(context.Background(), 20, 100, 0.1, interval.Options{Method: interval.AgrestiCoull})
	fmt.Printf("min %.3f at n = %d, mean %.3f over %d n\n", s.MinCoverage, s.MinAtN, s.MeanCoverage, s.Points)
	// Output:
	// min 0.945 at n = 77, mean 0.963 over 81 n
}

func ExampleParseMethod() {
	m, _ := interval.ParseMethod("clopper-pearson")
	fmt.Println(m, "|", interval.Method(0))
	_, err := interval.ParseMethod("fancy")
	fmt.Println(err != nil)
	// Output:
	// Clopper-Pearson | Wilson
	// true
}

func ExampleParseSide() {
	s, _ := interval.ParseSide("upper bound")
	fmt.Println(s)
	// Output:
	// upper bound
}

func ExampleParseDiffMethod() {
	d, _ := interval.ParseDiffMethod("newcombe")
	r, _ := interval.ParseRatioMethod("katz log")
	o, _ := interval.ParseOddsMethod("exact")
	p, _ := interval.ParsePairedMethod("tango")
	fmt.Println(d, "|", r, "|", o, "|", p)
	// Output:
	// Newcombe hybrid score | Katz log | Cornfield exact conditional | Tango score
}

func ExampleInterval_MarshalJSON() {
	// Invented counts: 3 of 10 against 0 of 10; the upper limit is infinite.
	iv, _ := interval.Ratio(3, 10, 0, 10, interval.RatioOptions{Method: interval.RatioKoopman})
	b, _ := iv.MarshalJSON()
	fmt.Println(string(b))
	fmt.Println(iv.Contains(2), iv.Width())
	// Output:
	// {"lower":0.9239925615759068,"upper":"+Inf","estimate":"+Inf","level":0.95,"side":"two-sided","method":"Koopman","parameter":"p1 / p2","clipped":false}
	// true +Inf
}

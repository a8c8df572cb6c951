package power_test

import (
	"context"
	"fmt"

	"github.com/kofnlab/kofn/power"
	"github.com/kofnlab/kofn/test"
)

// Invented scenario: a seed supplier claims 50% germination; a grower
// wants 80% power to detect 70% with a two-sided exact test at 5%.
func ExampleOneSampleN() {
	r, err := power.OneSampleN(context.Background(), 0.5, 0.7, power.OneSampleOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("first n %d (power %.3f), stable n %d (power %.3f), normal n %d\n",
		r.First, r.FirstPower, r.Stable, r.StablePower, r.Normal.N)
	// Output:
	// first n 49 (power 0.810), stable n 54 (power 0.837), normal n 47
}

// Invented scenario: the power of 60 trials for the same question.
func ExampleOneSamplePower() {
	r, err := power.OneSamplePower(60, 0.5, 0.7, power.OneSampleOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("power %.4f, size %.4f, accept %d..%d\n", r.Power, r.Size, r.AcceptLo, r.AcceptHi)
	// Output:
	// power 0.8382, size 0.0273, accept 22..38
}

// Invented scenario: the power curve of a one-sided test for plotting.
func ExampleOneSampleCurve() {
	c, err := power.OneSampleCurve(context.Background(), 0.2, 0.35, 100, power.OneSampleOptions{Alternative: test.Higher})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, pt := range c[49:55] {
		fmt.Printf("n %d power %.3f\n", pt.N, pt.Power)
	}
	// Output:
	// n 50 power 0.720
	// n 51 power 0.752
	// n 52 power 0.782
	// n 53 power 0.719
	// n 54 power 0.751
	// n 55 power 0.780
}

// Invented scenario: the normal-approximation n beside the exact one.
func ExampleOneSampleNormalN() {
	r, err := power.OneSampleNormalN(0.5, 0.7, power.OneSampleOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("n %d (%.2f), power %.3f\n", r.N, r.Real, r.Power)
	// Output:
	// n 47 (46.63), power 0.803
}

func ExampleOneSampleNormalPower() {
	pw, err := power.OneSampleNormalPower(50, 0.5, 0.7, power.OneSampleOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%.3f\n", pw)
	// Output:
	// 0.828
}

// Fleiss (1981) Table A.3: 5% against 10%, two-sided 5%, power 80%.
func ExampleTwoSampleNormalN() {
	r, err := power.TwoSampleNormalN(0.05, 0.10, power.TwoSampleOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%d per group (uncorrected %.2f, corrected %.2f)\n", r.N, r.Uncorrected, r.Real)
	// Output:
	// 474 per group (uncorrected 434.43, corrected 473.59)
}

// Invented scenario: a non-inferiority trial of a cheaper cleaning method
// with 85% success expected in both arms and a 10-point margin.
func ExampleTwoSampleNormalN_nonInferiority() {
	r, err := power.TwoSampleNormalN(0.85, 0.85, power.TwoSampleOptions{Hypothesis: power.NonInferiority, Margin: 0.10, Alpha: 0.025})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%d per group, %s\n", r.N, r.Method)
	// Output:
	// 201 per group, non-inferiority, unpooled variance (Blackwelder)
}

func ExampleTwoSampleNormalPower() {
	pw, err := power.TwoSampleNormalPower(474, 474, 0.05, 0.10, power.TwoSampleOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%.3f\n", pw)
	// Output:
	// 0.800
}

// Invented scenario: two coatings, 30% and 55% failing, 40 panels each.
func ExampleTwoSamplePower() {
	ctx := context.Background()
	for _, t := range []power.ExactTest{power.FisherExactTest, power.BarnardExactTest, power.ZPooledTest} {
		r, err := power.TwoSamplePower(ctx, 40, 40, 0.30, 0.55, power.TwoSampleOptions{Test: t})
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("%s: power %.4f, size %.4f\n", t, r.Power, r.Size)
	}
	// Output:
	// fisher: power 0.5510, size 0.0312
	// barnard: power 0.6135, size 0.0464
	// z-pooled: power 0.6405, size 0.0540
}

// Invented scenario: panels per coating for 80% power with Fisher's test.
func ExampleTwoSampleN() {
	r, err := power.TwoSampleN(context.Background(), 0.30, 0.55, power.TwoSampleOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("first %d, stable %d, normal (CPS) %d\n", r.First, r.Stable, r.Normal.N)
	// Output:
	// first 69, stable 69, normal (CPS) 68
}

// Invented scenario: a before/after survey where 20% switch one way and
// 8% the other.
func ExamplePairedN() {
	r, err := power.PairedN(context.Background(), 0.20, 0.08, power.PairedOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("exact %d pairs (power %.3f), Connor %d\n", r.Stable, r.StablePower, r.Normal.N)
	// Output:
	// exact 161 pairs (power 0.802), Connor 151
}

func ExamplePairedPower() {
	r, err := power.PairedPower(context.Background(), 150, 0.20, 0.08, power.PairedOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("power %.4f, size %.4f\n", r.Power, r.Size)
	// Output:
	// power 0.7685, size 0.0352
}

func ExamplePairedNormalN() {
	r, err := power.PairedNormalN(0.20, 0.08, power.PairedOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%d pairs\n", r.N)
	// Output:
	// 151 pairs
}

func ExamplePairedNormalPower() {
	pw, err := power.PairedNormalPower(150, 0.20, 0.08, power.PairedOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("%.3f\n", pw)
	// Output:
	// 0.799
}

// Common practice: a poll with a 3-point margin at 95%.
func ExampleMarginOfErrorN() {
	n, err := power.MarginOfErrorN(0.5, 0.03, 0.95)
	fmt.Println(n, err)
	// Output:
	// 1068 <nil>
}

// Common practice: 99% reliability at 95% confidence.
func ExampleDemonstrationTrials() {
	for f := int64(0); f <= 2; f++ {
		d, err := power.DemonstrationTrials(f, 0.99, 0.95)
		if err != nil {
			fmt.Println(err)
			return
		}
		fmt.Printf("%d failures allowed: %d trials (confidence %.5f)\n", f, d.Trials, d.AchievedLevel)
	}
	// Output:
	// 0 failures allowed: 299 trials (confidence 0.95046)
	// 1 failures allowed: 473 trials (confidence 0.95020)
	// 2 failures allowed: 628 trials (confidence 0.95021)
}

// Invented scenario: 30 valves cycled without a failure.
func ExampleDemonstratedReliability() {
	r, err := power.DemonstratedReliability(30, 0, 0.90)
	fmt.Printf("%.4f %v\n", r, err)
	// Output:
	// 0.9261 <nil>
}

// Montgomery's plan n = 89, c = 2.
func ExampleAcceptProb() {
	pl := power.Plan{SampleSize: 89, AcceptNumber: 2}
	for _, p := range []float64{0.01, 0.03, 0.05} {
		pa, _ := power.AcceptProb(pl, p)
		fmt.Printf("p %.2f: Pa %.5f\n", p, pa)
	}
	// Output:
	// p 0.01: Pa 0.93969
	// p 0.03: Pa 0.49848
	// p 0.05: Pa 0.17208
}

// Invented scenario: a lot of 500 fasteners with 10 bad ones.
func ExampleAcceptProbLot() {
	pa, err := power.AcceptProbLot(power.Plan{SampleSize: 50, AcceptNumber: 1}, 500, 10)
	fmt.Printf("%.4f %v\n", pa, err)
	// Output:
	// 0.7365 <nil>
}

func ExampleOCCurve() {
	pts, err := power.OCCurve(power.Plan{SampleSize: 89, AcceptNumber: 2}, 0.1, 4)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, pt := range pts {
		fmt.Printf("%.3f %.4f\n", pt.X, pt.Y)
	}
	// Output:
	// 0.000 1.0000
	// 0.025 0.6153
	// 0.050 0.1721
	// 0.075 0.0329
	// 0.100 0.0050
}

// Montgomery: lots of 10000, p = 1%, rectifying inspection.
func ExampleRectify() {
	r, err := power.Rectify(power.Plan{SampleSize: 89, AcceptNumber: 2}, 10000, 0.01)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("Pa %.4f, AOQ %.5f, ATI %.0f\n", r.AcceptProb, r.AOQ, r.ATI)
	// Output:
	// Pa 0.9397, AOQ 0.00931, ATI 687
}

func ExampleAOQL() {
	r, err := power.AOQL(power.Plan{SampleSize: 89, AcceptNumber: 2}, 10000)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("AOQL %.4f at p %.4f\n", r.AOQL, r.P)
	// Output:
	// AOQL 0.0152 at p 0.0253
}

// Invented scenario: a buyer and a supplier of castings agree on AQL 1%
// (producer's risk 5%) and RQL 6% (consumer's risk 10%).
func ExampleDesignPlan() {
	d, err := power.DesignPlan(context.Background(), 0.01, 0.06, power.DesignOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Printf("n %d, c %d, producer's risk %.4f, consumer's risk %.4f\n",
		d.Plan.SampleSize, d.Plan.AcceptNumber, d.AchievedProducerRisk, d.AchievedConsumerRisk)
	// Output:
	// n 110, c 3, producer's risk 0.0250, consumer's risk 0.0980
}

func ExampleParseExactTest() {
	t, err := power.ParseExactTest("barnard")
	fmt.Println(t, err)
	// Output:
	// barnard <nil>
}

func ExampleParseVariance() {
	v, err := power.ParseVariance("unpooled")
	fmt.Println(v, err)
	// Output:
	// unpooled <nil>
}

func ExampleParseCorrection() {
	c, err := power.ParseCorrection("none")
	fmt.Println(c, err)
	// Output:
	// none <nil>
}

func ExampleParseHypothesis() {
	h, err := power.ParseHypothesis("equivalence")
	fmt.Println(h, err)
	// Output:
	// equivalence <nil>
}

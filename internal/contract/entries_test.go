package contract

import (
	"context"
	"fmt"
	"math"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/power"
	"github.com/kofnlab/kofn/test"
)

// Option draws. Enum fields take in-range and out-of-range values alike.
func (a args) ivOpt() interval.Options {
	return interval.Options{Level: a.F(), Method: interval.Method(a.E()), Side: interval.Side(a.E())}
}
func (a args) alt() test.Alternative   { return test.Alternative(a.E()) }
func (a args) rule() test.TwoSidedRule { return test.TwoSidedRule(a.E()) }
func (a args) plan() power.Plan        { return power.Plan{SampleSize: a.C(), AcceptNumber: a.C()} }

// probRange checks a float64 result that must be a probability.
func probRange(v any) string {
	if x := v.(float64); !(x >= 0 && x <= 1) {
		return fmt.Sprintf("%v is not a probability", x)
	}
	return ""
}

// finite checks a float64 result that must be a finite number.
func finite(v any) string {
	if x := v.(float64); math.IsNaN(x) || math.IsInf(x, 0) {
		return fmt.Sprintf("%v is not finite", x)
	}
	return ""
}

// positiveCount checks an int64 result that must be at least 1.
func positiveCount(v any) string {
	if x := v.(int64); x < 1 {
		return fmt.Sprintf("%d is not a positive count", x)
	}
	return ""
}

// ordered checks an interval's limits: ordered (a documented empty
// interval is NaN with a warning, which the generic walk accepts).
func ordered(v any) string {
	iv := v.(interval.Interval)
	if iv.Lower > iv.Upper {
		return fmt.Sprintf("lower limit %v above upper %v", iv.Lower, iv.Upper)
	}
	return ""
}

// within returns a check that an interval lies in [lo, hi].
func within(lo, hi float64) func(any) string {
	return func(v any) string {
		iv := v.(interval.Interval)
		if s := ordered(v); s != "" {
			return s
		}
		if iv.Lower < lo || iv.Upper > hi {
			return fmt.Sprintf("limits [%v, %v] outside [%v, %v]", iv.Lower, iv.Upper, lo, hi)
		}
		return ""
	}
}

// testResult checks a test result: its interval, when attached, ordered.
func testResult(v any) string {
	r := v.(test.Result)
	if r.Interval != nil {
		return ordered(*r.Interval)
	}
	return ""
}

// entries lists the computations of interval, test and power. Each call
// draws its arguments in signature order.
func entries() []entry {
	e := []entry{
		// interval
		{name: "Proportion", call: func(_ context.Context, a args) (any, error) {
			return interval.Proportion(a.C(), a.C(), a.ivOpt())
		}, check: within(0, 1)},
		{name: "Difference", call: func(_ context.Context, a args) (any, error) {
			return interval.Difference(a.C(), a.C(), a.C(), a.C(), interval.DiffOptions{Level: a.F(), Method: interval.DiffMethod(a.E()), Side: interval.Side(a.E())})
		}, check: within(-1, 1)},
		{name: "Ratio", call: func(_ context.Context, a args) (any, error) {
			return interval.Ratio(a.C(), a.C(), a.C(), a.C(), interval.RatioOptions{Level: a.F(), Method: interval.RatioMethod(a.E()), Side: interval.Side(a.E())})
		}, check: within(0, math.Inf(1))},
		{name: "OddsRatio", call: func(_ context.Context, a args) (any, error) {
			return interval.OddsRatio(a.C(), a.C(), a.C(), a.C(), interval.OddsOptions{Level: a.F(), Method: interval.OddsMethod(a.E()), Side: interval.Side(a.E())})
		}, check: within(0, math.Inf(1))},
		{name: "OddsRatioCMLE", call: func(_ context.Context, a args) (any, error) {
			return interval.OddsRatioCMLE(a.C(), a.C(), a.C(), a.C())
		}, check: func(v any) string {
			if x := v.(float64); !(x >= 0) {
				return fmt.Sprintf("estimate %v", x)
			}
			return ""
		}},
		{name: "PairedDifference", call: func(_ context.Context, a args) (any, error) {
			return interval.PairedDifference(a.C(), a.C(), a.C(), a.C(), interval.PairedOptions{Level: a.F(), Method: interval.PairedMethod(a.E()), Side: interval.Side(a.E())})
		}, check: within(-1, 1)},
		{name: "DiscordantRatio", call: func(_ context.Context, a args) (any, error) {
			return interval.DiscordantRatio(a.C(), a.C(), a.ivOpt())
		}, check: within(0, math.Inf(1))},
		{name: "Multinomial", call: func(_ context.Context, a args) (any, error) {
			return interval.Multinomial(a.Counts(), interval.MultinomialOptions{Level: a.F(), Method: interval.MultinomialMethod(a.E())})
		}},
		{name: "interval.VersusControl", call: func(_ context.Context, a args) (any, error) {
			return interval.VersusControl(a.Counts(), a.Counts(), a.E(), interval.ControlOptions{Level: a.F(), Method: interval.DiffMethod(a.E()), Sidak: a.B()})
		}},
		{name: "Coverage", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return interval.Coverage(ctx, a.C(), a.F(), a.ivOpt())
		}},
		{name: "CoverageOverN", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			p, s, err := interval.CoverageOverN(ctx, a.C(), a.C(), a.F(), a.ivOpt())
			return []any{p, s}, err
		}},
		{name: "CoverageCurve", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			p, s, err := interval.CoverageCurve(ctx, a.C(), a.Reals(), a.ivOpt())
			return []any{p, s}, err
		}},
		{name: "Interval.Contains", call: func(_ context.Context, a args) (any, error) {
			iv := interval.Interval{Lower: a.F(), Upper: a.F()}
			return iv.Contains(a.F()), nil
		}},
		{name: "Interval.Width", call: func(_ context.Context, a args) (any, error) {
			iv, err := interval.Proportion(a.C(), a.C(), a.ivOpt())
			if err != nil {
				return nil, err
			}
			return iv.Width(), nil
		}, check: func(v any) string {
			if x := v.(float64); !(x >= 0) {
				return fmt.Sprintf("width %v", x)
			}
			return ""
		}},

		// test
		{name: "Binomial", call: func(_ context.Context, a args) (any, error) {
			return test.Binomial(a.C(), a.C(), a.F(), test.BinomialOptions{Method: test.BinomialMethod(a.E()), Rule: a.rule(), MidP: a.B(), Alternative: a.alt(), Level: a.F(), SkipInterval: a.B()})
		}, check: testResult},
		{name: "Fisher", call: func(_ context.Context, a args) (any, error) {
			return test.Fisher(a.C(), a.C(), a.C(), a.C(), test.FisherOptions{Rule: a.rule(), MidP: a.B(), Alternative: a.alt()})
		}, check: testResult},
		{name: "McNemar", call: func(_ context.Context, a args) (any, error) {
			return test.McNemar(a.C(), a.C(), test.McNemarOptions{Method: test.McNemarMethod(a.E()), MidP: a.B(), Alternative: a.alt()})
		}, check: testResult},
		{name: "TwoSample", call: func(_ context.Context, a args) (any, error) {
			return test.TwoSample(a.C(), a.C(), a.C(), a.C(), test.TwoSampleOptions{Method: test.TwoSampleMethod(a.E()), Alternative: a.alt()})
		}, check: testResult},
		{name: "DifferenceMargin", call: func(_ context.Context, a args) (any, error) {
			return test.DifferenceMargin(a.C(), a.C(), a.C(), a.C(), a.F()-0.5, test.MarginOptions{Method: test.MarginMethod(a.E()), Alternative: a.alt()})
		}, check: testResult},
		{name: "DifferenceEquivalence", call: func(_ context.Context, a args) (any, error) {
			return test.DifferenceEquivalence(a.C(), a.C(), a.C(), a.C(), -a.F(), a.F(), test.MarginOptions{Method: test.MarginMethod(a.E())})
		}, check: testResult},
		{name: "RatioMargin", call: func(_ context.Context, a args) (any, error) {
			return test.RatioMargin(a.C(), a.C(), a.C(), a.C(), a.F()*2, test.MarginOptions{Method: test.MarginMethod(a.E()), Alternative: a.alt()})
		}, check: testResult},
		{name: "RatioEquivalence", call: func(_ context.Context, a args) (any, error) {
			return test.RatioEquivalence(a.C(), a.C(), a.C(), a.C(), a.F(), 1+a.F(), test.MarginOptions{Method: test.MarginMethod(a.E())})
		}, check: testResult},
		{name: "Barnard", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return test.Barnard(ctx, a.Small(), a.Small(), a.Small(), a.Small(), test.UnconditionalOptions{Alternative: a.alt(), BergerBoos: a.F() / 10, Rule: a.rule()})
		}, check: testResult},
		{name: "Boschloo", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return test.Boschloo(ctx, a.Small(), a.Small(), a.Small(), a.Small(), test.UnconditionalOptions{Alternative: a.alt(), BergerBoos: a.F() / 10, Rule: a.rule()})
		}, check: testResult},
		{name: "EqualProportions", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return test.EqualProportions(ctx, a.Counts(), a.Counts(), test.KSampleOptions{Method: test.KSampleMethod(a.E()), MidP: a.B()})
		}},
		{name: "Pairwise", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return test.Pairwise(ctx, a.Counts(), a.Counts(), test.ComparisonOptions{Asymptotic: a.B(), MidP: a.B(), Adjustment: test.Adjustment(a.E()), Alpha: a.F()})
		}},
		{name: "test.VersusControl", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return test.VersusControl(ctx, a.Counts(), a.Counts(), a.E(), test.ComparisonOptions{Asymptotic: a.B(), MidP: a.B(), Adjustment: test.Adjustment(a.E()), Alpha: a.F()})
		}},
		{name: "SampleRatio", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return test.SampleRatio(ctx, a.Counts(), a.Reals(), test.SampleRatioOptions{Method: test.FitMethod(a.E()), Alpha: a.F()})
		}},
		{name: "AdjustPValues", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return test.AdjustPValues(ctx, a.Reals(), test.Adjustment(a.E()))
		}, check: func(v any) string {
			for _, x := range v.([]float64) {
				if !(x >= 0 && x <= 1) {
					return fmt.Sprintf("adjusted p-value %v", x)
				}
			}
			return ""
		}},
		{name: "AdjustPValuesInto", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			p := a.Reals()
			dst := make([]float64, max(0, len(p)+a.r.IntN(2)-a.r.IntN(2))) // sometimes the wrong length
			return dst, test.AdjustPValuesInto(ctx, dst, p, test.Adjustment(a.E()))
		}},
		{name: "Adjust", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return test.Adjust(ctx, a.Reals(), a.F(), test.Adjustment(a.E()))
		}},
		{name: "FamilyLevel", call: func(_ context.Context, a args) (any, error) {
			return test.FamilyLevel(a.F(), a.E(), test.Adjustment(a.E()))
		}, check: probRange},
		{name: "SelectedLevel", call: func(_ context.Context, a args) (any, error) {
			return test.SelectedLevel(a.F(), a.E(), a.E())
		}, check: probRange},

		// power
		{name: "OneSamplePower", call: func(_ context.Context, a args) (any, error) {
			return power.OneSamplePower(a.C(), a.F(), a.F(), power.OneSampleOptions{Alpha: a.F(), Alternative: a.alt(), Rule: a.rule(), MidP: a.B()})
		}},
		{name: "OneSampleNormalPower", call: func(_ context.Context, a args) (any, error) {
			return power.OneSampleNormalPower(a.C(), a.F(), a.F(), power.OneSampleOptions{Alpha: a.F(), Alternative: a.alt()})
		}, check: probRange},
		{name: "OneSampleNormalN", call: func(_ context.Context, a args) (any, error) {
			return power.OneSampleNormalN(a.F(), a.F(), power.OneSampleOptions{Alpha: a.F(), Power: a.F(), Alternative: a.alt()})
		}},
		{name: "OneSampleN", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return power.OneSampleN(ctx, a.F(), a.F(), power.OneSampleOptions{Alpha: a.F(), Power: a.F(), Alternative: a.alt(), Rule: a.rule(), MidP: a.B(), MaxN: a.C()})
		}},
		{name: "OneSampleCurve", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return power.OneSampleCurve(ctx, a.F(), a.F(), a.C(), power.OneSampleOptions{Alpha: a.F(), Alternative: a.alt(), Rule: a.rule(), MidP: a.B()})
		}},
		{name: "PairedPower", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return power.PairedPower(ctx, a.C(), a.F()/2, a.F()/2, power.PairedOptions{Alpha: a.F(), Alternative: a.alt(), Method: test.McNemarMethod(a.E()), MidP: a.B(), Enumerate: a.B()})
		}},
		{name: "PairedNormalPower", call: func(_ context.Context, a args) (any, error) {
			return power.PairedNormalPower(a.C(), a.F()/2, a.F()/2, power.PairedOptions{Alpha: a.F(), Alternative: a.alt()})
		}, check: probRange},
		{name: "PairedNormalN", call: func(_ context.Context, a args) (any, error) {
			return power.PairedNormalN(a.F()/2, a.F()/2, power.PairedOptions{Alpha: a.F(), Power: a.F(), Alternative: a.alt()})
		}},
		{name: "PairedN", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return power.PairedN(ctx, a.F()/2, a.F()/2, power.PairedOptions{Alpha: a.F(), Power: a.F(), Alternative: a.alt(), Method: test.McNemarMethod(a.E()), MidP: a.B(), Enumerate: a.B(), MaxN: a.C()})
		}},
		{name: "TwoSamplePower", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return power.TwoSamplePower(ctx, a.Small(), a.Small(), a.F(), a.F(), a.twoOpt())
		}},
		{name: "TwoSampleNormalPower", call: func(_ context.Context, a args) (any, error) {
			return power.TwoSampleNormalPower(a.C(), a.C(), a.F(), a.F(), a.twoOpt())
		}, check: probRange},
		{name: "TwoSampleNormalN", call: func(_ context.Context, a args) (any, error) {
			return power.TwoSampleNormalN(a.F(), a.F(), a.twoOpt())
		}},
		{name: "TwoSampleN", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return power.TwoSampleN(ctx, a.F(), a.F(), a.twoOpt())
		}},
		{name: "PrecisionN", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return power.PrecisionN(ctx, a.F(), a.F(), power.PrecisionOptions{Level: a.F(), MaxN: a.C()})
		}},
		{name: "WorstPrecisionN", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return power.WorstPrecisionN(ctx, a.F(), power.PrecisionOptions{Level: a.F(), MaxN: a.C()})
		}},
		{name: "WorstPrecisionAt", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return power.WorstPrecisionAt(ctx, a.C(), a.F())
		}},
		{name: "MarginOfErrorN", call: func(_ context.Context, a args) (any, error) {
			return power.MarginOfErrorN(a.F(), a.F(), a.F())
		}, check: positiveCount},
		{name: "ExpectedWidthN", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return power.ExpectedWidthN(ctx, a.F(), a.F(), power.WidthOptions{Interval: a.ivOpt(), Assurance: a.F(), MaxN: a.C()})
		}},
		{name: "AssuranceN", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return power.AssuranceN(ctx, a.F(), a.F(), power.WidthOptions{Interval: a.ivOpt(), Assurance: a.F(), MaxN: a.C()})
		}},
		{name: "DemonstrationTrials", call: func(_ context.Context, a args) (any, error) {
			return power.DemonstrationTrials(a.C(), a.F(), a.F())
		}},
		{name: "DemonstratedReliability", call: func(_ context.Context, a args) (any, error) {
			return power.DemonstratedReliability(a.C(), a.C(), a.F())
		}, check: probRange},
		{name: "AcceptProb", call: func(_ context.Context, a args) (any, error) {
			return power.AcceptProb(a.plan(), a.F())
		}, check: probRange},
		{name: "AcceptProbLot", call: func(_ context.Context, a args) (any, error) {
			return power.AcceptProbLot(a.plan(), a.C(), a.C())
		}, check: probRange},
		{name: "AOQL", call: func(_ context.Context, a args) (any, error) {
			return power.AOQL(a.plan(), a.C())
		}},
		{name: "Rectify", call: func(_ context.Context, a args) (any, error) {
			return power.Rectify(a.plan(), a.C(), a.F())
		}},
		{name: "OCCurve", call: func(_ context.Context, a args) (any, error) {
			return power.OCCurve(a.plan(), a.F(), a.E()*100)
		}},
		{name: "DesignPlan", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return power.DesignPlan(ctx, a.F()/10, a.F(), power.DesignOptions{ProducerRisk: a.F(), ConsumerRisk: a.F(), MaxN: a.C(), Lot: a.C()})
		}},
	}
	e = append(e, distEntries()...)
	e = append(e, stagesEntries()...)
	e = append(e, allEnums()...)
	e = append(e, sequentialEntries()...)
	e = append(e, bayesStrataEntries()...)
	return append(e, allJSON()...)
}

func (a args) twoOpt() power.TwoSampleOptions {
	return power.TwoSampleOptions{Alpha: a.F(), Power: a.F(), Alternative: a.alt(), Ratio: a.F() * 3,
		Variance: power.Variance(a.E()), Correction: power.Correction(a.E()), Hypothesis: power.Hypothesis(a.E()),
		Margin: a.F() / 5, Test: power.ExactTest(a.E()), MaxN: a.Small()}
}

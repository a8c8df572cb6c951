package contract

import (
	"context"
	"fmt"
	"math"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/power"
	"github.com/kofnlab/kofn/test"
)

func (a args) prior() interval.Prior {
	return interval.Prior{Kind: interval.PriorKind(a.E()), A: a.F() * 10, B: a.F() * 10}
}

// strata draws 0 to 4 strata from small counts (and sometimes hostile ones).
func (a args) strata() []interval.Stratum {
	s := make([]interval.Stratum, a.r.IntN(5))
	for i := range s {
		s[i] = interval.Stratum{K1: a.Small(), N1: a.Small(), K2: a.Small(), N2: a.Small()}
	}
	return s
}

// pair checks a (probability, log-probability) pair from a posterior.
func pair(p, lp float64, err error) (any, error) {
	if err != nil {
		return nil, err
	}
	if !(p >= 0 && p <= 1) || math.IsNaN(lp) || lp > 1e-12 {
		return fmt.Sprintf("probability %v with log %v", p, lp), nil
	}
	return "", nil
}

// bayesStrataEntries covers the Bayesian summaries (priors, posteriors,
// credible intervals, arm comparisons) and the stratified analyses.
func bayesStrataEntries() []entry {
	e := []entry{
		{name: "BetaPrior", call: func(_ context.Context, a args) (any, error) {
			// Unvalidated by design (Resolve checks): it must only not panic.
			return interval.BetaPrior(a.F()*10, a.F()*10).String(), nil
		}},
		{name: "JeffreysPrior", also: []string{"UniformPrior", "Prior.String"}, call: func(_ context.Context, a args) (any, error) {
			_ = a.prior().String() // any prior, valid or not, prints
			return []interval.Prior{interval.JeffreysPrior(), interval.UniformPrior()}, nil
		}},
		{name: "Prior.Resolve", call: func(_ context.Context, a args) (any, error) {
			return a.prior().Resolve("contract.Resolve")
		}},
		{name: "Prior.Update", call: func(_ context.Context, a args) (any, error) {
			p, lo, hi, err := a.prior().Update("contract.Update", "k", "n", a.C(), a.C())
			return []any{p, lo, hi}, err
		}},
		{name: "NewPosterior", call: func(_ context.Context, a args) (any, error) {
			return interval.NewPosterior(a.C(), a.C(), a.prior())
		}},
		{name: "Posterior.ProbAbove", call: func(_ context.Context, a args) (any, error) {
			p, err := interval.NewPosterior(a.C(), a.C(), a.prior())
			if err != nil {
				return nil, err
			}
			return pair(p.ProbAbove(a.F()))
		}, check: problems},
		{name: "Posterior.ProbBelow", call: func(_ context.Context, a args) (any, error) {
			p, err := interval.NewPosterior(a.C(), a.C(), a.prior())
			if err != nil {
				return nil, err
			}
			return pair(p.ProbBelow(a.F()))
		}, check: problems},
		{name: "Credible", call: func(_ context.Context, a args) (any, error) {
			return interval.Credible(a.C(), a.C(), interval.CredibleOptions{Level: a.F(), Side: interval.Side(a.E()), Kind: interval.CredibleKind(a.E()), Prior: a.prior()})
		}, check: within(0, 1)},
		{name: "HPDBeta", call: func(_ context.Context, a args) (any, error) {
			lo, hi, _, err := interval.HPDBeta(a.F()*10, a.F()*10, a.F())
			if err != nil {
				return nil, err
			}
			if !(lo >= 0 && lo <= hi && hi <= 1) {
				return fmt.Sprintf("HPD limits [%v, %v]", lo, hi), nil
			}
			return "", nil
		}, check: problems},
		{name: "Compare", call: func(_ context.Context, a args) (any, error) {
			return test.Compare(a.C(), a.C(), a.C(), a.C(), test.CompareOptions{Prior1: a.prior(), Prior2: a.prior()})
		}},
		{name: "CommonOddsRatio", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return interval.CommonOddsRatio(ctx, a.strata(), interval.CommonOptions{Level: a.F(), Method: interval.CommonMethod(a.E()), Side: interval.Side(a.E()), Weights: interval.ScoreWeights(a.E())})
		}, check: within(0, math.Inf(1))},
		{name: "CommonRiskRatio", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return interval.CommonRiskRatio(ctx, a.strata(), interval.CommonOptions{Level: a.F(), Method: interval.CommonMethod(a.E()), Side: interval.Side(a.E()), Weights: interval.ScoreWeights(a.E())})
		}, check: within(0, math.Inf(1))},
		{name: "CommonRiskDifference", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return interval.CommonRiskDifference(ctx, a.strata(), interval.CommonOptions{Level: a.F(), Method: interval.CommonMethod(a.E()), Side: interval.Side(a.E()), Weights: interval.ScoreWeights(a.E())})
		}, check: within(-1, 1)},
		{name: "CMH", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return test.CMH(ctx, a.strata(), test.CMHOptions{Alternative: a.alt(), Exact: a.B(), Rule: a.rule(), MidP: a.B(), Correction: a.B(), Level: a.F()})
		}, check: testResult},
		{name: "BreslowDay", call: func(_ context.Context, a args) (any, error) {
			return test.BreslowDay(a.strata(), test.BreslowDayOptions{NoTarone: a.B()})
		}, check: testResult},
		{name: "ZelenExact", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return test.ZelenExact(ctx, a.strata())
		}, check: testResult},
		{name: "CochranArmitage", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return test.CochranArmitage(ctx, a.Counts(), a.Counts(), test.TrendOptions{Scores: a.Reals(), Alternative: a.alt(), Exact: a.B(), MidP: a.B()})
		}, check: testResult},
	}
	e = append(e, entry{name: "ProbBest", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
		k, n := a.Counts(), a.Counts()
		priors := make([]interval.Prior, a.r.IntN(len(n)+2))
		for i := range priors {
			priors[i] = a.prior()
		}
		return test.ProbBest(ctx, k, n, priors)
	}})
	e = append(e, jsonEntries[test.BestArm]("BestArm")...)
	credOpt := func(a args) interval.CredibleOptions {
		return interval.CredibleOptions{Level: a.F(), Side: interval.Side(a.E()), Kind: interval.CredibleKind(a.E()), Prior: a.prior()}
	}
	e = append(e,
		entry{name: "CredibleDifference", call: func(_ context.Context, a args) (any, error) {
			return interval.CredibleDifference(a.C(), a.C(), a.C(), a.C(), credOpt(a))
		}, check: within(-1, 1)},
		entry{name: "CredibleRatio", call: func(_ context.Context, a args) (any, error) {
			return interval.CredibleRatio(a.C(), a.C(), a.C(), a.C(), credOpt(a))
		}, check: within(0, math.Inf(1))},
		entry{name: "Posterior.Quantile", call: func(_ context.Context, a args) (any, error) {
			p, err := interval.NewPosterior(a.C(), a.C(), a.prior())
			if err != nil {
				return nil, err
			}
			q := a.F()
			x := p.Quantile(q)
			if q == q && !(x >= 0 && x <= 1) {
				return fmt.Sprintf("quantile %v at %v", x, q), nil
			}
			return "", nil
		}, check: problems},
		entry{name: "Posterior.Density", call: func(_ context.Context, a args) (any, error) {
			p, err := interval.NewPosterior(a.C(), a.C(), a.prior())
			if err != nil {
				return nil, err
			}
			x := a.F()
			if d := p.Density(x); x == x && !(d >= 0) {
				return fmt.Sprintf("density %v at %v", d, x), nil
			}
			return "", nil
		}, check: problems},
		entry{name: "PredictiveAtLeast", call: func(_ context.Context, a args) (any, error) {
			return power.PredictiveAtLeast(a.C(), a.C(), a.C(), a.C(), a.prior())
		}},
		entry{name: "PredictiveSuccess", call: func(_ context.Context, a args) (any, error) {
			return power.PredictiveSuccess(a.C(), a.C(), a.C(), a.F(), a.F(), a.prior())
		}},
		entry{name: "PredictiveDesign.OC", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			d := power.PredictiveDesign{Final: a.Small(), P0: a.F(), ThetaT: a.F(), ThetaL: a.F(), ThetaU: a.F(), Prior: a.prior()}
			if a.B() {
				d.Looks = a.Counts()
			}
			return d.OC(ctx, a.Reals())
		}},
	)
	e = append(e, jsonEntries[power.Predictive]("Predictive")...)
	e = append(e, jsonEntries[power.PredictiveOC]("PredictiveOC")...)
	e = append(e, enumEntries("CommonMethod", "ParseCommonMethod", interval.CommonMethodValues, interval.ParseCommonMethod)...)
	e = append(e, enumEntries("ScoreWeights", "ParseScoreWeights", interval.ScoreWeightsValues, interval.ParseScoreWeights)...)
	e = append(e, enumEntries("CredibleKind", "ParseCredibleKind", interval.CredibleKindValues, interval.ParseCredibleKind)...)
	e = append(e, enumEntries("PriorKind", "ParsePriorKind", interval.PriorKindValues, interval.ParsePriorKind)...)
	e = append(e, jsonEntries[interval.Posterior]("Posterior")...)
	e = append(e, jsonEntries[interval.Prior]("Prior")...)
	e = append(e, jsonEntries[test.ArmComparison]("ArmComparison")...)
	return e
}

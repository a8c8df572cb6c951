package test

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/stagewise"
	"github.com/kofnlab/kofn/interval"
)

// StageWiseOptions selects the alternative and the level of the attached
// interval of StageWise.
type StageWiseOptions struct {
	// Alternative: TwoSided (the zero value) or a one-sided alternative.
	// A Simon two-stage or group-sequential design that stops for
	// efficacy only on high counts is planned for the one-sided
	// alternative that p is above p0.
	Alternative Alternative
	// Level is the confidence level of the attached interval; 0 means
	// 0.95.
	Level float64
	// SkipInterval leaves Result.Interval nil.
	SkipInterval bool
}

// StageWise tests H0: P = p0 after a multi-stage one-proportion study
// (a Simon two-stage design or a group-sequential design, described by
// its looks) that stopped at look (1-based) with k successes among the
// cumulative looks[look-1].N trials, with the exact p-value of the
// stage-wise ordering of the outcomes (Jennison C, Turnbull BW (2000),
// Group Sequential Methods with Applications to Clinical Trials, section
// 8.4; Koyama T, Chen H (2008), Proper inference from Simon's two-stage
// designs, Statistics in Medicine 27:3145-3154):
//
//	upper: P_p0(outcome >= observed) = sum_{j<look} P(efficacy stop at j) + P(reach look, S >= k)
//	lower: P_p0(outcome <= observed) = sum_{j<look} P(futility stop at j) + P(reach look, S <= k)
//	two-sided: min(1, 2 min(upper, lower))
//
// for the alternatives P > p0 (the one such designs are planned for), P <
// p0 and two-sided. The naive binomial p-value for k of N ignores the
// stopping rule and is wrong after a design that may stop early. The
// attached interval (unless SkipInterval) is interval.StageWise at Level,
// the one-sided bound for a one-sided alternative: it excludes p0 exactly
// when PValue < 1 - Level.
//
// Result: Statistic is k (named "k"), Estimate the maximum likelihood estimate
// k/N (biased after early stopping), Null p0, Method "stage-wise ordering
// (exact)". Errors: invalid looks (see interval.Look), a look or count
// that does not stop the study, p0 outside (0, 1). Accuracy: the tails
// are sums of positive terms from binom's log-space densities, within
// about 1e-13 relative (in log space below 1e-280). Cost O(N^2) at worst
// per tail, ctx checked inside; final N above interval.MaxStageWiseN
// returns ErrTooLarge.
func StageWise(ctx context.Context, looks []interval.Look, look int, k int64, p0 float64, opt StageWiseOptions) (Result, error) {
	const fn = "test.StageWise"
	if err := stagewise.Validate(fn, looks); err != nil {
		return Result{}, err
	}
	if err := stagewise.CheckOutcome(fn, looks, look-1, k); err != nil {
		return Result{}, err
	}
	if err := argerr.OpenProb(fn, "p0", p0); err != nil {
		return Result{}, err
	}
	if err := checkAlt(fn, opt.Alternative); err != nil {
		return Result{}, err
	}
	lvl, err := level(fn, opt.Level)
	if err != nil {
		return Result{}, err
	}
	tail := func(t stagewise.Tail) (float64, error) {
		v, err := stagewise.LogTail(ctx, looks, look-1, k, p0, t)
		if err != nil {
			return 0, argerr.Canceled(fn, ctx)
		}
		return v, nil
	}
	var lp float64
	switch opt.Alternative {
	case Higher:
		lp, err = tail(stagewise.UpperTail)
	case Lower:
		lp, err = tail(stagewise.LowerTail)
	default:
		var u, l float64
		if u, err = tail(stagewise.UpperTail); err != nil {
			return Result{}, err
		}
		if l, err = tail(stagewise.LowerTail); err != nil {
			return Result{}, err
		}
		lp = math.Min(0, math.Ln2+math.Min(u, l))
	}
	if err != nil {
		return Result{}, err
	}
	r := newResult("stage-wise ordering (exact)", opt.Alternative, lp)
	r.Statistic = Statistic{Name: "k", Value: float64(k)}
	r.Estimate = float64(k) / float64(looks[look-1].N)
	r.Null = p0
	if !opt.SkipInterval {
		side := interval.TwoSided
		switch opt.Alternative {
		case Higher:
			side = interval.LowerBound
		case Lower:
			side = interval.UpperBound
		}
		iv, err := interval.StageWise(ctx, looks, look, k, interval.StageWiseOptions{Level: lvl, Side: side})
		if err != nil {
			return Result{}, err
		}
		r.Interval = &iv
	}
	return r, nil
}

package interval

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/root"
	"github.com/kofnlab/kofn/internal/stagewise"
)

// Look is one planned analysis of a multi-stage one-proportion study (a
// Simon two-stage design, a group-sequential design): the cumulative
// number of trials N, and the counts at which the study stops. It stops
// for futility when the cumulative count of successes is at most Futility
// (-1: no futility stop) and stops rejecting H0 when it is at least
// Efficacy (N + 1: no efficacy stop); at the final look Efficacy =
// Futility + 1. The same type is used by package test and package power.
type Look = stagewise.Look

// StageWiseOptions selects the level and side of StageWise.
type StageWiseOptions struct {
	// Level is the confidence level in (0, 1); 0 means 0.95.
	Level float64
	// Side selects a two-sided interval (the zero value) or a one-sided
	// bound.
	Side Side
}

// MaxStageWiseN is the largest final cumulative size StageWise accepts.
const MaxStageWiseN = stagewise.MaxN

// StageWise returns the exact confidence interval for p after a
// multi-stage study that stopped at look (1-based) with k successes in
// the cumulative looks[look-1].N trials, by inverting the stage-wise
// ordering of the outcomes (Jennison C, Turnbull BW (2000), Group
// Sequential Methods with Applications to Clinical Trials, section 8.4;
// for Simon's two-stage designs Koyama T, Chen H (2008), Proper inference
// from Simon's two-stage designs, Statistics in Medicine 27:3145-3154):
//
//	lower limit pL: P_pL(outcome >= observed) = a
//	upper limit pU: P_pU(outcome <= observed) = a
//
// with a = (1-Level)/2 for a two-sided interval and 1-Level for a bound.
// An outcome ranks above another when it stops for efficacy at an earlier
// look, or stops at the same look with more successes, or when the other
// stopped for futility and it went further. The naive Clopper-Pearson
// interval for k of N ignores the stopping rule and does not have its
// stated coverage after a design that may stop early. pL = 0 when the
// observed outcome is the one every study with p = 0 ends in, and pU = 1
// when it is the one reached at p = 1. Estimate is the maximum likelihood
// estimate k/N, which is biased after early stopping; Method is
// "stage-wise ordering (exact)".
//
// Each tail is an exact sum by dynamic programming over the count (see
// Look), monotone in p; each limit is found by bisection to a relative
// error below 1e-12 (about 50 evaluations). Cost O(N^2) per evaluation at
// worst; ctx is checked inside, and designs with a final N above
// MaxStageWiseN return ErrTooLarge.
func StageWise(ctx context.Context, looks []Look, look int, k int64, opt StageWiseOptions) (Interval, error) {
	const fn = "interval.StageWise"
	if err := stagewise.Validate(fn, looks); err != nil {
		return Interval{}, err
	}
	if err := stagewise.CheckOutcome(fn, looks, look-1, k); err != nil {
		return Interval{}, err
	}
	lv, err := newLevel(fn, opt.Level, opt.Side)
	if err != nil {
		return Interval{}, err
	}
	iv := Interval{Lower: 0, Upper: 1, Estimate: float64(k) / float64(looks[look-1].N), Level: lv.level,
		Side: lv.side, Method: "stage-wise ordering (exact)", Parameter: "p"}
	smallest, largest := stagewise.Extreme(looks, look-1, k)
	limit := func(t stagewise.Tail) (float64, error) {
		lt := math.Log(lv.tail)
		var ferr error
		ok := func(p float64) bool {
			if ferr != nil {
				return true
			}
			v, err := stagewise.LogTail(ctx, looks, look-1, k, p, t)
			if err != nil {
				ferr = err
				return true
			}
			if t == stagewise.UpperTail {
				return v >= lt // upper tail grows with p
			}
			return v < lt // lower tail falls with p
		}
		p := root.Bisect(ok, 0, 1, 1e-13, 1e-300)
		if ferr != nil {
			return 0, argerr.Canceled(fn, ctx)
		}
		return p, nil
	}
	if lv.wantLower() && !smallest {
		if iv.Lower, err = limit(stagewise.UpperTail); err != nil {
			return Interval{}, err
		}
	}
	if lv.wantUpper() && !largest {
		if iv.Upper, err = limit(stagewise.LowerTail); err != nil {
			return Interval{}, err
		}
	}
	return iv, nil
}

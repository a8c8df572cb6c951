package contract

import (
	"context"
	"fmt"
	"math"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/power"
	"github.com/kofnlab/kofn/test"
)

// stagesEntries covers the multi-stage designs of power and the stage-wise
// inference of test and interval.
func stagesEntries() []entry {
	// looks draws a two- or three-look design from small counts, valid or
	// not (the functions must reject the invalid ones with a typed error).
	looks := func(a args) []interval.Look {
		n1 := a.Small()
		r1 := a.Small() - 1
		n := n1 + a.Small()
		r := a.Small()
		l := []interval.Look{{N: n1, Futility: r1, Efficacy: n1 + 1}, {N: n, Futility: r, Efficacy: r + 1}}
		if a.B() {
			l = append([]interval.Look{{N: a.Small(), Futility: a.Small() - 1, Efficacy: a.Small()}}, l...)
		}
		return l
	}
	sizes := func(a args) []int64 {
		s := a.Counts()
		if a.B() {
			return []int64{a.Small(), a.Small() + 60, a.C()}
		}
		return s
	}
	spend := func(a args) power.SpendingFunction {
		return power.SpendingFunction{Family: power.Spending(a.E()), Rho: a.F() * 4}
	}
	seqOpt := func(a args) power.SequentialOptions {
		return power.SequentialOptions{Spending: spend(a), Futility: a.B(), FutilitySpending: spend(a), Binding: a.B()}
	}
	stage := power.TwoStage{}
	e := []entry{
		{name: "Simon", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return power.Simon(ctx, a.F(), a.F(), a.F(), a.F(), power.SimonOptions{MaxN: a.Small()})
		}, check: func(v any) string {
			r := v.(power.SimonResult)
			if r.Optimal.Alpha > r.Alpha*(1+1e-9) || r.Optimal.Power < (1-r.Beta)*(1-1e-9) || r.Minimax.N > r.Optimal.N {
				return fmt.Sprintf("designs miss the goals: %+v", r)
			}
			return ""
		}},
		{name: "EvaluateTwoStage", call: func(_ context.Context, a args) (any, error) {
			return power.EvaluateTwoStage(power.TwoStage{R1: a.Small(), N1: a.Small(), R: a.Small(), N: a.C()}, a.F())
		}},
		{name: "EvaluateStages", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return power.EvaluateStages(ctx, looks(a), a.F())
		}, check: func(v any) string {
			e := v.(power.StagesEval)
			var s float64
			for _, l := range e.Looks {
				s += l.Futile + l.Reject
			}
			if math.Abs(s-1) > 1e-9 || !(e.Reject >= 0 && e.Reject <= 1) {
				return fmt.Sprintf("stop chances sum to %v, reject %v", s, e.Reject)
			}
			return ""
		}},
		{name: "TwoStage.Looks", call: func(_ context.Context, a args) (any, error) {
			stage = power.TwoStage{R1: a.C(), N1: a.C(), R: a.C(), N: a.C()}
			return stage.Looks(), nil
		}},
		{name: "SequentialOne", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return power.SequentialOne(ctx, a.F(), a.F(), a.F(), a.F(), sizes(a), seqOpt(a))
		}, check: func(v any) string {
			d := v.(power.SequentialOneDesign)
			if !(d.AttainedAlpha >= 0 && d.AttainedAlpha <= 1 && d.Power >= 0 && d.Power <= 1) {
				return fmt.Sprintf("size %v, power %v", d.AttainedAlpha, d.Power)
			}
			if !d.Binding && d.AlphaNonBinding > d.Alpha*(1+1e-9) {
				return fmt.Sprintf("non-binding size %v above alpha %v", d.AlphaNonBinding, d.Alpha)
			}
			return ""
		}},
		{name: "SequentialOneN", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return power.SequentialOneN(ctx, a.F(), a.F(), a.F(), a.F(), int(a.E()), a.C(), seqOpt(a))
		}},
		{name: "SequentialOneDesign.StageLooks", call: func(_ context.Context, a args) (any, error) {
			d := power.SequentialOneDesign{Looks: []power.SequentialLook{{N: a.C(), Efficacy: a.C(), Futility: a.C()}}}
			return d.StageLooks(), nil
		}},
		{name: "EqualLooks", call: func(_ context.Context, a args) (any, error) {
			n := a.Small()
			return power.EqualLooks(n, int(a.E()%8+8)%8), nil
		}},
		{name: "SequentialTwo", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return power.SequentialTwo(ctx, a.F(), a.F(), a.F()/2, a.F()/2, append(a.Reals(), 1), seqOpt(a))
		}},
		{name: "SpendingBounds", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return power.SpendingBounds(ctx, append(a.Reals(), 1), a.F()/2, spend(a))
		}},
		{name: "SpendingFunction.Spent", call: func(_ context.Context, a args) (any, error) {
			f := spend(a)
			total, t := a.F(), a.F()
			x := f.Spent(total, t)
			ok := total > 0 && total < 1 && !math.IsNaN(t) && f.Family >= 0 && f.Family <= power.PowerFamily &&
				(f.Family != power.PowerFamily || f.Rho > 0 && f.Rho <= 100)
			switch {
			case !ok && !math.IsNaN(x):
				return fmt.Sprintf("Spent(%v, %v) = %v for invalid arguments, want NaN", total, t, x), nil
			case ok && !(x >= 0 && x <= total):
				return fmt.Sprintf("Spent(%v, %v) = %v outside [0, %v]", total, t, x, total), nil
			}
			return "", nil
		}, check: problems},
		{name: "SpendingFunction.String", call: func(_ context.Context, a args) (any, error) {
			return spend(a).String(), nil
		}},
		{name: "test.StageWise", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return test.StageWise(ctx, looks(a), int(a.E()), a.Small(), a.F(), test.StageWiseOptions{Alternative: a.alt(), Level: a.F(), SkipInterval: a.B()})
		}, check: testResult},
		{name: "interval.StageWise", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return interval.StageWise(ctx, looks(a), int(a.E()), a.Small(), interval.StageWiseOptions{Level: a.F(), Side: interval.Side(a.E())})
		}, check: within(0, 1)},
	}
	e = append(e, enumEntries("Spending", "ParseSpending", power.SpendingValues, power.ParseSpending)...)
	e = append(e, jsonEntries[power.TwoStageEval]("TwoStageEval")...)
	e = append(e, jsonEntries[power.StageEval]("StageEval")...)
	e = append(e, jsonEntries[power.StagesEval]("StagesEval")...)
	e = append(e, jsonEntries[power.SimonDesign]("SimonDesign")...)
	e = append(e, jsonEntries[power.SimonResult]("SimonResult")...)
	e = append(e, jsonEntries[power.SpendingFunction]("SpendingFunction")...)
	e = append(e, jsonEntries[power.SequentialLook]("SequentialLook")...)
	e = append(e, jsonEntries[power.SequentialOneDesign]("SequentialOneDesign")...)
	e = append(e, jsonEntries[power.SequentialTwoLook]("SequentialTwoLook")...)
	e = append(e, jsonEntries[power.SequentialTwoDesign]("SequentialTwoDesign")...)
	return e
}

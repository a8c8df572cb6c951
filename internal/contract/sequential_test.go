package contract

import (
	"context"
	"fmt"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/power"
	"github.com/kofnlab/kofn/test"
)

func (a args) seqOpt() interval.SequenceOptions {
	return interval.SequenceOptions{Concentration: a.F() * 100, PriorA: a.F(), PriorB: a.F(), PlannedN: a.C(), PlannedP: a.F()}
}

func (a args) sprt() (test.SPRT, error) {
	if a.B() {
		return test.NewPairedSPRT(a.F()*2, a.F(), a.F(), test.SPRTOptions{MaxN: a.C()})
	}
	return test.NewSPRT(a.F(), a.F(), a.F(), a.F(), test.SPRTOptions{MaxN: a.C()})
}

// sequentialEntries covers the sequential and multi-stage functions:
// confidence sequences, SPRTs, mixture and difference sequences, CUSUM
// charts, group-sequential and two-stage designs.
func sequentialEntries() []entry {
	e := []entry{
		{name: "ConfidenceSequence", call: func(_ context.Context, a args) (any, error) {
			return interval.ConfidenceSequence(a.C(), a.C(), a.F(), a.seqOpt())
		}, check: within(0, 1)},
		{name: "SequenceErrorProb", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			return interval.SequenceErrorProb(ctx, a.F(), a.C(), a.F(), a.seqOpt())
		}, check: probRange},
		{name: "SequenceMixture", call: func(_ context.Context, a args) (any, error) {
			return interval.SequenceMixture(a.F(), a.seqOpt())
		}},
		{name: "SequenceInterval", call: func(_ context.Context, a args) (any, error) {
			// Documented without validation: 0 <= k <= n and a mixture from
			// SequenceMixture at the same level are the caller's to keep, so
			// only that domain is swept (hostile values go to
			// ConfidenceSequence, which validates).
			level := a.F()
			mx, err := interval.SequenceMixture(level, a.seqOpt())
			if err != nil {
				return nil, err
			}
			n := a.C()
			k := a.C()
			if !(k >= 0 && k <= n && n <= 1<<53) {
				return nil, nil
			}
			return interval.SequenceInterval(k, n, level, mx), nil
		}, check: func(v any) string {
			if v == nil {
				return ""
			}
			return within(0, 1)(v)
		}},
		{name: "SequenceLogMartingale", call: func(_ context.Context, a args) (any, error) {
			mx := interval.Mixture{Centered: a.B(), Concentration: a.F() * 10, A: a.F(), B: a.F()}
			return interval.SequenceLogMartingale(a.C(), a.C(), a.F(), mx)
		}, check: func(v any) string {
			if x := v.(float64); x != x {
				return "NaN log-martingale"
			}
			return ""
		}},
		{name: "TunedConcentration", call: func(_ context.Context, a args) (any, error) {
			return interval.TunedConcentration(a.F(), a.C(), a.F()*10)
		}, check: finite},
		{name: "TunedTau2", call: func(_ context.Context, a args) (any, error) {
			return test.TunedTau2(a.F(), a.C())
		}, check: finite},
		{name: "NewSPRT", call: func(_ context.Context, a args) (any, error) {
			return test.NewSPRT(a.F(), a.F(), a.F(), a.F(), test.SPRTOptions{MaxN: a.C()})
		}},
		{name: "NewPairedSPRT", call: func(_ context.Context, a args) (any, error) {
			return test.NewPairedSPRT(a.F()*2, a.F(), a.F(), test.SPRTOptions{MaxN: a.C()})
		}},
		{name: "SPRT.Decide", call: func(_ context.Context, a args) (any, error) {
			s, err := a.sprt()
			if err != nil {
				return nil, err
			}
			return s.Decide(a.C(), a.C())
		}},
		{name: "SPRT.DecidePaired", call: func(_ context.Context, a args) (any, error) {
			s, err := a.sprt()
			if err != nil {
				return nil, err
			}
			return s.DecidePaired(a.C(), a.C())
		}},
		{name: "SPRT.Decision", call: func(_ context.Context, a args) (any, error) {
			s, err := a.sprt()
			if err != nil {
				return nil, err
			}
			return s.Decision(a.C(), a.C()).String(), nil
		}},
		{name: "SPRT.LogRatio", call: func(_ context.Context, a args) (any, error) {
			s, err := a.sprt()
			if err != nil {
				return nil, err
			}
			return s.LogRatio(a.C(), a.C()), nil
		}, check: func(v any) string {
			if x := v.(float64); x != x {
				return "NaN log-ratio"
			}
			return ""
		}},
		{name: "NewMixtureSequence", call: func(_ context.Context, a args) (any, error) {
			return test.NewMixtureSequence(a.F(), a.F(), a.seqOpt())
		}},
		{name: "MixtureSequence.Look", call: func(_ context.Context, a args) (any, error) {
			s, err := test.NewMixtureSequence(a.F(), a.F(), a.seqOpt())
			if err != nil {
				return nil, err
			}
			first, err := s.Look(nil, a.C(), a.C())
			if err != nil {
				return nil, err
			}
			return s.Look(&first, a.C(), a.C())
		}},
		{name: "NewDifferenceSequence", call: func(_ context.Context, a args) (any, error) {
			return test.NewDifferenceSequence(a.F()-0.5, a.F(), test.DifferenceSequenceOptions{Method: test.SequenceMethod(a.E()), Tau2: a.F(), Prior: a.seqOpt()})
		}},
		{name: "DifferenceSequence.Look", call: func(_ context.Context, a args) (any, error) {
			s, err := test.NewDifferenceSequence(a.F()-0.5, a.F(), test.DifferenceSequenceOptions{Method: test.SequenceMethod(a.E()), Tau2: a.F()})
			if err != nil {
				return nil, err
			}
			first, err := s.Look(nil, a.C(), a.C(), a.C(), a.C())
			if err != nil {
				return nil, err
			}
			return s.Look(&first, a.C(), a.C(), a.C(), a.C())
		}},
		{name: "DifferenceSequence.Limits", call: func(_ context.Context, a args) (any, error) {
			s, err := test.NewDifferenceSequence(a.F()-0.5, a.F(), test.DifferenceSequenceOptions{Method: test.SequenceMethod(a.E()), Tau2: a.F()})
			if err != nil {
				return nil, err
			}
			lo, hi := s.Limits(a.C(), a.C(), a.C(), a.C())
			if lo > hi {
				return fmt.Sprintf("limits %v > %v", lo, hi), nil
			}
			return "", nil
		}, check: problems},

		// power
		{name: "NewCUSUM", call: func(_ context.Context, a args) (any, error) {
			return power.NewCUSUM(a.F(), a.F(), a.F()*10, power.CUSUMOptions{Shift: power.Shift(a.E()), Unit: a.C()})
		}},
		{name: "CUSUM.Step", call: func(_ context.Context, a args) (any, error) {
			c, err := power.NewCUSUM(a.F(), a.F(), a.F()*10, power.CUSUMOptions{Shift: power.Shift(a.E())})
			if err != nil {
				return nil, err
			}
			s, _ := c.Step(a.C(), a.B())
			return s, nil
		}},
		{name: "CUSUM.Batch", call: func(_ context.Context, a args) (any, error) {
			c, err := power.NewCUSUM(a.F(), a.F(), a.F()*10, power.CUSUMOptions{Shift: power.Shift(a.E())})
			if err != nil {
				return nil, err
			}
			s, _, err := c.Batch(a.C(), a.C(), a.C())
			return s, err
		}},
		{name: "CUSUMRunLength", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			c, err := power.NewCUSUM(a.F(), a.F(), a.F()*10, power.CUSUMOptions{Shift: power.Shift(a.E())})
			if err != nil {
				return nil, err
			}
			return power.CUSUMRunLength(ctx, c, a.F())
		}},
		{name: "CUSUMForARL", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			c, rl, err := power.CUSUMForARL(ctx, a.F(), a.F(), a.F()*1000, power.CUSUMOptions{Shift: power.Shift(a.E()), Unit: a.Small()})
			return []any{c, rl}, err
		}},
		{name: "SPRTOperating", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			s, err := a.sprt()
			if err != nil {
				return nil, err
			}
			return power.SPRTOperating(ctx, s, a.F())
		}},
		{name: "PairedSPRTOperating", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			s, err := a.sprt()
			if err != nil {
				return nil, err
			}
			return power.PairedSPRTOperating(ctx, s, a.F()/2, a.F()/2)
		}},
		{name: "SPRTCurve", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			s, err := a.sprt()
			if err != nil {
				return nil, err
			}
			return power.SPRTCurve(ctx, s, a.Reals())
		}},
		{name: "DifferenceSequenceErrorProb", hasCtx: true, call: func(ctx context.Context, a args) (any, error) {
			s, err := test.NewDifferenceSequence(a.F()-0.5, a.F(), test.DifferenceSequenceOptions{Method: test.SequenceMethod(a.E()), Tau2: a.F()})
			if err != nil {
				return nil, err
			}
			return power.DifferenceSequenceErrorProb(ctx, s, a.F(), a.F(), a.C())
		}, check: probRange},
	}
	e = append(e, enumEntries("Decision", "ParseDecision", test.DecisionValues, test.ParseDecision)...)
	e = append(e, enumEntries("SequenceMethod", "ParseSequenceMethod", test.SequenceMethodValues, test.ParseSequenceMethod)...)
	e = append(e, enumEntries("Shift", "ParseShift", power.ShiftValues, power.ParseShift)...)
	e = append(e, jsonEntries[interval.Mixture]("Mixture")...)
	e = append(e, jsonEntries[test.DifferenceLook]("DifferenceLook")...)
	e = append(e, jsonEntries[test.DifferenceSequence]("DifferenceSequence")...)
	e = append(e, jsonEntries[test.MixtureLook]("MixtureLook")...)
	e = append(e, jsonEntries[test.MixtureSequence]("MixtureSequence")...)
	e = append(e, jsonEntries[test.SPRT]("SPRT")...)
	e = append(e, jsonEntries[test.SPRTLook]("SPRTLook")...)
	e = append(e, jsonEntries[power.CUSUM]("CUSUM")...)
	e = append(e, jsonEntries[power.RunLength]("RunLength")...)
	e = append(e, jsonEntries[power.SPRTOperatingPoint]("SPRTOperatingPoint")...)
	return e
}

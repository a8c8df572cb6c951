package power

import (
	"context"
	"testing"
)

func FuzzStages(f *testing.F) {
	f.Add(0.05, 0.25, 0.05, 0.2, int64(10), int64(20), int64(30), 0, true)
	f.Add(0.5, 0.6, 0.1, 0.1, int64(1), int64(2), int64(3), 2, false)
	f.Add(0.99, 0.999, 0.01, 0.5, int64(5), int64(6), int64(200), 1, true)
	f.Fuzz(func(t *testing.T, p0, p1, alpha, beta float64, a, b, c int64, fam int, fut bool) {
		ctx := context.Background()
		r, err := Simon(ctx, p0, p1, alpha, beta, SimonOptions{MaxN: 40})
		checkFuzz(t, "Simon", err, r.Optimal.Alpha, r.Optimal.Power, r.Optimal.ExpectedN0, r.Minimax.ExpectedN0)
		if err == nil && (r.Optimal.Alpha > alpha*(1+1e-9) || r.Optimal.Power < (1-beta)*(1-1e-9) || r.Minimax.N > r.Optimal.N) {
			t.Fatalf("Simon(%v, %v, %v, %v): %+v", p0, p1, alpha, beta, r)
		}
		for _, d := range r.Admissible {
			e, err := EvaluateTwoStage(d.TwoStage, p0)
			checkFuzz(t, "EvaluateTwoStage", err, e.Reject, e.EarlyStop, e.ExpectedN)
		}
		sf := SpendingFunction{Family: Spending(fam % 4), Rho: float64(fam%5) / 2}
		opt := SequentialOptions{Spending: sf, Futility: fut, FutilitySpending: sf}
		looks := []int64{a % 300, b % 300, c % 300}
		d, err := SequentialOne(ctx, p0, p1, alpha, beta, looks, opt)
		checkFuzz(t, "SequentialOne", err, d.AttainedAlpha, d.AlphaNonBinding, d.Power, d.ExpectedN0, d.ExpectedN1)
		if err == nil {
			if d.AlphaNonBinding > alpha*(1+1e-9) {
				t.Fatalf("SequentialOne(%v, %v, %v, %v, %v): non-binding size %v above alpha", p0, p1, alpha, beta, looks, d.AlphaNonBinding)
			}
			for _, l := range d.Looks {
				if l.AlphaCumulative > l.AlphaSpent*(1+1e-9) && !fut {
					t.Fatalf("look %+v spends more than allowed", l)
				}
			}
		}
	})
}

package power

import (
	"context"
	"errors"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/golden"
)

// Demonstration sizes, exact bounds and smallest sampling plans against a
// direct SciPy search (testdata/gen/power_reliability.py). The demo rows
// are the standard binomial reliability-demonstration table (for example
// R = 0.90, C = 0.90: 22, 38, 52 trials for 0, 1, 2 failures; R = 0.99,
// C = 0.95: 299, 473, 628), as printed in reliability handbooks (recalled,
// recomputed). The plan row aql 0.01, rql 0.06 is the example Montgomery
// solves with the binomial nomograph, reading n = 120, c = 3 (recalled);
// the exact search gives the smaller n = 110, c = 3, which meets both risks.
func TestReliabilityGolden(t *testing.T) {
	t.Parallel()
	_, rows := golden.ReadCases(t, "../testdata/power_reliability.tsv")
	for _, r := range rows {
		switch r.Fields[0] {
		case "demo":
			d, err := DemonstrationTrials(r.Int(3), r.Float(1), r.Float(2))
			if err != nil {
				t.Fatal(err)
			}
			if d.Trials != r.Int(4) {
				t.Errorf("DemonstrationTrials%v = %d, want %s", r.Fields[1:4], d.Trials, r.Fields[4])
			}
			if d.AchievedLevel < d.Level || (d.PreviousLevel >= d.Level) {
				t.Errorf("%v: achieved %v previous %v", r.Fields[1:4], d.AchievedLevel, d.PreviousLevel)
			}
		case "bound":
			got, err := DemonstratedReliability(r.Int(1), r.Int(2), r.Float(3))
			if err != nil {
				t.Fatal(err)
			}
			if diff := cmp.Diff(r.Float(4), got, cmpopts.EquateApprox(1e-12, 0)); diff != "" {
				t.Errorf("DemonstratedReliability%v (-want +got):\n%s", r.Fields[1:4], diff)
			}
		case "plan":
			d, err := DesignPlan(context.Background(), r.Float(1), r.Float(2), DesignOptions{ProducerRisk: r.Float(3), ConsumerRisk: r.Float(4)})
			if err != nil {
				t.Fatal(err)
			}
			if d.Plan.SampleSize != r.Int(5) || d.Plan.AcceptNumber != r.Int(6) {
				t.Errorf("DesignPlan%v = %+v, want n = %s, c = %s", r.Fields[1:5], d.Plan, r.Fields[5], r.Fields[6])
			}
		}
	}
}

func TestReliabilityErrors(t *testing.T) {
	t.Parallel()
	if _, err := DemonstrationTrials(0, 1, 0.9); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("R = 1: %v", err)
	}
	if _, err := DemonstrationTrials(-1, 0.9, 0.9); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("failures = -1: %v", err)
	}
	if _, err := DemonstrationTrials(0, 1-1e-15, 0.9); !errors.Is(err, ErrTooLarge) {
		t.Errorf("R = 1 - 1e-15: %v", err)
	}
	if _, err := DemonstratedReliability(10, 11, 0.9); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("failures > n: %v", err)
	}
	if r, err := DemonstratedReliability(10, 10, 0.9); err != nil || r != 0 {
		t.Errorf("all failed: %v, %v", r, err)
	}
	if _, err := DesignPlan(context.Background(), 0.05, 0.01, DesignOptions{}); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("rql below aql: %v", err)
	}
	if _, err := DesignPlan(context.Background(), 0.01, 0.0101, DesignOptions{MaxN: 1000}); !errors.Is(err, ErrNoSolution) {
		t.Errorf("impossible plan: %v", err)
	}
}

package power

import (
	"context"
	"errors"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

// Finite lots: the hypergeometric OC approaches the binomial one for large
// lots, and equals a direct count for a small lot (lot 20, 4 defective,
// sample 5, accept at most 1: [C(16,5) + 4 C(16,4)] / C(20,5) =
// (4368 + 7280) / 15504 = 0.751290, computed by hand).
func TestAcceptProbLot(t *testing.T) {
	t.Parallel()
	pl := Plan{SampleSize: 5, AcceptNumber: 1}
	got, err := AcceptProbLot(pl, 20, 4)
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(11648.0/15504, got, cmpopts.EquateApprox(1e-12, 0)); diff != "" {
		t.Errorf("small lot (-want +got):\n%s", diff)
	}
	big := Plan{SampleSize: 89, AcceptNumber: 2}
	h, err := AcceptProbLot(big, 10_000_000, 100_000)
	if err != nil {
		t.Fatal(err)
	}
	b, _ := AcceptProb(big, 0.01)
	if diff := cmp.Diff(b, h, cmpopts.EquateApprox(1e-4, 0)); diff != "" {
		t.Errorf("large lot vs binomial (-want +got):\n%s", diff)
	}
	if _, err := AcceptProbLot(pl, 4, 1); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("lot below n: %v", err)
	}
}

// AOQL of the Montgomery plan n = 89, c = 2, N = 10000 (Montgomery,
// Introduction to Statistical Quality Control, rectifying inspection; the
// text reads about 0.0155 from the AOQ curve, recalled; recomputed here as
// the maximum of Pa(p) p (N - n)/N, checked against a fine grid).
func TestAOQL(t *testing.T) {
	t.Parallel()
	pl := Plan{SampleSize: 89, AcceptNumber: 2}
	r, err := AOQL(pl, 10000)
	if err != nil {
		t.Fatal(err)
	}
	best := 0.0
	for i := 1; i < 200000; i++ {
		p := float64(i) / 2e6
		best = math.Max(best, pl.rectify(10000, p).AOQ)
	}
	if r.AOQL < best-1e-12 || r.AOQL > best*(1+1e-6) {
		t.Errorf("AOQL = %v at p = %v; grid maximum %v", r.AOQL, r.P, best)
	}
	if math.Abs(r.AOQL-0.0155) > 0.0005 {
		t.Errorf("AOQL = %v, Montgomery reads about 0.0155", r.AOQL)
	}
	if len(r.Curve) != 401 {
		t.Errorf("curve has %d points", len(r.Curve))
	}
}

func TestAcceptanceErrors(t *testing.T) {
	t.Parallel()
	for _, pl := range []Plan{{0, 0}, {10, -1}, {10, 10}} {
		if _, err := AcceptProb(pl, 0.1); !errors.Is(err, ErrInvalidArgument) {
			t.Errorf("plan %+v: %v", pl, err)
		}
	}
	if _, err := AcceptProb(Plan{10, 1}, math.NaN()); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("NaN p accepted")
	}
	if _, err := Rectify(Plan{10, 1}, 5, 0.1); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("lot below n accepted")
	}
}

// Finite-lot design: the plan meets both risks under the hypergeometric
// OC and no smaller plan does (brute force); for a huge lot it equals the
// binomial design.
func TestDesignPlanLot(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	const lot = 500
	d, err := DesignPlan(ctx, 0.01, 0.06, DesignOptions{Lot: lot})
	if err != nil {
		t.Fatal(err)
	}
	pa := func(pl Plan, D int64) float64 { v, _ := AcceptProbLot(pl, lot, D); return v }
	if 1-pa(d.Plan, 5) > 0.05+1e-12 || pa(d.Plan, 30) > 0.10 {
		t.Errorf("plan %+v misses a risk: %v %v", d.Plan, 1-pa(d.Plan, 5), pa(d.Plan, 30))
	}
	for n := int64(1); n < d.Plan.SampleSize; n++ {
		for c := int64(0); c < n; c++ {
			q := Plan{SampleSize: n, AcceptNumber: c}
			if pa(q, 30) <= 0.10 && 1-pa(q, 5) <= 0.05 {
				t.Fatalf("smaller plan %+v meets both risks; design gave %+v", q, d.Plan)
			}
		}
	}
	big, err := DesignPlan(ctx, 0.01, 0.06, DesignOptions{Lot: 100_000_000})
	if err != nil || big.Plan != (Plan{SampleSize: 110, AcceptNumber: 3}) {
		t.Errorf("huge lot: %+v %v", big.Plan, err)
	}
	if _, err := DesignPlan(ctx, 0.01, 0.012, DesignOptions{Lot: 100}); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("indistinguishable levels: %v", err)
	}
}

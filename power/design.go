package power

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/internal/root"
)

// DefaultMaxPlanN is the largest sample size DesignPlan examines when
// DesignOptions.MaxN is 0.
const DefaultMaxPlanN int64 = 1_000_000

// MaxPlanN is the largest MaxN DesignPlan accepts (ErrTooLarge beyond).
const MaxPlanN int64 = 1 << 40

// DesignOptions configures DesignPlan. The zero value means: producer's
// risk 0.05, consumer's risk 0.10, search limit DefaultMaxPlanN.
type DesignOptions struct {
	// ProducerRisk alpha is the largest allowed probability of rejecting a
	// lot at the acceptable quality level; 0 means 0.05.
	ProducerRisk float64
	// ConsumerRisk beta is the largest allowed probability of accepting a
	// lot at the rejectable quality level; 0 means 0.10.
	ConsumerRisk float64
	// MaxN bounds the sample size searched; 0 means DefaultMaxPlanN.
	MaxN int64
	// Lot, when positive, designs for isolated lots of that size with
	// hypergeometric acceptance probabilities (type A OC): a lot at the
	// AQL holds round(AQL Lot) defectives and one at the RQL round(RQL
	// Lot), which must differ; the sample size is then at most Lot. 0
	// means large lots or a process (binomial, type B OC).
	Lot int64
}

// Candidate is the smallest sample size that meets the consumer's risk for
// one acceptance number, as examined by DesignPlan.
type Candidate struct {
	Plan Plan `json:"plan"`
	// ProducerRisk is 1 - Pa(AQL) for the plan.
	ProducerRisk float64 `json:"producer_risk"`
	// ConsumerRisk is Pa(RQL) for the plan.
	ConsumerRisk float64 `json:"consumer_risk"`
}

// MarshalJSON encodes the candidate with non-finite floats as strings.
func (c Candidate) MarshalJSON() ([]byte, error) {
	type plain Candidate
	return jsonfloat.Marshal(plain(c))
}

// UnmarshalJSON decodes what MarshalJSON writes, non-finite numbers
// included.
func (c *Candidate) UnmarshalJSON(b []byte) error {
	type plain Candidate
	return jsonfloat.Unmarshal(b, (*plain)(c))
}

// PlanDesign is the result of DesignPlan.
type PlanDesign struct {
	// Plan is the plan with the smallest sample size meeting both risks;
	// among plans of that size it has the smallest acceptance number.
	Plan Plan `json:"plan"`
	// AQL and RQL are the quality levels the risks are set at.
	AQL float64 `json:"aql"`
	RQL float64 `json:"rql"`
	// ProducerRisk and ConsumerRisk are the requested limits.
	ProducerRisk float64 `json:"producer_risk"`
	ConsumerRisk float64 `json:"consumer_risk"`
	// AchievedProducerRisk = 1 - Pa(AQL) and AchievedConsumerRisk =
	// Pa(RQL) for Plan, each at most its limit.
	AchievedProducerRisk float64 `json:"achieved_producer_risk"`
	AchievedConsumerRisk float64 `json:"achieved_consumer_risk"`
	// Candidates lists, for c = 0, 1, ..., Plan.AcceptNumber, the smallest
	// n meeting the consumer's risk and that plan's producer's risk.
	Candidates []Candidate `json:"candidates"`
}

// MarshalJSON encodes the result with non-finite floats as strings.
func (r PlanDesign) MarshalJSON() ([]byte, error) {
	type plain PlanDesign
	return jsonfloat.Marshal(plain(r))
}

// UnmarshalJSON decodes what MarshalJSON writes, non-finite numbers
// included.
func (r *PlanDesign) UnmarshalJSON(b []byte) error {
	type plain PlanDesign
	return jsonfloat.Unmarshal(b, (*plain)(r))
}

// DesignPlan returns the single sampling plan (n, c) with the smallest n
// such that, with binomial acceptance probabilities (large lots),
//
//	1 - Pa(aql) <= alpha  (producer's risk)  and  Pa(rql) <= beta  (consumer's risk).
//
// The search is exact, not a nomograph or a normal approximation. For each
// c = 0, 1, ... it finds n_c, the smallest n with Pa(rql; n, c) <= beta
// (Pa falls as n grows, so this is a bisection); the producer's risk of
// (n, c) grows with n, so n_c is the only n worth testing for that c, and
// n_c increases with c. The first c whose n_c meets the producer's risk
// therefore gives the smallest plan: any smaller n either has a larger c
// (failing the consumer's risk) or a smaller c whose producer's risk
// already failed at n_c. Cost: O(c log n) tail evaluations.
//
// With o.Lot > 0 the same search runs on hypergeometric probabilities for
// a lot of that size (Pa also falls as n grows there), capped at n = Lot;
// ErrTooLarge when such a lot's hypergeometric spread at n = min(MaxN,
// Lot/2) exceeds binom.MaxHyperStdDev (lots of about 1e10 and more), where
// Lot = 0 (the binomial OC) answers.
//
// Domain: 0 < aql < rql < 1, risks in (0, 1). ErrNoSolution when no plan
// with n <= MaxN meets both risks (the reason gives the closest
// candidate); ErrTooLarge for MaxN above MaxPlanN. ctx is checked for
// every acceptance number.
func DesignPlan(ctx context.Context, aql, rql float64, o DesignOptions) (PlanDesign, error) {
	const fn = "power.DesignPlan"
	if err := argerr.OpenProb(fn, "aql", aql); err != nil {
		return PlanDesign{}, err
	}
	if err := argerr.OpenProb(fn, "rql", rql); err != nil {
		return PlanDesign{}, err
	}
	if rql <= aql {
		return PlanDesign{}, argerr.Invalid(fn, "rql", rql, "must exceed aql = "+argerr.Format(aql)+"; a plan cannot accept worse lots more often than better ones")
	}
	alpha, beta := orDefault(o.ProducerRisk, 0.05), orDefault(o.ConsumerRisk, 0.10)
	if err := checkLevel(fn, "ProducerRisk", alpha); err != nil {
		return PlanDesign{}, err
	}
	if err := checkLevel(fn, "ConsumerRisk", beta); err != nil {
		return PlanDesign{}, err
	}
	if alpha+beta >= 1 {
		return PlanDesign{}, argerr.Invalid(fn, "ConsumerRisk", beta, "plus ProducerRisk = "+argerr.Format(alpha)+" reaches 1: a coin toss meets both")
	}
	maxN := o.MaxN
	if maxN == 0 {
		maxN = DefaultMaxPlanN
	}
	if maxN < 1 {
		return PlanDesign{}, argerr.Invalid(fn, "MaxN", maxN, "must be at least 1 (0 means the default)")
	}
	if maxN > MaxPlanN {
		return PlanDesign{}, argerr.TooLarge(fn, "MaxN", maxN, "exceeds 2^40")
	}
	// logAccept(p, n, c) is ln Pa and logReject ln(1 - Pa), binomial or,
	// for a finite lot, hypergeometric.
	logAccept := func(p float64, n, c int64) float64 { return binom.Dist{N: n, P: p}.LogCDF(c) }
	logReject := func(p float64, n, c int64) float64 { return binom.Dist{N: n, P: p}.LogSurvival(c) }
	if o.Lot != 0 {
		if o.Lot < 0 || o.Lot > binom.MaxN {
			return PlanDesign{}, argerr.Invalid(fn, "Lot", o.Lot, "must be a lot size in [1, 2^53] (0 means large lots)")
		}
		dq, dr := int64(math.Round(aql*float64(o.Lot))), int64(math.Round(rql*float64(o.Lot)))
		if dr <= dq {
			return PlanDesign{}, argerr.Invalid(fn, "Lot", o.Lot, "is too small to tell aql from rql: both round to "+argerr.Format(dq)+" defectives")
		}
		// The hypergeometric variance in n peaks at n = lot/2; refuse lots
		// whose OC would need sums beyond binom.MaxHyperStdDev.
		for _, d := range []int64{dq, dr} {
			if _, err := binom.NewHyper(o.Lot, d, min(maxN, o.Lot/2)); err != nil {
				return PlanDesign{}, argerr.TooLarge(fn, "Lot", o.Lot, "is too large for the exact hypergeometric OC ("+err.Error()+"); use Lot = 0 (the binomial OC of large lots)")
			}
		}
		defectives := func(p float64) int64 {
			if p == aql {
				return dq
			}
			return dr
		}
		logAccept = func(p float64, n, c int64) float64 {
			return binom.Hyper{Total: o.Lot, Successes: defectives(p), Draws: n}.LogCDF(c)
		}
		logReject = func(p float64, n, c int64) float64 {
			return binom.Hyper{Total: o.Lot, Successes: defectives(p), Draws: n}.LogSurvival(c)
		}
		maxN = min(maxN, o.Lot)
	}
	res := PlanDesign{AQL: aql, RQL: rql, ProducerRisk: alpha, ConsumerRisk: beta}
	lo := int64(0) // n_c > lo for every c still to come
	for c := int64(0); ; c++ {
		if err := argerr.Canceled(fn, ctx); err != nil {
			return PlanDesign{}, err
		}
		// Decided on the reported probabilities themselves, so a plan never
		// shows a risk above its limit by a rounding.
		// ctx is checked at every evaluation too: near MaxPlanN one value of
		// c costs some 80 tail evaluations.
		var cerr error
		meetsRQL := func(n int64) bool {
			if cerr = argerr.Canceled(fn, ctx); cerr != nil {
				return true // ends the searches at once
			}
			return math.Exp(logAccept(rql, n, c)) <= beta
		}
		if lo < c {
			lo = c // n must exceed c
		}
		if lo >= maxN {
			return PlanDesign{}, noPlan(fn, res, maxN)
		}
		hi := lo + 1
		for !meetsRQL(hi) {
			lo = hi
			if hi >= maxN {
				return PlanDesign{}, noPlan(fn, res, maxN)
			}
			hi = min(2*hi, maxN)
		}
		n := root.SmallestInt(meetsRQL, lo+1, hi)
		if cerr != nil {
			return PlanDesign{}, cerr
		}
		lo = n - 1
		pl := Plan{SampleSize: n, AcceptNumber: c}
		cand := Candidate{
			Plan:         pl,
			ProducerRisk: math.Exp(logReject(aql, n, c)),
			ConsumerRisk: math.Exp(logAccept(rql, n, c)),
		}
		res.Candidates = append(res.Candidates, cand)
		if cand.ProducerRisk <= alpha {
			res.Plan = pl
			res.AchievedProducerRisk, res.AchievedConsumerRisk = cand.ProducerRisk, cand.ConsumerRisk
			return res, nil
		}
	}
}

func noPlan(fn string, res PlanDesign, maxN int64) error {
	reason := "no plan with n <= " + argerr.Format(maxN) + " meets both risks"
	if k := len(res.Candidates); k > 0 {
		c := res.Candidates[k-1]
		reason += "; the last candidate (n = " + argerr.Format(c.Plan.SampleSize) + ", c = " + argerr.Format(c.Plan.AcceptNumber) +
			") has producer's risk " + argerr.Format(c.ProducerRisk) + "; raise MaxN or move aql and rql apart"
	}
	return argerr.NoSolution(fn, reason)
}

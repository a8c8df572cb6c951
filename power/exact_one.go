package power

import (
	"context"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/test"
)

// NPower is one point of a power curve: the power at sample size N.
type NPower struct {
	N     int64   `json:"n"`
	Power float64 `json:"power"`
}

// MarshalJSON encodes the point with non-finite floats as strings.
func (p NPower) MarshalJSON() ([]byte, error) {
	type plain NPower
	return jsonfloat.Marshal(plain(p))
}

// UnmarshalJSON decodes what MarshalJSON writes, non-finite numbers
// included.
func (p *NPower) UnmarshalJSON(b []byte) error {
	type plain NPower
	return jsonfloat.Unmarshal(b, (*plain)(p))
}

// ExactPower is the exact power of a test at one sample size.
type ExactPower struct {
	// Test names the test, for example "exact binomial, two-sided
	// point-probability".
	Test string `json:"test"`
	// N is the number of trials (group 1 for two samples, pairs for
	// McNemar).
	N int64 `json:"n"`
	// Power is the probability of rejecting H0 at the true proportion(s).
	Power float64 `json:"power"`
	// Alpha is the nominal level; Size the attained size, the rejection
	// probability under H0 (at most Alpha for the non-mid-p tests).
	Alpha float64 `json:"alpha"`
	Size  float64 `json:"size"`
	// AcceptLo and AcceptHi bound the acceptance region: outcomes k with
	// AcceptLo <= k <= AcceptHi are not rejected (one-sample tests only;
	// AcceptLo > AcceptHi when every outcome is rejected).
	AcceptLo int64 `json:"accept_lo"`
	AcceptHi int64 `json:"accept_hi"`
}

// MarshalJSON encodes the result with non-finite floats as strings.
func (r ExactPower) MarshalJSON() ([]byte, error) {
	type plain ExactPower
	return jsonfloat.Marshal(plain(r))
}

// UnmarshalJSON decodes what MarshalJSON writes, non-finite numbers
// included.
func (r *ExactPower) UnmarshalJSON(b []byte) error {
	type plain ExactPower
	return jsonfloat.Unmarshal(b, (*plain)(r))
}

// rejectProb returns P(X < lo) + P(X > hi) for X ~ Binomial(n, p): the
// rejection probability of the acceptance region [lo, hi], each tail
// computed directly.
func rejectProb(n int64, p float64, lo, hi int64) float64 {
	if lo > hi {
		return 1
	}
	d := binom.Dist{N: n, P: p}
	s := 0.0
	if lo > 0 {
		s = d.CDF(lo - 1)
	}
	if hi < n {
		s += d.Survival(hi)
	}
	return min(s, 1)
}

func testName(o OneSampleOptions) string {
	s := "exact binomial, " + o.Alternative.String()
	if o.Alternative == test.TwoSided {
		s += " " + o.Rule.String()
	}
	if o.MidP {
		s += ", mid-p"
	}
	return s
}

// OneSamplePower returns the exact power of the one-sample exact binomial
// test of H0: p = p0 (the test package's test, through its acceptance
// region: k is rejected when its p-value is below alpha) with n trials at
// the true proportion p1:
//
//	power = P(X < lo) + P(X > hi),  X ~ Binomial(n, p1),
//
// where [lo, hi] is the acceptance region; Size is the same sum at p0.
// p1 may equal p0 (Power = Size). Domain: n >= 1 (at most binom.MaxN),
// 0 < p0 < 1, 0 <= p1 <= 1, o.Alpha in (0, 1). Accuracy: binom's tails,
// 1e-13 relative. Cost: O(log n) p-values.
func OneSamplePower(n int64, p0, p1 float64, o OneSampleOptions) (ExactPower, error) {
	const fn = "power.OneSamplePower"
	alpha, _, err := o.base(fn, p0, p1)
	if err != nil {
		return ExactPower{}, err
	}
	if n < 1 {
		return ExactPower{}, argerr.Invalid(fn, "n", n, "must be at least 1")
	}
	if n > binom.MaxN {
		return ExactPower{}, argerr.TooLarge(fn, "n", n, "exceeds 2^53")
	}
	r := newRegion(oneTest(p0, o.Alternative, o.Rule, o.MidP), alpha)
	lo, hi := r.at(n)
	return ExactPower{
		Test: testName(o), N: n, Alpha: alpha,
		Power: rejectProb(n, p1, lo, hi), Size: rejectProb(n, p0, lo, hi),
		AcceptLo: lo, AcceptHi: hi,
	}, nil
}

// OneSampleCurve returns the exact power of the one-sample test (as in
// OneSamplePower) for every n = 1, ..., nMax, in order. The acceptance
// region is carried from n to n + 1 (a one-sided boundary moves by 0 or 1,
// decided by one p-value; two-sided boundaries by a short certified walk),
// so the cost is one p-value per n one-sided and two two-sided (plus O(1)
// tail recurrences), Blaker's p-value the costliest. nMax is limited to
// MaxSearchN; ctx is
// checked every 256 n. Memory: the curve, 16 bytes per n (160 MB at
// MaxSearchN).
func OneSampleCurve(ctx context.Context, p0, p1 float64, nMax int64, o OneSampleOptions) ([]NPower, error) {
	const fn = "power.OneSampleCurve"
	alpha, _, err := o.base(fn, p0, p1)
	if err != nil {
		return nil, err
	}
	if nMax < 1 {
		return nil, argerr.Invalid(fn, "nMax", nMax, "must be at least 1")
	}
	if nMax > MaxSearchN {
		return nil, argerr.TooLarge(fn, "nMax", nMax, "exceeds MaxSearchN = "+argerr.Format(MaxSearchN))
	}
	c := newCurve(p0, p1, alpha, o)
	// Grown as the curve is computed (not allocated for nMax up front, which
	// at MaxSearchN took a third of a second before the first check).
	var out []NPower
	for n := int64(1); n <= nMax; n++ {
		if n&255 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return nil, err
			}
		}
		out = append(out, NPower{N: n, Power: c.power(n)})
	}
	return out, nil
}

// oneCurve evaluates the power of a one-sample test along n = 1, 2, ...
type oneCurve struct {
	reg   *region
	tails *tailPair
}

func newCurve(p0, p1, alpha float64, o OneSampleOptions) *oneCurve {
	return &oneCurve{reg: newRegion(oneTest(p0, o.Alternative, o.Rule, o.MidP), alpha), tails: newTailPair(p1)}
}

func (c *oneCurve) power(n int64) float64 {
	lo, hi := c.reg.at(n)
	return c.tails.at(n, lo, hi)
}

// ExactSize is the result of an exact sample size search.
type ExactSize struct {
	// Test names the test.
	Test string `json:"test"`
	// Target is the requested power.
	Target float64 `json:"target"`
	// First is the smallest n whose power reaches Target, FirstPower its
	// power.
	First      int64   `json:"first"`
	FirstPower float64 `json:"first_power"`
	// Stable is the smallest n from which every n up to Horizon reaches
	// Target (the sawtooth of exact power can make it larger than First);
	// StablePower its power. 0 when power at Horizon = MaxN itself fails.
	Stable      int64   `json:"stable"`
	StablePower float64 `json:"stable_power"`
	// Horizon is the largest n examined: at least max(2 First, First +
	// 100) (capped at MaxN), extended by doubling while the last n below
	// Target lies in the upper half of [First, Horizon].
	Horizon int64 `json:"horizon"`
	// Size is the attained size at Stable (at First when Stable is 0); 0
	// for the precision planners, which involve no test.
	Size float64 `json:"size"`
	// Normal is the normal-approximation size for comparison.
	Normal NormalSize `json:"normal"`
	// Curve holds the power for n = 1, ..., Horizon, for plotting.
	Curve []NPower `json:"curve"`
	// Warnings lists caveats that do not stop the answer.
	Warnings []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the result with non-finite floats as strings.
func (r ExactSize) MarshalJSON() ([]byte, error) {
	type plain ExactSize
	return jsonfloat.Marshal(plain(r))
}

// UnmarshalJSON decodes what MarshalJSON writes, non-finite numbers
// included.
func (r *ExactSize) UnmarshalJSON(b []byte) error {
	type plain ExactSize
	return jsonfloat.Unmarshal(b, (*plain)(r))
}

// searchStable scans n = 1, 2, ... with power(n), finds the first n
// reaching target and the start of the run that keeps it, as documented
// on ExactSize: the horizon is max(2 First, First + 100), doubled while
// the last failing n lies in its upper half. It returns ErrNoSolution
// when no n <= maxN reaches the target.
func searchStable(ctx context.Context, fn string, power func(int64) float64, target float64, maxN int64) (ExactSize, error) {
	return scanStable(ctx, fn, scan{start: 1, maxN: maxN, target: target, extend: true,
		horizon: func(first int64) int64 { return max(2*first, first+100) }},
		func(n int64) (float64, error) { return power(n), nil })
}

// scan describes a sawtooth-aware scan over n: where it starts, its
// limit, the target, the horizon after the first success, and whether the
// horizon doubles while the last failure lies in its upper half.
type scan struct {
	start, maxN int64
	target      float64
	horizon     func(first int64) int64
	extend      bool
}

// scanStable evaluates power(n) for n = sc.start, ..., finds the first n
// reaching the target and the smallest n from which every n through the
// horizon keeps it, and fills an ExactSize with the curve. It returns
// ErrNoSolution when no n <= sc.maxN reaches the target, and power's
// error or a cancellation (ctx is checked every 16 n) unchanged.
func scanStable(ctx context.Context, fn string, sc scan, power func(int64) (float64, error)) (ExactSize, error) {
	r := ExactSize{Target: sc.target}
	horizon := sc.maxN
	lastFail := sc.start - 1
	for n := sc.start; n <= horizon; n++ {
		if n&15 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return ExactSize{}, err
			}
		}
		pw, err := power(n)
		if err != nil {
			return ExactSize{}, err
		}
		r.Curve = append(r.Curve, NPower{N: n, Power: pw})
		if pw < sc.target {
			lastFail = n
		} else if r.First == 0 {
			r.First, r.FirstPower = n, pw
			horizon = min(sc.maxN, sc.horizon(n))
		}
		if sc.extend && n == horizon && r.First > 0 && lastFail > r.First+(horizon-r.First)/2 && horizon < sc.maxN {
			horizon = min(sc.maxN, 2*horizon)
		}
	}
	if r.First == 0 {
		return ExactSize{}, argerr.NoSolution(fn, "no n up to MaxN = "+argerr.Format(sc.maxN)+" reaches the target "+
			argerr.Format(sc.target)+"; raise MaxN or the effect")
	}
	r.Horizon = horizon
	if lastFail < horizon {
		r.Stable = max(lastFail+1, r.First)
		r.StablePower = r.Curve[r.Stable-sc.start].Power
	} else {
		r.Warnings = append(r.Warnings, "the target is missed again at MaxN: no stable n found")
	}
	if r.First == sc.start && sc.start > 1 {
		r.Warnings = append(r.Warnings, "the target is already reached where the scan starts: smaller n were not examined")
	}
	return r, nil
}

// OneSampleN returns the exact sample size of the one-sample exact
// binomial test of H0: p = p0 for power o.Power at p1: the first n whose
// exact power reaches the target and the smallest n from which every
// larger n (through ExactSize.Horizon) keeps it. Exact power is a sawtooth
// in n, because the attained size jumps as the rejection region gains an
// outcome, so the two can differ; the normal-approximation n is reported
// beside them. The scan starts at n = 1 so First is certain; it stops at
// o.MaxN (default DefaultMaxN, at most MaxSearchN) with ErrNoSolution.
// Domain as OneSampleNormalN. ctx is checked every 16 n.
func OneSampleN(ctx context.Context, p0, p1 float64, o OneSampleOptions) (ExactSize, error) {
	const fn = "power.OneSampleN"
	alpha, pw, err := o.levels(fn, p0, p1)
	if err != nil {
		return ExactSize{}, err
	}
	limit, err := maxN(fn, o.MaxN, DefaultMaxN, MaxSearchN)
	if err != nil {
		return ExactSize{}, err
	}
	c := newCurve(p0, p1, alpha, o)
	r, err := searchStable(ctx, fn, c.power, pw, limit)
	if err != nil {
		return ExactSize{}, err
	}
	r.Test = testName(o)
	at := r.Stable
	if at == 0 {
		at = r.First
	}
	ep, _ := OneSamplePower(at, p0, p1, o)
	r.Size = ep.Size
	if ns, err := OneSampleNormalN(p0, p1, o); err == nil {
		r.Normal = ns
	}
	return r, nil
}

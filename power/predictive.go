package power

import (
	"context"
	"math"
	"strconv"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/internal/root"
	"github.com/kofnlab/kofn/interval"
)

// Predictive is the posterior predictive probability that a single-arm
// study reaches a success criterion at its final size, given the data so
// far, under a stated Beta prior.
type Predictive struct {
	Prior interval.Prior `json:"prior"` // the prior, with its shapes
	X     int64          `json:"x"`     // successes so far
	N     int64          `json:"n"`     // trials so far
	Final int64          `json:"final"` // planned final number of trials
	// NeedTotal is the smallest total number of successes at the final
	// size that meets the criterion (Final + 1 when none does).
	NeedTotal int64 `json:"need_total"`
	// Prob is P(final successes >= NeedTotal | x of n), the beta-binomial
	// predictive tail of the Final - N remaining trials; LogProb its log.
	Prob     float64  `json:"prob"`
	LogProb  float64  `json:"log_prob"`
	Warnings []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the result through jsonfloat.
func (p Predictive) MarshalJSON() ([]byte, error) {
	type plain Predictive
	return jsonfloat.Marshal(plain(p))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (p *Predictive) UnmarshalJSON(b []byte) error {
	type plain Predictive
	return jsonfloat.Unmarshal(b, (*plain)(p))
}

// PredictiveAtLeast returns the posterior predictive probability that a
// study planned for final trials ends with at least need successes in all,
// given x successes in the first n, under prior (the zero Prior is
// Jeffreys): with a = prior.A + x, b = prior.B + n - x and m = final - n,
//
//	P = P(Y >= need - x),  Y ~ BetaBinomial(m, a, b)
//
// (Geisser S (1993), Predictive Inference: An Introduction, chapter 2;
// the beta-binomial from binom.BetaBinom, tails summed directly).
// Errors: x < 0, x > n, final < n, need < 0, final - n above
// binom.MaxBetaBinomN (ErrTooLarge), an invalid prior.
func PredictiveAtLeast(x, n, final, need int64, prior interval.Prior) (Predictive, error) {
	const fn = "power.PredictiveAtLeast"
	pr, a, b, err := prior.Update(fn, "x", "n", x, n)
	if err != nil {
		return Predictive{}, err
	}
	if final < n {
		return Predictive{}, argerr.Invalid(fn, "final", final, "is below n = "+strconv.FormatInt(n, 10))
	}
	if need < 0 {
		return Predictive{}, argerr.Invalid(fn, "need", need, "is negative")
	}
	if final-n > binom.MaxBetaBinomN {
		return Predictive{}, argerr.TooLarge(fn, "final", final, "leaves more than 2^21 trials to predict")
	}
	r := Predictive{Prior: pr, X: x, N: n, Final: final, NeedTotal: need}
	r.LogProb = predictiveLogTail(final-n, a, b, need-x)
	r.Prob = math.Exp(r.LogProb)
	return r, nil
}

// PredictiveSuccess returns the predictive probability of Lee and Liu
// (2008) after x successes in n: the probability, under the beta-binomial
// predictive distribution of the remaining final - n trials, that at the
// final size the posterior probability P(p > p0 | data) exceeds thetaT.
// NeedTotal is the smallest final number of successes that meets that
// criterion (found by bisection: the posterior tail grows with the count),
// and Prob = P(final successes >= NeedTotal | x of n). Errors: as
// PredictiveAtLeast, p0 and thetaT outside (0, 1).
func PredictiveSuccess(x, n, final int64, p0, thetaT float64, prior interval.Prior) (Predictive, error) {
	const fn = "power.PredictiveSuccess"
	if err := argerr.OpenProb(fn, "p0", p0); err != nil {
		return Predictive{}, err
	}
	if err := argerr.OpenProb(fn, "thetaT", thetaT); err != nil {
		return Predictive{}, err
	}
	pr, err := prior.Resolve(fn)
	if err != nil {
		return Predictive{}, err
	}
	if final < n || final > 1<<49 {
		return Predictive{}, argerr.Invalid(fn, "final", final, "must lie between n = "+strconv.FormatInt(n, 10)+" and 2^49")
	}
	var bad error
	need := root.SmallestInt(func(s int64) bool {
		post, err := interval.NewPosterior(s, final, pr)
		if err != nil {
			bad = err
			return true
		}
		pa, _, _ := post.ProbAbove(p0)
		return pa > thetaT
	}, 0, final)
	if bad != nil {
		return Predictive{}, bad
	}
	r, err := PredictiveAtLeast(x, n, final, need, pr)
	if err != nil {
		return Predictive{}, err
	}
	if need > final {
		r.Warnings = append(r.Warnings, "no final count meets the criterion: the predictive probability is 0")
	}
	return r, nil
}

// predictiveLogTail returns ln P(Y >= j), Y ~ BetaBinomial(m, a, b).
func predictiveLogTail(m int64, a, b float64, j int64) float64 {
	if j <= 0 {
		return 0
	}
	if j > m {
		return math.Inf(-1)
	}
	return binom.BetaBinom{N: m, A: a, B: b}.LogSurvival(j - 1)
}

// MaxPredictiveN is the largest final size PredictiveDesign evaluates:
// its exact operating characteristics cost about final^2 beta-binomial
// tails.
const MaxPredictiveN = 2000

// PredictiveDesign is a single-arm design monitored by predictive
// probability (Lee JJ, Liu DD (2008), "A predictive probability design for
// phase II cancer clinical trials", Clinical Trials 5:93-106): after each
// interim look, with x successes of n, compute
//
//	PP = P(P(p > P0 | all Final outcomes) > ThetaT | x of n),
//
// the predictive probability that the final posterior will show the
// response rate above P0 with probability above ThetaT; stop for futility
// when PP < ThetaL and (if ThetaU < 1) for efficacy when PP > ThetaU. At
// the final size the null hypothesis p <= P0 is rejected when
// P(p > P0 | data) > ThetaT.
type PredictiveDesign struct {
	Final  int64          // maximum (final) number of trials, 1 to MaxPredictiveN
	Looks  []int64        // interim sizes, increasing, each in [1, Final); nil means after every trial from 1
	P0     float64        // response rate of no interest, in (0, 1)
	ThetaT float64        // posterior threshold at the end, in (0, 1)
	ThetaL float64        // futility threshold for PP, in [0, 1)
	ThetaU float64        // efficacy threshold for PP, in (0, 1]; 0 means 1 (no efficacy stop)
	Prior  interval.Prior // prior of the response rate (zero value: Jeffreys)
}

// DesignOC holds the exact frequentist operating characteristics of a
// PredictiveDesign at one true response rate.
type DesignOC struct {
	P float64 `json:"p"` // the true response rate
	// Reject is the probability of declaring the treatment promising
	// (rejecting p <= P0): at an efficacy stop or at the final analysis.
	Reject float64 `json:"reject"`
	// EarlyStop is the probability of stopping at an interim look (for
	// futility or efficacy); EarlyFutility that of a futility stop.
	EarlyStop     float64 `json:"early_stop"`
	EarlyFutility float64 `json:"early_futility"`
	ExpectedN     float64 `json:"expected_n"` // expected number of trials
}

// PredictiveOC is the result of PredictiveDesign.OC.
type PredictiveOC struct {
	Prior interval.Prior `json:"prior"`
	// FinalNeed is the smallest number of successes at the final size
	// with P(p > P0 | data) > ThetaT (Final + 1 when none).
	FinalNeed int64 `json:"final_need"`
	// Futility[i] is the largest number of successes at Looks[i] that
	// stops for futility (-1 when none); Efficacy[i] the smallest that
	// stops for efficacy (Looks[i] + 1 when none).
	Looks    []int64    `json:"looks"`
	Futility []int64    `json:"futility"`
	Efficacy []int64    `json:"efficacy"`
	OC       []DesignOC `json:"oc"` // at each requested true rate
	Warnings []string   `json:"warnings,omitempty"`
}

// MarshalJSON encodes the result through jsonfloat.
func (r PredictiveOC) MarshalJSON() ([]byte, error) {
	type plain PredictiveOC
	return jsonfloat.Marshal(plain(r))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (r *PredictiveOC) UnmarshalJSON(b []byte) error {
	type plain PredictiveOC
	return jsonfloat.Unmarshal(b, (*plain)(r))
}

// OC returns the design's stopping boundaries and its exact operating
// characteristics at each true response rate in ps (for example P0 for
// the type I error and the target rate for the power): the probability of
// rejecting p <= P0, of stopping early, and the expected number of trials,
// by forward recursion over the looks of the distribution of the number of
// successes among the studies still running (binomial increments between
// looks), with no simulation.
//
// The boundaries follow from monotonicity: P(p > P0 | x of Final) grows
// with x, so the final criterion is x >= FinalNeed, and PP at a look is the
// beta-binomial tail P(Y >= FinalNeed - x), which grows with x, so each
// look stops for futility below one count and for efficacy above another.
//
// Cost: one posterior tail per candidate final count, a binary search of
// beta-binomial tails at each look (each up to Final - n terms), and
// O(Final) work per look and rate; ctx is checked at every look. Errors name the bad field (Final above
// MaxPredictiveN is ErrTooLarge).
func (d PredictiveDesign) OC(ctx context.Context, ps []float64) (PredictiveOC, error) {
	const fn = "power.PredictiveDesign.OC"
	if d.Final < 1 {
		return PredictiveOC{}, argerr.Invalid(fn, "Final", d.Final, "must be at least 1")
	}
	if d.Final > MaxPredictiveN {
		return PredictiveOC{}, argerr.TooLarge(fn, "Final", d.Final, "exceeds 2000, the limit of the exact operating characteristics")
	}
	if err := argerr.OpenProb(fn, "P0", d.P0); err != nil {
		return PredictiveOC{}, err
	}
	if err := argerr.OpenProb(fn, "ThetaT", d.ThetaT); err != nil {
		return PredictiveOC{}, err
	}
	if !(d.ThetaL >= 0 && d.ThetaL < 1) {
		return PredictiveOC{}, argerr.Invalid(fn, "ThetaL", d.ThetaL, "must lie in [0, 1)")
	}
	thetaU := d.ThetaU
	if thetaU == 0 {
		thetaU = 1
	}
	if !(thetaU > d.ThetaL && thetaU <= 1) {
		return PredictiveOC{}, argerr.Invalid(fn, "ThetaU", d.ThetaU, "must lie in (ThetaL, 1] (0 means 1: no efficacy stop)")
	}
	looks := d.Looks
	if looks == nil {
		for n := int64(1); n < d.Final; n++ {
			looks = append(looks, n)
		}
	}
	for i, n := range looks {
		if n < 1 || n >= d.Final || (i > 0 && n <= looks[i-1]) {
			return PredictiveOC{}, argerr.Invalid(fn, "Looks["+strconv.Itoa(i)+"]", n, "must increase and lie in [1, Final)")
		}
	}
	for i, p := range ps {
		if err := argerr.Prob(fn, "ps["+strconv.Itoa(i)+"]", p); err != nil {
			return PredictiveOC{}, err
		}
	}
	pr, err := d.Prior.Resolve(fn)
	if err != nil {
		return PredictiveOC{}, err
	}
	r := PredictiveOC{Prior: pr, Looks: append([]int64(nil), looks...)}
	// Final criterion: smallest x with P(p > P0 | x of Final) > ThetaT.
	r.FinalNeed = d.Final + 1
	for x := int64(0); x <= d.Final; x++ {
		post, err := interval.NewPosterior(x, d.Final, pr)
		if err != nil {
			return PredictiveOC{}, err
		}
		if pa, _, _ := post.ProbAbove(d.P0); pa > d.ThetaT {
			r.FinalNeed = x
			break
		}
	}
	// Boundaries at each look.
	for _, n := range looks {
		if err := argerr.Canceled(fn, ctx); err != nil {
			return PredictiveOC{}, err
		}
		pp := func(x int64) float64 {
			a, b := pr.A+float64(x), pr.B+float64(n-x)
			return math.Exp(predictiveLogTail(d.Final-n, a, b, r.FinalNeed-x))
		}
		// PP increases with x: binary searches for both boundaries.
		fut := root.SmallestInt(func(x int64) bool { return pp(x) >= d.ThetaL }, 0, n) - 1
		eff := n + 1
		if thetaU < 1 {
			eff = root.SmallestInt(func(x int64) bool { return pp(x) > thetaU }, 0, n)
		}
		r.Futility = append(r.Futility, fut)
		r.Efficacy = append(r.Efficacy, eff)
	}
	for _, p := range ps {
		oc, err := d.walk(ctx, fn, r, p)
		if err != nil {
			return PredictiveOC{}, err
		}
		r.OC = append(r.OC, oc)
	}
	return r, nil
}

// walk runs the forward recursion at true rate p.
func (d PredictiveDesign) walk(ctx context.Context, fn string, r PredictiveOC, p float64) (DesignOC, error) {
	oc := DesignOC{P: p}
	cur := []float64{1} // distribution of successes among running studies at size prev
	prev := int64(0)
	step := func(to int64) {
		m := to - prev
		inc, _ := binom.New(m, p)
		pm := make([]float64, m+1)
		for j := range pm {
			pm[j] = inc.Prob(int64(j))
		}
		next := make([]float64, int64(len(cur))+m)
		for x, w := range cur {
			if w == 0 {
				continue
			}
			for j, q := range pm {
				next[x+j] += w * q
			}
		}
		cur, prev = next, to
	}
	for i, n := range r.Looks {
		if err := argerr.Canceled(fn, ctx); err != nil {
			return DesignOC{}, err
		}
		step(n)
		for x := range cur {
			switch {
			case int64(x) <= r.Futility[i]:
				oc.EarlyStop += cur[x]
				oc.EarlyFutility += cur[x]
				oc.ExpectedN += cur[x] * float64(n)
				cur[x] = 0
			case int64(x) >= r.Efficacy[i]:
				oc.EarlyStop += cur[x]
				oc.Reject += cur[x]
				oc.ExpectedN += cur[x] * float64(n)
				cur[x] = 0
			}
		}
	}
	step(d.Final)
	for x, w := range cur {
		oc.ExpectedN += w * float64(d.Final)
		if int64(x) >= r.FinalNeed {
			oc.Reject += w
		}
	}
	return oc, nil
}

package power

import (
	"context"
	"math"
	"strconv"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/internal/root"
	"github.com/kofnlab/kofn/internal/stagewise"
)

// SequentialOptions holds the spending functions of a group-sequential
// design; the zero value means O'Brien-Fleming type alpha spending and no
// futility bounds.
type SequentialOptions struct {
	// Spending is the alpha-spending function of the efficacy bounds.
	Spending SpendingFunction
	// Futility adds futility bounds from the beta-spending function
	// FutilitySpending.
	Futility         bool
	FutilitySpending SpendingFunction
	// Binding computes the efficacy bounds with the futility stops taken
	// into account (the futility rule must then be obeyed, or the size
	// exceeds alpha). The default, non-binding, computes the efficacy
	// bounds as if the study never stopped for futility, so the size stays
	// at most alpha whether or not the futility rule is followed (common
	// practice, and what regulators usually ask for).
	Binding bool
}

func (o SequentialOptions) check(fn string) error {
	if err := o.Spending.check(fn, "Spending"); err != nil {
		return err
	}
	if o.Futility {
		return o.FutilitySpending.check(fn, "FutilitySpending")
	}
	return nil
}

// SequentialLook is one look of a group-sequential design with its
// boundaries and error rates.
type SequentialLook struct {
	// N is the cumulative sample size (trials, or subjects per group for
	// two groups) and Fraction = N / N_final the information fraction.
	N        int64   `json:"n"`
	Fraction float64 `json:"fraction"`
	// Efficacy and Futility are the stopping counts (see Look): stop
	// rejecting H0 at counts >= Efficacy (N + 1: no efficacy stop at this
	// look), stop for futility at counts <= Futility (-1: none).
	Efficacy int64 `json:"efficacy"`
	Futility int64 `json:"futility"`
	// Z and ZFutility are the stopping counts on the z scale, the score
	// statistic (k - N p0)/sqrt(N p0 (1 - p0)); +Inf when no count stops
	// for efficacy, -Inf when none stops for futility (ZFutility is
	// omitted without futility bounds).
	Z         float64 `json:"z"`
	ZFutility float64 `json:"z_futility,omitempty"`
	// AlphaSpent is the cumulative alpha the spending function allows by
	// this look; AlphaCumulative the attained cumulative probability of
	// rejecting H0 by this look under H0 (exact for one proportion; for
	// two proportions the normal-theory value, equal to AlphaSpent).
	AlphaSpent      float64 `json:"alpha_spent"`
	AlphaCumulative float64 `json:"alpha_cumulative"`
	// BetaSpent and BetaCumulative are the same for stopping for futility
	// under H1 (futility bounds only).
	BetaSpent      float64 `json:"beta_spent,omitempty"`
	BetaCumulative float64 `json:"beta_cumulative,omitempty"`
	// Stop0 and Stop1 are the probabilities of stopping at this look under
	// H0 and H1 (either bound).
	Stop0 float64 `json:"stop0"`
	Stop1 float64 `json:"stop1"`
}

// MarshalJSON encodes the look with non-finite floats as strings.
func (l SequentialLook) MarshalJSON() ([]byte, error) {
	type plain SequentialLook
	return jsonfloat.Marshal(plain(l))
}

// UnmarshalJSON decodes what MarshalJSON encodes.
func (l *SequentialLook) UnmarshalJSON(b []byte) error {
	type plain SequentialLook
	return jsonfloat.Unmarshal(b, (*plain)(l))
}

// SequentialOneDesign is a group-sequential design for one proportion.
type SequentialOneDesign struct {
	P0    float64 `json:"p0"`    // success probability under H0
	P1    float64 `json:"p1"`    // success probability under H1 (> p0)
	Alpha float64 `json:"alpha"` // one-sided size requested
	Beta  float64 `json:"beta"`  // type II error requested (futility spending)
	// Spending and FutilitySpending name the spending functions
	// (FutilitySpending only with futility bounds); Binding says whether
	// the efficacy bounds account for futility stops.
	Spending         string           `json:"spending"`
	FutilitySpending string           `json:"futility_spending,omitempty"`
	Binding          bool             `json:"binding"`
	Looks            []SequentialLook `json:"looks"`
	// AttainedAlpha is the exact probability of rejecting H0 at p0 with
	// the futility stops obeyed; AlphaNonBinding the same with them
	// ignored (equal without futility bounds). Both at most Alpha for a
	// non-binding design; for a binding design only AttainedAlpha is.
	AttainedAlpha   float64 `json:"attained_alpha"`
	AlphaNonBinding float64 `json:"alpha_non_binding"`
	// Power is the exact probability of rejecting H0 at p1.
	Power float64 `json:"power"`
	// ExpectedN0 and ExpectedN1 are the expected sample sizes under H0
	// and H1; MaxN the final look's N.
	ExpectedN0 float64 `json:"expected_n0"`
	ExpectedN1 float64 `json:"expected_n1"`
	MaxN       int64   `json:"max_n"`
	// Warnings lists caveats that do not stop the answer.
	Warnings []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the design with non-finite floats as strings.
func (d SequentialOneDesign) MarshalJSON() ([]byte, error) {
	type plain SequentialOneDesign
	return jsonfloat.Marshal(plain(d))
}

// UnmarshalJSON decodes what MarshalJSON encodes.
func (d *SequentialOneDesign) UnmarshalJSON(b []byte) error {
	type plain SequentialOneDesign
	return jsonfloat.Unmarshal(b, (*plain)(d))
}

// StageLooks returns the design's stopping counts as the looks that
// test.StageWise and interval.StageWise take for the inference at the end
// of the study.
func (d SequentialOneDesign) StageLooks() []Look {
	out := make([]Look, len(d.Looks))
	for i, l := range d.Looks {
		out[i] = Look{N: l.N, Futility: l.Futility, Efficacy: l.Efficacy}
	}
	return out
}

// spendTol is the relative tolerance with which an exact crossing
// probability may meet the spent error.
const spendTol = 1e-12

// SequentialOne designs a group-sequential test of H0: p <= p0 against
// H1: p > p0 for one proportion, with looks after the cumulative numbers of
// trials in looks, on the exact binomial distribution. At look k the
// efficacy count is the smallest count b_k with
//
//	P_p0(reject by look k) = sum_{j<k} P_p0(efficacy stop at j) + P_p0(reach k, S_k >= b_k) <= a(t_k)
//
// where a is the alpha-spending function (opt.Spending) and t_k = N_k /
// N_K; with opt.Futility the futility count is the largest a_k below b_k -
// 1 with P_p1(futility stop by look k) <= beta(t_k) for the beta-spending
// function, and at the last look a_K = b_K - 1. The probabilities come from
// dynamic programming over the count (the density of S_k on the paths
// still running convolved with the binomial of the new trials; Jennison C,
// Turnbull BW (2000), Group Sequential Methods with Applications to
// Clinical Trials, Chapman & Hall/CRC, sections 7.2 (spending functions)
// and 12.1 (exact binary data)). Discreteness leaves part of the alpha
// unspent; the unspent part carries over to later looks because the
// comparison is cumulative. The power at p1 is reported, not imposed: use
// SequentialOneN to size the study.
//
// Errors: p0, p1 in (0, 1) with p0 < p1; alpha, beta in (0, 1) with alpha
// + beta < 1; looks strictly increasing from at least 1, at most 50 looks
// and a final N at most interval.MaxStageWiseN (ErrTooLarge). Cost O(N_K^2)
// at worst, ctx checked inside.
func SequentialOne(ctx context.Context, p0, p1, alpha, beta float64, looks []int64, opt SequentialOptions) (SequentialOneDesign, error) {
	const fn = "power.SequentialOne"
	if err := checkSequentialArgs(fn, p0, p1, alpha, beta, opt); err != nil {
		return SequentialOneDesign{}, err
	}
	if err := checkLookSizes(fn, looks); err != nil {
		return SequentialOneDesign{}, err
	}
	d, err := sequentialOne(ctx, p0, p1, alpha, beta, looks, opt)
	if err != nil {
		return SequentialOneDesign{}, argerr.Canceled(fn, ctx)
	}
	return d, nil
}

func checkSequentialArgs(fn string, p0, p1, alpha, beta float64, opt SequentialOptions) error {
	if err := argerr.OpenProb(fn, "p0", p0); err != nil {
		return err
	}
	if err := argerr.OpenProb(fn, "p1", p1); err != nil {
		return err
	}
	if p1 <= p0 {
		return argerr.Invalid(fn, "p1", p1, "must exceed p0 = "+argerr.Format(p0))
	}
	if err := argerr.OpenProb(fn, "alpha", alpha); err != nil {
		return err
	}
	if err := argerr.OpenProb(fn, "beta", beta); err != nil {
		return err
	}
	if alpha+beta >= 1 {
		return argerr.Invalid(fn, "beta", beta, "plus alpha must be below 1")
	}
	return opt.check(fn)
}

// MaxLooks is the largest number of looks a group-sequential design may
// have.
const MaxLooks = 50

func checkLookSizes(fn string, looks []int64) error {
	if len(looks) == 0 {
		return argerr.Invalid(fn, "looks", 0, "looks: need at least one look")
	}
	if len(looks) > MaxLooks {
		return argerr.TooLarge(fn, "len(looks)", len(looks), "exceeds MaxLooks = "+strconv.Itoa(MaxLooks))
	}
	var prev int64
	for i, n := range looks {
		if n <= prev {
			return argerr.Invalid(fn, "looks["+strconv.Itoa(i)+"]", n, "must exceed the previous look's size "+argerr.Format(prev))
		}
		prev = n
	}
	if prev > stagewise.MaxN {
		return argerr.TooLarge(fn, "looks["+strconv.Itoa(len(looks)-1)+"]", prev, "exceeds the limit of "+argerr.Format(stagewise.MaxN)+" trials")
	}
	return nil
}

// sequentialOne computes the boundaries look by look: the density under
// p0 (with or without futility stops) fixes b_k, the density under p1
// (with both stops) fixes a_k.
func sequentialOne(ctx context.Context, p0, p1, alpha, beta float64, looks []int64, opt SequentialOptions) (SequentialOneDesign, error) {
	K := len(looks)
	nK := looks[K-1]
	d := SequentialOneDesign{P0: p0, P1: p1, Alpha: alpha, Beta: beta, Spending: opt.Spending.String(),
		Binding: opt.Binding && opt.Futility, MaxN: nK}
	if opt.Futility {
		d.FutilitySpending = opt.FutilitySpending.String()
	}
	g0, g1 := []float64{1}, []float64{1}
	var lo0, lo1 int64 // count at g[0]
	var cum0, cum1 float64
	var prevN int64
	st := make([]Look, K)
	crossed := false
	for k, n := range looks {
		m := n - prevN
		t := float64(n) / float64(nK)
		h0, err := stagewise.Convolve(ctx, g0, stagewise.PMF(m, p0))
		if err != nil {
			return d, err
		}
		spent := opt.Spending.Spent(alpha, t)
		// smallest b with cum0 + P0(S >= b) <= spent: walk down from the top
		// (a non-final look keeps b >= 1 so that the study can go on).
		minB := max(lo0, 1)
		if k == K-1 {
			minB = max(lo0, 0)
		}
		b := n + 1
		var tailv float64
		for b-1 >= minB {
			v := tailv + at(h0, lo0, b-1)
			if cum0+v > spent*(1+spendTol) {
				break
			}
			tailv = v
			b--
		}
		cum0 += tailv
		a := int64(-1)
		h1, err := stagewise.Convolve(ctx, g1, stagewise.PMF(m, p1))
		if err != nil {
			return d, err
		}
		if k == K-1 {
			a = b - 1
		} else if opt.Futility {
			bspent := opt.FutilitySpending.Spent(beta, t)
			var lowv float64
			capped := true
			for a+1 <= b-2 {
				v := at(h1, lo1, a+1)
				if cum1+lowv+v > bspent*(1+spendTol) {
					capped = false
					break
				}
				lowv += v
				a++
			}
			cum1 += lowv
			if capped && !crossed {
				crossed = true
				d.Warnings = append(d.Warnings, "the futility bound reaches the efficacy bound before the last look (look "+strconv.Itoa(k+1)+"): the study is too small for the futility spending; consider more trials")
			}
		}
		st[k] = Look{N: n, Futility: a, Efficacy: b}
		// Continue: the p0 density keeps the futility stop only when binding.
		a0 := int64(-1)
		if opt.Binding {
			a0 = a
		}
		g0, lo0 = restrict(h0, lo0, a0, b)
		g1, lo1 = restrict(h1, lo1, a, b)
		prevN = n
	}
	if err := d.evaluate(ctx, st, alpha, beta, opt); err != nil {
		return d, err
	}
	return d, nil
}

// at returns h at count s (0 outside the stored range starting at lo).
func at(h []float64, lo, s int64) float64 {
	if i := s - lo; i >= 0 && i < int64(len(h)) {
		return h[i]
	}
	return 0
}

// restrict keeps the counts strictly between a and b of the density h
// whose first entry is count lo.
func restrict(h []float64, lo, a, b int64) ([]float64, int64) {
	x, y := max(a+1, lo), min(b-1, lo+int64(len(h))-1)
	if x > y {
		return nil, x
	}
	return h[x-lo : y-lo+1], x
}

// evaluate fills the looks' error rates and the design's summary from the
// stopping counts, by the exact recursion of internal/stagewise.
func (d *SequentialOneDesign) evaluate(ctx context.Context, st []Look, alpha, beta float64, opt SequentialOptions) error {
	e0, err := stagewise.New(ctx, st, d.P0)
	if err != nil {
		return err
	}
	e1, err := stagewise.New(ctx, st, d.P1)
	if err != nil {
		return err
	}
	// Non-binding size: the same efficacy counts with no futility stops.
	nb := make([]Look, len(st))
	for i, l := range st {
		nb[i] = Look{N: l.N, Futility: -1, Efficacy: l.Efficacy}
	}
	nb[len(nb)-1].Futility = nb[len(nb)-1].Efficacy - 1
	enb, err := stagewise.New(ctx, nb, d.P0)
	if err != nil {
		return err
	}
	nK := st[len(st)-1].N
	sd := math.Sqrt(d.P0 * (1 - d.P0))
	var c0, c1 float64
	d.Looks = make([]SequentialLook, len(st))
	for k, l := range st {
		t := float64(l.N) / float64(nK)
		c0 += e0.High[k]
		c1 += e1.Low[k]
		sl := SequentialLook{N: l.N, Fraction: t, Efficacy: l.Efficacy, Futility: l.Futility,
			Z:          zScore(l.Efficacy, l.N, d.P0, sd),
			AlphaSpent: opt.Spending.Spent(alpha, t), AlphaCumulative: c0,
			Stop0: e0.Low[k] + e0.High[k], Stop1: e1.Low[k] + e1.High[k]}
		if opt.Futility {
			sl.ZFutility = zScore(l.Futility, l.N, d.P0, sd)
			sl.BetaSpent = opt.FutilitySpending.Spent(beta, t)
			sl.BetaCumulative = c1
		}
		d.Looks[k] = sl
	}
	d.AttainedAlpha = e0.Reject()
	d.AlphaNonBinding = enb.Reject()
	d.Power = e1.Reject()
	d.ExpectedN0 = e0.ExpectedN()
	d.ExpectedN1 = e1.ExpectedN()
	if d.Power < 1-beta {
		d.Warnings = append(d.Warnings, "power "+strconv.FormatFloat(d.Power, 'f', 4, 64)+" is below the target "+
			strconv.FormatFloat(1-beta, 'f', 4, 64)+"; use SequentialOneN to size the study")
	}
	return nil
}

// npFirstN returns the smallest n <= maxN at which the most powerful
// randomized one-sided level-alpha test of p0 against p1 has power 1 -
// beta (maxN + 1 if none), by bisection over n: that power never falls as
// n grows, since a test of n + 1 trials may ignore one.
func npFirstN(p0, p1, alpha, beta float64, maxN int64) int64 {
	ok := func(n int64) bool {
		d0, d1 := binom.Dist{N: n, P: p0}, binom.Dist{N: n, P: p1}
		c := d0.UpperQuantile(alpha) // smallest c with P0(X > c) <= alpha
		pw := d1.Survival(c)
		if f0 := d0.Prob(c); f0 > 0 {
			pw += (alpha - d0.Survival(c)) / f0 * d1.Prob(c)
		}
		return pw >= (1-beta)*(1-spendTol)
	}
	return root.SmallestInt(ok, 1, maxN)
}

// zScore is the score statistic of count k of n at p0 (sd = sqrt(p0 q0)),
// +Inf above n and -Inf below 0.
func zScore(k, n int64, p0, sd float64) float64 {
	switch {
	case k > n:
		return math.Inf(1)
	case k < 0:
		return math.Inf(-1)
	}
	return (float64(k) - float64(n)*p0) / (math.Sqrt(float64(n)) * sd)
}

// EqualLooks returns k looks spread evenly over n trials: round(i n / k)
// for i = 1..k (strictly increasing when n >= k).
func EqualLooks(n int64, k int) []int64 {
	if k <= 0 {
		return nil // no looks (a negative k once panicked)
	}
	out := make([]int64, k)
	for i := 1; i <= k; i++ {
		out[i-1] = int64(math.Round(float64(n) * float64(i) / float64(k)))
	}
	return out
}

// SequentialOneN returns the smallest final size N (looks equally spaced:
// EqualLooks(N, looks)) whose SequentialOne design has power at least 1 -
// beta at p1, searching N from looks up to maxN (0 means
// 5000, at most interval.MaxStageWiseN). Power is a sawtooth in N (see the package
// doc): the first N found is returned, and larger N can fall short. The
// search starts at the smallest N whose most powerful single-stage test
// reaches the power (no multi-stage design of that size does better) and
// steps up one N at a time, one design each: O(N^2) per step, usually a
// few dozen steps; ctx checked. ErrNoSolution when no N up to maxN
// reaches the power (at once when even the single-stage bound exceeds
// maxN).
func SequentialOneN(ctx context.Context, p0, p1, alpha, beta float64, looks int, maxN int64, opt SequentialOptions) (SequentialOneDesign, error) {
	const fn = "power.SequentialOneN"
	if err := checkSequentialArgs(fn, p0, p1, alpha, beta, opt); err != nil {
		return SequentialOneDesign{}, err
	}
	if looks < 1 || looks > MaxLooks {
		return SequentialOneDesign{}, argerr.Invalid(fn, "looks", looks, "must be between 1 and "+strconv.Itoa(MaxLooks))
	}
	if maxN == 0 {
		maxN = 5000
	}
	if maxN > stagewise.MaxN {
		return SequentialOneDesign{}, argerr.TooLarge(fn, "maxN", maxN, "exceeds the limit of "+argerr.Format(stagewise.MaxN))
	}
	if maxN < int64(looks) {
		return SequentialOneDesign{}, argerr.Invalid(fn, "maxN", maxN, "is below the number of looks")
	}
	// No design with final size n beats the most powerful (randomized)
	// single-stage test of n trials (Neyman-Pearson lemma): start there.
	lo := npFirstN(p0, p1, alpha, beta, maxN)
	if lo > maxN {
		return SequentialOneDesign{}, argerr.NoSolution(fn, "no final size up to maxN = "+argerr.Format(maxN)+
			" reaches the power: even a single-stage test needs more")
	}
	for n := max(int64(looks), lo); n <= maxN; n++ {
		if err := argerr.Canceled(fn, ctx); err != nil {
			return SequentialOneDesign{}, err
		}
		d, err := sequentialOne(ctx, p0, p1, alpha, beta, EqualLooks(n, looks), opt)
		if err != nil {
			return SequentialOneDesign{}, argerr.Canceled(fn, ctx)
		}
		if d.Power >= 1-beta {
			d.Warnings = nil
			return d, nil
		}
	}
	return SequentialOneDesign{}, argerr.NoSolution(fn, "no final size up to maxN = "+argerr.Format(maxN)+" reaches the power")
}

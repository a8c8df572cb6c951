package interval

import (
	"context"
	"fmt"
	"math"
	"sync"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/internal/root"
)

// SequenceMethod is the published name of the one-proportion confidence
// sequence, as it appears in Interval.Method.
const SequenceMethod = "beta-binomial mixture confidence sequence"

// DefaultPlannedN is the number of observations at which the default
// mixing prior of a confidence sequence is tuned when
// SequenceOptions.PlannedN is 0.
const DefaultPlannedN = 1000

// SequenceOptions choose the mixing prior of the beta-binomial mixture
// martingale. The zero value is the centred prior whose concentration is
// tuned for DefaultPlannedN observations around a proportion of 1/2.
//
// The prior changes only where the sequence is narrow, never its
// validity: every prior gives a time-uniform level.
//
//   - Centred prior (the default, or Concentration > 0): for each
//     candidate p the mixture is over Beta(r p, r (1 - p)), a prior with
//     mean p and concentration r. A large r makes the sequence narrow
//     late and wide early, a small r the reverse; r tuned for a planned n
//     makes it narrowest around that n (TunedConcentration).
//   - Fixed prior (PriorA, PriorB > 0): one Beta(a, b) prior for every p,
//     Robbins's original form (a = b = 1 is the uniform prior); narrow
//     where the prior has mass, wide elsewhere.
type SequenceOptions struct {
	// Concentration is r of the centred prior; 0 means the tuned value.
	Concentration float64
	// PriorA and PriorB are the shapes of a fixed Beta prior; both 0
	// (the default) means the centred prior. They cannot be combined with
	// Concentration.
	PriorA, PriorB float64
	// PlannedN and PlannedP tune the default concentration: the r whose
	// sequence at PlannedN observations with PlannedN x PlannedP
	// successes is narrowest. 0 means DefaultPlannedN and 1/2. Fix them
	// before the data are seen.
	PlannedN int64
	PlannedP float64
}

// Mixture is the mixing prior a confidence sequence uses: the centred
// Beta(R p, R (1 - p)) prior when Centered, else the fixed Beta(A, B).
type Mixture struct {
	Centered      bool    `json:"centered"`
	Concentration float64 `json:"concentration,omitempty"` // R of the centred prior
	A             float64 `json:"a,omitempty"`             // fixed prior's shapes
	B             float64 `json:"b,omitempty"`
}

// MarshalJSON encodes the mixture with non-finite floats as strings.
func (m Mixture) MarshalJSON() ([]byte, error) {
	type plain Mixture
	return jsonfloat.Marshal(plain(m))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (m *Mixture) UnmarshalJSON(b []byte) error {
	type plain Mixture
	return jsonfloat.Unmarshal(b, (*plain)(m))
}

// shapes returns the Beta shapes the mixture uses at the tested p.
func (m Mixture) shapes(p float64) (float64, float64) {
	if m.Centered {
		return m.Concentration * p, m.Concentration * (1 - p)
	}
	return m.A, m.B
}

// lbeta returns ln B(x, y) for x, y > 0 (math.Lgamma: absolute error about
// 1e-16 times the magnitude of the largest term, 1e-9 at x + y = 1e6).
func lbeta(x, y float64) float64 {
	a, _ := math.Lgamma(x)
	b, _ := math.Lgamma(y)
	c, _ := math.Lgamma(x + y)
	return a + b - c
}

// logM returns ln M_n(p) for k successes in n trials (real k allowed):
//
//	M_n(p) = B(a + k, b + n - k) / B(a, b) / (p^k (1 - p)^(n-k)),
//
// (a, b) the shapes at p.
func (m Mixture) logM(k, n, p float64) float64 {
	a, b := m.shapes(p)
	v := lbeta(a+k, b+(n-k)) - lbeta(a, b)
	if k > 0 {
		v -= k * math.Log(p)
	}
	if n > k {
		v -= (n - k) * math.Log1p(-p)
	}
	return v
}

// lower returns the lower limit of {p : ln M_n(p) < t} for real k in
// [0, n]: the first crossing below k/n, or 0 when k = 0. The scan steps
// down from k/n by factors of 2^(1/4) (64 of them, then by factors that
// square at each step) to the first p outside and brackets the crossing
// there (ln M_n(k/n) <= 0 < t always: the
// likelihood ratio of any mixture to the maximum is at most 1). For the
// fixed prior ln M_n is convex in p and the crossing is the only one; for
// the centred prior it is unimodal in every case checked (see the
// tests).
func (m Mixture) lower(k, n, t float64) float64 {
	if k <= 0 {
		return 0
	}
	hat := k / n
	h := func(p float64) float64 { // > 0 inside
		if p >= 1 {
			// k = n: at p = 1 the centred prior is a point mass at 1 and
			// M_n(1) = 1 (its limit); the fixed prior's value is finite
			if m.Centered {
				return t
			}
		}
		return t - m.logM(k, n, p)
	}
	in, out := hat, hat
	// Steps of 2^(1/4) for the first 64 (down to hat / 2^16), then the
	// factor squares at every step, so a crossing near 1e-300 is reached
	// in a few dozen evaluations instead of thousands.
	f := 0.8408964152537145 // 2^(-1/4)
	for step := 0; ; step++ {
		if step >= 64 {
			f *= f
		}
		out = in * f
		if out < 1e-300 {
			if h(1e-300) > 0 {
				return 0
			}
			out = 1e-300
			break
		}
		if h(out) <= 0 {
			break
		}
		in = out
	}
	r, err := root.Brent(h, out, in, 1e-15, 0)
	if err != nil {
		return in
	}
	return r
}

// mirror returns the mixture for the failures (p -> 1 - p).
func (m Mixture) mirror() Mixture { m.A, m.B = m.B, m.A; return m }

// limits returns the two limits of the sequence at level for k of n.
func (m Mixture) limits(k, n, level float64) (float64, float64) {
	t := -math.Log1p(-level)
	return m.lower(k, n, t), 1 - m.mirror().lower(n-k, n, t)
}

// TunedConcentration returns the concentration r of the centred prior
// whose confidence sequence at level has the narrowest two-sided limits at
// n observations with n m successes (m in (0, 1); the count may be
// fractional here). r is found by a scan of ln r over [ln 0.01,
// ln max(1000, 100 n)] in steps of 0.5 and a golden-section refinement of
// the best step; the
// width is flat near its minimum, so r is approximate and the width at n
// within 1e-9 of the least; at level 0.95 and m = 1/2 it comes out near
// n / 8.2 (13.1 at n = 100, 122.6 at 1000, 1218.6 at 10000); above n =
// 1e9 it is scaled linearly from its value at 1e9. Results are cached per
// (level, n, m), up to 4096 of them; the search is about a hundred limit
// computations (well under 10 ms in all, at extreme m and n = 1 too, so it
// takes no context; BenchmarkTunedConcentration).
//
// Domain: level in (0, 1), n >= 1, m in (0, 1).
func TunedConcentration(level float64, n int64, m float64) (float64, error) {
	const fn = "interval.TunedConcentration"
	if !(level > 0 && level < 1) {
		return 0, argerr.Invalid(fn, "level", level, "must lie strictly between 0 and 1")
	}
	if n < 1 {
		return 0, argerr.Invalid(fn, "n", n, "must be at least 1")
	}
	if n > 1<<53 {
		return 0, argerr.TooLarge(fn, "n", n, "exceeds 2^53")
	}
	if err := argerr.OpenProb(fn, "m", m); err != nil {
		return 0, err
	}
	return tunedConcentration(level, float64(n), m), nil
}

type tuneKey struct{ level, n, m float64 }

// tuneCache holds tuned concentrations; it stops growing at maxTuneCache
// entries (later ones are computed each time), so a service that sees
// arbitrary planned sizes keeps bounded memory.
var (
	tuneMu    sync.Mutex
	tuneCache = map[tuneKey]float64{}
)

const maxTuneCache = 4096

// tuneLinearN is the planned size above which the tuned concentration is
// scaled linearly from its value at tuneLinearN: r/n converges (0.12263 at
// n = 1000, 0.12178 at 1e5, 0.12160 at 1e9 at level 0.95, m = 1/2), and the
// width's minimum is too flat beyond to locate by a scan in floating point.
const tuneLinearN = 1e9

func tunedConcentration(level, n, m float64) float64 {
	if n > tuneLinearN {
		return tunedConcentration(level, tuneLinearN, m) * (n / tuneLinearN)
	}
	key := tuneKey{level, n, m}
	tuneMu.Lock()
	v, ok := tuneCache[key]
	tuneMu.Unlock()
	if ok {
		return v
	}
	k := n * m
	width := func(lr float64) float64 {
		lo, hi := Mixture{Centered: true, Concentration: math.Exp(lr)}.limits(k, n, level)
		return hi - lo
	}
	// The optimum sits near n/8 (n/8.2 at 0.95); the scan covers ln r from
	// ln 0.01 to ln max(1000, 100 n), far on both sides, in steps of 0.5.
	best, bestW := math.Log(0.01), math.Inf(1)
	for lr := math.Log(0.01); lr <= math.Log(math.Max(1000, 100*n)); lr += 0.5 {
		if w := width(lr); w < bestW {
			best, bestW = lr, w
		}
	}
	g := (math.Sqrt(5) - 1) / 2
	a, b := best-0.5, best+0.5
	x1, x2 := b-g*(b-a), a+g*(b-a)
	f1, f2 := width(x1), width(x2)
	for i := 0; i < 60 && b-a > 1e-10; i++ {
		if f1 < f2 {
			b, x2, f2 = x2, x1, f1
			x1 = b - g*(b-a)
			f1 = width(x1)
		} else {
			a, x1, f1 = x1, x2, f2
			x2 = a + g*(b-a)
			f2 = width(x2)
		}
	}
	r := math.Exp(0.5 * (a + b))
	tuneMu.Lock()
	if len(tuneCache) < maxTuneCache {
		tuneCache[key] = r
	}
	tuneMu.Unlock()
	return r
}

// SequenceMixture returns the mixture a confidence sequence with these
// options uses at level (level 0 means 0.95).
func SequenceMixture(level float64, opt SequenceOptions) (Mixture, error) {
	if level == 0 {
		level = 0.95
	}
	return sequenceMixture("interval.SequenceMixture", level, opt)
}

func sequenceMixture(fn string, level float64, opt SequenceOptions) (Mixture, error) {
	if !(level > 0 && level < 1) {
		return Mixture{}, argerr.Invalid(fn, "level", level, "must lie strictly between 0 and 1 (0 means 0.95)")
	}
	if opt.PriorA != 0 || opt.PriorB != 0 {
		if opt.Concentration != 0 {
			return Mixture{}, argerr.Invalid(fn, "Concentration", opt.Concentration, "cannot be combined with a fixed prior (PriorA, PriorB)")
		}
		if !(opt.PriorA > 0 && opt.PriorA < math.Inf(1)) {
			return Mixture{}, argerr.Invalid(fn, "PriorA", opt.PriorA, "must be positive and finite (both shapes 0 mean the centred prior)")
		}
		if !(opt.PriorB > 0 && opt.PriorB < math.Inf(1)) {
			return Mixture{}, argerr.Invalid(fn, "PriorB", opt.PriorB, "must be positive and finite (both shapes 0 mean the centred prior)")
		}
		return Mixture{A: opt.PriorA, B: opt.PriorB}, nil
	}
	if opt.Concentration != 0 {
		if !(opt.Concentration > 0 && opt.Concentration <= 1e15) {
			return Mixture{}, argerr.Invalid(fn, "Concentration", opt.Concentration, "must be positive and at most 1e15 (0 means tuned)")
		}
		return Mixture{Centered: true, Concentration: opt.Concentration}, nil
	}
	n := opt.PlannedN
	if n == 0 {
		n = DefaultPlannedN
	}
	if n < 0 {
		return Mixture{}, argerr.Invalid(fn, "PlannedN", n, "is negative; use 0 for the default")
	}
	if n > 1<<53 {
		return Mixture{}, argerr.TooLarge(fn, "PlannedN", n, "exceeds 2^53")
	}
	m := opt.PlannedP
	if m == 0 {
		m = 0.5
	}
	if err := argerr.OpenProb(fn, "PlannedP", m); err != nil {
		return Mixture{}, err
	}
	return Mixture{Centered: true, Concentration: tunedConcentration(level, float64(n), m)}, nil
}

// ConfidenceSequence returns the time-uniform confidence interval for a
// proportion after k successes in n trials from the beta-binomial mixture
// martingale: with M_n(p) as below, the set
//
//	C_n = {p : M_n(p) < 1/(1 - level)},
//	M_n(p) = B(a + k, b + n - k) / B(a, b) / (p^k (1 - p)^(n - k)),
//
// (a, b) = (r p, r (1 - p)) for the centred prior, the fixed shapes
// otherwise (SequenceOptions). For each true p, M_n(p) is a nonnegative
// martingale with M_0 = 1 (the likelihood ratio of the beta mixture of
// Bernoulli laws to the law at p), so by Ville's inequality the
// probability that C_n ever excludes p, at any n whatever, is at most
// 1 - level: the limits may be read after every observation, at looks
// chosen while watching, and the study may stop at any look, without
// inflating the error (Robbins 1970; Howard, Ramdas, McAuliffe, Sekhon
// 2021). The price is width: at a fixed n it is wider than a fixed-n
// interval (about 1.55 times Wilson's width at the planned n and level
// 0.95, more far from it). SequenceErrorProb computes the exact probability of ever missing p
// up to a horizon.
//
// The intervals for successive n need not be nested; the running
// intersection of all those seen is also a valid confidence sequence
// (test.MixtureSequence keeps it).
//
// Result: Side is TwoSided (one-sided sequences are not offered), Method
// is SequenceMethod, Parameter "p", Estimate k/n (NaN for n = 0, with the
// interval [0, 1]). level 0 means 0.95.
//
// Accuracy: ln M_n is a difference of log-gamma values of size n ln n,
// so it carries an absolute error of about 1e-16 n ln n (1e-10 at n =
// 1e5); the limits agree with a 40-digit evaluation to 1e-11 relative up
// to n = 1e5 (tested), closer at smaller n. Cost O(1) in n: a short scan and
// a bracketed root search per limit; the tuned concentration is computed
// once per (level, PlannedN, PlannedP) and cached.
//
// Sources: Robbins H (1970), Statistical methods related to the law of
// the iterated logarithm, Annals of Mathematical Statistics
// 41:1397-1409; Howard SR, Ramdas A, McAuliffe J, Sekhon J (2021),
// Time-uniform, nonparametric, nonasymptotic confidence sequences, Annals
// of Statistics 49:1055-1080; Ville J (1939), Etude critique de la notion
// de collectif.
func ConfidenceSequence(k, n int64, level float64, opt SequenceOptions) (Interval, error) {
	const fn = "interval.ConfidenceSequence"
	if err := argerr.KN(fn, "k", "n", k, n); err != nil {
		return Interval{}, err
	}
	if n > 1<<53 {
		return Interval{}, argerr.TooLarge(fn, "n", n, "exceeds 2^53")
	}
	if level == 0 {
		level = 0.95
	}
	mx, err := sequenceMixture(fn, level, opt)
	if err != nil {
		return Interval{}, err
	}
	return SequenceInterval(k, n, level, mx), nil
}

// SequenceInterval is ConfidenceSequence for a mixture already chosen
// (SequenceMixture), without validation of level or mixture: callers
// that update at every look use it to skip the option handling. k and n
// must satisfy 0 <= k <= n.
func SequenceInterval(k, n int64, level float64, mx Mixture) Interval {
	iv := Interval{Level: level, Side: TwoSided, Method: SequenceMethod, Parameter: "p", Lower: 0, Upper: 1}
	if n == 0 {
		iv.Estimate = math.NaN()
		iv.warn("no observations: the sequence starts as [0, 1]")
		return iv
	}
	kf, nf := float64(k), float64(n)
	iv.Estimate = kf / nf
	iv.Lower, iv.Upper = mx.limits(kf, nf, level)
	return iv
}

// SequenceLogMartingale returns ln M_n(p0), the log of the mixture
// martingale of ConfidenceSequence at p0 after k successes in n trials.
// Its reciprocal is the always-valid p-value of H0: p = p0 at this look
// (test.MixtureSequence keeps the running minimum).
// Domain: 0 <= k <= n <= 2^53, p0 in (0, 1), a mixture from
// SequenceMixture.
func SequenceLogMartingale(k, n int64, p0 float64, mx Mixture) (float64, error) {
	const fn = "interval.SequenceLogMartingale"
	if err := argerr.KN(fn, "k", "n", k, n); err != nil {
		return 0, err
	}
	if n > 1<<53 {
		return 0, argerr.TooLarge(fn, "n", n, "exceeds 2^53")
	}
	if err := argerr.OpenProb(fn, "p0", p0); err != nil {
		return 0, err
	}
	a, b := mx.shapes(p0)
	if !(a > 0 && a < math.Inf(1)) || !(b > 0 && b < math.Inf(1)) {
		return 0, argerr.Invalid(fn, "mx", fmt.Sprintf("%+v", mx), "has no positive finite shapes; use SequenceMixture")
	}
	return mx.logM(float64(k), float64(n), p0), nil
}

// MaxSequenceHorizon bounds the horizon of SequenceErrorProb.
const MaxSequenceHorizon = 1_000_000

// SequenceErrorProb returns the exact probability that the confidence
// sequence of ConfidenceSequence excludes the true proportion p at some n
// in 1..horizon:
//
//	P(exists n <= horizon : M_n(p) >= 1/(1 - level)),
//
// which Ville's inequality bounds by 1 - level for every horizon. Method:
// dynamic programming over k; after n trials the paths that have never
// left the sequence occupy the band of k with ln M_n(p) below the
// threshold (an interval of k, ln M_n being convex in k), about
// 2 sqrt(2 n p (1 - p) ln n) wide, and the recursion carries their
// probabilities to n + 1. The comparison is with ln M_n directly (the same
// set as the limits, up to rounding at exact ties).
//
// Accuracy: sums of nonnegative terms, about 1e-13 relative. Cost
// O(horizon^1.5) (the README's speed table has the measured time). horizon
// is limited to MaxSequenceHorizon; ctx is checked every 256 steps.
//
// Domain: p in (0, 1), horizon >= 1, level and opt as ConfidenceSequence.
func SequenceErrorProb(ctx context.Context, p float64, horizon int64, level float64, opt SequenceOptions) (float64, error) {
	const fn = "interval.SequenceErrorProb"
	if err := argerr.OpenProb(fn, "p", p); err != nil {
		return 0, err
	}
	if horizon < 1 {
		return 0, argerr.Invalid(fn, "horizon", horizon, "must be at least 1")
	}
	if horizon > MaxSequenceHorizon {
		return 0, argerr.TooLarge(fn, "horizon", horizon, "exceeds MaxSequenceHorizon = 1000000")
	}
	if level == 0 {
		level = 0.95
	}
	mx, err := sequenceMixture(fn, level, opt)
	if err != nil {
		return 0, err
	}
	return sequenceErrorProb(ctx, fn, p, horizon, func(k, n int64) bool {
		return mx.logM(float64(k), float64(n), p) < -math.Log1p(-level)
	})
}

// sequenceErrorProb runs the recursion of SequenceErrorProb for any
// membership rule inside(k, n) (p in the sequence after k of n) whose
// inside set is an interval of k containing round(n p) or empty.
func sequenceErrorProb(ctx context.Context, fn string, p float64, horizon int64, inside func(k, n int64) bool) (float64, error) {
	cur := []float64{1} // probabilities of k = lo .. lo+len-1 among paths never out
	nxt := []float64{}
	lo := int64(0)
	miss := 0.0
	for n := int64(1); n <= horizon; n++ {
		if n&255 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return 0, err
			}
		}
		// band at n: k in [nlo, nhi] inside the sequence
		center := int64(math.Round(float64(n) * p))
		var nlo, nhi int64
		if inside(center, n) {
			nlo = min(lo, center)
			for nlo > 0 && inside(nlo-1, n) {
				nlo--
			}
			for !inside(nlo, n) {
				nlo++
			}
			nhi = max(lo+int64(len(cur)), center)
			if nhi > n {
				nhi = n
			}
			for nhi < n && inside(nhi+1, n) {
				nhi++
			}
			for !inside(nhi, n) {
				nhi--
			}
		} else {
			// the centre is outside: scan every k (convexity still makes
			// the inside set an interval, possibly empty)
			nlo, nhi = 0, -1
			for k := int64(0); k <= n; k++ {
				if inside(k, n) {
					if nhi < nlo {
						nlo = k
					}
					nhi = k
				}
			}
		}
		nxt = nxt[:0]
		for k := nlo; k <= nhi; k++ {
			v := 0.0
			if i := k - lo; i >= 0 && i < int64(len(cur)) {
				v += cur[i] * (1 - p)
			}
			if i := k - 1 - lo; i >= 0 && i < int64(len(cur)) {
				v += cur[i] * p
			}
			nxt = append(nxt, v)
		}
		// the mass that leaves the sequence at n, summed directly
		for i, v := range cur {
			if k := lo + int64(i); k < nlo || k > nhi {
				miss += v * (1 - p)
			}
			if k := lo + int64(i) + 1; k < nlo || k > nhi {
				miss += v * p
			}
		}
		cur, nxt = nxt, cur
		lo = nlo
		if len(cur) == 0 {
			break
		}
	}
	return miss, nil
}

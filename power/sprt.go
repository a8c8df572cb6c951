package power

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/test"
)

// MaxSPRTWork bounds the exact SPRT calculation: the number of steps times
// the width of the continuation band (the states the recursion keeps),
// which keeps a call to seconds; beyond it SPRTOperating returns
// ErrTooLarge.
const MaxSPRTWork = 4e9

// maxSPRTSteps is the number of observations the recursion follows an
// untruncated test for before it stops and reports the undecided mass.
const maxSPRTSteps = 1_000_000

// SPRTOperatingPoint is the behaviour of a sequential probability ratio test at
// one success probability P: the exact operating characteristic and
// expected sample number, and Wald's approximations to them.
type SPRTOperatingPoint struct {
	// P is the true success probability (for a paired test the share
	// theta of n12 among discordant pairs).
	P float64 `json:"p"`
	// Accept and Reject are the exact probabilities that the test ends by
	// accepting and by rejecting H0 (Accept is the operating
	// characteristic; Reject at P0 is the achieved type I error, Accept at
	// P1 the achieved type II error).
	Accept float64 `json:"accept"`
	Reject float64 `json:"reject"`
	// Undecided is the probability that an untruncated test is still
	// running after Steps observations (0 for a truncated test; below
	// 1e-15 when the recursion ran to completion).
	Undecided float64 `json:"undecided"`
	// ASN is the exact expected number of observations (discordant pairs
	// for a paired test) until the decision; for an untruncated test with
	// Undecided > 0 it is the expectation of min(N, Steps), a lower bound.
	ASN float64 `json:"asn"`
	// Steps is the number of observations the recursion covered: MaxN for
	// a truncated test.
	Steps int64 `json:"steps"`
	// WaldAccept and WaldASN are Wald's approximations for the untruncated
	// test, which ignore the overshoot of the boundaries:
	//
	//	L(p) = (A^h - 1) / (A^h - B^h),  A = e^LogUpper, B = e^LogLower,
	//	p = (1 - r^h) / (q^h - r^h),     q = P1/P0, r = (1-P1)/(1-P0),
	//	ASN(p) = (L ln B + (1 - L) ln A) / E[z],
	//	E[z] = p ln q + (1 - p) ln r,
	//
	// with the limits L = ln A / (ln A - ln B), ASN = -ln A ln B / E[z^2]
	// at h = 0 (E[z] = 0).
	WaldAccept float64 `json:"wald_accept"`
	WaldASN    float64 `json:"wald_asn"`
	// DiscordantProb and ExpectedPairs are, for a paired test evaluated by
	// PairedSPRTOperating, p12 + p21 and the expected number of all pairs,
	// ASN / (p12 + p21) (exact: the pairs until the N-th discordant one
	// are a sum of N geometric waiting times, and Wald's identity applies).
	DiscordantProb float64 `json:"discordant_prob,omitempty"`
	ExpectedPairs  float64 `json:"expected_pairs,omitempty"`
	// Warnings lists caveats (an untruncated test cut off with mass left).
	Warnings []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the result with non-finite floats as strings.
func (r SPRTOperatingPoint) MarshalJSON() ([]byte, error) {
	type plain SPRTOperatingPoint
	return jsonfloat.Marshal(plain(r))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (r *SPRTOperatingPoint) UnmarshalJSON(b []byte) error {
	type plain SPRTOperatingPoint
	return jsonfloat.Unmarshal(b, (*plain)(r))
}

// SPRTOperating returns the exact operating characteristic and expected
// sample number of the SPRT s when the success probability is p, beside
// Wald's approximations.
//
// Method: dynamic programming over the number of successes. After n
// observations the test is still running only for the k strictly between
// the decision lines, a band of about (LogUpper - LogLower)/|D| + 1
// counts whatever n is; the recursion carries the probability of each
// such k to n + 1, moving the mass that crosses a line to Accept or
// Reject, and adds the running mass to the ASN (ASN = sum over n of P(N >
// n)). A truncated test (MaxN > 0) ends at MaxN by the rule of
// test.SPRTOptions. An untruncated test is followed until the running mass
// is below 1e-15 or for 10^6 observations, whichever comes first.
// Decisions use test.SPRT.Decision, so they agree with test.SPRT.Decide
// look by look; a look after every observation is assumed.
//
// Accuracy: sums of non-negative terms, relative error about 1e-13 per
// 10^4 steps. Cost O(steps x band) (BenchmarkSPRTOperating: MaxN = 10000
// at bands 36 and 364). Work over MaxSPRTWork returns
// ErrTooLarge; ctx is checked every 1024 steps.
//
// Domain: s built by test.NewSPRT or test.NewPairedSPRT, p in [0, 1].
//
// Sources: Wald A (1947), Sequential Analysis, Wiley, chapters 3 and 5
// (the approximations); the recursion is the exact first-passage
// calculation over the lattice of (n, k) (Armitage P (1975), Sequential
// Medical Trials, 2nd ed., chapter 3, recalled).
func SPRTOperating(ctx context.Context, s test.SPRT, p float64) (SPRTOperatingPoint, error) {
	return sprtOperating(ctx, "power.SPRTOperating", s, p)
}

// PairedSPRTOperating is SPRTOperating for a paired SPRT
// (test.NewPairedSPRT) at cell probabilities p12 and p21 of the two kinds
// of discordant pair: theta = p12/(p12 + p21) is the success probability
// of the discordant stream, and ExpectedPairs = ASN/(p12 + p21) the
// expected number of all pairs. Domain: p12, p21 >= 0, 0 < p12 + p21 <= 1.
func PairedSPRTOperating(ctx context.Context, s test.SPRT, p12, p21 float64) (SPRTOperatingPoint, error) {
	const fn = "power.PairedSPRTOperating"
	if err := argerr.Prob(fn, "p12", p12); err != nil {
		return SPRTOperatingPoint{}, err
	}
	if err := argerr.Prob(fn, "p21", p21); err != nil {
		return SPRTOperatingPoint{}, err
	}
	pd := p12 + p21
	if !(pd > 0 && pd <= 1) {
		return SPRTOperatingPoint{}, argerr.Invalid(fn, "p21", p21, "plus p12 = "+argerr.Format(p12)+" must lie in (0, 1]")
	}
	r, err := sprtOperating(ctx, fn, s, p12/pd)
	if err != nil {
		return r, err
	}
	r.DiscordantProb = pd
	r.ExpectedPairs = r.ASN / pd
	return r, nil
}

// SPRTCurve returns SPRTOperating at each probability of ps (an OC and ASN
// curve for plotting); ctx is checked at every point.
func SPRTCurve(ctx context.Context, s test.SPRT, ps []float64) ([]SPRTOperatingPoint, error) {
	const fn = "power.SPRTCurve"
	out := make([]SPRTOperatingPoint, 0, len(ps))
	for _, p := range ps {
		r, err := sprtOperating(ctx, fn, s, p)
		if err != nil {
			return nil, err
		}
		out = append(out, r)
	}
	return out, nil
}

// sprtBand is the continuation band of an SPRT in terms of the count u
// that raises Z (successes when P1 > P0, failures otherwise).
type sprtBand struct {
	s    test.SPRT
	up   bool    // u counts successes
	step float64 // |D|, the rise of Z per unit of u at fixed n
}

// decision returns the SPRT's decision for u up-counts in n observations.
func (b sprtBand) decision(u, n int64) test.Decision {
	if b.up {
		return b.s.Decision(u, n)
	}
	return b.s.Decision(n-u, n)
}

// limits returns the continuation band [lo, hi] of up-counts after n
// observations (empty when lo > hi), starting the search from a guess.
func (b sprtBand) limits(n int64, lo, hi int64) (int64, int64) {
	// lo: smallest u in [0, n] that does not accept; hi: largest that
	// does not reject. Start from the previous step's values (the lines
	// rise by less than one count per observation) and move.
	if lo < 0 {
		lo = 0
	}
	for lo > 0 && b.decision(lo-1, n) != test.AcceptNull {
		lo--
	}
	for lo <= n && b.decision(lo, n) == test.AcceptNull {
		lo++
	}
	if hi > n {
		hi = n
	}
	if hi < lo-1 {
		hi = lo - 1
	}
	for hi < n && b.decision(hi+1, n) != test.RejectNull {
		hi++
	}
	for hi >= lo && b.decision(hi, n) == test.RejectNull {
		hi--
	}
	return lo, hi
}

func sprtOperating(ctx context.Context, fn string, s test.SPRT, p float64) (SPRTOperatingPoint, error) {
	if s.Alpha == 0 || !(s.LogUpper > 0) || !(s.LogLower < 0) {
		return SPRTOperatingPoint{}, argerr.Invalid(fn, "s", "SPRT{}", "is not built; use test.NewSPRT or test.NewPairedSPRT")
	}
	if err := argerr.Prob(fn, "p", p); err != nil {
		return SPRTOperatingPoint{}, err
	}
	d := s.Success - s.Failure
	b := sprtBand{s: s, up: d > 0, step: math.Abs(d)}
	width := (s.LogUpper-s.LogLower)/b.step + 2
	steps := int64(maxSPRTSteps)
	if s.MaxN > 0 {
		steps = s.MaxN
	}
	if width*float64(steps) > MaxSPRTWork {
		return SPRTOperatingPoint{}, argerr.TooLarge(fn, "s", "SPRT", "needs about "+argerr.Format(math.Round(width*float64(steps)))+
			" state updates (band of "+argerr.Format(math.Round(width))+" counts over "+argerr.Format(steps)+" steps); the limit is MaxSPRTWork = 4e9")
	}
	pu := p // probability of an up-step
	if !b.up {
		pu = 1 - p
	}
	pd := 1 - pu
	r := SPRTOperatingPoint{P: p}
	r.WaldAccept, r.WaldASN = waldOC(s, p)

	// cur[i] is the probability of u = lo + i at step n among running paths.
	w := int(width) + 4
	cur := make([]float64, 0, w)
	nxt := make([]float64, 0, w)
	lo, hi := int64(0), int64(0)
	cur = append(cur, 1)
	running := 1.0
	var n int64
	for n = 0; n < steps; n++ {
		if n&1023 == 1023 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return SPRTOperatingPoint{}, err
			}
		}
		r.ASN += running
		m := n + 1
		nlo, nhi := b.limits(m, lo, hi+1)
		if s.MaxN > 0 && m == s.MaxN {
			// Every path ends here: split by the full rule at MaxN.
			for i, q := range cur {
				u := lo + int64(i)
				for _, mv := range [2]struct {
					u int64
					w float64
				}{{u, pd}, {u + 1, pu}} {
					if b.decision(mv.u, m) == test.RejectNull {
						r.Reject += q * mv.w
					} else {
						r.Accept += q * mv.w
					}
				}
			}
			running = 0
			n = m
			break
		}
		nxt = nxt[:0]
		for u := nlo; u <= nhi; u++ {
			v := 0.0
			if i := u - lo; i >= 0 && i < int64(len(cur)) {
				v += cur[i] * pd
			}
			if i := u - 1 - lo; i >= 0 && i < int64(len(cur)) {
				v += cur[i] * pu
			}
			nxt = append(nxt, v)
		}
		// Mass leaving: below nlo accepts, above nhi rejects.
		for i, q := range cur {
			u := lo + int64(i)
			if u < nlo {
				r.Accept += q * pd
			} else if u > nhi {
				r.Reject += q * pd
			}
			if u+1 < nlo {
				r.Accept += q * pu
			} else if u+1 > nhi {
				r.Reject += q * pu
			}
		}
		cur, nxt = nxt, cur
		lo, hi = nlo, nhi
		running = 0
		for _, q := range cur {
			running += q
		}
		if running < 1e-15 && s.MaxN == 0 {
			n = m
			break
		}
		if len(cur) == 0 {
			n = m
			break
		}
	}
	r.Steps = n
	r.Undecided = running
	if running >= 1e-15 {
		r.Warnings = append(r.Warnings, "the untruncated test was followed for "+argerr.Format(n)+
			" observations and is still running with probability "+argerr.Format(running)+"; Accept, Reject and ASN are lower bounds")
	}
	return r, nil
}

// waldOC returns Wald's approximate operating characteristic and ASN.
func waldOC(s test.SPRT, p float64) (float64, float64) {
	la, lb := s.LogUpper, s.LogLower
	a, c := s.Success, s.Failure // per-observation increments: success, failure
	ez := p*a + (1-p)*c
	// p(h) = -expm1(h c) / (expm1(h a) - expm1(h c)), decreasing in h when
	// a > c (increasing when a < c); pOf(0) is the slope.
	pOf := func(h float64) float64 {
		if h == 0 {
			return -c / (a - c)
		}
		ea, ec := math.Expm1(h*a), math.Expm1(h*c)
		if math.IsInf(ea, 1) || math.IsInf(ec, 1) {
			// one exponential dominates
			if h*a > h*c {
				return 0
			}
			return 1
		}
		return -ec / (ea - ec)
	}
	var h float64
	switch {
	case p <= 0:
		if a > c {
			h = math.Inf(1)
		} else {
			h = math.Inf(-1)
		}
	case p >= 1:
		if a > c {
			h = math.Inf(-1)
		} else {
			h = math.Inf(1)
		}
	default:
		dec := a > c
		f := func(h float64) float64 {
			v := pOf(h) - p
			if !dec {
				v = -v
			}
			return v // decreasing in h
		}
		lo, hi := -1.0, 1.0
		for i := 0; i < 2000 && f(lo) < 0; i++ {
			lo *= 2
		}
		for i := 0; i < 2000 && f(hi) > 0; i++ {
			hi *= 2
		}
		for i := 0; i < 200; i++ {
			mid := 0.5 * (lo + hi)
			if mid <= lo || mid >= hi {
				break
			}
			if f(mid) > 0 {
				lo = mid
			} else {
				hi = mid
			}
		}
		h = 0.5 * (lo + hi)
	}
	var l float64
	switch {
	case math.IsInf(h, 1):
		l = 1
	case math.IsInf(h, -1):
		l = 0
	case math.Abs(h) < 1e-7:
		l = la / (la - lb)
	case h > 0:
		// (1 - A^-h) / (1 - B^h A^-h)
		l = -math.Expm1(-h*la) / -math.Expm1(h*(lb-la))
	default:
		// (A^h - 1) / (A^h - B^h) with B^h large: multiply by B^-h
		l = math.Expm1(h*la) / (math.Expm1(h*la) - math.Expm1(h*lb))
		if math.IsInf(math.Expm1(h*lb), 1) {
			l = 0
		}
	}
	var asn float64
	if math.Abs(h) < 1e-7 || ez == 0 {
		asn = -la * lb / (p*a*a + (1-p)*c*c)
	} else {
		asn = (l*lb + (1-l)*la) / ez
	}
	return l, asn
}

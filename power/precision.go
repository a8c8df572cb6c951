package power

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
)

// PrecisionOptions configures PrecisionN and WorstPrecisionN. The zero
// value means target probability 0.95 and search limit DefaultMaxN.
type PrecisionOptions struct {
	// Level is the required probability that k/n lands within halfWidth of p,
	// in (0, 1); 0 means 0.95.
	Level float64
	// MaxN bounds the search; 0 means DefaultMaxN (PrecisionN) or
	// DefaultMaxWorstN (WorstPrecisionN).
	MaxN int64
}

// DefaultMaxWorstN is the search limit of WorstPrecisionN when MaxN is 0;
// MaxWorstN the largest it accepts (each n costs O(n) range probabilities).
const (
	DefaultMaxWorstN int64 = 20_000
	MaxWorstN        int64 = 200_000
)

func (o PrecisionOptions) check(fn string, halfWidth float64, def, limit int64) (target float64, nmax int64, err error) {
	if !(halfWidth > 0 && halfWidth < 0.5) {
		return 0, 0, argerr.Invalid(fn, "halfWidth", halfWidth, "must lie in (0, 0.5)")
	}
	target = orDefault(o.Level, 0.95)
	if err = checkLevel(fn, "Level", target); err != nil {
		return
	}
	nmax, err = maxN(fn, o.MaxN, def, limit)
	return
}

// PrecisionN returns the number of trials for the sample proportion to
// land within halfWidth of p with probability at least o.Level,
//
//	P(|X/n - p| <= halfWidth) >= target,  X ~ Binomial(n, p),
//
// computed exactly by binom's ProportionWithin (boundaries included, p
// and halfWidth read as the decimals that print them). The probability is a
// sawtooth in n (the count range [n(p - halfWidth), n(p + halfWidth)] gains or loses
// an outcome as n grows), so the result gives the first n reaching the
// target and the stable n from which every n through Horizon keeps it,
// exactly as OneSampleN; Normal is the common-practice margin-of-error n
// z^2 p (1-p) / halfWidth^2 for comparison. Domain: 0 < p < 1, 0 < halfWidth < 0.5.
// The scan runs from n = 1 to at most o.MaxN (ErrNoSolution beyond).
func PrecisionN(ctx context.Context, p, halfWidth float64, o PrecisionOptions) (ExactSize, error) {
	const fn = "power.PrecisionN"
	if err := argerr.OpenProb(fn, "p", p); err != nil {
		return ExactSize{}, err
	}
	target, limit, err := o.check(fn, halfWidth, DefaultMaxN, MaxSearchN)
	if err != nil {
		return ExactSize{}, err
	}
	within := func(n int64) float64 { return binom.Dist{N: n, P: p}.ProportionWithin(halfWidth) }
	r, err := searchStable(ctx, fn, within, target, limit)
	if err != nil {
		return ExactSize{}, err
	}
	r.Test = "exact P(|k/n - p| <= half-width)"
	if n, err := MarginOfErrorN(p, halfWidth, target); err == nil {
		r.Normal = NormalSize{Method: "margin of error z^2 p (1-p) / half-width^2 (common practice)", N: n, Real: float64(n), Uncorrected: float64(n), Power: normalWithin(n, p, halfWidth)}
	}
	return r, nil
}

// normalWithin is the normal approximation to P(|k/n - p| <= h) at n
// trials, 2 Phi(h sqrt(n / (p (1-p)))) - 1 = erf(h sqrt(n / (2 p (1-p)))),
// the probability the margin-of-error formula plans for.
func normalWithin(n int64, p, h float64) float64 {
	return math.Erf(h * math.Sqrt(float64(n)/(2*p*(1-p))))
}

// WorstPrecision is the smallest probability, over all true proportions,
// that k/n lands within halfWidth of p, at one n.
type WorstPrecision struct {
	N int64 `json:"n"`
	// Prob is inf over p of P(|X/n - p| <= halfWidth). The infimum is a limit:
	// it is approached as p tends to WorstP from the side where the range
	// of counts loses an end point.
	Prob float64 `json:"prob"`
	// WorstP is the p (at most 1/2; 1 - WorstP is as bad) where it is
	// approached.
	WorstP float64 `json:"worst_p"`
}

// MarshalJSON encodes the result with non-finite floats as strings.
func (w WorstPrecision) MarshalJSON() ([]byte, error) {
	type plain WorstPrecision
	return jsonfloat.Marshal(plain(w))
}

// UnmarshalJSON decodes what MarshalJSON writes, non-finite numbers
// included.
func (w *WorstPrecision) UnmarshalJSON(b []byte) error {
	type plain WorstPrecision
	return jsonfloat.Unmarshal(b, (*plain)(w))
}

// worstWithin returns the infimum over p of P(|X/n - p| <= halfWidth). For p in
// an open interval where kmin = ceil(n(p - halfWidth)) and kmax = floor(n(p +
// halfWidth)) stay fixed, P(kmin <= X <= kmax) is unimodal in p, so the infimum
// is a one-sided limit at an end of such an interval: p = j/n - halfWidth
// approached from below (kmax drops to j - 1) or p = k/n + halfWidth from above
// (kmin rises to k + 1). By symmetry only p <= 1/2 is examined. The
// candidates are taken outward from p = 1/2 and the scan stops as soon as
// the infimum is below stopBelow (the value returned is then an upper
// bound that already misses it). Cost: O(n) range probabilities for an n
// that passes, usually a few for one that fails.
func worstWithin(ctx context.Context, fn string, n int64, halfWidth, stopBelow float64) (WorstPrecision, error) {
	w := WorstPrecision{N: n, Prob: 1, WorstP: 0.5}
	// p = 1/2 itself first: the worst case is usually next to it.
	if v := (binom.Dist{N: n, P: 0.5}).ProportionWithin(halfWidth); v < w.Prob {
		w.Prob = v
	}
	fn64 := float64(n)
	ceilTol := func(x float64) int64 { // ceil with integers within 1e-9 kept
		r := math.Round(x)
		if math.Abs(x-r) <= 1e-9*math.Max(1, math.Abs(r)) {
			return int64(r)
		}
		return int64(math.Ceil(x))
	}
	floorTol := func(x float64) int64 {
		r := math.Round(x)
		if math.Abs(x-r) <= 1e-9*math.Max(1, math.Abs(r)) {
			return int64(r)
		}
		return int64(math.Floor(x))
	}
	try := func(p float64, lo, hi int64) {
		if !(p > 0 && p <= 0.5) {
			return
		}
		lo, hi = max(lo, 0), min(hi, n)
		v := 0.0
		if lo <= hi {
			v = binom.Dist{N: n, P: p}.ProbRange(lo, hi)
		}
		if v < w.Prob {
			w.Prob, w.WorstP = v, p
		}
	}
	// Candidates in order of distance from p = 1/2, so that an n that
	// misses stopBelow is usually rejected after a few of them.
	ja := int64(math.Round(fn64 * (0.5 + halfWidth))) // p = ja/n - halfWidth near 1/2
	jb := int64(math.Round(fn64 * (0.5 - halfWidth))) // p = jb/n + halfWidth near 1/2
	for t := int64(0); t <= n+2; t++ {
		if t&31 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return w, err
			}
		}
		for _, j := range [2]int64{ja - t, ja + t + 1} {
			if j >= 0 && j <= n+1 { // p = j/n - halfWidth from below: kmax = j - 1
				p := float64(j)/fn64 - halfWidth
				try(p, ceilTol(fn64*(p-halfWidth)), j-1)
			}
		}
		for _, j := range [2]int64{jb - t, jb + t + 1} {
			if j >= 0 && j <= n+1 { // p = j/n + halfWidth from above: kmin = j + 1
				p := float64(j)/fn64 + halfWidth
				try(p, j+1, floorTol(fn64*(p+halfWidth)))
			}
		}
		if w.Prob < stopBelow {
			break
		}
	}
	return w, nil
}

// WorstPrecisionN returns the number of trials for which k/n lands within
// halfWidth of the true proportion with probability at least o.Level whatever
// the proportion (the infimum over p described on WorstPrecision). The
// worst case is a sawtooth in n as well; the result gives the first and
// the stable n as OneSampleN does, with Curve holding the worst-case
// probability per n (for an n that misses the target, the first
// candidate value found below it). An n that reaches the target costs O(n)
// range probabilities, so the scan starts at n = max(1, floor(N/2)), N the
// common-practice worst-case
// margin-of-error size at p = 1/2 (smaller n are not examined), and the
// limit is o.MaxN (default DefaultMaxWorstN, at most MaxWorstN).
// Example (invented planning question): halfWidth = 0.1 at 95% needs the
// worst-case n reported by the package example. Domain: 0 < halfWidth < 0.5.
func WorstPrecisionN(ctx context.Context, halfWidth float64, o PrecisionOptions) (ExactSize, error) {
	const fn = "power.WorstPrecisionN"
	target, limit, err := o.check(fn, halfWidth, DefaultMaxWorstN, MaxWorstN)
	if err != nil {
		return ExactSize{}, err
	}
	n0, err := MarginOfErrorN(0.5, halfWidth, target)
	if err != nil {
		return ExactSize{}, err
	}
	start := max(1, n0/2)
	if start > limit {
		return ExactSize{}, argerr.NoSolution(fn, "the margin-of-error size "+argerr.Format(n0)+" is beyond twice MaxN = "+argerr.Format(limit))
	}
	worst := func(n int64) (float64, error) {
		w, err := worstWithin(ctx, fn, n, halfWidth, target)
		return w.Prob, err
	}
	res, err := scanStable(ctx, fn, scan{start: start, maxN: limit, target: target,
		horizon: func(first int64) int64 { return first + max(20, first/4) }}, worst)
	if err != nil {
		return ExactSize{}, err
	}
	res.Test = "exact worst-case P(|k/n - p| <= half-width)"
	res.Normal = NormalSize{Method: "margin of error at p = 1/2 (common practice)", N: n0, Real: float64(n0), Uncorrected: float64(n0), Power: normalWithin(n0, 0.5, halfWidth)}
	return res, nil
}

// WorstPrecisionAt returns, for n trials, the infimum over the true
// proportion p of P(|X/n - p| <= halfWidth) and the p where it is approached
// (see WorstPrecision for the method). Domain: n >= 1, at most MaxWorstN
// (each call costs O(n) range probabilities); 0 < halfWidth < 0.5. ctx is
// checked during the scan.
func WorstPrecisionAt(ctx context.Context, n int64, halfWidth float64) (WorstPrecision, error) {
	const fn = "power.WorstPrecisionAt"
	if n < 1 {
		return WorstPrecision{}, argerr.Invalid(fn, "n", n, "must be at least 1")
	}
	if n > MaxWorstN {
		return WorstPrecision{}, argerr.TooLarge(fn, "n", n, "exceeds MaxWorstN = "+argerr.Format(MaxWorstN))
	}
	if !(halfWidth > 0 && halfWidth < 0.5) {
		return WorstPrecision{}, argerr.Invalid(fn, "halfWidth", halfWidth, "must lie in (0, 0.5)")
	}
	return worstWithin(ctx, fn, n, halfWidth, -1)
}

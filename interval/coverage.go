package interval

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
)

// Size limits of the coverage computations; larger problems return
// ErrTooLarge instead of running for minutes.
const (
	// MaxCoverageN is the largest n that Coverage and CoverageOverN accept:
	// at p = 1/2 a point then visits about 40 sqrt(n) = 1.3e5 counts, each
	// needing an interval.
	MaxCoverageN = 10_000_000
	// MaxCurveN is the largest n that CoverageCurve accepts: it keeps the
	// limits of every count 0..n (16 bytes each) for reuse across p.
	MaxCurveN = 1_000_000
	// MaxCurvePoints bounds the number of grid points of one sweep.
	MaxCurvePoints = 1_000_000
)

// Performance is the exact frequentist performance of a one-proportion
// interval method at a true proportion P with N trials:
//
//	Coverage      = sum over k of b(k; N, P) 1{L(k) <= P <= U(k)}
//	ExpectedWidth = sum over k of b(k; N, P) (U(k) - L(k))
//
// with closed intervals, as in Brown, Cai and DasGupta (2001). The sum
// runs outward from the mode until the binomial terms fall below 1e-18 of
// the total, so the omitted mass is below about 1e-16.
type Performance struct {
	N             int64   `json:"n"`
	P             float64 `json:"p"`
	Coverage      float64 `json:"coverage"`       // exact coverage probability
	ExpectedWidth float64 `json:"expected_width"` // exact expected width U - L
	Level         float64 `json:"level"`          // requested confidence level
	Side          Side    `json:"side"`
	Method        string  `json:"method"` // published name of the method
}

// MarshalJSON encodes the performance with non-finite values spelled out.
func (p Performance) MarshalJSON() ([]byte, error) {
	type plain Performance
	return jsonfloat.Marshal(plain(p))
}

// UnmarshalJSON decodes what MarshalJSON writes, non-finite numbers
// included.
func (p *Performance) UnmarshalJSON(b []byte) error {
	type plain Performance
	return jsonfloat.Unmarshal(b, (*plain)(p))
}

// CoverageSummary condenses a sweep: the smallest coverage and where it
// occurs, and the averages over the grid (for an evenly spaced grid of p,
// the average approximates the integral of coverage over p, the "mean
// coverage" of Newcombe 1998 and Brown, Cai and DasGupta 2001).
type CoverageSummary struct {
	MinCoverage  float64 `json:"min_coverage"`  // smallest coverage over the grid
	MinAtP       float64 `json:"min_at_p"`      // the p where it occurs (first such)
	MinAtN       int64   `json:"min_at_n"`      // the n where it occurs (first such)
	MeanCoverage float64 `json:"mean_coverage"` // average coverage over the grid
	MeanWidth    float64 `json:"mean_width"`    // average expected width over the grid
	Points       int     `json:"points"`        // number of grid points
}

// MarshalJSON encodes the summary with non-finite values spelled out.
func (s CoverageSummary) MarshalJSON() ([]byte, error) {
	type plain CoverageSummary
	return jsonfloat.Marshal(plain(s))
}

// UnmarshalJSON decodes what MarshalJSON writes, non-finite numbers
// included.
func (s *CoverageSummary) UnmarshalJSON(b []byte) error {
	type plain CoverageSummary
	return jsonfloat.Unmarshal(b, (*plain)(s))
}

// Coverage returns the exact coverage probability and expected width of
// the one-proportion method opt at n trials and true proportion p, by
// summing over the outcomes k weighted by their binomial probabilities
// (not by simulation). Cost: O(sqrt(n p (1-p)) + 1) intervals, each as
// costly as one Proportion call; use CoverageCurve to reuse the intervals
// across many p. Accuracy: about 1e-12 absolute (the binomial weights come
// from a ratio recurrence anchored at the mode). At the largest n the
// exact methods take seconds (Blaker at n = 1e7 and p = 1/2 about 3.5 s),
// so ctx is checked every 16 intervals and a cancelled call returns within
// about a millisecond with the context's error wrapped.
//
// Errors: n < 1 or n > MaxCoverageN (ErrTooLarge), p outside [0, 1] or
// NaN, or a bad option as in Proportion.
func Coverage(ctx context.Context, n int64, p float64, opt Options) (Performance, error) {
	const fn = "interval.Coverage"
	lv, err := checkCoverage(fn, n, opt)
	if err != nil {
		return Performance{}, err
	}
	if err := argerr.Prob(fn, "p", p); err != nil {
		return Performance{}, err
	}
	lim := func(k int64) (float64, float64) {
		lo, hi, _ := limits(opt.Method, k, n, lv)
		return lo, hi
	}
	c, w, err := perform(ctx, fn, n, p, lim)
	if err != nil {
		return Performance{}, err
	}
	return Performance{N: n, P: p, Coverage: c, ExpectedWidth: w, Level: lv.level, Side: lv.side, Method: opt.Method.String()}, nil
}

// checkCoverage validates n and the options of a coverage computation.
func checkCoverage(fn string, n int64, opt Options) (level, error) {
	if n < 1 {
		return level{}, argerr.Invalid(fn, "n", n, "must be at least 1")
	}
	if n > MaxCoverageN {
		return level{}, argerr.TooLarge(fn, "n", n, "exceeds MaxCoverageN = 1e7")
	}
	lv, err := newLevel(fn, opt.Level, opt.Side)
	if err != nil {
		return level{}, err
	}
	if opt.Method < 0 || opt.Method >= numMethods {
		return level{}, argerr.Invalid(fn, "Method", int(opt.Method), "is not a method; see the Method constants")
	}
	return lv, nil
}

// perform sums coverage and expected width at (n, p) with limits lim(k).
// The binomial weights b(k) start from exp(LogProb(mode)) and follow the
// ratios b(k+1)/b(k) = (n-k)p/((k+1)(1-p)) outward in both directions
// until a weight falls below 1e-18 of the running total. ctx is checked
// every 16 counts; a cancellation returns its wrapped error (for fn).
func perform(ctx context.Context, fn string, n int64, p float64, lim func(int64) (float64, float64)) (cov, width float64, err error) {
	calls := 0
	add := func(k int64, b float64) {
		if calls++; calls&15 == 0 && err == nil {
			err = argerr.Canceled(fn, ctx)
		}
		if err != nil {
			return
		}
		lo, hi := lim(k)
		if lo <= p && p <= hi {
			cov += b
		}
		width += b * (hi - lo)
	}
	switch p {
	case 0:
		add(0, 1)
		return cov, width, err
	case 1:
		add(n, 1)
		return cov, width, err
	}
	d := binom.Dist{N: n, P: p}
	mode := d.Mode()
	b0 := math.Exp(d.LogProb(mode))
	total := b0
	add(mode, b0)
	r, nf := p/(1-p), float64(n)
	b := b0
	for k := mode; k < n && err == nil; k++ {
		b *= (nf - float64(k)) / float64(k+1) * r
		if b < 1e-18*total {
			break
		}
		total += b
		add(k+1, b)
	}
	b = b0
	for k := mode; k > 0 && err == nil; k-- {
		b *= float64(k) / (nf - float64(k) + 1) / r
		if b < 1e-18*total {
			break
		}
		total += b
		add(k-1, b)
	}
	if err != nil {
		return 0, 0, err
	}
	// Normalize by the summed weights: it removes the recurrence's
	// accumulated rounding from the mode's anchor.
	return cov / total, width / total, nil
}

// CoverageCurve returns the exact performance of method opt at n trials
// for each true proportion in ps, and their summary, for coverage plots
// and for choosing a method. The limits of each count are computed once
// and reused across p, so a point costs O(sqrt(n p (1-p)) + 1) additions
// after at most n+1 interval computations in total.
//
// Errors: n < 1 or n > MaxCurveN, more than MaxCurvePoints points, an empty
// grid, a p outside [0, 1] (naming it as ps[i]), a bad option; ctx is
// checked every 16 counts summed and every point.
func CoverageCurve(ctx context.Context, n int64, ps []float64, opt Options) ([]Performance, CoverageSummary, error) {
	const fn = "interval.CoverageCurve"
	lv, err := checkCoverage(fn, n, opt)
	if err != nil {
		return nil, CoverageSummary{}, err
	}
	if n > MaxCurveN {
		return nil, CoverageSummary{}, argerr.TooLarge(fn, "n", n, "exceeds MaxCurveN = 1e6; use Coverage per point")
	}
	if len(ps) == 0 || len(ps) > MaxCurvePoints {
		return nil, CoverageSummary{}, argerr.Invalid(fn, "len(ps)", len(ps), "must be between 1 and MaxCurvePoints = 1e6")
	}
	for i, p := range ps {
		if !(p >= 0 && p <= 1) {
			return nil, CoverageSummary{}, argerr.Invalid(fn, "ps["+argerr.Format(i)+"]", p, "is not a probability in [0, 1]")
		}
	}
	// Cache of limits, filled on demand (NaN = not yet computed).
	los, his := make([]float64, n+1), make([]float64, n+1)
	for i := range los {
		los[i] = math.NaN()
	}
	var computed int
	var cerr error
	lim := func(k int64) (float64, float64) {
		if math.IsNaN(los[k]) {
			if computed++; computed%1024 == 0 && cerr == nil {
				cerr = argerr.Canceled(fn, ctx)
			}
			los[k], his[k], _ = limits(opt.Method, k, n, lv)
		}
		return los[k], his[k]
	}
	out := make([]Performance, len(ps))
	for i, p := range ps {
		if err := argerr.Canceled(fn, ctx); err != nil {
			return nil, CoverageSummary{}, err
		}
		c, w, err := perform(ctx, fn, n, p, lim)
		if err != nil {
			return nil, CoverageSummary{}, err
		}
		if cerr != nil {
			return nil, CoverageSummary{}, cerr
		}
		out[i] = Performance{N: n, P: p, Coverage: c, ExpectedWidth: w, Level: lv.level, Side: lv.side, Method: opt.Method.String()}
	}
	return out, summarize(out), nil
}

// CoverageOverN returns the exact performance of method opt at the true
// proportion p for every n from nMin to nMax, and their summary: the
// saw-tooth of coverage in n that Brown, Cai and DasGupta (2001) show.
//
// Errors: nMin < 1, nMax < nMin, nMax > MaxCoverageN, more than
// MaxCurvePoints values of n, p outside [0, 1], a bad option; ctx is
// checked for every n and every 16 intervals within one n (a single n of
// 1e7 with Blaker's method takes seconds).
func CoverageOverN(ctx context.Context, nMin, nMax int64, p float64, opt Options) ([]Performance, CoverageSummary, error) {
	const fn = "interval.CoverageOverN"
	if nMin < 1 {
		return nil, CoverageSummary{}, argerr.Invalid(fn, "nMin", nMin, "must be at least 1")
	}
	if nMax < nMin {
		return nil, CoverageSummary{}, argerr.Invalid(fn, "nMax", nMax, "is below nMin = "+argerr.Format(nMin))
	}
	lv, err := checkCoverage(fn, nMax, opt)
	if err != nil {
		return nil, CoverageSummary{}, err
	}
	if nMax-nMin >= MaxCurvePoints {
		return nil, CoverageSummary{}, argerr.TooLarge(fn, "nMax - nMin", nMax-nMin, "exceeds MaxCurvePoints = 1e6")
	}
	if err := argerr.Prob(fn, "p", p); err != nil {
		return nil, CoverageSummary{}, err
	}
	out := make([]Performance, 0, nMax-nMin+1)
	for n := nMin; n <= nMax; n++ {
		if err := argerr.Canceled(fn, ctx); err != nil {
			return nil, CoverageSummary{}, err
		}
		c, w, err := perform(ctx, fn, n, p, func(k int64) (float64, float64) {
			lo, hi, _ := limits(opt.Method, k, n, lv)
			return lo, hi
		})
		if err != nil {
			return nil, CoverageSummary{}, err
		}
		out = append(out, Performance{N: n, P: p, Coverage: c, ExpectedWidth: w, Level: lv.level, Side: lv.side, Method: opt.Method.String()})
	}
	return out, summarize(out), nil
}

// summarize returns the minimum and the averages of a sweep.
func summarize(ps []Performance) CoverageSummary {
	s := CoverageSummary{MinCoverage: math.Inf(1), Points: len(ps)}
	for _, p := range ps {
		if p.Coverage < s.MinCoverage {
			s.MinCoverage, s.MinAtP, s.MinAtN = p.Coverage, p.P, p.N
		}
		s.MeanCoverage += p.Coverage
		s.MeanWidth += p.ExpectedWidth
	}
	s.MeanCoverage /= float64(len(ps))
	s.MeanWidth /= float64(len(ps))
	return s
}

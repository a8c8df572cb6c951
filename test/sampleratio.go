package test

import (
	"context"
	"fmt"
	"math"
	"strconv"

	"github.com/kofnlab/kofn/internal/enum"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/internal/xmath"
)

// FitMethod selects the goodness-of-fit test of SampleRatio.
//
// The zero value, FitPearson, is the default: sample-ratio checks are run
// on arm sizes in the thousands to millions, where Pearson's chi-square is
// accurate and instant; the exact test is for small totals.
type FitMethod int

// Tests of observed counts c_j (total N) against intended shares pi_j,
// with expected counts E_j = N pi_j.
const (
	// FitPearson: X2 = sum_j (c_j - E_j)^2 / E_j, chi-square with k - 1
	// degrees of freedom (Pearson 1900).
	FitPearson FitMethod = iota
	// FitG: G2 = 2 sum_j c_j ln(c_j/E_j), chi-square with k - 1 degrees
	// of freedom.
	FitG
	// FitExact: the exact multinomial test, the total probability of the
	// outcomes no more probable than the observed one (relative tolerance
	// 1e-7). For two arms it is the exact binomial test with the
	// point-probability two-sided p-value, at any total; for more arms the
	// outcomes are listed, up to MaxExactFitOutcomes of them.
	FitExact
)

// MaxExactFitOutcomes bounds the number of outcomes C(N+k-1, k-1) the
// exact multinomial test lists for k >= 3 arms (about a second of work);
// beyond it the test fails with ErrTooLarge.
const MaxExactFitOutcomes = 20_000_000

var fitNames = enum.New[FitMethod]("test.FitMethod", []string{"Pearson chi-square", "likelihood-ratio G", "exact multinomial"}, nil)

// String returns the published name.
func (m FitMethod) String() string { return fitNames.String(m) }

// MarshalText encodes the value by its String form.
func (m FitMethod) MarshalText() ([]byte, error) { return fitNames.MarshalText(m) }

// UnmarshalText decodes any spelling ParseFitMethod accepts.
func (m *FitMethod) UnmarshalText(b []byte) error { return fitNames.UnmarshalText(m, b) }

// ParseFitMethod returns the value whose String() is s, ignoring case.
func ParseFitMethod(s string) (FitMethod, error) { return fitNames.Parse("test.ParseFitMethod", s) }

// FitMethodValues lists the methods in the order of their values.
func FitMethodValues() []FitMethod { return []FitMethod{FitPearson, FitG, FitExact} }

// SampleRatioOptions are the options of SampleRatio.
type SampleRatioOptions struct {
	Method FitMethod
	// Alpha is the level below which the split is flagged as a mismatch;
	// 0 means 0.001 (common practice for sample-ratio checks, which are
	// run on every experiment and must rarely raise false alarms).
	Alpha float64
}

// ArmShare compares one arm's observed size with its intended share.
type ArmShare struct {
	Observed int64   `json:"observed"`       // the arm's size
	Expected float64 `json:"expected"`       // N times the intended share
	Intended float64 `json:"intended_share"` // the intended share (weights normalized)
	Share    float64 `json:"observed_share"` // the observed share, Observed/N
	Ratio    float64 `json:"ratio"`          // observed over intended share
}

// SampleRatioResult is the outcome of SampleRatio.
type SampleRatioResult struct {
	Method    string    `json:"method"`
	Statistic Statistic `json:"statistic"`    // "chi-square" X2, "G2", or the exact test's "outcome probability"
	DF        int       `json:"df,omitempty"` // k - 1 for the chi-square methods
	PValue    float64   `json:"p_value"`
	LogPValue float64   `json:"log_p_value"`
	// Arms compares each arm's observed and intended share.
	Arms []ArmShare `json:"arms"`
	// Alpha is the flagging level; Mismatch is PValue < Alpha.
	Alpha    float64  `json:"alpha"`
	Mismatch bool     `json:"mismatch"`
	Warnings []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the result with non-finite floats as strings.
func (r SampleRatioResult) MarshalJSON() ([]byte, error) {
	type plain SampleRatioResult
	return jsonfloat.Marshal(plain(r))
}

// UnmarshalJSON decodes what MarshalJSON writes, non-finite numbers
// included.
func (r *SampleRatioResult) UnmarshalJSON(b []byte) error {
	type plain SampleRatioResult
	return jsonfloat.Unmarshal(b, (*plain)(r))
}

// SampleRatio checks an experiment's allocation: whether the observed arm
// sizes counts[j] are consistent with the intended split, given as
// positive weights (normalized to shares pi_j; 1, 1, 1 means equal thirds).
// It is a goodness-of-fit test of the multinomial counts (see FitMethod)
// and reports each arm's observed against intended share.
//
// A mismatch (PValue < Alpha) means the assignment, the logging or the
// filtering of units did not work as designed; the comparison of the arms
// is then not trustworthy, whatever its p-value, until the cause is found.
// The result's warnings say so.
//
// Errors: fewer than 2 arms, lengths that differ, a negative count, a
// weight that is not positive and finite, a total of 0, alpha outside
// (0, 1), an unknown method; for FitExact with k >= 3, ErrTooLarge beyond
// MaxExactFitOutcomes outcomes, and the context's error when ctx ends.
//
// Accuracy: chi-square tails about 1e-13 relative; the exact p-value about
// 1e-12 relative. Cost: O(k); the exact test with k >= 3 lists every
// outcome.
//
// Sources: Pearson K (1900), Phil Mag 50:157-175; Read TRC, Cressie NAC
// (1988), Goodness-of-Fit Statistics for Discrete Multivariate Data,
// Springer; Kohavi R, Tang D, Xu Y (2020), Trustworthy Online Controlled
// Experiments, Cambridge University Press, chapter 21 (sample ratio
// mismatch); Fabijan A et al. (2019), Diagnosing sample ratio mismatch in
// online controlled experiments, KDD '19.
func SampleRatio(ctx context.Context, counts []int64, weights []float64, opt SampleRatioOptions) (SampleRatioResult, error) {
	const fn = "test.SampleRatio"
	k := len(counts)
	if k < 2 {
		return SampleRatioResult{}, argerr.Invalid(fn, "counts", k, "arms given; a sample-ratio check needs at least 2")
	}
	if len(weights) != k {
		return SampleRatioResult{}, argerr.Invalid(fn, "weights", len(weights), "weights given for "+strconv.Itoa(k)+" arms; give one per arm")
	}
	if opt.Method < 0 || !fitNames.Valid(opt.Method) {
		return SampleRatioResult{}, argerr.Invalid(fn, "method", int(opt.Method), "is not a goodness-of-fit method")
	}
	alpha := opt.Alpha
	if alpha == 0 {
		alpha = 0.001
	}
	if !(alpha > 0 && alpha < 1) {
		return SampleRatioResult{}, argerr.Invalid(fn, "alpha", alpha, "must lie strictly between 0 and 1 (0 means 0.001)")
	}
	var N int64
	wsum := 0.0
	for j := range counts {
		if err := argerr.Count(fn, "counts["+strconv.Itoa(j)+"]", counts[j]); err != nil {
			return SampleRatioResult{}, err
		}
		if !(weights[j] > 0) || math.IsInf(weights[j], 1) {
			return SampleRatioResult{}, argerr.Invalid(fn, "weights["+strconv.Itoa(j)+"]", weights[j], "must be positive and finite")
		}
		if N > 1<<53-counts[j] {
			return SampleRatioResult{}, argerr.TooLarge(fn, "counts["+strconv.Itoa(j)+"]", counts[j], "makes the total exceed 2^53")
		}
		N += counts[j]
		wsum += weights[j]
	}
	if N == 0 {
		return SampleRatioResult{}, argerr.Invalid(fn, "", nil, "every count is 0; the check needs at least one unit")
	}
	pi := make([]float64, k)
	r := SampleRatioResult{Method: opt.Method.String(), Alpha: alpha, Arms: make([]ArmShare, k)}
	for j := range pi {
		pi[j] = weights[j] / wsum
		e := float64(N) * pi[j]
		sh := float64(counts[j]) / float64(N)
		r.Arms[j] = ArmShare{Observed: counts[j], Expected: e, Intended: pi[j], Share: sh, Ratio: sh / pi[j]}
	}
	switch opt.Method {
	case FitExact:
		r.Statistic.Name = "outcome probability"
		lp, lobs, err := exactMultinomial(ctx, fn, counts, pi, N)
		if err != nil {
			return SampleRatioResult{}, err
		}
		r.Statistic.Value, r.LogPValue = math.Exp(lobs), lp
	default:
		r.DF = k - 1
		stat, minE := 0.0, math.Inf(1)
		for j, c := range counts {
			e := r.Arms[j].Expected
			minE = math.Min(minE, e)
			o := float64(c)
			if opt.Method == FitG {
				if c > 0 {
					stat += 2 * o * math.Log(o/e)
				}
				continue
			}
			stat += (o - e) * (o - e) / e
		}
		stat = math.Max(0, stat)
		r.Statistic = Statistic{Name: "chi-square", Value: stat}
		if opt.Method == FitG {
			r.Statistic.Name = "G2"
		}
		r.LogPValue = logChiSquareSurvival(stat, k-1)
		if minE < 5 {
			r.Warnings = append(r.Warnings, fmt.Sprintf("smallest expected count %.3g is below 5 (common practice): prefer the exact multinomial test", minE))
		}
	}
	r.LogPValue = math.Min(0, r.LogPValue)
	r.PValue = math.Exp(r.LogPValue)
	r.Mismatch = r.PValue < alpha
	if r.Mismatch {
		r.Warnings = append(r.Warnings, fmt.Sprintf("sample ratio mismatch (p = %.3g < %g): the arms' sizes do not fit the intended split, so the comparison of the arms is not trustworthy until the cause (assignment, logging, filtering) is found", r.PValue, alpha))
	}
	return r, nil
}

// exactMultinomial returns the log p-value of the exact multinomial test
// and the log probability of the observed outcome.
func exactMultinomial(ctx context.Context, fn string, c []int64, pi []float64, N int64) (logP, logObs float64, err error) {
	k := len(c)
	if k == 2 {
		b, err := Binomial(c[0], N, pi[0], BinomialOptions{})
		if err != nil {
			return 0, 0, err
		}
		lg, _ := math.Lgamma(float64(N + 1))
		l0, _ := math.Lgamma(float64(c[0] + 1))
		l1, _ := math.Lgamma(float64(c[1] + 1))
		return b.LogPValue, lg - l0 - l1 + float64(c[0])*math.Log(pi[0]) + float64(c[1])*math.Log(pi[1]), nil
	}
	// C(N+k-1, k-1) outcomes, computed in floating point to compare.
	lo, _ := math.Lgamma(float64(N + int64(k)))
	l1, _ := math.Lgamma(float64(k))
	l2, _ := math.Lgamma(float64(N + 1))
	if lo-l1-l2 > math.Log(MaxExactFitOutcomes) {
		return 0, 0, &argerr.Error{Func: fn, Reason: "a total of " + strconv.FormatInt(N, 10) + " in " + strconv.Itoa(k) + " arms has more than 20,000,000 outcomes (MaxExactFitOutcomes) for the exact multinomial test; use the Pearson chi-square or G test", Err: argerr.ErrTooLarge}
	}
	// w[j][y] = y ln pi_j - ln y!, so ln P(y) = ln N! + sum_j w[j][y_j].
	w := make([][]float64, k)
	for j := range w {
		w[j] = make([]float64, N+1)
		lp := math.Log(pi[j])
		for y := int64(0); y <= N; y++ {
			lf, _ := math.Lgamma(float64(y + 1))
			w[j][y] = float64(y)*lp - lf
		}
	}
	T := 0.0
	for j := range c {
		T += w[j][c[j]]
	}
	lgN, _ := math.Lgamma(float64(N + 1))
	thr := T + fhTol
	sum := 0.0 // sum of e^(ln P - T) over the counted outcomes
	steps := 0
	var rec func(j int, left int64, v float64) bool
	rec = func(j int, left int64, v float64) bool {
		if j == k-1 {
			if t := v + w[j][left]; t <= thr {
				sum += math.Exp(t - T)
			}
			steps++
			if steps&4095 == 0 && ctx.Err() != nil {
				return false
			}
			return true
		}
		for y := int64(0); y <= left; y++ {
			if !rec(j+1, left-y, v+w[j][y]) {
				return false
			}
		}
		return true
	}
	if !rec(0, N, 0) {
		return 0, 0, argerr.Canceled(fn, ctx)
	}
	return math.Min(0, xmath.Log(sum)+T+lgN), math.Min(0, T+lgN), nil
}

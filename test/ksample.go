package test

import (
	"context"
	"fmt"
	"math"
	"strconv"

	"github.com/kofnlab/kofn/internal/enum"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
)

// KSampleMethod selects the test of EqualProportions.
//
// The zero value, FreemanHalton, is the default: it is exact (its size
// never exceeds alpha, whatever the counts), where the chi-square
// approximations of the other two can be far off at small or sparse
// counts. At large totals it may refuse with ErrTooLarge; Pearson's
// chi-square is then the usual choice.
type KSampleMethod int

// Tests of p_1 = ... = p_k for k independent binomial samples, written as
// the 2 x k table of successes x_j and failures n_j - x_j, with pooled
// proportion p = S/N (S the total of successes, N of trials), expected
// counts E = n_j p and n_j (1-p).
const (
	// FreemanHalton is the exact conditional test: given the margins, the
	// table has the multivariate hypergeometric distribution
	// P(x) = prod_j C(n_j, x_j) / C(N, S), and the p-value is the total
	// probability of the tables no more probable than the observed one
	// (Freeman and Halton 1951), within the relative tolerance 1e-7.
	FreemanHalton KSampleMethod = iota
	// PearsonChiSquare: X2 = sum_j (x_j - n_j p)^2 / (n_j p (1-p)) against
	// chi-square with k - 1 degrees of freedom (Pearson 1900).
	PearsonChiSquare
	// LikelihoodRatioG: G2 = 2 sum over the 2k cells of O ln(O/E) against
	// chi-square with k - 1 degrees of freedom (Wilks 1938).
	LikelihoodRatioG
)

var kSampleNames = enum.New[KSampleMethod]("test.KSampleMethod", []string{"Freeman-Halton", "Pearson chi-square", "likelihood-ratio G"}, nil)

// String returns the published name.
func (m KSampleMethod) String() string { return kSampleNames.String(m) }

// MarshalText encodes the value by its String form.
func (m KSampleMethod) MarshalText() ([]byte, error) { return kSampleNames.MarshalText(m) }

// UnmarshalText decodes any spelling ParseKSampleMethod accepts.
func (m *KSampleMethod) UnmarshalText(b []byte) error { return kSampleNames.UnmarshalText(m, b) }

// ParseKSampleMethod returns the value whose String() is s, ignoring case.
func ParseKSampleMethod(s string) (KSampleMethod, error) {
	return kSampleNames.Parse("test.ParseKSampleMethod", s)
}

// KSampleMethodValues lists the methods in the order of their values.
func KSampleMethodValues() []KSampleMethod { return kSampleNames.Values() }

// KSampleOptions are the options of EqualProportions; the zero value is
// the exact Freeman-Halton test without mid-p.
type KSampleOptions struct {
	Method KSampleMethod
	// MidP (FreemanHalton only): count the tables exactly as probable as
	// the observed one (within the tolerance) with half their probability.
	MidP bool
}

// KSampleResult is the outcome of EqualProportions.
type KSampleResult struct {
	// Method is the published name of the test, with " mid-p" for the
	// mid-p version.
	Method string `json:"method"`
	// Statistic is X2, G2, or for the exact test the conditional
	// probability of the observed table; its Name says which
	// ("chi-square", "G2", "table probability").
	Statistic Statistic `json:"statistic"`
	// DF is the degrees of freedom of the chi-square reference (k - 1);
	// omitted for the exact test.
	DF int `json:"df,omitempty"`
	// PValue is the p-value in [0, 1] (0 where it underflows); LogPValue
	// its natural logarithm, finite where PValue underflows.
	PValue    float64 `json:"p_value"`
	LogPValue float64 `json:"log_p_value"`
	// Proportions are the arms' observed proportions x_j/n_j; Pooled is S/N.
	Proportions []float64 `json:"proportions"`
	Pooled      float64   `json:"pooled"`
	// Warnings lists conditions that weaken the answer.
	Warnings []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the result with non-finite floats as strings.
func (r KSampleResult) MarshalJSON() ([]byte, error) {
	type plain KSampleResult
	return jsonfloat.Marshal(plain(r))
}

// UnmarshalJSON decodes what MarshalJSON writes, non-finite numbers
// included.
func (r *KSampleResult) UnmarshalJSON(b []byte) error {
	type plain KSampleResult
	return jsonfloat.Unmarshal(b, (*plain)(r))
}

// checkArms validates successes and sizes of k >= 2 arms.
func checkArms(fn string, x, n []int64) (S, N int64, err error) {
	if len(x) != len(n) {
		return 0, 0, argerr.Invalid(fn, "successes", len(x), "arms given, but "+strconv.Itoa(len(n))+" sizes; give one of each per arm")
	}
	if len(x) < 2 {
		return 0, 0, argerr.Invalid(fn, "sizes", len(n), "arms given; the test needs at least 2")
	}
	for j := range x {
		xa, na := "successes["+strconv.Itoa(j)+"]", "sizes["+strconv.Itoa(j)+"]"
		if err := argerr.KN(fn, xa, na, x[j], n[j]); err != nil {
			return 0, 0, err
		}
		if n[j] == 0 {
			return 0, 0, argerr.Invalid(fn, na, 0, "is 0; each arm needs at least one trial")
		}
		if N > 1<<53-n[j] {
			return 0, 0, argerr.TooLarge(fn, na, n[j], "makes the total exceed 2^53")
		}
		S += x[j]
		N += n[j]
	}
	return S, N, nil
}

// EqualProportions tests H0: p_1 = ... = p_k for x[j] successes out of
// n[j] trials in k >= 2 independent arms, by opt.Method (see
// KSampleMethod). For k = 2 the exact test is Fisher's two-sided
// point-probability test and X2 is the square of the pooled z.
//
// Special cases: when every trial is a success or every one a failure
// only one table is possible; the p-value is 1 and a warning says so.
// Warnings also report expected counts below 5 for the chi-square
// methods (Cochran's rule, common practice) and the mid-p caveat.
//
// Errors: len(x) != len(n), fewer than 2 arms, a count negative or above
// its arm size, an empty arm, an unknown method; for the exact test,
// ErrTooLarge beyond MaxFreemanHaltonWork steps or a total above 2^24,
// and the context's error when ctx ends (checked every few thousand
// steps).
//
// Accuracy: chi-square tails about 1e-13 relative (see the doc of the
// exact test for its own accuracy). Cost: O(k) for the chi-square
// methods; see FreemanHalton for the exact test.
//
// Exact test algorithm: the table probability is a product over columns,
// so the tables are not listed; a dynamic programme runs over the columns
// (smallest arms first), its state the column and the running total of
// successes. At each state the most probable completion (a max-plus
// convolution of the log-concave column terms, merged once in O(N)) decides
// whether every completion is no more probable than the observed table, in
// which case the whole subtree's probability is added at once from a
// hypergeometric tail (Vandermonde's identity gives the subtree totals);
// the states whose completions straddle the observed probability form an
// interval around the mode and are expanded. The last two columns are
// never expanded: their distribution given the running total is a
// unimodal hypergeometric, whose two tails below a threshold are found by
// bisection and summed from precomputed ratio recursions. The cost grows
// with the number of tables within the observed table's probability
// contour of the first k - 2 columns: about 1e5-1e6 steps for k = 5 at a
// total of 10,000, more for very small p-values (BenchmarkFreemanHalton).
// Column log-probabilities come from the saddle-point binomial density,
// so the log p-value is accurate to about 1e-12 relative to
// max(1, |ln p|).
//
// Sources: Pearson K (1900), Phil Mag 50:157-175; Freeman GH, Halton JH
// (1951), Biometrika 38:141-149; Mehta CR, Patel NR (1983), JASA
// 78:427-434 (the network algorithm: states of partial column sums,
// longest-path bounds); Wilks SS (1938), Ann Math Statist 9:60-62;
// Agresti A (2002), Categorical Data Analysis, 2nd ed., sections 3.2 and
// 3.5.
func EqualProportions(ctx context.Context, x, n []int64, opt KSampleOptions) (KSampleResult, error) {
	const fn = "test.EqualProportions"
	S, N, err := checkArms(fn, x, n)
	if err != nil {
		return KSampleResult{}, err
	}
	if opt.Method < 0 || !kSampleNames.Valid(opt.Method) {
		return KSampleResult{}, argerr.Invalid(fn, "method", int(opt.Method), "is not a k-sample method")
	}
	if opt.MidP && opt.Method != FreemanHalton {
		return KSampleResult{}, argerr.Invalid(fn, "mid-p", "true", "applies to the exact Freeman-Halton test only")
	}
	k := len(x)
	r := KSampleResult{Method: opt.Method.String(), Proportions: make([]float64, k), Pooled: float64(S) / float64(N)}
	for j := range x {
		r.Proportions[j] = float64(x[j]) / float64(n[j])
	}
	if opt.MidP {
		r.Method += " mid-p"
		r.Warnings = append(r.Warnings, "mid-p value: not guaranteed to keep the size at or below alpha")
	}
	degenerate := S == 0 || S == N
	if degenerate {
		r.Warnings = append(r.Warnings, "every trial is a success or every one a failure: only one table is possible and the p-value is 1")
	}
	switch opt.Method {
	case FreemanHalton:
		r.Statistic.Name = "table probability"
		lp, lobs, err := freemanHalton(ctx, fn, x, n, S, N, opt.MidP)
		if err != nil {
			return KSampleResult{}, err
		}
		r.Statistic.Value, r.LogPValue = math.Exp(lobs), lp
	default:
		r.DF = k - 1
		stat := pearsonG(x, n, S, N, opt.Method == LikelihoodRatioG)
		r.Statistic.Name = "chi-square"
		if opt.Method == LikelihoodRatioG {
			r.Statistic.Name = "G2"
		}
		r.Statistic.Value, r.LogPValue = stat, logChiSquareSurvival(stat, k-1)
		if !degenerate {
			if e := minExpected(n, S, N); e < 5 {
				r.Warnings = append(r.Warnings, fmt.Sprintf("smallest expected count %.3g is below 5 (common practice): prefer the exact Freeman-Halton test", e))
			}
		}
	}
	r.LogPValue = math.Min(0, r.LogPValue)
	r.PValue = math.Exp(r.LogPValue)
	return r, nil
}

// pearsonG returns Pearson's X2 or the likelihood-ratio G2 of the 2 x k
// table (0 for a degenerate table).
func pearsonG(x, n []int64, S, N int64, g bool) float64 {
	if S == 0 || S == N {
		return 0
	}
	p := float64(S) / float64(N)
	stat := 0.0
	for j := range x {
		e1, e0 := float64(n[j])*p, float64(n[j])*(1-p)
		o1, o0 := float64(x[j]), float64(n[j]-x[j])
		if g {
			if o1 > 0 {
				stat += o1 * math.Log(o1/e1)
			}
			if o0 > 0 {
				stat += o0 * math.Log(o0/e0)
			}
			continue
		}
		// (x - n p)^2 / (n p (1-p)) with x - n p = (x N - n S)/N exact in integers while it fits.
		d := (float64(x[j])*float64(N) - float64(n[j])*float64(S)) / float64(N)
		if N <= 1<<31 {
			d = float64(x[j]*N-n[j]*S) / float64(N)
		}
		stat += d * d / (float64(n[j]) * p * (1 - p))
	}
	if g {
		stat *= 2
	}
	return math.Max(0, stat)
}

// minExpected returns the smallest expected cell count of the 2 x k table.
func minExpected(n []int64, S, N int64) float64 {
	nmin := n[0]
	for _, v := range n {
		nmin = min(nmin, v)
	}
	return float64(nmin) * float64(min(S, N-S)) / float64(N)
}

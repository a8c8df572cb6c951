package test

import (
	"context"
	"strconv"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
)

// ComparisonOptions are the options of Pairwise and VersusControl; the
// zero value compares each pair by Fisher's exact test (two-sided, point
// probability) and adjusts by Holm at alpha 0.05.
type ComparisonOptions struct {
	// Asymptotic selects the pooled z test (the signed root of Pearson's
	// chi-square) instead of Fisher's exact test.
	Asymptotic bool
	// MidP (Fisher only) uses Fisher's mid-p values.
	MidP bool
	// Adjustment is the multiplicity adjustment over the family of
	// comparisons (default Holm).
	Adjustment Adjustment
	// Alpha is the family-level significance level (0 means 0.05).
	Alpha float64
}

// Comparison is one two-arm comparison within a family.
type Comparison struct {
	First  int `json:"first"`  // index of the first arm
	Second int `json:"second"` // index of the second arm (the control for VersusControl)
	// Difference is p_first - p_second, the difference of the observed
	// proportions.
	Difference float64 `json:"difference"`
	// PValue is the two-sided p-value of the comparison alone;
	// AdjustedPValue the adjusted one; Reject is AdjustedPValue <= Alpha.
	PValue         float64 `json:"p_value"`
	AdjustedPValue float64 `json:"adjusted_p_value"`
	Reject         bool    `json:"reject"`
}

// ComparisonsResult is the outcome of Pairwise and VersusControl.
type ComparisonsResult struct {
	// Test is the published name of the two-arm test.
	Test        string       `json:"test"`
	Adjustment  Adjustment   `json:"adjustment"`
	Alpha       float64      `json:"alpha"`
	Comparisons []Comparison `json:"comparisons"`
	Warnings    []string     `json:"warnings,omitempty"`
}

// MarshalJSON encodes the result with non-finite floats as strings.
func (r ComparisonsResult) MarshalJSON() ([]byte, error) {
	type plain ComparisonsResult
	return jsonfloat.Marshal(plain(r))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (r *ComparisonsResult) UnmarshalJSON(b []byte) error {
	type plain ComparisonsResult
	return jsonfloat.Unmarshal(b, (*plain)(r))
}

// Pairwise compares every pair of the k arms (x[i] successes of n[i]),
// k (k-1)/2 two-sided tests of p_i = p_j in the order (0,1), (0,2), ...,
// (1,2), ..., each by Fisher's exact test or the pooled z test, and
// adjusts their p-values over the family by opt.Adjustment (see
// AdjustPValues); a comparison is significant when its adjusted p-value
// is at most opt.Alpha.
//
// Errors: as EqualProportions for the counts; an unknown adjustment;
// alpha outside (0, 1); MidP with Asymptotic; the context's error.
// Cost: k (k-1)/2 two-arm tests and one adjustment.
//
// Source: Agresti A (2002), Categorical Data Analysis, 2nd ed., section
// 3.3 (comparing several proportions); Holm S (1979), Scand J Statist
// 6:65-70.
func Pairwise(ctx context.Context, x, n []int64, opt ComparisonOptions) (ComparisonsResult, error) {
	const fn = "test.Pairwise"
	if _, _, err := checkArms(fn, x, n); err != nil {
		return ComparisonsResult{}, err
	}
	var pairs [][2]int
	for i := range x {
		for j := i + 1; j < len(x); j++ {
			pairs = append(pairs, [2]int{i, j})
		}
	}
	return compare(ctx, fn, x, n, pairs, opt)
}

// VersusControl compares each of the k - 1 other arms with the control arm
// (index control): k - 1 two-sided tests of p_j = p_control, adjusted over
// that family (many-to-one comparisons). The comparisons come in the order
// of the arms; Difference is p_j - p_control. Everything else is as
// Pairwise. A control index outside 0..k-1 is an error.
//
// Adjusting over k - 1 comparisons instead of k (k-1)/2 is what makes
// many-to-one designs more powerful than all pairs: decide before the
// data which arm is the control.
func VersusControl(ctx context.Context, x, n []int64, control int, opt ComparisonOptions) (ComparisonsResult, error) {
	const fn = "test.VersusControl"
	if _, _, err := checkArms(fn, x, n); err != nil {
		return ComparisonsResult{}, err
	}
	if control < 0 || control >= len(x) {
		return ComparisonsResult{}, argerr.Invalid(fn, "control", control, "is not an arm index in 0.."+strconv.Itoa(len(x)-1))
	}
	var pairs [][2]int
	for j := range x {
		if j != control {
			pairs = append(pairs, [2]int{j, control})
		}
	}
	return compare(ctx, fn, x, n, pairs, opt)
}

func compare(ctx context.Context, fn string, x, n []int64, pairs [][2]int, opt ComparisonOptions) (ComparisonsResult, error) {
	if err := checkAdjustment(fn, opt.Adjustment); err != nil {
		return ComparisonsResult{}, err
	}
	if opt.MidP && opt.Asymptotic {
		return ComparisonsResult{}, argerr.Invalid(fn, "mid-p", "true", "applies to Fisher's exact test only, not with the asymptotic test")
	}
	r := ComparisonsResult{Adjustment: opt.Adjustment, Comparisons: make([]Comparison, len(pairs))}
	p := make([]float64, len(pairs))
	seen := map[string]bool{}
	for c, pr := range pairs {
		if err := argerr.Canceled(fn, ctx); err != nil {
			return ComparisonsResult{}, err
		}
		i, j := pr[0], pr[1]
		var res Result
		var err error
		if opt.Asymptotic {
			res, err = TwoSample(x[i], n[i], x[j], n[j], TwoSampleOptions{})
		} else {
			res, err = Fisher(x[i], n[i], x[j], n[j], FisherOptions{MidP: opt.MidP})
		}
		if err != nil {
			return ComparisonsResult{}, err
		}
		r.Test = res.Method
		p[c] = res.PValue
		r.Comparisons[c] = Comparison{First: i, Second: j, Difference: float64(x[i])/float64(n[i]) - float64(x[j])/float64(n[j]), PValue: res.PValue}
		for _, w := range res.Warnings {
			if !seen[w] {
				seen[w] = true
				r.Warnings = append(r.Warnings, "arms "+strconv.Itoa(i)+" and "+strconv.Itoa(j)+": "+w)
			}
		}
	}
	adj, err := Adjust(ctx, p, opt.Alpha, opt.Adjustment)
	if err != nil {
		if e, ok := err.(*Error); ok {
			e.Func = fn
		}
		return ComparisonsResult{}, err
	}
	r.Alpha = adj.Alpha
	for c := range r.Comparisons {
		r.Comparisons[c].AdjustedPValue = adj.AdjustedPValues[c]
		r.Comparisons[c].Reject = adj.Reject[c]
	}
	r.Warnings = append(r.Warnings, adj.Warnings...)
	return r, nil
}

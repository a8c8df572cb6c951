package test

import (
	"context"
	"math"
	"strconv"

	"github.com/kofnlab/kofn/internal/enum"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
)

// Adjustment is a multiplicity adjustment of a family of p-values.
//
// The zero value, Holm, is the default: it controls the familywise error
// rate under any dependence between the tests, like Bonferroni, and
// rejects everything Bonferroni rejects and sometimes more.
type Adjustment int

// The adjustments. With m p-values sorted as p(1) <= ... <= p(m), the
// adjusted p-value of the hypothesis with the i-th smallest p-value is:
const (
	// Holm (1979), step-down: max over j <= i of min(1, (m-j+1) p(j)).
	// Familywise error rate, any dependence.
	Holm Adjustment = iota
	// Bonferroni: min(1, m p). Familywise error rate, any dependence.
	Bonferroni
	// Sidak (Šidák 1967): 1 - (1-p)^m. Familywise error rate for
	// independent tests (or positively orthant dependent ones).
	Sidak
	// Hochberg (1988), step-up: min over j >= i of min(1, (m-j+1) p(j)).
	// Familywise error rate for independent or positively dependent tests.
	Hochberg
	// Hommel (1988): the closed test of Simes's local tests, max over the
	// subsets I containing the hypothesis of min over j of |I| p(j:I)/j.
	// Familywise error rate under the conditions of Simes's test; rejects
	// everything Hochberg rejects.
	Hommel
	// BenjaminiHochberg (1995), step-up: min over j >= i of min(1, m p(j)/j).
	// False discovery rate, independent or positively dependent tests.
	BenjaminiHochberg
	// BenjaminiYekutieli (2001): the Benjamini-Hochberg values times
	// sum_{l=1}^m 1/l, capped at 1. False discovery rate, any dependence.
	BenjaminiYekutieli
)

var adjustmentNames = enum.New[Adjustment]("test.Adjustment", []string{"Holm", "Bonferroni", "Sidak", "Hochberg", "Hommel", "Benjamini-Hochberg", "Benjamini-Yekutieli"}, map[string]Adjustment{"bh": BenjaminiHochberg, "by": BenjaminiYekutieli})

// String returns the published name.
func (a Adjustment) String() string { return adjustmentNames.String(a) }

// MarshalText encodes the value by its String form.
func (a Adjustment) MarshalText() ([]byte, error) { return adjustmentNames.MarshalText(a) }

// UnmarshalText decodes any spelling ParseAdjustment accepts.
func (a *Adjustment) UnmarshalText(b []byte) error { return adjustmentNames.UnmarshalText(a, b) }

// ParseAdjustment returns the value whose String() is s, ignoring case.
func ParseAdjustment(s string) (Adjustment, error) {
	return adjustmentNames.Parse("test.ParseAdjustment", s)
}

// AdjustmentValues lists the adjustments in the order of their values.
func AdjustmentValues() []Adjustment { return adjustmentNames.Values() }

// ControlsFDR reports whether the adjustment controls the false discovery
// rate (Benjamini-Hochberg, Benjamini-Yekutieli) rather than the
// familywise error rate (the others).
func (a Adjustment) ControlsFDR() bool { return a == BenjaminiHochberg || a == BenjaminiYekutieli }

// checkAdjustment validates an adjustment for function fn.
func checkAdjustment(fn string, a Adjustment) error {
	if a < 0 || !adjustmentNames.Valid(a) {
		return argerr.Invalid(fn, "method", int(a), "is not a multiplicity adjustment")
	}
	return nil
}

// AdjustPValues returns the adjusted p-values of p by method, in the order
// of p (see the Adjustment constants for the formulas). An adjusted p-value
// is the smallest family-level alpha at which the procedure rejects that
// hypothesis; it is never below the raw p-value and never above 1.
//
// p may have any length (an empty slice gives an empty result); values 0
// and 1 and ties are allowed, and tied p-values get equal adjusted values.
// Each p[i] must lie in [0, 1] (NaN is rejected, naming its index). p is
// not modified. The result is freshly allocated; AdjustPValuesInto writes
// into a caller's slice.
//
// Cost: O(m) after an O(m) radix sort of the p-values (64-bit keys), for
// every method including Hommel, whose closed Simes test is evaluated by
// an upper envelope of lines and a sweep with a heap (O(m log m)) instead
// of the quadratic loop over subset sizes (Wright 1992). Memory O(m)
// (BenchmarkAdjust measures a million p-values). ctx is checked every
// 65536 elements; on cancellation the error wraps ctx.Err().
//
// Accuracy: each adjusted value is a product or quotient of a p-value by
// an integer (or 1 - (1-p)^m by log1p/expm1 for Sidak), so within a few
// ulps.
//
// Sources: Holm S (1979), Scand J Statist 6:65-70; Šidák Z (1967), JASA
// 62:626-633; Hochberg Y (1988), Biometrika 75:800-802; Hommel G (1988),
// Biometrika 75:383-386; Wright SP (1992), Biometrics 48:1005-1013
// (adjusted p-values); Benjamini Y, Hochberg Y (1995), JRSS B 57:289-300;
// Benjamini Y, Yekutieli D (2001), Ann Statist 29:1165-1188.
func AdjustPValues(ctx context.Context, p []float64, method Adjustment) ([]float64, error) {
	out := make([]float64, len(p))
	if err := adjustInto(ctx, "test.AdjustPValues", out, p, method); err != nil {
		return nil, err
	}
	return out, nil
}

// AdjustPValuesInto is AdjustPValues writing into dst, which must have the
// length of p (dst may be p itself). On error dst is left unspecified.
func AdjustPValuesInto(ctx context.Context, dst, p []float64, method Adjustment) error {
	const fn = "test.AdjustPValuesInto"
	if len(dst) != len(p) {
		return argerr.Invalid(fn, "dst", len(dst), "must have the length of p ("+strconv.Itoa(len(p))+")")
	}
	return adjustInto(ctx, fn, dst, p, method)
}

// Adjusted is the outcome of Adjust: the adjusted p-values of a family and
// the decisions at a family-level alpha.
type Adjusted struct {
	// Method is the adjustment.
	Method Adjustment `json:"method"`
	// Alpha is the family-level significance level of the decisions: the
	// familywise error rate or, for Benjamini-Hochberg and
	// Benjamini-Yekutieli, the false discovery rate.
	Alpha float64 `json:"alpha"`
	// AdjustedPValues are the adjusted p-values in the order of the input.
	AdjustedPValues []float64 `json:"adjusted_p_values"`
	// Reject[i] is true when hypothesis i is rejected: adjusted p <= Alpha.
	Reject []bool `json:"reject"`
	// Rejections is the number of rejected hypotheses.
	Rejections int `json:"rejections"`
	// Warnings lists conditions that weaken the decisions.
	Warnings []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the result with non-finite floats as strings.
func (r Adjusted) MarshalJSON() ([]byte, error) {
	type plain Adjusted
	return jsonfloat.Marshal(plain(r))
}

// UnmarshalJSON decodes what MarshalJSON writes, non-finite numbers
// included.
func (r *Adjusted) UnmarshalJSON(b []byte) error {
	type plain Adjusted
	return jsonfloat.Unmarshal(b, (*plain)(r))
}

// Adjust adjusts the p-values p by method (see AdjustPValues) and decides
// each hypothesis at the family-level alpha (0 means 0.05): hypothesis i
// is rejected when its adjusted p-value is at most alpha, which is the
// same decision as the step-down, step-up or closed procedure itself.
// Errors: as AdjustPValues, and alpha outside (0, 1).
func Adjust(ctx context.Context, p []float64, alpha float64, method Adjustment) (Adjusted, error) {
	const fn = "test.Adjust"
	if alpha == 0 {
		alpha = 0.05
	}
	if !(alpha > 0 && alpha < 1) {
		return Adjusted{}, argerr.Invalid(fn, "alpha", alpha, "must lie strictly between 0 and 1 (0 means 0.05)")
	}
	adj := make([]float64, len(p))
	if err := adjustInto(ctx, fn, adj, p, method); err != nil {
		return Adjusted{}, err
	}
	r := Adjusted{Method: method, Alpha: alpha, AdjustedPValues: adj, Reject: make([]bool, len(p))}
	for i, q := range adj {
		if q <= alpha {
			r.Reject[i] = true
			r.Rejections++
		}
	}
	switch method {
	case Sidak:
		r.Warnings = append(r.Warnings, "Sidak assumes independent (or positively orthant dependent) tests")
	case Hochberg, Hommel:
		r.Warnings = append(r.Warnings, method.String()+" assumes independent or positively dependent tests (the conditions of Simes's test)")
	case BenjaminiHochberg:
		r.Warnings = append(r.Warnings, "Benjamini-Hochberg controls the false discovery rate, not the familywise error rate, and assumes independent or positively dependent tests")
	case BenjaminiYekutieli:
		r.Warnings = append(r.Warnings, "Benjamini-Yekutieli controls the false discovery rate, not the familywise error rate")
	}
	return r, nil
}

// checkEvery is how many elements the adjustment loops handle between two
// looks at the context.
const checkEvery = 1 << 16

func adjustInto(ctx context.Context, fn string, dst, p []float64, method Adjustment) error {
	if err := checkAdjustment(fn, method); err != nil {
		return err
	}
	for i, v := range p {
		if !(v >= 0 && v <= 1) {
			return argerr.Invalid(fn, "p["+strconv.Itoa(i)+"]", v, "is not a p-value in [0, 1]")
		}
	}
	m := len(p)
	if m == 0 {
		return nil
	}
	if err := argerr.Canceled(fn, ctx); err != nil {
		return err
	}
	fm := float64(m)
	switch method {
	case Bonferroni:
		for i, v := range p {
			dst[i] = math.Min(1, fm*v)
		}
		return nil
	case Sidak:
		for i, v := range p {
			dst[i] = sidak(v, fm)
		}
		return nil
	}
	order, err := sortOrder(ctx, fn, p)
	if err != nil {
		return err
	}
	// s[j] is the j-th smallest p-value (0-based); the adjusted values are
	// computed in sorted order into a, then scattered.
	s := make([]float64, m)
	for j, i := range order {
		s[j] = p[i]
	}
	a := make([]float64, m)
	switch method {
	case Holm:
		run := 0.0
		for j, v := range s {
			run = math.Max(run, math.Min(1, float64(m-j)*v))
			a[j] = run
		}
	case Hochberg:
		run := 1.0
		for j := m - 1; j >= 0; j-- {
			run = math.Min(run, float64(m-j)*s[j])
			a[j] = run
		}
	case BenjaminiHochberg, BenjaminiYekutieli:
		c := 1.0
		if method == BenjaminiYekutieli {
			c = harmonic(m)
		}
		run := 1.0
		for j := m - 1; j >= 0; j-- {
			run = math.Min(run, c*fm*s[j]/float64(j+1))
			a[j] = run
		}
	case Hommel:
		if err := hommelSorted(ctx, fn, s, a); err != nil {
			return err
		}
	}
	if err := argerr.Canceled(fn, ctx); err != nil {
		return err
	}
	for j, i := range order {
		dst[i] = a[j]
	}
	return nil
}

// sidak returns 1 - (1-p)^m without cancellation for small p.
func sidak(p, m float64) float64 {
	if p == 1 {
		return 1
	}
	return math.Min(1, -math.Expm1(m*math.Log1p(-p)))
}

// harmonic returns sum_{l=1}^m 1/l, summed from the small terms up.
func harmonic(m int) float64 {
	if m > 1<<20 {
		// Euler-Maclaurin: ln m + gamma + 1/(2m) - 1/(12 m^2), error below 1e-25.
		x := float64(m)
		return math.Log(x) + 0.57721566490153286061 + 1/(2*x) - 1/(12*x*x)
	}
	h := 0.0
	for l := m; l >= 1; l-- {
		h += 1 / float64(l)
	}
	return h
}

// FamilyLevel returns the confidence level each of m intervals needs so
// that all m cover their parameters together with probability at least
// level:
//
//	Bonferroni: 1 - (1 - level)/m   (any dependence between the intervals)
//	Sidak:      level^(1/m)         (independent intervals)
//
// Other adjustments have no such per-interval level and are refused; for
// intervals reported only for hypotheses selected by a false-discovery
// procedure see SelectedLevel. Errors: level outside (0, 1), m < 1, an
// adjustment other than Bonferroni or Sidak. Cost O(1).
//
// Sources: Dunn OJ (1961), JASA 56:52-64; Šidák Z (1967), JASA 62:626-633.
func FamilyLevel(level float64, m int, method Adjustment) (float64, error) {
	const fn = "test.FamilyLevel"
	if !(level > 0 && level < 1) {
		return 0, argerr.Invalid(fn, "level", level, "must lie strictly between 0 and 1")
	}
	if m < 1 {
		return 0, argerr.Invalid(fn, "m", m, "must be at least 1")
	}
	switch method {
	case Bonferroni:
		return 1 - (1-level)/float64(m), nil
	case Sidak:
		return 1 + math.Expm1(math.Log(level)/float64(m)), nil
	}
	return 0, argerr.Invalid(fn, "method", method.String(), "has no per-interval level; use Bonferroni or Sidak")
}

// SelectedLevel returns the level of the intervals reported for the
// selected of m parameters (for example those a Benjamini-Hochberg
// procedure rejected) so that the expected proportion of non-covering
// intervals among those reported, the false coverage-statement rate, is
// at most 1 - level:
//
//	1 - selected (1 - level) / m
//
// (with selected = 0 it returns level). Errors: level outside (0, 1),
// m < 1, selected outside 0..m. Source: Benjamini Y, Yekutieli D (2005),
// False discovery rate-adjusted multiple confidence intervals for selected
// parameters, JASA 100:71-81.
func SelectedLevel(level float64, selected, m int) (float64, error) {
	const fn = "test.SelectedLevel"
	if !(level > 0 && level < 1) {
		return 0, argerr.Invalid(fn, "level", level, "must lie strictly between 0 and 1")
	}
	if m < 1 {
		return 0, argerr.Invalid(fn, "m", m, "must be at least 1")
	}
	if selected < 0 || selected > m {
		return 0, argerr.Invalid(fn, "selected", selected, "must lie in 0..m = "+strconv.Itoa(m))
	}
	if selected == 0 {
		return level, nil
	}
	return 1 - float64(selected)*(1-level)/float64(m), nil
}

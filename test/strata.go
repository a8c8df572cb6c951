package test

import (
	"context"
	"fmt"
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/onesample"
	"github.com/kofnlab/kofn/internal/strata"
	"github.com/kofnlab/kofn/interval"
)

// CMHOptions are the options of CMH; the zero value is the two-sided
// asymptotic Cochran-Mantel-Haenszel test without continuity correction.
type CMHOptions struct {
	// Alternative about the common odds ratio against 1: Higher when
	// group 1's odds are higher in every stratum, Lower when lower.
	Alternative Alternative
	// Exact selects the exact conditional test: the distribution of the
	// sum of the strata's first cells given every stratum's margins.
	Exact bool
	// Rule is the exact test's two-sided rule on the conditional
	// distribution (PointProbability, the zero value, as Fisher's test,
	// or Central).
	Rule TwoSidedRule
	// MidP halves the probability of the observed sum (exact test only).
	MidP bool
	// Correction subtracts 1/2 from |sum (a_i - E a_i)| (asymptotic test
	// only; the correction of Mantel and Haenszel 1959).
	Correction bool
	// Level is the confidence level of the exact test's interval for the
	// common odds ratio; 0 means 0.95.
	Level float64
}

// CMH tests conditional independence across K strata (H0: the odds ratio
// is 1 in every stratum) against a common odds ratio above or below 1.
//
// Asymptotic (Mantel and Haenszel 1959; Cochran 1954): with a_i the first
// cell of stratum i, E_i = n1_i m_i / n_i and
// V_i = n1_i n2_i m_i (n_i - m_i) / (n_i^2 (n_i - 1)) (m_i = a_i + c_i),
//
//	X2 = (|sum a_i - sum E_i| - cc)^2 / sum V_i,   1 degree of freedom,
//
// cc = 1/2 with Correction; one-sided p-values refer the signed root to
// the normal. Exact: S = sum a_i given every stratum's margins has the
// convolution of the strata's hypergeometric distributions; one-sided
// p-values are its tails, the two-sided one follows Rule as Fisher's test
// does (mid-p halves the probability of the outcomes exactly as extreme;
// the convolution of hypergeometric distributions is log-concave, so the
// point-probability rule's region is an interval), and Interval is the exact conditional interval of the
// common odds ratio that inverts the same test
// (interval.CommonExactConditional), with the conditional MLE.
//
// Result: Statistic is the chi-square (asymptotic) or S ("sum of first
// cells", exact); Estimate the Mantel-Haenszel common odds ratio
// (asymptotic) or the conditional MLE (exact); Null 1. A warning is added
// when the Breslow-Day test with Tarone's correction rejects homogeneity
// of the odds ratios at 0.05 (the common odds ratio then summarises
// strata that disagree), and when the asymptotic test rests on small
// counts (sum of V_i below 5, common practice).
//
// Errors: no strata, a bad count, an unknown alternative, MidP with the
// asymptotic test or Correction with the exact one, a conditional support
// above 200,000 sums (ErrTooLarge; the asymptotic test answers at that
// size), a cancelled ctx.
//
// Sources: Cochran WG (1954), Biometrics 10:417-451; Mantel N, Haenszel W
// (1959), JNCI 22:719-748; Agresti A (2002), Categorical Data Analysis,
// 2nd ed., sections 6.3 and 6.7.
func CMH(ctx context.Context, ts []interval.Stratum, opt CMHOptions) (Result, error) {
	const fn = "test.CMH"
	if err := strata.Check(fn, ts); err != nil {
		return Result{}, err
	}
	if err := checkAlt(fn, opt.Alternative); err != nil {
		return Result{}, err
	}
	if opt.MidP && !opt.Exact {
		return Result{}, argerr.Invalid(fn, "MidP", "true", "applies to the exact test only; set Exact")
	}
	if opt.Rule != PointProbability && opt.Rule != Central {
		return Result{}, argerr.Invalid(fn, "Rule", int(opt.Rule), "is not a two-sided rule of the exact stratified test; use PointProbability or Central")
	}
	if opt.Correction && opt.Exact {
		return Result{}, argerr.Invalid(fn, "Correction", "true", "applies to the asymptotic test only")
	}
	lvl, err := level(fn, opt.Level)
	if err != nil {
		return Result{}, err
	}
	if ctx == nil {
		ctx = context.Background()
	}
	var r Result
	if opt.Exact {
		c, err := strata.NewConditional(ctx, fn, ts)
		if err != nil {
			return Result{}, err
		}
		lp := onesample.LogPValueOf(c.NewNull(), c.Lo, c.Hi(), c.Obs, opt.Rule, opt.MidP, opt.Alternative)
		name := "exact conditional CMH"
		if opt.Alternative == TwoSided {
			name += " " + opt.Rule.String()
		}
		method := interval.CommonExactConditional
		if opt.MidP {
			name += " mid-p"
			method = interval.CommonExactConditionalMidP
			r.Warnings = append(r.Warnings, "mid-p value: not guaranteed to keep the size at or below alpha")
		}
		r = withWarnings(newResult(name, opt.Alternative, lp), r.Warnings)
		r.Statistic = Statistic{Name: "sum of first cells", Value: float64(c.Obs)}
		tail := 1 - lvl
		if opt.Alternative == TwoSided {
			tail /= 2
		}
		lo, hi := 0.0, math.Inf(1)
		if opt.Alternative != Lower && c.Obs > c.Lo {
			lo = c.Limit(tail, opt.MidP, true)
		}
		if opt.Alternative != Higher && c.Obs < c.Hi() {
			hi = c.Limit(tail, opt.MidP, false)
		}
		r.Estimate = c.MLE()
		r.Interval = invertedInterval(lo, hi, r.Estimate, lvl, opt.Alternative, method.String(), "common odds ratio")
	} else {
		var d, v float64
		for _, t := range ts {
			n1, n2 := float64(t.N1), float64(t.N2)
			n, m := n1+n2, float64(t.K1+t.K2)
			if n < 2 {
				continue
			}
			d += float64(t.K1) - n1*m/n
			v += n1 * n2 * m * (n - m) / (n * n * (n - 1))
		}
		name := "Cochran-Mantel-Haenszel"
		if opt.Correction {
			name += " with continuity correction"
			d = math.Copysign(math.Max(0, math.Abs(d)-0.5), d)
		}
		z := 0.0
		if d != 0 {
			z = d / math.Sqrt(v)
		}
		r = newResult(name, opt.Alternative, logZP(z, opt.Alternative))
		r.Statistic = Statistic{Name: "chi-square", Value: z * z}
		m := strata.MH(ts)
		r.Estimate = m.R / m.S
		if m.R == 0 && m.S == 0 {
			r.Warnings = append(r.Warnings, "no stratum has a discordant product (a d or b c): the Mantel-Haenszel odds ratio is undefined")
		}
		if v == 0 {
			r = setP(r, 0)
			r.Statistic.Value = 0
			r.Warnings = append(r.Warnings, "no stratum has variation in both margins: the data carry no information on the odds ratio (p-value 1)")
		} else if v < 5 {
			r.Warnings = append(r.Warnings, fmt.Sprintf("the variance of the sum of first cells is %.3g, below 5 (common practice asks for 5 or more); prefer the exact test", v))
		}
	}
	r.Null = 1
	if len(ts) > 1 {
		if bd, err := breslowDay(ts, true); err == nil && bd.PValue < 0.05 {
			r.Warnings = append(r.Warnings, fmt.Sprintf("the strata disagree: Breslow-Day-Tarone test of equal odds ratios p = %.3g; a common odds ratio summarises strata that differ", bd.PValue))
		}
	}
	return r, nil
}

// withWarnings returns r with warnings appended.
func withWarnings(r Result, w []string) Result {
	r.Warnings = append(r.Warnings, w...)
	return r
}

// logMinusHalfP returns ln(e^a - e^b/2), the mid-p tail from a tail a and
// the observed point b.
func logMinusHalfP(a, b float64) float64 {
	d := math.Exp(b-a) / 2
	if d >= 1 {
		return math.Inf(-1)
	}
	return a + math.Log1p(-d)
}

// BreslowDayOptions are the options of BreslowDay; the zero value applies
// Tarone's correction.
type BreslowDayOptions struct {
	// NoTarone leaves out Tarone's (1985) correction, giving the original
	// Breslow-Day statistic (not a chi-square in general: Tarone showed
	// it is slightly too large).
	NoTarone bool
}

// BreslowDay tests homogeneity of the odds ratio across strata (H0: every
// stratum has the same odds ratio) by the Breslow-Day statistic at the
// Mantel-Haenszel common odds ratio psi:
//
//	X2_BD = sum (a_i - A_i)^2 / Var_i,   Var_i = 1 / (1/A_i + 1/B_i + 1/C_i + 1/D_i),
//
// A_i the first cell that gives stratum i odds ratio psi with its margins
// (the root of a quadratic inside the stratum's range), B_i, C_i, D_i the
// other cells it implies; Tarone's correction subtracts
// (sum a_i - sum A_i)^2 / sum Var_i. Referred to chi-square with K' - 1
// degrees of freedom, K' the strata whose first cell can vary.
//
// Result: Statistic "chi-square"; Estimate the Mantel-Haenszel common odds
// ratio; Null 1 (the ratio of odds ratios). Warnings when a fitted cell is
// below 5 (common practice: the chi-square approximation is then poor) or
// when the common odds ratio is 0 or infinite (the test is then
// undefined; p-value 1).
//
// Errors: fewer than two strata, bad counts.
//
// Sources: Breslow NE, Day NE (1980), Statistical Methods in Cancer
// Research I, IARC, section 4.4; Tarone RE (1985), Biometrika 72:91-95.
func BreslowDay(ts []interval.Stratum, opt BreslowDayOptions) (Result, error) {
	const fn = "test.BreslowDay"
	if err := strata.Check(fn, ts); err != nil {
		return Result{}, err
	}
	if len(ts) < 2 {
		return Result{}, argerr.Invalid(fn, "strata", len(ts), "holds one stratum; homogeneity needs two or more")
	}
	return breslowDay(ts, !opt.NoTarone)
}

func breslowDay(ts []interval.Stratum, tarone bool) (Result, error) {
	m := strata.MH(ts)
	psi := m.R / m.S
	name := "Breslow-Day"
	if tarone {
		name += "-Tarone"
	}
	if !(psi > 0 && !math.IsInf(psi, 1)) {
		r := newResult(name, TwoSided, 0)
		r.Estimate, r.Null = psi, 1
		r.Statistic = Statistic{Name: "chi-square"}
		r.Warnings = append(r.Warnings, "the Mantel-Haenszel odds ratio is 0, infinite or undefined: homogeneity cannot be assessed (p-value 1)")
		return r, nil
	}
	var x2, dsum, vsum float64
	df := -1
	small := false
	for _, t := range ts {
		n1, n2 := float64(t.N1), float64(t.N2)
		m := float64(t.K1 + t.K2)
		lo, hi := math.Max(0, m-n2), math.Min(m, n1)
		if lo == hi {
			continue
		}
		df++
		A := fittedCell(n1, n2, m, psi, lo, hi)
		B, C, D := n1-A, m-A, n2-m+A
		v := 1 / (1/A + 1/B + 1/C + 1/D)
		a := float64(t.K1)
		x2 += (a - A) * (a - A) / v
		dsum += a - A
		vsum += v
		small = small || A < 5 || B < 5 || C < 5 || D < 5
	}
	if tarone && vsum > 0 {
		x2 -= dsum * dsum / vsum
	}
	x2 = math.Max(x2, 0)
	r := newResult(name, TwoSided, 0)
	if df >= 1 {
		r = newResult(name, TwoSided, logChiSquareSurvival(x2, df))
	} else {
		r.Warnings = append(r.Warnings, "fewer than two strata can vary: homogeneity cannot be assessed (p-value 1)")
	}
	r.Statistic = Statistic{Name: "chi-square", Value: x2}
	r.Estimate, r.Null = psi, 1
	if small {
		r.Warnings = append(r.Warnings, "a fitted cell is below 5 (common practice asks for 5 or more): the chi-square approximation may be poor")
	}
	return r, nil
}

// fittedCell returns the first cell A in (lo, hi) with
// A (n2 - m + A) / ((n1 - A)(m - A)) = psi: the root of
// (1 - psi) A^2 + (n2 - m + psi (n1 + m)) A - psi n1 m = 0 inside the
// range, computed without cancellation.
func fittedCell(n1, n2, m, psi, lo, hi float64) float64 {
	qa := 1 - psi
	qb := n2 - m + psi*(n1+m)
	qc := -psi * n1 * m
	var A float64
	if math.Abs(qa) < 1e-12*math.Abs(qb) {
		A = -qc / qb
	} else {
		disc := math.Sqrt(qb*qb - 4*qa*qc)
		q := -0.5 * (qb + math.Copysign(disc, qb))
		r1, r2 := q/qa, qc/q
		A = r1
		if !(r1 > lo && r1 < hi) {
			A = r2
		}
	}
	return math.Min(math.Max(A, lo), hi)
}

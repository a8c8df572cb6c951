package test

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/xmath"
)

// TrendOptions are the options of CochranArmitage; the zero value is the
// two-sided asymptotic test with scores 0, 1, 2, ...
type TrendOptions struct {
	// Scores are the ordered groups' scores (doses, levels); nil means
	// 0, 1, ..., k-1. The exact test needs whole-number scores.
	Scores []float64
	// Alternative: Higher when the proportion rises with the score.
	Alternative Alternative
	// Exact selects the exact conditional test given the total number of
	// successes.
	Exact bool
	// MidP halves the probability of the observed statistic (exact only).
	MidP bool
}

// MaxTrendStates bounds the exact trend test: the number of (successes,
// statistic) states of its dynamic programme.
const MaxTrendStates = 50_000_000

// CochranArmitage tests for a trend in proportions across k ordered
// groups, x_i successes of n_i at score t_i, against H0: equal
// proportions. With p = X/N the pooled proportion and t_bar = sum n_i t_i / N,
//
//	T = sum t_i (x_i - n_i p),   Var T = p (1 - p) sum n_i (t_i - t_bar)^2,
//	z = T / sqrt(Var T)
//
// (Cochran 1954; Armitage 1955); z^2 is the trend chi-square with 1
// degree of freedom, one-sided tests use z. The slope of the
// least-squares line of x_i/n_i on t_i weighted by n_i,
// b = T / sum n_i (t_i - t_bar)^2, is the Estimate. Exact: given the total
// X, the vector of x_i is multivariate hypergeometric and T's
// distribution (equivalently sum t_i x_i) is built by a dynamic programme
// over the groups on (successes so far, statistic so far), in log space;
// one-sided p-values are its tails, the two-sided p-value sums the
// outcomes with |T| at least the observed (relative tolerance 1e-7).
//
// Result: Statistic z ("z", asymptotic) or sum t_i x_i (exact); Null 0.
//
// Errors: fewer than two groups, bad counts, scores of the wrong length,
// non-finite or all-equal scores, non-whole scores with Exact, an exact
// problem above MaxTrendStates (ErrTooLarge; the asymptotic test answers
// there), a cancelled ctx.
//
// Sources: Cochran WG (1954), Biometrics 10:417-451; Armitage P (1955),
// Biometrics 11:375-386; Agresti A (2002), Categorical Data Analysis, 2nd
// ed., section 5.3.5.
func CochranArmitage(ctx context.Context, x, n []int64, opt TrendOptions) (Result, error) {
	const fn = "test.CochranArmitage"
	if len(x) != len(n) {
		return Result{}, argerr.Invalid(fn, "x", len(x), "values against "+argerr.Format(len(n))+" group sizes; give one count per group")
	}
	k := len(x)
	if k < 2 {
		return Result{}, argerr.Invalid(fn, "n", k, "groups; a trend needs two or more")
	}
	var X, N int64
	for i := range x {
		if err := argerr.KN(fn, "x["+argerr.Format(i)+"]", "n["+argerr.Format(i)+"]", x[i], n[i]); err != nil {
			return Result{}, err
		}
		if n[i] > binom.MaxN-N {
			return Result{}, argerr.TooLarge(fn, "n", n[i], "makes the total exceed 2^53")
		}
		X, N = X+x[i], N+n[i]
	}
	if err := checkAlt(fn, opt.Alternative); err != nil {
		return Result{}, err
	}
	t := opt.Scores
	if t == nil {
		t = make([]float64, k)
		for i := range t {
			t[i] = float64(i)
		}
	}
	if len(t) != k {
		return Result{}, argerr.Invalid(fn, "Scores", len(t), "scores for "+argerr.Format(k)+" groups")
	}
	for i, s := range t {
		if math.IsNaN(s) || math.IsInf(s, 0) {
			return Result{}, argerr.Invalid(fn, "Scores["+argerr.Format(i)+"]", s, "is not a finite number")
		}
		if opt.Exact && (s != math.Trunc(s) || math.Abs(s) > 1e6) {
			return Result{}, argerr.Invalid(fn, "Scores["+argerr.Format(i)+"]", s, "is not a whole number of at most 1e6 in magnitude, which the exact test needs")
		}
	}
	if opt.MidP && !opt.Exact {
		return Result{}, argerr.Invalid(fn, "MidP", "true", "applies to the exact test only; set Exact")
	}
	var tbar, ssq float64
	for i := range t {
		tbar += float64(n[i]) * t[i]
	}
	if N > 0 {
		tbar /= float64(N)
	}
	for i := range t {
		ssq += float64(n[i]) * (t[i] - tbar) * (t[i] - tbar)
	}
	if ssq == 0 && N > 0 {
		return Result{}, argerr.Invalid(fn, "Scores", fmtScores(t), "are equal across the groups with trials; a trend needs different scores")
	}
	p := 0.0
	if N > 0 {
		p = float64(X) / float64(N)
	}
	var T float64
	for i := range t {
		T += t[i] * (float64(x[i]) - float64(n[i])*p)
	}
	slope := T / ssq
	if X == 0 || X == N {
		r := newResult("Cochran-Armitage trend", opt.Alternative, 0)
		r.Statistic, r.Estimate = Statistic{Name: "z"}, 0
		r.Warnings = append(r.Warnings, "every trial is a success or every trial a failure: the data carry no information on a trend (p-value 1)")
		return r, nil
	}
	if !opt.Exact {
		z := T / math.Sqrt(p*(1-p)*ssq)
		r := newResult("Cochran-Armitage trend", opt.Alternative, logZP(z, opt.Alternative))
		r.Statistic, r.Estimate = Statistic{Name: "z", Value: z}, slope
		if e := math.Min(float64(X), float64(N-X)); e < 10 {
			r.Warnings = append(r.Warnings, "fewer than 10 successes or failures in all (common practice): prefer the exact test")
		}
		return r, nil
	}
	if ctx == nil {
		ctx = context.Background()
	}
	lp, stat, err := exactTrend(ctx, fn, x, n, t, X, opt)
	if err != nil {
		return Result{}, err
	}
	name := "exact conditional Cochran-Armitage trend"
	if opt.MidP {
		name += " mid-p"
	}
	r := newResult(name, opt.Alternative, lp)
	r.Statistic, r.Estimate = Statistic{Name: "sum of score x successes", Value: stat}, slope
	if opt.MidP {
		r.Warnings = append(r.Warnings, "mid-p value: not guaranteed to keep the size at or below alpha")
	}
	return r, nil
}

func fmtScores(t []float64) string {
	s := ""
	for i, v := range t {
		if i > 0 {
			s += ","
		}
		s += argerr.Format(v)
	}
	return s
}

// exactTrend returns the exact conditional log p-value of the trend test
// and the observed W = sum t_i x_i. Given X, P(x) = prod C(n_i, x_i) /
// C(N, X); the programme keeps, after each group, ln of the summed
// weights of every (successes so far, W so far) reached.
func exactTrend(ctx context.Context, fn string, x, n []int64, t []float64, X int64, opt TrendOptions) (float64, float64, error) {
	minT, maxT := t[0], t[0]
	for _, s := range t {
		minT, maxT = math.Min(minT, s), math.Max(maxT, s)
	}
	// Shift scores to start at 0 (the test is invariant to a shift).
	sc := make([]int64, len(t))
	var wObs int64
	span := int64(0)
	for i, s := range t {
		sc[i] = int64(s - minT)
		wObs += sc[i] * x[i]
		span += sc[i] * n[i]
	}
	if span > 0 && float64(X+1)*float64(min(span, X*int64(maxT-minT))+1) > MaxTrendStates {
		return 0, 0, argerr.TooLarge(fn, "n", X, "successes with these scores need more than 5e7 states; use the asymptotic test (Exact false)")
	}
	wMax := X * int64(maxT-minT)
	// state[s][w] as a flat slice of log weights.
	width := wMax + 1
	cur := make([]float64, (X+1)*width)
	for i := range cur {
		cur[i] = math.Inf(-1)
	}
	cur[0] = 0
	var used int64
	for g := range n {
		if err := argerr.Canceled(fn, ctx); err != nil {
			return 0, 0, err
		}
		next := make([]float64, len(cur))
		for i := range next {
			next[i] = math.Inf(-1)
		}
		lc := logChooseRow(n[g])
		for s := int64(0); s <= min(used, X); s++ {
			for w := int64(0); w < width; w++ {
				v := cur[s*width+w]
				if math.IsInf(v, -1) {
					continue
				}
				for j := int64(0); j <= n[g] && s+j <= X; j++ {
					nw := w + j*sc[g]
					if nw >= width {
						break
					}
					idx := (s+j)*width + nw
					next[idx] = xmath.LogAddExp(next[idx], v+lc[j])
				}
			}
		}
		used += n[g]
		cur = next
	}
	row := cur[X*width : (X+1)*width]
	total := math.Inf(-1)
	for _, v := range row {
		total = xmath.LogAddExp(total, v)
	}
	// Statistic T = W - X * mean score (shifted); "as extreme" by W's
	// distance from its mean for the two-sided test.
	var mean float64
	for w, v := range row {
		if !math.IsInf(v, -1) {
			mean += float64(w) * math.Exp(v-total)
		}
	}
	dObs := math.Abs(float64(wObs) - mean)
	lower, upper, two, point := math.Inf(-1), math.Inf(-1), math.Inf(-1), row[wObs]-total
	for w, v := range row {
		if math.IsInf(v, -1) {
			continue
		}
		lv := v - total
		if int64(w) <= wObs {
			lower = xmath.LogAddExp(lower, lv)
		}
		if int64(w) >= wObs {
			upper = xmath.LogAddExp(upper, lv)
		}
		if math.Abs(float64(w)-mean) >= dObs*(1-1e-7) {
			two = xmath.LogAddExp(two, lv)
		}
	}
	var lp float64
	switch opt.Alternative {
	case Lower:
		lp = lower
	case Higher:
		lp = upper
	default:
		lp = two
	}
	if opt.MidP {
		pt := point
		if opt.Alternative == TwoSided {
			// the outcomes exactly as far from the mean: the observed W and its mirror, if possible
			mir := int64(math.Round(2*mean)) - wObs
			if mir != wObs && mir >= 0 && mir < width && math.Abs(math.Abs(float64(mir)-mean)-dObs) <= 1e-7*math.Max(dObs, 1) {
				pt = xmath.LogAddExp(pt, row[mir]-total)
			}
		}
		lp = logMinusHalfP(lp, pt)
	}
	return math.Min(lp, 0), float64(wObs) + minT*float64(X), nil
}

// logChooseRow returns ln C(m, j) for j = 0..m.
func logChooseRow(m int64) []float64 {
	out := make([]float64, m+1)
	for j := int64(1); j <= m; j++ {
		out[j] = out[j-1] + math.Log(float64(m-j+1)) - math.Log(float64(j))
	}
	return out
}

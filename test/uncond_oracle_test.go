package test

import (
	"context"
	"math"
	"sort"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/onesample"
	"github.com/kofnlab/kofn/internal/xmath"
)

// This file keeps the row-by-row rejection-region code that Barnard and
// Boschloo used before the regions were held by margin (every table of
// the region visited, O(n1 n2) time and memory), unchanged but for the
// names, as the reference oracle of uncond_oracle_check_test.go.

// oldRegion is a rejection oldRegion of 2x2 tables (x1 of n1, x2 of n2): for
// each x1 a prefix [0, pre[x1]] and a suffix [suf[x1], n2] of x2 values,
// and, only where the ordering breaks Barnard's convexity condition,
// interior runs. Under an ordering that satisfies the condition every row
// is a prefix, a suffix or both, so the probability of the oldRegion at a
// nuisance value costs O(n1 + n2) tail sums.
type oldRegion struct {
	n1, n2   int
	pre, suf []int
	inner    [][3]int // {x1, a, b}: x2 in [a, b] strictly inside the row, in order of x1
	runAt    []int    // inner[runAt[x1]:runAt[x1+1]] are the runs of row x1 (nil without runs)
	in00     bool     // the table (0, 0) belongs to the oldRegion
	inNN     bool     // the table (n1, n2) belongs to the oldRegion
	lc1, lc2 []float64
}

// oldNewRegion builds the oldRegion {(x1, x2) : in(x1, x2)}, checking ctx once
// per row.
func oldNewRegion(ctx context.Context, fn string, n1, n2 int, in func(x1, x2 int) bool) (*oldRegion, error) {
	r := &oldRegion{n1: n1, n2: n2, pre: make([]int, n1+1), suf: make([]int, n1+1)}
	for x1 := 0; x1 <= n1; x1++ {
		if x1%64 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return nil, err
			}
		}
		a := 0
		for a <= n2 && in(x1, a) {
			a++
		}
		r.pre[x1] = a - 1
		b := n2
		for b >= a && in(x1, b) {
			b--
		}
		r.suf[x1] = b + 1
		for x2 := a; x2 <= b; x2++ {
			if !in(x1, x2) {
				continue
			}
			e := x2
			for e+1 <= b && in(x1, e+1) {
				e++
			}
			r.inner = append(r.inner, [3]int{x1, x2, e})
			x2 = e
		}
	}
	r.in00 = in(0, 0)
	r.inNN = in(n1, n2)
	if len(r.inner) > 0 {
		r.runAt = make([]int, n1+2)
		for _, run := range r.inner {
			r.runAt[run[0]+1]++
		}
		for x1 := 1; x1 <= n1+1; x1++ {
			r.runAt[x1] += r.runAt[x1-1]
		}
	}
	lg := oldLogFactorials(max(n1, n2))
	r.lc1 = oldLogChooseFrom(lg, n1)
	r.lc2 = oldLogChooseFrom(lg, n2)
	return r, nil
}

// oldLogFactorials returns ln x! for x = 0..n (one lgamma per entry).
func oldLogFactorials(n int) []float64 {
	lg := make([]float64, n+1)
	for x := range lg {
		lg[x], _ = math.Lgamma(float64(x + 1))
	}
	return lg
}

// oldLogChooseFrom returns ln C(n, x) for x = 0..n from a table of ln x! that
// reaches at least n (absolute error about 1e-13 at n = 2000 from lgamma,
// far below what the p-value needs).
func oldLogChooseFrom(lg []float64, n int) []float64 {
	c := make([]float64, n+1)
	for x := range c {
		c[x] = lg[n] - lg[x] - lg[n-x]
	}
	return c
}

// oldScratch holds the buffers of one evaluation of a oldRegion's probability.
type oldScratch struct {
	l1, l2           []float64
	preM, preS       []float64
	sufM, sufS, term []float64
}

func oldNewScratch(n1, n2 int) *oldScratch {
	return &oldScratch{
		l1: make([]float64, n1+1), l2: make([]float64, n2+1),
		preM: make([]float64, n2+1), preS: make([]float64, n2+1),
		sufM: make([]float64, n2+1), sufS: make([]float64, n2+1),
		term: make([]float64, n1+1),
	}
}

// oldWindowCut is the depth, in natural-log units below the largest term, at
// which the windowed sum of logProbBound stops: terms of a binomial PMF
// below e^-60 of its mode (beyond about 11 standard deviations) are left
// out, and the error bound of the sum accounts for them.
const oldWindowCut = 60

// oldWindow fills e[x] = P(X = x) / P(X = mode) for X ~ Bin(n, pi),
// 0 < pi < 1, on the range [lo, hi] around the mode floor((n+1) pi)
// outside of which every term is below e^-oldWindowCut, and returns the range
// and m = ln P(X = mode). The terms come from the ratio of neighbours,
//
//	P(X = x+1) / P(X = x) = (n - x) pi / ((x + 1) (1 - pi)),
//
// one product per term (relative error about 2e-16 per step, so below 1e-11
// across the at most about 22 sqrt(n pi (1-pi)) + 2 terms of the range);
// the PMF is log-concave, so the range ends where the terms first fall
// below the cut.
func oldWindow(e, lc []float64, n int, pi, lp, lq float64) (lo, hi int, m float64) {
	mode := min(n, int(float64(n+1)*pi))
	m = lc[mode] + float64(mode)*lp + float64(n-mode)*lq
	cut := math.Exp(-oldWindowCut)
	r := pi / (1 - pi)
	e[mode] = 1
	lo, hi = mode, mode
	for v := 1.0; lo > 0; {
		v *= float64(lo) / (float64(n-lo+1) * r)
		if v < cut {
			break
		}
		lo--
		e[lo] = v
	}
	for v := 1.0; hi < n; {
		v *= float64(n-hi) * r / float64(hi+1)
		if v < cut {
			break
		}
		hi++
		e[hi] = v
	}
	return lo, hi, m
}

// logProb returns ln P(oldRegion) when X1 ~ Bin(n1, pi) and X2 ~ Bin(n2, pi)
// independently: the windowed sum of logProbBound where its error bound is
// below 1e-10 of the value, otherwise the sum over all tables of
// logProbFull.
func (r *oldRegion) logProb(w *oldScratch, pi float64) float64 {
	if v, exact := r.logProbBound(w, pi); exact {
		return v
	}
	return r.logProbFull(w, pi)
}

// logProbBound returns ln P(oldRegion) from the tables inside the windows of
// both PMFs (see oldWindow), in linear space scaled by the two modes, at a
// cost of O(sqrt(n1) + sqrt(n2)) plus the interior runs of the rows in the
// oldWindow. The terms left out add at most
//
//	D1 (S2 + D2) + S1 D2,  Di = (ni + 1) e^-oldWindowCut,
//
// to the scaled sum, where Si is the scaled sum of PMF i over its oldWindow.
// When that bound is at most 1e-10 of the sum, the value is returned with
// exact = true (relative error below 1e-10 from the oldWindow); otherwise
// exact = false and the value is an upper bound, ln(sum + bound).
func (r *oldRegion) logProbBound(w *oldScratch, pi float64) (v float64, exact bool) {
	switch {
	case pi <= 0:
		return oldLogIf(r.in00), true
	case pi >= 1:
		return oldLogIf(r.inNN), true
	}
	lp, lq := xmath.Log(pi), math.Log1p(-pi)
	lo1, hi1, m1 := oldWindow(w.term, r.lc1, r.n1, pi, lp, lq)
	lo2, hi2, m2 := oldWindow(w.sufM, r.lc2, r.n2, pi, lp, lq)
	// term and sufM hold the scaled PMFs of X1 and X2, preS[c] the sum of
	// the scaled PMF of X2 over [lo2, c] and sufS[c] over [c, hi2].
	acc := 0.0
	for x := lo2; x <= hi2; x++ {
		acc += w.sufM[x]
		w.preS[x] = acc
	}
	s2 := acc
	acc = 0
	for x := hi2; x >= lo2; x-- {
		acc += w.sufM[x]
		w.sufS[x] = acc
	}
	total, s1 := 0.0, 0.0
	for x1 := lo1; x1 <= hi1; x1++ {
		t := 0.0
		if c := min(r.pre[x1], hi2); c >= lo2 {
			t = w.preS[c]
		}
		if c := max(r.suf[x1], lo2); c <= hi2 {
			t += w.sufS[c]
		}
		if r.runAt != nil {
			for _, run := range r.inner[r.runAt[x1]:r.runAt[x1+1]] {
				for x2 := max(run[1], lo2); x2 <= min(run[2], hi2); x2++ {
					t += w.sufM[x2]
				}
			}
		}
		e := w.term[x1]
		s1 += e
		total += e * t
	}
	d1 := float64(r.n1+1) * math.Exp(-oldWindowCut)
	d2 := float64(r.n2+1) * math.Exp(-oldWindowCut)
	if lo1 == 0 && hi1 == r.n1 {
		d1 = 0
	}
	if lo2 == 0 && hi2 == r.n2 {
		d2 = 0
	}
	bound := d1*(s2+d2) + (s1+d1)*d2
	if bound <= 1e-10*total && total >= 1e-250 {
		return math.Min(0, m1+m2+math.Log(total)), true
	}
	if total+bound == 0 {
		return math.Inf(-1), false
	}
	return math.Min(0, m1+m2+math.Log(total+bound)), false
}

// logProbFull is ln P(oldRegion) summed over all tables. It first sums in
// linear space, each PMF scaled by its largest term (n1 + n2 exponentials
// and one logarithm); when the scaled sum falls below 1e-250, where terms
// that underflowed could matter, it repeats the sum in log space
// (logProbLog), where nothing underflows. Cost O(n1 + n2) plus the
// interior runs.
func (r *oldRegion) logProbFull(w *oldScratch, pi float64) float64 {
	switch {
	case pi <= 0:
		return oldLogIf(r.in00)
	case pi >= 1:
		return oldLogIf(r.inNN)
	}
	lp, lq := xmath.Log(pi), math.Log1p(-pi)
	m1, m2 := math.Inf(-1), math.Inf(-1)
	for x := 0; x <= r.n1; x++ {
		w.l1[x] = r.lc1[x] + float64(x)*lp + float64(r.n1-x)*lq
		m1 = math.Max(m1, w.l1[x])
	}
	for x := 0; x <= r.n2; x++ {
		w.l2[x] = r.lc2[x] + float64(x)*lp + float64(r.n2-x)*lq
		m2 = math.Max(m2, w.l2[x])
	}
	// preS[c] = sum of the scaled PMF of X2 over [0, c], sufS[c] over [c, n2].
	acc := 0.0
	for x := 0; x <= r.n2; x++ {
		w.sufM[x] = math.Exp(w.l2[x] - m2) // scaled PMF, kept for the interior runs
		acc += w.sufM[x]
		w.preS[x] = acc
	}
	acc = 0
	for x := r.n2; x >= 0; x-- {
		acc += w.sufM[x]
		w.sufS[x] = acc
	}
	for x1 := 0; x1 <= r.n1; x1++ {
		t := 0.0
		if c := r.pre[x1]; c >= 0 {
			t = w.preS[c]
		}
		if c := r.suf[x1]; c <= r.n2 {
			t += w.sufS[c]
		}
		w.term[x1] = t
	}
	for _, run := range r.inner {
		for x2 := run[1]; x2 <= run[2]; x2++ {
			w.term[run[0]] += w.sufM[x2]
		}
	}
	total := 0.0
	for x1 := 0; x1 <= r.n1; x1++ {
		if t := w.term[x1]; t > 0 {
			total += math.Exp(w.l1[x1]-m1) * t
		}
	}
	if total >= 1e-250 {
		return math.Min(0, m1+m2+math.Log(total))
	}
	return r.logProbLog(w)
}

// logProbLog is logProbFull in log space, for w.l1 and w.l2 already filled:
// for each row the prefix and suffix tails of X2 come from cumulative sums
// held as (max, scaled sum) pairs, so nothing underflows.
func (r *oldRegion) logProbLog(w *oldScratch) float64 {
	// Running sums S = e^m s, one exponential per step.
	m, s := math.Inf(-1), 0.0
	for x := 0; x <= r.n2; x++ {
		m, s = oldAddScaled(m, s, w.l2[x])
		w.preM[x], w.preS[x] = m, s
	}
	m, s = math.Inf(-1), 0.0
	for x := r.n2; x >= 0; x-- {
		m, s = oldAddScaled(m, s, w.l2[x])
		w.sufM[x], w.sufS[x] = m, s
	}
	for x1 := 0; x1 <= r.n1; x1++ {
		t := math.Inf(-1)
		if c := r.pre[x1]; c >= 0 {
			t = w.preM[c] + math.Log(w.preS[c])
		}
		if c := r.suf[x1]; c <= r.n2 {
			t = onesample.LogAddExp(t, w.sufM[c]+math.Log(w.sufS[c]))
		}
		w.term[x1] = t
	}
	for _, run := range r.inner {
		t := w.term[run[0]]
		for x2 := run[1]; x2 <= run[2]; x2++ {
			t = onesample.LogAddExp(t, w.l2[x2])
		}
		w.term[run[0]] = t
	}
	mx := math.Inf(-1)
	for x1 := range w.term {
		w.term[x1] += w.l1[x1]
		mx = math.Max(mx, w.term[x1])
	}
	if math.IsInf(mx, -1) {
		return mx
	}
	sum := 0.0
	for _, t := range w.term {
		sum += math.Exp(t - mx)
	}
	return math.Min(0, mx+math.Log(sum))
}

// oldAddScaled adds e^l to the sum e^m s.
func oldAddScaled(m, s, l float64) (float64, float64) {
	switch {
	case math.IsInf(l, -1):
		return m, s
	case l <= m:
		return m, s + math.Exp(l-m)
	}
	return l, s*math.Exp(m-l) + 1
}

func oldLogIf(b bool) float64 {
	if b {
		return 0
	}
	return math.Inf(-1)
}

// supremum returns the largest ln P(oldRegion; pi) over pi in [lo, hi] and
// where it is attained. The function is a polynomial in pi whose peaks have
// widths of order sqrt(pi (1-pi) / (n1+n2)), so it is first evaluated on a
// grid equally spaced in arcsin(sqrt(pi)) with about 8 sqrt(n1+n2) points
// (at least 64), fine enough that no peak falls between grid points. Grid
// values come from the windowed sums of logProbBound (O(sqrt(n1) +
// sqrt(n2)) each); a point whose windowed sum is only an upper bound is
// summed in full only if that bound comes within 2% of the best value
// found, so the grid costs O(n1 + n2) in all. Every grid point that is a
// local maximum within 2% of the best (the first point of a flat run
// counting once) is then refined by golden-section search on its two
// neighbouring cells, to 1e-7 in pi (so the supremum is located to better
// than 1e-6), best candidates first and at most maxRefine of them. A grid
// value of ln 1 = 0 is the supremum itself and ends the search.
func (r *oldRegion) supremum(ctx context.Context, fn string, lo, hi float64) (logP, at float64, err error) {
	w := oldNewScratch(r.n1, r.n2)
	g := int(math.Max(64, 8*math.Sqrt(float64(r.n1+r.n2))))
	t0, t1 := math.Asin(math.Sqrt(lo)), math.Asin(math.Sqrt(hi))
	xs := make([]float64, g+1)
	vs := make([]float64, g+1)
	exact := make([]bool, g+1)
	for _, x := range []float64{lo, hi} {
		if v, _ := r.logProbBound(w, x); v >= 0 && (x == 0 || x == 1) {
			return 0, x, nil // the end point where the oldRegion is certain
		}
	}
	best, bestAt := math.Inf(-1), lo
	for i := 0; i <= g; i++ {
		if i%16 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return 0, 0, err
			}
		}
		s := math.Sin(t0 + (t1-t0)*float64(i)/float64(g))
		x := s * s
		switch i {
		case 0:
			x = lo
		case g:
			x = hi
		}
		xs[i] = x
		vs[i], exact[i] = r.logProbBound(w, x)
		if exact[i] && vs[i] > best {
			best, bestAt = vs[i], x
			if best >= 0 {
				return 0, x, nil
			}
		}
	}
	// A peak rises above its best grid point by well under 0.1% at this
	// grid density (measured: 0.04% at n1 = n2 = 100), so only grid maxima
	// within 2% of the best can hold the supremum. Upper bounds below that
	// cut are left as they are: they cannot hold the supremum and do not
	// change which points above the cut are local maxima.
	for i := 0; i <= g; i++ {
		if exact[i] || vs[i] < best-0.02 {
			continue
		}
		if i%16 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return 0, 0, err
			}
		}
		vs[i], exact[i] = r.logProbFull(w, xs[i]), true
		if vs[i] > best {
			best, bestAt = vs[i], xs[i]
		}
	}
	if best >= 0 {
		return 0, bestAt, nil
	}
	cut := best - 0.02
	var cand []int
	for i := 0; i <= g; i++ {
		if vs[i] < cut || (i > 0 && vs[i-1] >= vs[i]) || (i < g && vs[i+1] > vs[i]) {
			continue
		}
		cand = append(cand, i)
	}
	sort.Slice(cand, func(a, b int) bool { return vs[cand[a]] > vs[cand[b]] })
	if len(cand) > maxRefine {
		cand = cand[:maxRefine]
	}
	for _, i := range cand {
		if err := argerr.Canceled(fn, ctx); err != nil {
			return 0, 0, err
		}
		a, b := xs[max(i-1, 0)], xs[min(i+1, g)]
		x, v := goldenMax(func(p float64) float64 { return r.logProb(w, p) }, a, b, 1e-7)
		if v > best {
			best, bestAt = v, x
		}
	}
	return best, bestAt, nil
}

// oldFisherTable returns the log Fisher p-value of every table (x1, x2),
// indexed x1*(n2+1) + x2, under the alternative (two-sided by method m),
// from the hypergeometric PMF of x1 given s = x1 + x2 (log binomial
// coefficients from lgamma; the ordering needs them only to far better
// than the tolerance 1e-7 that decides ties). Cost O(n1 n2), with a sort
// per margin for the point-probability definition.
func oldFisherTable(ctx context.Context, fn string, n1, n2 int, alt Alternative, m TwoSidedRule) ([]float64, error) {
	lg := oldLogFactorials(n1 + n2)
	lc1, lc2, lcn := oldLogChooseFrom(lg, n1), oldLogChooseFrom(lg, n2), oldLogChooseFrom(lg, n1+n2)
	w := n2 + 1
	out := make([]float64, (n1+1)*w)
	lf := make([]float64, n1+1)
	lower := make([]float64, n1+1)
	upper := make([]float64, n1+1)
	sorted := make([]float64, 0, n1+1)
	cum := make([]float64, 0, n1+1)
	for s := 0; s <= n1+n2; s++ {
		if s%64 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return nil, err
			}
		}
		lo, hi := max(0, s-n2), min(n1, s)
		for x := lo; x <= hi; x++ {
			lf[x] = lc1[x] + lc2[s-x] - lcn[s]
		}
		if alt != Higher {
			mm, ss := math.Inf(-1), 0.0
			for x := lo; x <= hi; x++ {
				mm, ss = oldAddScaled(mm, ss, lf[x])
				lower[x] = math.Min(0, mm+math.Log(ss))
			}
		}
		if alt != Lower {
			mm, ss := math.Inf(-1), 0.0
			for x := hi; x >= lo; x-- {
				mm, ss = oldAddScaled(mm, ss, lf[x])
				upper[x] = math.Min(0, mm+math.Log(ss))
			}
		}
		if alt == TwoSided && m == PointProbability {
			sorted = append(sorted[:0], lf[lo:hi+1]...)
			sort.Float64s(sorted)
			cum = cum[:0]
			mm, ss := math.Inf(-1), 0.0
			for _, v := range sorted {
				mm, ss = oldAddScaled(mm, ss, v)
				cum = append(cum, math.Min(0, mm+math.Log(ss)))
			}
		}
		for x := lo; x <= hi; x++ {
			var v float64
			switch {
			case alt == Lower:
				v = lower[x]
			case alt == Higher:
				v = upper[x]
			case m == Central:
				v = math.Min(0, math.Ln2+math.Min(lower[x], upper[x]))
			default:
				j := sort.SearchFloat64s(sorted, lf[x]+logRelTol)
				v = cum[j-1] // sorted[j-1] <= lf[x] + tol, j >= 1 since lf[x] itself is there
				if j < len(sorted) && sorted[j] <= lf[x]+logRelTol {
					v = cum[j]
				}
			}
			out[x*w+s-x] = v
		}
	}
	return out, nil
}

// oldPValue is the p-value of Barnard (boschloo false) or Boschloo as the
// row-by-row code computed it, for n1, n2 >= 1: ln p, the nuisance value
// of the supremum and the observed statistic (z, or Boschloo's Fisher
// p-value). pf, when not nil, is Boschloo's oldFisherTable of the shape
// (computed once per shape by a sweep).
func oldPValue(k1, n1, k2, n2 int, opt UnconditionalOptions, boschloo bool, pf []float64) (lp, at, stat float64, err error) {
	ctx := context.Background()
	const fn = "oracle"
	var reg *oldRegion
	if boschloo {
		if pf == nil {
			if pf, err = oldFisherTable(ctx, fn, n1, n2, opt.Alternative, opt.Rule); err != nil {
				return 0, 0, 0, err
			}
		}
		w := n2 + 1
		obs := pf[k1*w+k2]
		thr := obs + logRelTol
		reg, err = oldNewRegion(ctx, fn, n1, n2, func(x1, x2 int) bool { return pf[x1*w+x2] <= thr })
		if err != nil {
			return 0, 0, 0, err
		}
		stat = math.Exp(obs)
	} else {
		obs := newZKey(k1, k2, n1, n2)
		var in func(x1, x2 int) bool
		switch opt.Alternative {
		case Lower:
			in = func(x1, x2 int) bool { return newZKey(x1, x2, n1, n2).le(obs) }
		case Higher:
			in = func(x1, x2 int) bool { return obs.le(newZKey(x1, x2, n1, n2)) }
		default:
			in = func(x1, x2 int) bool { return cmpAbs(newZKey(x1, x2, n1, n2), obs) >= 0 }
		}
		reg, err = oldNewRegion(ctx, fn, n1, n2, in)
		if err != nil {
			return 0, 0, 0, err
		}
		stat = obs.value(n1, n2)
	}
	lo, hi := 0.0, 1.0
	if g := opt.BergerBoos; g > 0 {
		s, n := int64(k1+k2), int64(n1+n2)
		lp := func(p float64) float64 { return binomialLogP(BinomialOptions{Rule: Central}, s, n, p) }
		lo, hi, _, _ = invert(lp, xmath.Log(g), float64(s)/float64(n), TwoSided, false)
		switch s {
		case 0:
			lo = 0
		case n:
			hi = 1
		}
	}
	lp, at, err = reg.supremum(ctx, fn, lo, hi)
	if err != nil {
		return 0, 0, 0, err
	}
	if g := opt.BergerBoos; g > 0 {
		lp = math.Min(0, xmath.LogAddExp(lp, xmath.Log(g)))
	}
	return lp, at, stat, nil
}

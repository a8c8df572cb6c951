package test

import (
	"context"
	"math"
	"sort"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/xmath"
)

// MaxUnconditionalTotal is the size limit of Barnard and Boschloo: the
// total n1 + n2 may not exceed it. Time and memory grow with the total
// alone, not with the number of tables (n1+1)(n2+1): memory O(n1 + n2),
// time about O((n1 + n2)^1.5) (see the tests' Cost paragraphs), so a test
// at the limit takes seconds; the context cancels it sooner.
const MaxUnconditionalTotal = 2_000_000

// UnconditionalOptions are the options of Barnard and Boschloo. The zero
// value is the two-sided test with the supremum over the whole range
// [0, 1] of the nuisance parameter.
type UnconditionalOptions struct {
	Alternative Alternative // Lower: p1 < p2; Higher: p1 > p2
	// BergerBoos is the gamma of the Berger-Boos restriction: the
	// supremum is taken over the (1 - gamma) Clopper-Pearson interval for
	// the common proportion from the pooled count, and gamma is added to
	// it (the p-value stays valid). 0 means no restriction; otherwise it
	// must lie in (0, 0.5); 0.001 is the common choice. Berger RL, Boos DD
	// (1994), P values maximised over a confidence set for the nuisance
	// parameter, JASA 89:1012-1016.
	BergerBoos float64
	// Rule is the two-sided rule of Fisher's p-value that orders the
	// tables in Boschloo's test (PointProbability or Central); Barnard
	// ignores it.
	Rule TwoSidedRule
}

// region is a rejection region of 2x2 tables (x1 of n1, x2 of n2) held by
// margin. Given the total S = X1 + X2 = s, X1 is hypergeometric under H0
// whatever the common proportion pi, and
//
//	P(region; pi) = sum over s of b(s; N, pi) W_s,  N = n1 + n2,
//
// where b is the Binomial(N, pi) PMF and W_s the hypergeometric
// probability of the region's tables with total s (the pi-free factor
// C(n1, x1) C(n2, x2) / C(N, s) of each table's probability). Both tests
// order the tables of one margin monotonically in x1 (Barnard's z is
// linear in x1 there; Fisher's p-values are tails, or unimodal in x1 for
// the two-sided definitions), so the region's tables of margin s are two
// tails of x1, [lo, a] and [b, hi], and W_s costs two hypergeometric tail
// sums. This holds whether or not the region is Barnard-convex across
// margins; Boschloo's two-sided point-probability ordering is not (its
// rows have interior runs), and needs no special case here.
type region struct {
	n1, n2 int
	lw     []float64 // ln W_s, s = 0..N (-Inf where margin s holds no region table)
	w      []float64 // W_s / max W: linear weights, 0 where they underflow
	lmax   float64   // ln max W
	e      []float64 // scratch: the scaled binomial PMF of a window
	lb     []float64 // scratch: ln b(s; N, pi) of a full sum
	// ctx, when set (by supremum), is checked every 16384 margins of a full
	// sum; stop holds its error once it is done, and full sums then return
	// -Inf at once.
	ctx  context.Context
	fn   string
	stop error
}

// cutFunc returns the region's tables of margin s, whose x1 support is
// lo..hi: x1 in [lo, a] or [b, hi], with a = lo-1 or b = hi+1 for an
// empty tail (a >= b-1 when the whole margin belongs to the region).
type cutFunc func(s, lo, hi int) (a, b int)

// newRegion builds the region margin by margin, checking ctx every 16
// margins: O(N) memory, and per margin the cut plus two hypergeometric
// tails (binom.Hyper.LogCDF and LogSurvival, accurate to about 1e-13).
func newRegion(ctx context.Context, fn string, n1, n2 int, cut cutFunc) (*region, error) {
	N := n1 + n2
	r := &region{n1: n1, n2: n2, lw: make([]float64, N+1), w: make([]float64, N+1),
		e: make([]float64, N+1), lmax: math.Inf(-1)}
	for s := 0; s <= N; s++ {
		if s%16 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return nil, err
			}
		}
		lo, hi := max(0, s-n2), min(n1, s)
		a, b := cut(s, lo, hi)
		h := binom.Hyper{Total: int64(N), Successes: int64(n1), Draws: int64(s)}
		var v float64
		switch {
		case a >= b-1:
			v = 0
		default:
			v = math.Inf(-1)
			if a >= lo {
				v = h.LogCDF(int64(a))
			}
			if b <= hi {
				v = xmath.LogAddExp(v, h.LogSurvival(int64(b-1)))
			}
			v = math.Min(0, v)
		}
		r.lw[s] = v
		r.lmax = math.Max(r.lmax, v)
	}
	for s, v := range r.lw {
		if s%16384 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return nil, err
			}
		}
		r.w[s] = math.Exp(v - r.lmax)
	}
	return r, nil
}

// lastTrue returns the largest x in [lo, hi] with in(x) for a predicate
// true on a prefix of [lo, hi] (lo-1 when it is nowhere true), galloping
// from the guess g and then bisecting: O(log |answer - g|) calls.
func lastTrue(in func(int) bool, lo, hi, g int) int {
	t, f := lo-1, hi+1 // in(t) or t = lo-1; !in(f) or f = hi+1
	g = min(max(g, lo), hi)
	if in(g) {
		t = g
		for d := 1; t+d < f; d *= 2 {
			if !in(t + d) {
				f = t + d
				break
			}
			t += d
		}
	} else {
		f = g
		for d := 1; f-d > t; d *= 2 {
			if in(f - d) {
				t = f - d
				break
			}
			f -= d
		}
	}
	for f-t > 1 {
		m := t + (f-t)/2
		if in(m) {
			t = m
		} else {
			f = m
		}
	}
	return t
}

// firstTrue returns the smallest x in [lo, hi] with in(x) for a predicate
// true on a suffix (hi+1 when it is nowhere true), from the guess g.
func firstTrue(in func(int) bool, lo, hi, g int) int {
	return lastTrue(func(x int) bool { return !in(x) }, lo, hi, g-1) + 1
}

// windowCut is the depth, in natural-log units below the largest term, at
// which the windowed sum of logProbBound stops: terms of a binomial PMF
// below e^-60 of its mode (beyond about 11 standard deviations) are left
// out, and the error bound of the sum accounts for them.
const windowCut = 60

// window fills e[s] = b(s; n, pi) / b(mode; n, pi), 0 < pi < 1, on the
// range [lo, hi] around the mode floor((n+1) pi) outside of which every
// term is below e^-windowCut, and returns the range and m = ln b(mode)
// (binom.Dist.LogProb, accurate at any n). The terms come from the ratio
// of neighbours,
//
//	b(s+1) / b(s) = (n - s) pi / ((s + 1) (1 - pi)),
//
// one product per term (relative error about 2e-16 per step, so below 1e-12
// across the at most about 22 sqrt(n pi (1-pi)) + 2 terms of the range);
// the PMF is log-concave, so the range ends where the terms first fall
// below the cut.
func window(e []float64, n int, pi float64) (lo, hi int, m float64) {
	mode := min(n, int(float64(n+1)*pi))
	m = binom.Dist{N: int64(n), P: pi}.LogProb(int64(mode))
	cut := math.Exp(-windowCut)
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

// logProb returns ln P(region) at the common proportion pi: the windowed
// sum of logProbBound where its error bound is below 1e-10 of the value,
// otherwise the full sum of logProbFull.
func (r *region) logProb(pi float64) float64 {
	if v, exact := r.logProbBound(pi); exact {
		return v
	}
	return r.logProbFull(pi)
}

// logProbBound returns ln P(region) from the margins inside the window of
// the Binomial(N, pi) PMF (see window), in linear space scaled by the
// mode and by max W: O(sqrt(N)). The margins left out add at most
//
//	D = (N + 1) e^-windowCut
//
// to the scaled sum (each W_s / max W <= 1), and weights that underflowed
// less than 1e-300 each. When D is at most 1e-10 of the sum (and the sum
// is at least 1e-250), the value is returned with exact = true (relative
// error below 1e-10 from the window); otherwise exact = false and the
// value is an upper bound, ln(sum + D).
func (r *region) logProbBound(pi float64) (v float64, exact bool) {
	N := r.n1 + r.n2
	switch {
	case pi <= 0:
		return r.lw[0], true
	case pi >= 1:
		return r.lw[N], true
	}
	lo, hi, m := window(r.e, N, pi)
	total := 0.0
	for s := lo; s <= hi; s++ {
		total += r.e[s] * r.w[s]
	}
	d := 0.0
	if lo > 0 || hi < N {
		d = float64(N+1) * math.Exp(-windowCut)
	}
	if d <= 1e-10*total && total >= 1e-250 {
		return math.Min(0, m+r.lmax+math.Log(total)), true
	}
	if total+d == 0 {
		return math.Inf(-1), false
	}
	return math.Min(0, m+r.lmax+math.Log(total+d)), false
}

// logProbFull is ln P(region) summed over all margins in log space, where
// nothing underflows: ln b(s; N, pi) by the log of the neighbour ratio
// outward from the mode, re-anchored on binom.Dist.LogProb every 64
// margins (so its error stays a few units in the last place of the
// largest terms), then a scaled sum. Cost O(N): one logarithm and one
// exponential per margin.
func (r *region) logProbFull(pi float64) float64 {
	N := r.n1 + r.n2
	switch {
	case pi <= 0:
		return r.lw[0]
	case pi >= 1:
		return r.lw[N]
	}
	if r.stop != nil {
		return math.Inf(-1)
	}
	if r.lb == nil {
		r.lb = make([]float64, N+1)
	}
	d := binom.Dist{N: int64(N), P: pi}
	lr := xmath.Log(pi) - math.Log1p(-pi)
	mode := min(N, int(float64(N+1)*pi))
	r.lb[mode] = d.LogProb(int64(mode))
	for s := mode + 1; s <= N; s++ {
		if (s-mode)%16384 == 0 && r.canceled() {
			return math.Inf(-1)
		}
		if (s-mode)%64 == 0 {
			r.lb[s] = d.LogProb(int64(s))
		} else {
			r.lb[s] = r.lb[s-1] + math.Log(float64(N-s+1)/float64(s)) + lr
		}
	}
	for s := mode - 1; s >= 0; s-- {
		if (mode-s)%16384 == 0 && r.canceled() {
			return math.Inf(-1)
		}
		if (mode-s)%64 == 0 {
			r.lb[s] = d.LogProb(int64(s))
		} else {
			r.lb[s] = r.lb[s+1] + math.Log(float64(s+1)/float64(N-s)) - lr
		}
	}
	mx := math.Inf(-1)
	for s, v := range r.lw {
		r.lb[s] += v
		mx = math.Max(mx, r.lb[s])
	}
	if math.IsInf(mx, -1) {
		return mx
	}
	sum := 0.0
	for _, t := range r.lb {
		sum += math.Exp(t - mx)
	}
	return math.Min(0, mx+math.Log(sum))
}

// canceled reports whether r.ctx is done, recording its error in r.stop.
func (r *region) canceled() bool {
	if r.stop == nil && r.ctx != nil {
		r.stop = argerr.Canceled(r.fn, r.ctx)
	}
	return r.stop != nil
}

// supremum returns the largest ln P(region; pi) over pi in [lo, hi] and
// where it is attained. The function is a polynomial in pi whose peaks have
// widths of order sqrt(pi (1-pi) / (n1+n2)), so it is first evaluated on a
// grid equally spaced in arcsin(sqrt(pi)) with about 8 sqrt(n1+n2) points
// (at least 64), fine enough that no peak falls between grid points. Grid
// values come from the windowed sums of logProbBound (O(sqrt(n1 + n2))
// each); a point whose windowed sum is only an upper bound is
// summed in full only if that bound comes within 2% of the best value
// found, so the grid costs O(n1 + n2) in all. Every grid point that is a
// local maximum within 2% of the best (the first point of a flat run
// counting once) is then refined by golden-section search on its two
// neighbouring cells, to 1e-7 in pi (so the supremum is located to better
// than 1e-6), best candidates first and at most maxRefine of them. A grid
// value of ln 1 = 0 is the supremum itself and ends the search.
func (r *region) supremum(ctx context.Context, fn string, lo, hi float64) (logP, at float64, err error) {
	r.ctx, r.fn = ctx, fn
	g := int(math.Max(64, 8*math.Sqrt(float64(r.n1+r.n2))))
	t0, t1 := math.Asin(math.Sqrt(lo)), math.Asin(math.Sqrt(hi))
	xs := make([]float64, g+1)
	vs := make([]float64, g+1)
	exact := make([]bool, g+1)
	for _, x := range []float64{lo, hi} {
		if v, _ := r.logProbBound(x); v >= 0 && (x == 0 || x == 1) {
			return 0, x, nil // the end point where the region is certain
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
		vs[i], exact[i] = r.logProbBound(x)
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
		vs[i], exact[i] = r.logProbFull(xs[i]), true
		if r.canceled() {
			return 0, 0, r.stop
		}
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
		x, v := goldenMax(func(p float64) float64 { return r.logProb(p) }, a, b, 1e-7)
		if r.canceled() {
			return 0, 0, r.stop
		}
		if v > best {
			best, bestAt = v, x
		}
	}
	return best, bestAt, nil
}

// maxRefine is the largest number of grid maxima that supremum refines.
// Distinct peaks within 2% of the best are few (the region's probability
// is a sum of a few smooth tail probabilities); the cap only stops a
// function that is flat to rounding from costing a search per grid point.
const maxRefine = 32

// goldenMax maximizes f on [a, b] by golden-section search until the
// bracket is narrower than tol, returning the best point seen.
func goldenMax(f func(float64) float64, a, b, tol float64) (float64, float64) {
	const invPhi = 0.6180339887498949
	c := b - invPhi*(b-a)
	d := a + invPhi*(b-a)
	fc, fd := f(c), f(d)
	for b-a > tol {
		if fc >= fd {
			b, d, fd = d, c, fc
			c = b - invPhi*(b-a)
			fc = f(c)
		} else {
			a, c, fc = c, d, fd
			d = a + invPhi*(b-a)
			fd = f(d)
		}
	}
	if fc >= fd {
		return c, fc
	}
	return d, fd
}

// unconditional runs the common part of Barnard and Boschloo: argument
// checks, the region, the supremum (over the Berger-Boos interval when
// asked) and the result. statName names the ordering statistic, and
// emptyStat is its value for every table when a sample is empty.
//
// Two shapes have the exact answer p = 1 without a search:
//   - an empty sample (n1 = 0 or n2 = 0): then every table has the same
//     statistic (Barnard's Z numerator x1 n2 - x2 n1 is 0; Fisher's
//     hypergeometric law given the margin is a point mass, so every
//     Fisher p-value is 1), every table is as extreme as the observed one
//     and P(region) = 1 for every pi;
//   - the region holds the table (0, 0) and the range of pi reaches 0, or
//     holds (n1, n2) and the range reaches 1: that table has probability
//     1 at the end point, so the supremum is 1 there (supremum checks the
//     end points first). This covers no successes (or no failures) in both
//     samples, whose statistic is that of (0, 0) (or (n1, n2)) itself, and
//     every one-sided test whose observed table points the other way.
func unconditional(ctx context.Context, fn, method string, k1, n1, k2, n2 int64, opt UnconditionalOptions,
	statName string, emptyStat float64, build func(ctx context.Context) (*region, float64, error)) (Result, error) {
	if err := checkTwo(fn, k1, n1, k2, n2); err != nil {
		return Result{}, err
	}
	if err := checkAlt(fn, opt.Alternative); err != nil {
		return Result{}, err
	}
	if !(opt.BergerBoos == 0 || opt.BergerBoos > 0 && opt.BergerBoos < 0.5) {
		return Result{}, argerr.Invalid(fn, "BergerBoos", opt.BergerBoos, "must be 0 (no restriction) or lie in (0, 0.5); 0.001 is usual")
	}
	if opt.Rule != PointProbability && opt.Rule != Central {
		return Result{}, argerr.Invalid(fn, "Rule", int(opt.Rule), "is not a two-sided rule of Fisher's test; use PointProbability or Central")
	}
	if n1 > MaxUnconditionalTotal-n2 {
		return Result{}, argerr.TooLarge(fn, "n1", n1, "plus n2 = "+argerr.Format(n2)+" exceeds MaxUnconditionalTotal = "+argerr.Format(int64(MaxUnconditionalTotal))+", the size limit of the unconditional tests; use Fisher or an asymptotic test")
	}
	if ctx == nil {
		ctx = context.Background()
	}
	if opt.BergerBoos > 0 {
		method += " (Berger-Boos)"
	}
	var lp, at, stat float64
	if n1 == 0 || n2 == 0 {
		stat = emptyStat // p = 1 exactly, attained at every pi; 0 reported
	} else {
		reg, s, err := build(ctx)
		if err != nil {
			return Result{}, err
		}
		stat = s
		lo, hi := 0.0, 1.0
		if g := opt.BergerBoos; g > 0 {
			s, n := k1+k2, n1+n2
			lp := func(p float64) float64 { return binomialLogP(BinomialOptions{Rule: Central}, s, n, p) }
			lo, hi, _, _ = invert(lp, xmath.Log(g), float64(s)/float64(n), TwoSided, false)
			switch s {
			case 0:
				lo = 0 // the Clopper-Pearson interval of 0 successes starts at 0
			case n:
				hi = 1
			}
		}
		lp, at, err = reg.supremum(ctx, fn, lo, hi)
		if err != nil {
			return Result{}, err
		}
		if g := opt.BergerBoos; g > 0 {
			lp = math.Min(0, xmath.LogAddExp(lp, xmath.Log(g))) // ln min(1, p + gamma)
		}
	}
	res := newResult(method, opt.Alternative, lp)
	res.Statistic = Statistic{Name: statName, Value: stat}
	res.Estimate = diffEstimate(k1, n1, k2, n2)
	res.Nuisance = &Nuisance{At: at}
	switch {
	case n1 == 0 || n2 == 0:
		res.Warnings = append(res.Warnings, "an empty sample: the data carry no information on p1 - p2")
	case k1+k2 == 0:
		res.Warnings = append(res.Warnings, "no successes in either sample: the data carry no information on p1 - p2, and p = 1")
	case k1 == n1 && k2 == n2:
		res.Warnings = append(res.Warnings, "no failures in either sample: the data carry no information on p1 - p2, and p = 1")
	}
	return res, nil
}

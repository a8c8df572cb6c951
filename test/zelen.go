package test

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/strata"
	"github.com/kofnlab/kofn/internal/xmath"
	"github.com/kofnlab/kofn/interval"
)

// MaxZelenCells bounds the tables the exact homogeneity test builds
// before its search: for every stratum, one entry per possible sum of the
// first cells of the strata after it (the number of strata times the
// conditional support, at most). At the limit they take 72 MB and a few
// tenths of a second to build; ZelenExact refuses larger problems with
// ErrTooLarge before starting.
const MaxZelenCells = 3_000_000

// MaxZelenWork bounds the work of the exact homogeneity test twice: the
// convolution steps that build its tables (counted before starting, about
// a second at the limit) and the nodes of its search (counted as it runs;
// about two seconds), each answered by ErrTooLarge. The context is
// checked every 4096 convolution steps and every 1024 nodes, so a
// cancelled call returns within a few milliseconds.
const MaxZelenWork = 50_000_000

// zelenTol is the relative tolerance of "no more probable than the
// observed configuration" (common practice; Fisher's test uses the same).
const zelenTol = 1e-7

// ZelenExact is the exact test of homogeneity of the odds ratio across
// strata (H0: every stratum has the same odds ratio) of Zelen (1971).
// Given every stratum's margins and the total S of the first cells,
// the strata's first cells x = (x_1, ..., x_K) have, under H0, the
// distribution
//
//	P(x | margins, S) = prod_i h_i(x_i) / sum_{y: sum y = S} prod_i h_i(y_i),
//
// h_i the central hypergeometric probability of stratum i's first cell
// (the common odds ratio cancels). The p-value is the probability of the
// configurations no more probable than the observed one (relative
// tolerance 1e-7, as Fisher's test).
//
// The configurations are not listed: a branch-and-bound search runs over
// the strata (a node is a stratum and the sum of the first cells before
// it), with tables built beforehand by convolution in log space for every
// stratum and every sum of the strata after it: the log of their total
// mass and the largest and smallest log-probability of any completion. A
// node whose completions all lie at or below the observed probability adds
// its whole mass at once; one whose completions all lie above is dropped;
// only the others branch. The last two strata are settled at once: for a
// fixed sum their log probability is log-concave in the first of them, so
// the configurations at or below the threshold are two tails, found by
// binary search and added from cumulative tables. The search is exact but
// its work grows about geometrically with the strata when the observed
// configuration lies near the most probable ones (roughly eightfold for
// every two strata of 20 to 60 trials added; a dozen such strata take tens
// of milliseconds, sixteen seconds: BenchmarkZelenExact, and the README's
// measured figures); past MaxZelenWork nodes it stops with ErrTooLarge,
// and BreslowDay answers.
//
// Result: Statistic "conditional probability", the probability of the
// observed configuration given the margins and S; Estimate the
// Mantel-Haenszel common odds ratio (a warning and NaN when undefined);
// Null 1 (the ratio of the strata's odds ratios); Alternative TwoSided.
// Strata whose first cell cannot vary enter as constants; with fewer than
// two that vary the p-value is 1 with a warning.
//
// Errors: fewer than two strata, bad counts, tables above MaxZelenCells
// (ErrTooLarge before starting), a search above MaxZelenWork nodes
// (ErrTooLarge; BreslowDay answers at every size), a cancelled ctx.
// Memory: the tables, 24 bytes an entry (at most 72 MB), the last two
// strata's cumulative table (8 bytes per pair of their first cells), and
// O(K) for the search.
//
// Source: Zelen M (1971), The analysis of several 2 x 2 contingency
// tables, Biometrika 58:129-137; the network search as in Mehta CR, Patel
// NR (1983), A network algorithm for performing Fisher's exact test in
// r x c contingency tables, JASA 78:427-434.
func ZelenExact(ctx context.Context, ts []interval.Stratum) (Result, error) {
	const fn = "test.ZelenExact"
	if err := strata.Check(fn, ts); err != nil {
		return Result{}, err
	}
	if len(ts) < 2 {
		return Result{}, argerr.Invalid(fn, "strata", len(ts), "holds one stratum; homogeneity needs two or more")
	}
	if ctx == nil {
		ctx = context.Background()
	}
	// The strata whose first cell can vary, with their log probabilities.
	var lh [][]float64
	var lo, widths []int64
	var s int64
	for _, t := range ts {
		m := t.K1 + t.K2
		l, h := max(0, m-t.N2), min(m, t.N1)
		if l == h {
			continue
		}
		widths = append(widths, h-l)
		lo = append(lo, l)
		s += t.K1 - l
		lh = append(lh, nil)
	}
	// The tables' entries and the convolution steps that build them,
	// counted before starting.
	var cells, steps, suffix float64 = 1, 0, 1
	for i := len(lo) - 1; i >= 0; i-- {
		w := float64(widths[i] + 1)
		steps += w * suffix
		suffix += w - 1
		cells += suffix
	}
	if cells > MaxZelenCells {
		return Result{}, argerr.TooLarge(fn, "strata", len(ts), "need "+argerr.Format(cells)+
			" table entries for the exact homogeneity test, above MaxZelenCells = 3e6; use BreslowDay")
	}
	if steps > MaxZelenWork {
		return Result{}, argerr.TooLarge(fn, "strata", len(ts), "need "+argerr.Format(steps)+
			" convolution steps for the exact homogeneity test, above MaxZelenWork = 5e7; use BreslowDay")
	}
	r := Result{Method: "Zelen exact", Alternative: TwoSided, Null: 1}
	r.Statistic.Name = "conditional probability"
	m := strata.MH(ts)
	r.Estimate = m.R / m.S
	if !(r.Estimate > 0 && !math.IsInf(r.Estimate, 1)) {
		r.Warnings = append(r.Warnings, "the Mantel-Haenszel odds ratio is 0, infinite or undefined (no stratum with both discordant products); the exact test does not need it")
	}
	if len(lh) < 2 {
		r = setP(r, 0)
		r.Statistic.Value = 1
		r.Warnings = append(r.Warnings, "fewer than two strata can vary: homogeneity cannot be assessed (p-value 1)")
		return r, nil
	}
	var obs []int64
	j := 0
	for _, t := range ts {
		m := t.K1 + t.K2
		l, h := max(0, m-t.N2), min(m, t.N1)
		if l == h {
			continue
		}
		hy := binom.Hyper{Total: t.N1 + t.N2, Successes: t.N1, Draws: m}
		lh[j] = make([]float64, h-l+1)
		for x := l; x <= h; x++ {
			lh[j][x-l] = hy.LogProb(x)
		}
		obs = append(obs, t.K1-l)
		j++
	}
	z := zelen{ctx: ctx, fn: fn, lh: lh}
	if err := z.prepare(); err != nil {
		return Result{}, err
	}
	var lobs float64
	for i, x := range obs {
		lobs += lh[i][x]
	}
	z.thr = lobs + math.Log1p(zelenTol)
	z.work = 0
	z.total = z.mass[0][s]
	z.acc = math.Inf(-1)
	z.node(0, s, 0)
	if z.err != nil {
		return Result{}, z.err
	}
	r = setP(r, min(0, z.acc-z.total))
	r.Statistic.Value = math.Exp(min(0, lobs-z.total))
	return r, nil
}

// zelen is the state of one exact homogeneity search.
type zelen struct {
	ctx context.Context
	fn  string
	lh  [][]float64 // lh[i][x]: ln h_i of first cell lo_i + x
	// For the strata i.. K-1 and a sum u of their (shifted) first cells:
	// mass[i][u] = ln sum of prod h, hi[i][u] / low[i][u] the largest and
	// smallest ln prod h of any completion (-Inf where u is impossible).
	mass, hi, low [][]float64
	// The last two strata, for every sum u of their first cells: the
	// range lo..hi of the first of them, the (first) mode of
	// g_u(x) = lh[K-2][x] + lh[K-1][u-x] (log-concave in x), and at
	// off[u] + x - lo the log of the sum of e^g_u from lo up to x (x up to
	// the mode) or from x up to hi (x above it).
	pairLo, pairHi, pairMode, pairOff []int
	pairCum                           []float64
	thr                               float64 // count configurations with ln prod h <= thr
	total, acc                        float64 // ln of the normalising mass and of the counted mass
	work                              int64
	err                               error
}

// prepare builds the suffix tables by convolution, checking the context
// after every stratum.
func (z *zelen) prepare() error {
	k := len(z.lh)
	z.mass, z.hi, z.low = make([][]float64, k+1), make([][]float64, k+1), make([][]float64, k+1)
	z.mass[k], z.hi[k], z.low[k] = []float64{0}, []float64{0}, []float64{0}
	for i := k - 1; i >= 0; i-- {
		if err := argerr.Canceled(z.fn, z.ctx); err != nil {
			return err
		}
		a, b := z.lh[i], z.mass[i+1]
		n := len(a) + len(b) - 1
		ms, hs, ls := make([]float64, n), make([]float64, n), make([]float64, n)
		for u := range n {
			ms[u], hs[u], ls[u] = math.Inf(-1), math.Inf(-1), math.Inf(1)
		}
		for x, v := range a {
			for u, w := range b {
				if z.work++; z.work&0xfff == 0 {
					if err := argerr.Canceled(z.fn, z.ctx); err != nil {
						return err
					}
				}
				ms[x+u] = xmath.LogAddExp(ms[x+u], v+w)
				hs[x+u] = math.Max(hs[x+u], v+z.hi[i+1][u])
				ls[x+u] = math.Min(ls[x+u], v+z.low[i+1][u])
			}
		}
		z.mass[i], z.hi[i], z.low[i] = ms, hs, ls
	}
	return z.preparePair()
}

// preparePair builds the cumulative tables of the last two strata.
func (z *zelen) preparePair() error {
	k := len(z.lh)
	a, b := z.lh[k-2], z.lh[k-1]
	n := len(a) + len(b) - 1
	z.pairLo, z.pairHi, z.pairMode, z.pairOff = make([]int, n), make([]int, n), make([]int, n), make([]int, n)
	z.pairCum = make([]float64, 0, len(a)*len(b))
	for u := range n {
		if u&63 == 63 {
			if err := argerr.Canceled(z.fn, z.ctx); err != nil {
				return err
			}
		}
		lo, hi := max(0, u-len(b)+1), min(len(a)-1, u)
		mode := lo
		for x := lo + 1; x <= hi; x++ {
			if a[x]+b[u-x] > a[mode]+b[u-mode] {
				mode = x
			}
		}
		z.pairLo[u], z.pairHi[u], z.pairMode[u], z.pairOff[u] = lo, hi, mode, len(z.pairCum)
		z.pairCum = z.pairCum[:len(z.pairCum)+hi-lo+1]
		acc := math.Inf(-1)
		for x := lo; x <= mode; x++ {
			acc = xmath.LogAddExp(acc, a[x]+b[u-x])
			z.pairCum[z.pairOff[u]+x-lo] = acc
		}
		acc = math.Inf(-1)
		for x := hi; x > mode; x-- {
			acc = xmath.LogAddExp(acc, a[x]+b[u-x])
			z.pairCum[z.pairOff[u]+x-lo] = acc
		}
	}
	return nil
}

// pair adds the configurations of the last two strata with sum u whose
// log probability, with v before them, is at most the threshold: g_u
// rises up to its mode and falls after it, so they are the two tails,
// found by binary search and added from the cumulative tables.
func (z *zelen) pair(u int64, v float64) {
	k := len(z.lh)
	a, b := z.lh[k-2], z.lh[k-1]
	lo, hi, mode, off := z.pairLo[u], z.pairHi[u], z.pairMode[u], z.pairOff[u]
	c := z.thr - v
	g := func(x int) float64 { return a[x] + b[int(u)-x] }
	// Left: the last x in lo..mode with g(x) <= c (g increases there).
	l, r := lo, mode+1 // the first x with g(x) > c
	for l < r {
		m := int(uint(l+r) >> 1)
		if g(m) <= c {
			l = m + 1
		} else {
			r = m
		}
	}
	if l > lo {
		z.acc = xmath.LogAddExp(z.acc, v+z.pairCum[off+l-1-lo])
	}
	// Right: the first x in mode+1..hi with g(x) <= c (g falls there).
	l, r = mode+1, hi+1
	for l < r {
		m := int(uint(l+r) >> 1)
		if g(m) <= c {
			r = m
		} else {
			l = m + 1
		}
	}
	if l <= hi {
		z.acc = xmath.LogAddExp(z.acc, v+z.pairCum[off+l-lo])
	}
}

// node visits stratum i with the remaining strata's first cells to sum to
// u and the log probability v of the choices before it.
func (z *zelen) node(i int, u int64, v float64) {
	if z.err != nil || u < 0 || u >= int64(len(z.mass[i])) {
		return
	}
	z.work++
	if z.work&1023 == 0 {
		if err := argerr.Canceled(z.fn, z.ctx); err != nil {
			z.err = err
			return
		}
		if z.work > MaxZelenWork {
			z.err = argerr.TooLarge(z.fn, "strata", len(z.lh), "need a search of more than 5e7 nodes for the exact homogeneity test (MaxZelenWork); use BreslowDay")
			return
		}
	}
	if z.hi[i][u]+v <= z.thr {
		z.acc = xmath.LogAddExp(z.acc, v+z.mass[i][u])
		return
	}
	if z.low[i][u]+v > z.thr {
		return
	}
	if i == len(z.lh)-2 {
		z.pair(u, v)
		return
	}
	next := z.mass[i+1]
	for x, w := range z.lh[i] {
		rest := u - int64(x)
		if rest < 0 {
			break
		}
		if rest < int64(len(next)) {
			z.node(i+1, rest, v+w)
		}
	}
}

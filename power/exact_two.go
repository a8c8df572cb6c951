package power

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/onesample"
	"github.com/kofnlab/kofn/internal/xmath"
	"github.com/kofnlab/kofn/test"
)

// DefaultMaxN2 is the largest group-1 size the exact two-sample searches
// examine when MaxN is 0.
const DefaultMaxN2 int64 = 1000

// MaxTwoSampleTotal bounds the exact two-sample calculations: n1 + n2 may
// not exceed it (the test package's limit for its unconditional tests).
// Memory is O(n1 + n2) for the rejection region and the enumeration
// window; time grows faster (see TwoSamplePower), and ctx cancels.
const MaxTwoSampleTotal = test.MaxUnconditionalTotal

// twoRegion is the rejection region of a two-sample test with groups n1,
// n2, stored per margin s = x1 + x2 as the accepted x1 interval [a[i],
// b[i]], i = s - off (Fisher), or per row x1 = off + i as the accepted x2
// interval (z test). Margins or rows outside the stored ones reject
// nothing (see ends).
type twoRegion struct {
	n1, n2 int64
	bySum  bool
	inner  bool // rows store the rejected x2 interval instead of the accepted one
	off    int64
	a, b   []int64
	// win, when set, keeps the PMF windows prob needs (see winCache).
	win *winCache
	// ctx, set by buildRegion, is checked every 256 rows of prob; err
	// holds its error once it is done (prob then returns 0 at once).
	ctx context.Context
	fn  string
	err error
}

// ends returns the stored interval of margin or row i, or the one that
// rejects nothing outside the stored ones.
func (r *twoRegion) ends(i int64) (a, b int64) {
	if j := i - r.off; j >= 0 && j < int64(len(r.a)) {
		return r.a[j], r.b[j]
	}
	switch {
	case r.bySum:
		return 0, r.n1 + r.n2
	case r.inner:
		return 1, 0
	}
	return 0, r.n2
}

// twoScratch is the memory a sample-size search reuses from one group
// size to the next: the region's ends, the window cache and the tracker.
type twoScratch struct {
	a, b    []int64
	win     winCache
	tr      hyperTrack
	barnard barnardHint
}

// ends returns r's ends arrays for m margins or rows, from sc when it is
// not nil.
func (sc *twoScratch) ends(m int64) (a, b []int64) {
	if sc == nil {
		return make([]int64, m), make([]int64, m)
	}
	if int64(cap(sc.a)) < m {
		sc.a, sc.b = make([]int64, m), make([]int64, m)
	}
	return sc.a[:m], sc.b[:m]
}

// winCache keeps the PMF windows (see pmfWindow) of the few (n, p) pairs
// one group size needs: the span, the power and the size use the same ones.
type winCache struct {
	ent []winEntry
}

type winEntry struct {
	n  int64
	p  float64
	lo int64
	w  []float64
}

// window returns pmfWindow(n, p), computed once per reset.
func (c *winCache) window(n int64, p float64) (int64, []float64) {
	if c == nil {
		return pmfWindow(n, p, nil)
	}
	for _, e := range c.ent {
		if e.n == n && e.p == p {
			return e.lo, e.w
		}
	}
	lo, w := pmfWindow(n, p, nil)
	c.ent = append(c.ent, winEntry{n, p, lo, w})
	return lo, w
}

// reset forgets the windows.
func (c *winCache) reset() {
	if c != nil {
		clear(c.ent)
		c.ent = c.ent[:0]
	}
}

// canceled reports whether r.ctx is done, recording its error in r.err.
func (r *twoRegion) canceled() bool {
	if r.err == nil && r.ctx != nil {
		r.err = argerr.Canceled(r.fn, r.ctx)
	}
	return r.err != nil
}

// fisherRegion builds Fisher's rejection region at alpha: for each margin
// s the conditional (hypergeometric) acceptance interval of x1, decided by
// the test package's p-value (onesample.LogPValueOf on binom.Hyper, as
// test.Fisher computes it; point-probability two-sided definition), or
// by hyperTrack where it is certain to agree with it. The interval of s
// seeds the walk for s + 1. Only the margins of span sp are held (O(span)
// memory, from sc when not nil).
func fisherRegion(ctx context.Context, fn string, n1, n2 int64, alpha float64, alt test.Alternative, sp span, sc *twoScratch) (*twoRegion, error) {
	N := n1 + n2
	r := &twoRegion{n1: n1, n2: n2, bySum: true, off: sp.s0}
	r.a, r.b = sc.ends(max(sp.s1-sp.s0+1, 0)) // margins outside the span accept all (see ends)
	la := xmath.Log(alpha)
	oalt := onesample.TwoSided
	switch alt {
	case test.Higher:
		oalt = onesample.Higher
	case test.Lower:
		oalt = onesample.Lower
	}
	ga, gb := int64(0), int64(-1)
	// Decisions come from the tracker where they are certain and from the
	// test package's p-value otherwise (see hyperTrack); the tracker works
	// in linear space, so an alpha below 1e-250 takes every decision from
	// the test package.
	fast := alpha >= 1e-250
	tr := &hyperTrack{}
	if sc != nil {
		tr = &sc.tr
	}
	tr.floor = alpha
	for s := sp.s0; s <= sp.s1; s++ {
		if s&15 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return nil, err
			}
		}
		if s == sp.s0 {
			tr.at(n1, n2, s)
		} else {
			tr.next()
		}
		h := binom.Hyper{Total: N, Successes: n1, Draws: s}
		lo, hi := h.Support()
		if lo == hi {
			r.a[s-sp.s0], r.b[s-sp.s0] = lo, hi // one table: p = 1
			ga, gb = lo, hi
			continue
		}
		ok := func(x int64) bool {
			if fast {
				if accept, certain := tr.decide(x, alpha, alt); certain {
					return accept
				}
				tr.fallbacks++
			}
			return onesample.LogPValueOf(h, lo, hi, x, onesample.PointProbability, false, oalt) >= la
		}
		// certifyInterval only compares these values with each other: the
		// tracker's probabilities order the outcomes as their logarithms do.
		logProb := h.LogProb
		if fast {
			logProb = tr.orderKey
		}
		// As s grows by one both ends move up by about n1/N: start from the
		// previous interval, certified by two decisions when the test is
		// two-sided (see certifyInterval), walked otherwise.
		a, b, done := int64(0), int64(-1), false
		if alt == test.TwoSided {
			a, b, done = certifyInterval(ok, logProb, lo, hi, min(max(ga, lo), hi), min(max(gb, lo), hi))
		}
		if !done {
			peak := h.Mode() // where the two-sided p-value is largest
			switch alt {
			case test.Higher: // P(X1 >= x) falls with x
				peak = lo
			case test.Lower:
				peak = hi
			}
			a, b = acceptInterval(ok, lo, hi, peak, max(ga, lo), min(gb+1, hi))
		}
		r.a[s-sp.s0], r.b[s-sp.s0] = a, b
		ga, gb = a, b
	}
	return r, nil
}

// zRegion builds the rejection region of the pooled z test at alpha, row
// by row: for fixed x1 the pooled z decreases in x2, so the accepted x2
// form an interval, decided by test.TwoSample (z pooled) and seeded by the
// previous row. A table whose z lies clear of the normal critical value
// is decided by z alone (see zCut), without the call.
func zRegion(ctx context.Context, fn string, n1, n2 int64, alpha float64, alt test.Alternative, sp span, sc *twoScratch) (*twoRegion, error) {
	r := &twoRegion{n1: n1, n2: n2, off: sp.r0}
	r.a, r.b = sc.ends(max(sp.r1-sp.r0+1, 0)) // rows outside the span accept all (see ends)
	la := xmath.Log(alpha)
	opt := test.TwoSampleOptions{Method: test.ZPooled, Alternative: alt}
	zc := newZCut(alpha, alt)
	ga, gb := int64(0), n2
	for x1 := sp.r0; x1 <= sp.r1; x1++ {
		if x1&63 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return nil, err
			}
		}
		ok := func(x2 int64) bool {
			if accept, certain := zc.decide(pooledZ(x1, n1, x2, n2)); certain {
				return accept
			}
			res, err := test.TwoSample(x1, n1, x2, n2, opt)
			return err != nil || res.LogPValue >= la
		}
		// The p-value peaks where z = 0, x2 = x1 n2 / n1, for the two-sided
		// test; z falls as x2 grows, so at x2 = n2 (test.Higher) or 0 (test.Lower).
		peak := int64(math.Round(float64(x1) * float64(n2) / float64(n1)))
		switch alt {
		case test.Higher:
			peak = n2
		case test.Lower:
			peak = 0
		}
		a, b := acceptInterval(ok, 0, n2, peak, max(ga, 0), min(gb+1, n2))
		r.a[x1-sp.r0], r.b[x1-sp.r0] = a, b
		ga, gb = a, b
	}
	return r, nil
}

// zCut decides the pooled z test at alpha from the value of z: the test
// package's p-value is a normal tail of z (Phi(-z) for test.Higher, Phi(z)
// for test.Lower, 2 Phi(-|z|) two-sided), monotone in z, so the test
// accepts below the critical value c = z_(1-alpha) (test.Higher), above
// -c (test.Lower), or for |z| <= z_(1-alpha/2). A z within zCutGap
// (relative) of the critical value is left to the test package: the gap
// is some million times the error of the normal quantile and of the test
// package's normal tails, so a decision taken here is the one the test
// package takes. pooledZ computes z with the test package's formula.
type zCut struct {
	alt test.Alternative
	c   float64 // the critical value of z (or of |z|), NaN when unusable
}

const zCutGap = 1e-8

func newZCut(alpha float64, alt test.Alternative) zCut {
	c := -zq(alpha)
	if alt == test.TwoSided {
		c = -zq(alpha / 2)
	}
	if math.IsInf(c, 0) {
		c = math.NaN()
	}
	return zCut{alt: alt, c: c}
}

// decide returns the decision on a table whose pooled z is z (accept: the
// p-value is at least alpha) and whether it is certain.
func (zc zCut) decide(z float64) (accept, certain bool) {
	d := zc.c - z // accept when positive (test.Higher)
	switch zc.alt {
	case test.Lower:
		d = z + zc.c
	case test.TwoSided:
		d = zc.c - math.Abs(z)
	}
	g := zCutGap * math.Max(1, math.Abs(zc.c))
	switch {
	case d > g:
		return true, true
	case d < -g:
		return false, true
	}
	return false, false // within the gap, or c is NaN
}

// prob returns the probability of the rejection region when X1 ~
// Binomial(n1, p1) and X2 ~ Binomial(n2, p2), independent, summed over the
// tables inside both PMF windows (see pmfWindow; the mass left out is
// below 1e-14): O(sqrt(n1) + sqrt(n2)), each row of X1's window costing
// O(1) from running sums of X2's window. A region held by margin whose
// accepted interval [a[s], b[s]] has ends that never fall as s grows (as
// Fisher's do) rejects a prefix and a suffix of every row; one that breaks
// this is summed table by table, O(w1 w2) for window widths w (about 18
// standard deviations each).
func (r *twoRegion) prob(p1, p2 float64) float64 {
	l1, b1 := r.win.window(r.n1, p1)
	l2, b2 := r.win.window(r.n2, p2)
	h1, h2 := l1+int64(len(b1))-1, l2+int64(len(b2))-1
	sum := 0.0
	if r.bySum {
		if v, ok := r.probByRow(l1, b1, l2, b2); ok {
			return v
		}
		for x1 := l1; x1 <= h1; x1++ {
			if (x1-l1)%256 == 0 && r.canceled() {
				return 0
			}
			row := 0.0
			for x2 := l2; x2 <= h2; x2++ {
				if a, b := r.ends(x1 + x2); x1 < a || x1 > b {
					row += b2[x2-l2]
				}
			}
			sum += b1[x1-l1] * row
		}
		return min(max(sum, 0), 1)
	}
	// c2[k] = P(l2 <= X2 < l2 + k) over the window.
	c2 := make([]float64, len(b2)+1)
	for k, v := range b2 {
		c2[k+1] = c2[k] + v
	}
	// mass returns the window mass of X2 in [a, b].
	mass := func(a, b int64) float64 {
		a, b = max(a, l2), min(b, h2)
		if a > b {
			return 0
		}
		return c2[b-l2+1] - c2[a-l2]
	}
	for x1 := l1; x1 <= h1; x1++ {
		a, b := r.ends(x1)
		var rej float64
		switch {
		case r.inner && a <= b:
			rej = mass(a, b)
		case r.inner:
			rej = 0
		case a > b:
			rej = mass(0, r.n2)
		default:
			rej = mass(0, a-1) + mass(b+1, r.n2)
		}
		sum += b1[x1-l1] * rej
	}
	return min(max(sum, 0), 1)
}

// span is the part of a region that is built: rows x1 in [r0, r1], and
// margins s = x1 + x2 in [s0, s1] for a region held by margin.
type span struct{ r0, r1, s0, s1 int64 }

// spanOf returns the span that prob needs at the proportion pairs pts:
// the hull of the PMF windows (see pmfWindow) of each pair, rows from the
// first group's window and margins from the sum of both windows; the whole
// region when pts is nil. Outside its span a region built by buildRegion
// rejects nothing (prob never looks there).
func spanOf(n1, n2 int64, pts [][2]float64, win *winCache) span {
	if pts == nil {
		return span{0, n1, 0, n1 + n2}
	}
	sp := span{n1, 0, n1 + n2, 0}
	for _, p := range pts {
		l1, w1 := win.window(n1, p[0])
		l2, w2 := win.window(n2, p[1])
		h1, h2 := l1+int64(len(w1))-1, l2+int64(len(w2))-1
		sp.r0, sp.r1 = min(sp.r0, l1), max(sp.r1, h1)
		sp.s0, sp.s1 = min(sp.s0, l1+l2), max(sp.s1, h1+h2)
	}
	return sp
}

// buildRegion builds the rejection region of o.Test where prob will
// evaluate it at the proportion pairs pts (everywhere when pts is nil):
// O(sqrt(n1 + n2)) margins or rows instead of all of them, for Fisher's,
// the z test's and the margin tests' regions (Barnard's critical value
// depends on every table, and its region costs O(n1) once that is known).
func buildRegion(ctx context.Context, fn string, n1, n2 int64, alpha float64, o TwoSampleOptions, pts [][2]float64) (*twoRegion, error) {
	return buildRegionWith(ctx, fn, n1, n2, alpha, o, pts, &twoScratch{})
}

// buildRegionWith is buildRegion reusing the memory of sc, whose region
// and windows it overwrites: the region returned holds on to sc until the
// next call.
func buildRegionWith(ctx context.Context, fn string, n1, n2 int64, alpha float64, o TwoSampleOptions, pts [][2]float64, sc *twoScratch) (*twoRegion, error) {
	sc.win.reset()
	sp := spanOf(n1, n2, pts, &sc.win)
	var r *twoRegion
	var err error
	switch {
	case o.Hypothesis != Equality:
		r, err = marginRegion(ctx, fn, n1, n2, alpha, o.Hypothesis, o.Margin, sp)
	case o.Test == BarnardExactTest:
		r, err = barnardRegionFrom(ctx, fn, n1, n2, alpha, o.Alternative, &sc.barnard)
	case o.Test == ZPooledTest:
		r, err = zRegion(ctx, fn, n1, n2, alpha, o.Alternative, sp, sc)
	default:
		r, err = fisherRegion(ctx, fn, n1, n2, alpha, o.Alternative, sp, sc)
	}
	if err != nil {
		return nil, err
	}
	r.ctx, r.fn, r.win = ctx, fn, &sc.win
	return r, nil
}

func twoTestName(o TwoSampleOptions) string {
	switch o.Hypothesis {
	case NonInferiority:
		return "Miettinen-Nurminen score non-inferiority, margin " + argerr.Format(o.Margin)
	case Equivalence:
		return "Miettinen-Nurminen score equivalence (TOST), margin " + argerr.Format(o.Margin)
	}
	switch o.Test {
	case BarnardExactTest:
		return "Barnard exact unconditional, " + o.Alternative.String()
	case ZPooledTest:
		return "pooled z (enumerated), " + o.Alternative.String()
	}
	return "Fisher exact point-probability, " + o.Alternative.String()
}

func checkGroups(fn string, n1, n2 int64) error {
	if n1 < 1 {
		return argerr.Invalid(fn, "n1", n1, "must be at least 1")
	}
	if n2 < 1 {
		return argerr.Invalid(fn, "n2", n2, "must be at least 1")
	}
	if n1 > MaxTwoSampleTotal-n2 {
		return argerr.TooLarge(fn, "n1", n1, "plus n2 = "+argerr.Format(n2)+" exceeds MaxTwoSampleTotal = "+argerr.Format(int64(MaxTwoSampleTotal)))
	}
	return nil
}

// TwoSamplePower returns the exact power of the two-sample test o.Test
// (Fisher's exact, Barnard's exact unconditional, or the pooled z test) of
// H0: p1 = p2 with groups n1 and n2 at the true proportions p1, p2, by
// full enumeration of both binomials:
//
//	power = sum over rejected tables (x1, x2) of b(x1; n1, p1) b(x2; n2, p2).
//
// The rejection region is built from the test package's own decisions
// (reject when the p-value is below alpha): Fisher's per margin, by the
// conditional p-value of onesample.LogPValueOf on binom.Hyper as
// test.Fisher computes it; the z test per row by test.TwoSample; Barnard's
// by bisection on the value of the pooled z, each probe a call of
// test.Barnard on the table nearest the midpoint (found by binary searches
// per row, see barnardRegion). Size is the rejection probability at p1 = p2 = the
// pooled proportion (n1 p1 + n2 p2)/(n1 + n2) (the size of an exact
// unconditional test is at most alpha at every common proportion).
//
// With o.Hypothesis NonInferiority or Equivalence (margin o.Margin) the
// enumerated test is the test package's Miettinen-Nurminen score test
// with that margin (test.DifferenceMargin, one-sided at Alpha, or
// test.DifferenceEquivalence, two one-sided tests), o.Test being ignored,
// and Size is the rejection probability on the null boundary p1 = p2 - m
// (and p2 + m for equivalence) with p2 as planned, or at the boundary's
// nearest point inside [0, 1]^2 when that one leaves it (p2 < m: p1 = 0,
// p2 = m).
// Limits: n1 + n2 <= MaxTwoSampleTotal. Cost: memory O(n1 + n2); time
// O(sqrt(n1 + n2)) margins or rows of Fisher's and the z test's regions
// (those the binomial windows reach), each decided in O(1) from running
// hypergeometric tails (Fisher, see hyperTrack) or from the value of z
// (the z test, see zCut), the test package's own p-value deciding only
// the rare tables within 1e-9 (Fisher) or 1e-8 (z) of alpha's boundary;
// 10 to 40 p-values of test.Barnard for Barnard's region, then O(n1); then
// the sum over the tables inside both binomial windows by row, O(1) per
// row from running sums of X2's window (O(sqrt(n1) + sqrt(n2))). Measured
// times are in the README. ctx is checked while the region is built (and
// inside each test.Barnard call). Accuracy: absolute 1e-14 on the power.
func TwoSamplePower(ctx context.Context, n1, n2 int64, p1, p2 float64, o TwoSampleOptions) (ExactPower, error) {
	const fn = "power.TwoSamplePower"
	if err := checkGroups(fn, n1, n2); err != nil {
		return ExactPower{}, err
	}
	o.Ratio = 0
	s, err := o.setup(fn, p1, p2, false)
	if err != nil {
		return ExactPower{}, err
	}
	sz := sizePoints(n1, n2, p1, p2, s)
	reg, err := buildRegion(ctx, fn, n1, n2, s.alpha, o, append([][2]float64{{p1, p2}}, sz...))
	if err != nil {
		return ExactPower{}, err
	}
	pw, size := reg.prob(p1, p2), twoSize(reg, sz)
	if reg.err != nil {
		return ExactPower{}, reg.err
	}
	return ExactPower{
		Test: twoTestName(o), N: n1, Alpha: s.alpha,
		Power: pw, Size: size,
		AcceptLo: -1, AcceptHi: -1,
	}, nil
}

// TwoSampleN returns the group sizes for the exact power of o.Test to
// reach o.Power, searching n1 (with n2 = ceil(Ratio n1)) on the exact
// power of TwoSamplePower. Exact power has a sawtooth in n, so the result
// gives the first n1 reaching the target and the stable n1 from which
// every n1 through Horizon keeps it. Because each n costs a full
// enumeration, the scan starts at n1 = max(1, floor(N/2)), N the
// normal-approximation size with the CPS correction (exact sizes below
// half of it are not examined), and Horizon = First + max(10, First/4).
// Limits: n1 <= o.MaxN (default DefaultMaxN2) and n1 + n2 <=
// MaxTwoSampleTotal; ErrNoSolution when the target is not reached. ctx is
// checked throughout (inside every enumeration). Cost: one TwoSamplePower
// per n1 scanned, reusing one region's memory (O(sqrt(n1 + n2)) margins or
// rows held; O(n1) for Barnard) and, for Barnard, starting the search for
// each size's critical value at the previous size's. Fisher's test and the
// z test cost O(sqrt(n1 + n2)) margin updates per size scanned, so a
// search at some 18,000 per group (13,500 sizes) takes seconds; Barnard's
// costs some 6 to 9 test.Barnard calls per size scanned, so a Barnard
// search near 2,000 per group takes about a minute and grows faster than
// the group size beyond (cancellable).
// Measured times are in the README.
func TwoSampleN(ctx context.Context, p1, p2 float64, o TwoSampleOptions) (ExactSize, error) {
	const fn = "power.TwoSampleN"
	s, err := o.setup(fn, p1, p2, true)
	if err != nil {
		return ExactSize{}, err
	}
	limit, err := maxN(fn, o.MaxN, DefaultMaxN2, MaxTwoSampleTotal)
	if err != nil {
		return ExactSize{}, err
	}
	no := o
	no.Correction, no.Variance = CPS, PooledNull
	no.Alpha = s.alpha
	normal, err := TwoSampleNormalN(p1, p2, no)
	if err != nil {
		return ExactSize{}, err
	}
	start := max(1, normal.N/2)
	if start > limit {
		return ExactSize{}, argerr.NoSolution(fn, "the normal-approximation size "+argerr.Format(normal.N)+" is beyond twice MaxN = "+argerr.Format(limit))
	}
	n2Of := func(n1 int64) int64 { return ceilN(s.r * float64(n1)) }
	sizes := map[int64]float64{}
	sc := &twoScratch{} // one region's memory, reused from n1 to n1 + 1
	power := func(n1 int64) (float64, error) {
		n2 := n2Of(n1)
		if err := checkGroups(fn, n1, n2); err != nil {
			return 0, err
		}
		sz := sizePoints(n1, n2, p1, p2, s)
		reg, err := buildRegionWith(ctx, fn, n1, n2, s.alpha, o, append([][2]float64{{p1, p2}}, sz...), sc)
		if err != nil {
			return 0, err
		}
		sizes[n1] = twoSize(reg, sz)
		pw := reg.prob(p1, p2)
		return pw, reg.err
	}
	res, err := scanStable(ctx, fn, scan{start: start, maxN: limit, target: s.pw,
		horizon: func(first int64) int64 { return first + max(10, first/4) }}, power)
	if err != nil {
		return ExactSize{}, err
	}
	res.Test, res.Normal = twoTestName(o), normal
	res.Size = sizes[res.First]
	if res.Stable > 0 {
		res.Size = sizes[res.Stable]
	}
	return res, nil
}

// probByRow is prob for a region held by margin whose ends a[s] and b[s]
// never fall as s runs over the margins of the windows (ok false when they
// do). Then row x1 rejects x2 below c_b(x1) = min{s : b[s] >= x1} - x1
// (x1 > b[s] on a prefix of the margins) and from c_a(x1) = min{s : a[s] >
// x1} - x1 on (x1 < a[s] on a suffix), and both cuts never fall as x1
// grows. The row's rejected mass is a prefix sum plus a suffix sum of X2's
// window, each summed from its own end (positive terms only).
func (r *twoRegion) probByRow(l1 int64, b1 []float64, l2 int64, b2 []float64) (float64, bool) {
	h1, h2 := l1+int64(len(b1))-1, l2+int64(len(b2))-1
	s0, s1 := l1+l2, h1+h2
	if s0 < r.off || s1 >= r.off+int64(len(r.a)) {
		return 0, false // beyond the stored margins
	}
	ea, eb := r.a[s0-r.off:s1-r.off+1], r.b[s0-r.off:s1-r.off+1] // ea[i]: margin s0 + i
	for i := 1; i < len(ea); i++ {
		if ea[i] < ea[i-1] || eb[i] < eb[i-1] {
			return 0, false
		}
	}
	w := len(b2)
	// pre[k] = sum of b2[0:k]; suf[k] = sum of b2[k:w].
	pre := make([]float64, 2*(w+1))
	suf := pre[w+1:]
	for k, v := range b2 {
		pre[k+1] = pre[k] + v
	}
	for k := w - 1; k >= 0; k-- {
		suf[k] = suf[k+1] + b2[k]
	}
	sb, sa := s0, s0 // running min{s : b[s] >= x1} and min{s : a[s] > x1}
	sum := 0.0
	for x1 := l1; x1 <= h1; x1++ {
		if (x1-l1)%256 == 0 && r.canceled() {
			return 0, true
		}
		for sb <= s1 && eb[sb-s0] < x1 {
			sb++
		}
		for sa <= s1 && ea[sa-s0] <= x1 {
			sa++
		}
		// Rejected: x2 in [l2, sb-x1-1] and x2 in [sa-x1, h2], as window offsets.
		cb := min(max(sb-x1-l2, 0), int64(w))
		ca := min(max(sa-x1-l2, 0), int64(w))
		var row float64
		if cb >= ca {
			row = pre[w] // the two parts meet: the whole row
		} else {
			row = pre[cb] + suf[ca]
		}
		sum += b1[x1-l1] * row
	}
	return min(max(sum, 0), 1), true
}

// rejects reports whether the table (x1, x2) lies in the rejection region.
func (r *twoRegion) rejects(x1, x2 int64) bool {
	if r.bySum {
		a, b := r.ends(x1 + x2)
		return x1 < a || x1 > b
	}
	a, b := r.ends(x1)
	if r.inner {
		return x2 >= a && x2 <= b
	}
	return x2 < a || x2 > b
}

// marginRegion builds the rejection region of the test package's score
// tests with a margin m (Miettinen-Nurminen variance, the package
// default), row by row. Non-inferiority, test.DifferenceMargin with delta
// = -m, test.Higher: for fixed x1 the score z falls as x2 grows, so the
// accepted x2 form a suffix, found from x2 = n2. Equivalence,
// test.DifferenceEquivalence on (-m, m): the rejected x2 (equivalence
// shown) form an interval around x2 = x1 n2/n1. Each row is seeded by the
// previous one; the structure is checked table by table in the tests.
func marginRegion(ctx context.Context, fn string, n1, n2 int64, alpha float64, hyp Hypothesis, m float64, sp span) (*twoRegion, error) {
	r := &twoRegion{n1: n1, n2: n2, inner: hyp == Equivalence, a: make([]int64, n1+1), b: make([]int64, n1+1)}
	for x1 := range r.a { // reject nothing outside the span
		if r.inner {
			r.a[x1], r.b[x1] = 1, 0
		} else {
			r.a[x1], r.b[x1] = 0, n2
		}
	}
	la := xmath.Log(alpha)
	opt := test.MarginOptions{Alternative: test.Higher}
	ga, gb := int64(0), n2
	for x1 := sp.r0; x1 <= sp.r1; x1++ {
		if x1&63 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return nil, err
			}
		}
		var in func(x2 int64) bool // the stored interval's predicate
		peak := n2
		if hyp == Equivalence {
			in = func(x2 int64) bool {
				res, err := test.DifferenceEquivalence(x1, n1, x2, n2, -m, m, test.MarginOptions{})
				return err == nil && res.LogPValue < la
			}
			peak = int64(math.Round(float64(x1) * float64(n2) / float64(n1)))
		} else {
			in = func(x2 int64) bool {
				res, err := test.DifferenceMargin(x1, n1, x2, n2, -m, opt)
				return err != nil || res.LogPValue >= la
			}
		}
		a, b := acceptInterval(in, 0, n2, peak, max(ga, 0), min(gb+1, n2))
		r.a[x1], r.b[x1] = a, b
		if a <= b {
			ga, gb = a, b
		}
	}
	return r, nil
}

// sizePoints returns the proportion pairs (p1, p2) at which the attained
// size reported with an exact two-sample power is evaluated: the pooled
// proportion (n1 p1 + n2 p2)/(n1 + n2) for both groups for Equality; on
// the null boundary for margins, p1 = p2 - m (and p2 + m for
// equivalence) with p2 as planned, or the boundary's nearest point inside
// [0, 1]^2 when that one leaves it.
func sizePoints(n1, n2 int64, p1, p2 float64, s twoSetup) [][2]float64 {
	if s.hyp == Equality {
		pbar := (float64(n1)*p1 + float64(n2)*p2) / float64(n1+n2)
		return [][2]float64{{pbar, pbar}}
	}
	m := s.margin
	a1, a2 := p2-m, p2
	if a1 < 0 {
		a1, a2 = 0, m
	}
	pts := [][2]float64{{a1, a2}}
	if s.hyp == Equivalence {
		b1, b2 := p2+m, p2
		if b1 > 1 {
			b1, b2 = 1, 1-m
		}
		pts = append(pts, [2]float64{b1, b2})
	}
	return pts
}

// twoSize returns the attained size: the largest rejection probability of
// the region at the points of sizePoints.
func twoSize(reg *twoRegion, pts [][2]float64) float64 {
	size := 0.0
	for _, p := range pts {
		size = math.Max(size, reg.prob(p[0], p[1]))
	}
	return size
}

package test

import (
	"context"
	"math"
	"slices"
	"strconv"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/xmath"
)

// MaxFreemanHaltonWork is the number of steps (expanded states and
// evaluated final-column pairs) after which the exact k-sample test stops
// with ErrTooLarge rather than run for more than a few seconds. The
// exact test also refuses totals above 2^24 before starting.
const MaxFreemanHaltonWork = 100_000_000

// fhTol is the relative tolerance of "no more probable than the observed
// table" (common practice; the same as Fisher's test here).
const fhTol = 1e-7

// fh holds the state of one exact 2 x k computation (see EqualProportions).
type fh struct {
	ctx  context.Context
	fn   string
	n    []int64     // arm sizes, ascending
	w    [][]float64 // w[j][x] = ln(C(n_j, x) 2^-n_j)
	m    int         // columns 0..m-1 are expanded; m and m+1 are the final pair
	rest []int64     // rest[j] = n_j + ... + n_{m-1}
	// maxRem[j][u]: the largest sum of w over columns j..m-1 with total u;
	// remTot[j][u]: ln of the sum of exp(w) over them (Vandermonde).
	maxRem, remTot [][]float64
	T              float64 // ln of the observed table's weight
	c              float64 // threshold: tables with weight at most c count
	S              int64
	work           int64
	lin, log       float64 // counted weight / e^T: linear part, log part
	err            error
	// The final pair for the current remainder r.
	r                int64
	yLo, yHi, yMode  int64
	gL, rhoL         []float64 // y = yLo..yMode: g(y) increasing, rho = sum_{y' <= y} e^{g(y')-g(y)}
	gR, rhoR         []float64 // y = yHi down to yMode+1: g increasing along the slice
	gMax, gTot, gMin float64
	eL, eR           []float64 // e^(g - gMax) rho along gL and gR
}

// freemanHalton returns the log p-value of the exact test and the log
// conditional probability of the observed table.
func freemanHalton(ctx context.Context, fn string, x, n []int64, S, N int64, mid bool) (logP, logObs float64, err error) {
	if S == 0 || S == N {
		return 0, 0, nil
	}
	if N > 1<<24 {
		return 0, 0, &argerr.Error{Func: fn, Reason: "the sizes sum to " + strconv.FormatInt(N, 10) + " trials, above the exact test's limit of 2^24; use the Pearson chi-square or G test", Err: argerr.ErrTooLarge}
	}
	k := len(x)
	order := make([]int, k)
	for i := range order {
		order[i] = i
	}
	slices.SortStableFunc(order, func(a, b int) int { return int(n[a] - n[b]) })
	flip := 2*S > N // the test is symmetric in successes and failures
	f := &fh{ctx: ctx, fn: fn, n: make([]int64, k), w: make([][]float64, k), m: k - 2, S: S}
	xs := make([]int64, k)
	for i, j := range order {
		f.n[i], xs[i] = n[j], x[j]
		if flip {
			xs[i] = n[j] - x[j]
		}
	}
	if flip {
		f.S = N - S
	}
	for j := range f.n {
		f.w[j] = halfLogProbs(f.n[j], f.n[j])
		f.T += f.w[j][xs[j]]
	}
	logZ := halfDist(N).LogProb(f.S)
	logObs = math.Min(0, f.T-logZ)
	if err := f.prepare(); err != nil {
		return 0, 0, err
	}
	count := func(c float64) (float64, error) {
		f.c, f.lin, f.log = c, 0, math.Inf(-1)
		f.run()
		if f.err != nil {
			return 0, f.err
		}
		return xmath.LogAddExp(xmath.Log(f.lin), f.log) + f.T - logZ, nil
	}
	le, err := count(f.T + fhTol)
	if err != nil {
		return 0, 0, err
	}
	if !mid {
		return math.Min(0, le), logObs, nil
	}
	lt, err := count(f.T - fhTol)
	if err != nil {
		return 0, 0, err
	}
	return math.Min(0, xmath.LogAddExp(le, lt)-math.Ln2), logObs, nil
}

// halfDist returns the binomial distribution with n trials and P = 1/2.
func halfDist(n int64) binom.Dist { return binom.Dist{N: n, P: 0.5} }

// halfLogProbs returns ln(C(n, x) 2^-n) for x = 0..top.
func halfLogProbs(n, top int64) []float64 {
	d := halfDist(n)
	v := make([]float64, top+1)
	for x := range v {
		v[x] = d.LogProb(int64(x))
	}
	return v
}

// prepare computes the bounds and subtree totals of the expanded columns.
func (f *fh) prepare() error {
	m := f.m
	if m <= 0 {
		return nil
	}
	f.rest = make([]int64, m+1)
	for j := m - 1; j >= 0; j-- {
		f.rest[j] = f.rest[j+1] + f.n[j]
	}
	if int64(m)*f.rest[0] > 1<<26 {
		return &argerr.Error{Func: f.fn, Reason: "too many trials outside the two largest arms for the exact test; use the Pearson chi-square or G test", Err: argerr.ErrTooLarge}
	}
	f.maxRem = make([][]float64, m)
	f.remTot = make([][]float64, m)
	f.maxRem[m-1] = f.w[m-1]
	for j := m - 2; j >= 0; j-- {
		f.maxRem[j] = maxPlus(f.w[j], f.maxRem[j+1])
	}
	for j := 0; j < m; j++ {
		f.remTot[j] = halfLogProbs(f.rest[j], min(f.rest[j], f.S))
	}
	return nil
}

// maxPlus returns c[t] = max_{i+j=t} a[i] + b[j] for concave a and b: the
// increments of both are merged in decreasing order.
func maxPlus(a, b []float64) []float64 {
	c := make([]float64, len(a)+len(b)-1)
	i, j := 0, 0
	c[0] = a[0] + b[0]
	for t := 1; t < len(c); t++ {
		switch {
		case i == len(a)-1:
			j++
		case j == len(b)-1:
			i++
		case a[i+1]-a[i] >= b[j+1]-b[j]:
			i++
		default:
			j++
		}
		c[t] = a[i] + b[j]
	}
	return c
}

// margin is the allowance for rounding in the bounds: a subtree is taken
// whole only when its bound is below the threshold by more than this.
func (f *fh) margin() float64 { return 1e-9 * (1 + math.Abs(f.c)) }

// step counts work and looks at the context now and then.
func (f *fh) step() bool {
	f.work++
	if f.work&4095 == 0 {
		if err := argerr.Canceled(f.fn, f.ctx); err != nil {
			f.err = err
			return false
		}
		if f.work > MaxFreemanHaltonWork {
			f.err = &argerr.Error{Func: f.fn, Reason: "the exact test needs more than 1e8 steps (MaxFreemanHaltonWork) for this table; use the Pearson chi-square or G test", Err: argerr.ErrTooLarge}
			return false
		}
	}
	return f.err == nil
}

// addLog adds e^(l - T) to the log part of the count.
func (f *fh) addLog(l float64) { f.log = xmath.LogAddExp(f.log, l-f.T) }

// run counts the weight of the tables no heavier than f.c.
func (f *fh) run() {
	f.work = 0
	m := f.m
	if m == 0 {
		f.setPair(f.S)
		f.leaf(0)
		return
	}
	na, nb := f.n[m], f.n[m+1]
	lo, hi := max(0, f.S-na-nb), min(f.rest[0], f.S)
	bound := func(s int64) float64 { return f.maxRem[0][s] + f.pairMax(f.S-s) }
	a, b, ok := f.straddle(lo, hi, bound)
	tail := binom.Hyper{Total: f.rest[0] + na + nb, Successes: f.rest[0], Draws: f.S}
	if !ok {
		// Every table counts.
		f.addLog(halfDist(f.rest[0] + na + nb).LogProb(f.S))
		return
	}
	f.addOutside(halfDist(f.rest[0]+na+nb).LogProb(f.S), tail, lo, hi, a, b)
	for s := a; s <= b && f.err == nil; s++ {
		if m == 1 {
			// One leaf per s: its two tails from the hypergeometric
			// distribution directly, without tabulating the pair.
			if f.step() {
				f.leafTails(f.w[0][s], f.S-s)
			}
			continue
		}
		f.setPair(f.S - s)
		f.node(0, s, 0)
	}
}

// leafTails adds the final pair's tables of weight v + g(y) <= c for
// remainder r, where g(y) = w_a[y] + w_b[r-y] rises to the hypergeometric
// mode and falls after it: the two ends where g <= c - v are found by
// bisection and their probabilities are hypergeometric tails. Cost
// O(log n) plus two tail evaluations.
func (f *fh) leafTails(v float64, r int64) {
	na, nb := f.n[f.m], f.n[f.m+1]
	wa, wb := f.w[f.m], f.w[f.m+1]
	g := func(y int64) float64 { return wa[y] + wb[r-y] }
	yLo, yHi := max(0, r-nb), min(na, r)
	mode := min(max((r+1)*(na+1)/(na+nb+2), yLo), yHi)
	cv := f.c - v
	total := v + halfDist(na+nb).LogProb(r)
	h := binom.Hyper{Total: na + nb, Successes: na, Draws: r}
	if g(mode) <= cv {
		f.addLog(total) // every table of the pair counts
		return
	}
	// Left: the last y in [yLo, mode) with g(y) <= cv (g rises there).
	if g(yLo) <= cv {
		l, hh := yLo, mode-1 // g(l) <= cv; find the last such
		for l < hh {
			mid := l + (hh-l+1)/2
			if g(mid) <= cv {
				l = mid
			} else {
				hh = mid - 1
			}
		}
		f.addLog(total + h.LogCDF(l))
	}
	// Right: the first y in (mode, yHi] with g(y) <= cv (g falls there).
	if mode < yHi && g(yHi) <= cv {
		l, hh := mode+1, yHi // g(hh) <= cv; find the first such
		for l < hh {
			mid := l + (hh-l)/2
			if g(mid) <= cv {
				hh = mid
			} else {
				l = mid + 1
			}
		}
		f.addLog(total + h.LogSurvival(l-1))
	}
}

// straddle returns the interval [a, b] of lo..hi where bound(x) may exceed
// the threshold (bound is concave), or ok = false when it nowhere does.
func (f *fh) straddle(lo, hi int64, bound func(int64) float64) (a, b int64, ok bool) {
	// The mode of the concave bound by bisection on its increments.
	l, h := lo, hi
	for l < h {
		mid := l + (h-l)/2
		if bound(mid+1) > bound(mid) {
			l = mid + 1
		} else {
			h = mid
		}
	}
	thr := f.c - f.margin()
	if bound(l) <= thr {
		return 0, 0, false
	}
	a, b = l, l
	for a > lo && bound(a-1) > thr {
		a--
	}
	for b < hi && bound(b+1) > thr {
		b++
	}
	return a, b, true
}

// addOutside adds the weight e^total P(X < a or X > b) of the subtrees
// outside [a, b], every table of which counts; X ~ h on lo..hi.
func (f *fh) addOutside(total float64, h binom.Hyper, lo, hi, a, b int64) {
	if a > lo {
		f.addLog(total + h.LogCDF(a-1))
	}
	if b < hi {
		f.addLog(total + h.LogSurvival(b))
	}
}

// node expands column j with u successes left for columns j..m-1 and
// weight v so far.
func (f *fh) node(j int, u int64, v float64) {
	if !f.step() {
		return
	}
	if j == f.m-1 {
		f.leaf(v + f.w[j][u])
		return
	}
	lo, hi := max(0, u-f.rest[j+1]), min(f.n[j], u)
	wj, mr := f.w[j], f.maxRem[j+1]
	base := v + f.gMax
	bound := func(x int64) float64 { return base + wj[x] + mr[u-x] }
	total := v + f.remTot[j][u] + f.gTot
	a, b, ok := f.straddle(lo, hi, bound)
	if !ok {
		f.addLog(total)
		return
	}
	f.addOutside(total, binom.Hyper{Total: f.rest[j], Successes: f.n[j], Draws: u}, lo, hi, a, b)
	if j == f.m-2 {
		// The children are leaves: walk them from the mode outward.
		mode := a
		for x := a + 1; x <= b; x++ {
			if wj[x]+mr[u-x] > wj[mode]+mr[u-mode] {
				mode = x
			}
		}
		f.row(j, u, v, mode, a, -1)
		f.row(j, u, v, mode+1, b, +1)
		return
	}
	for x := a; x <= b && f.err == nil; x++ {
		f.node(j+1, u-x, v+wj[x])
	}
}

// row adds the leaves x = from, from+dir, ..., to of the node of column j
// (j = m-2) with u successes left and weight v, where the leaf weights
// v + w_j[x] + w_{m-1}[u-x] decrease along the walk. The thresholds c - v
// then grow, so the tail positions in the final pair only move forward,
// and the leaf weights follow a rational ratio recursion: no search and
// no exponential per leaf, unless the weights are so far above the
// threshold (beyond e^600) that the scaled products could overflow.
func (f *fh) row(j int, u int64, v float64, from, to int64, dir int64) {
	if (to-from)*dir < 0 {
		return
	}
	wj, wl := f.w[j], f.w[j+1]
	nj, nl := float64(f.n[j]), float64(f.n[j+1])
	uu := float64(u)
	lv := v + wj[from] + wl[u-from]
	if lv+f.gMax-f.T > 600 {
		for x := from; (to-x)*dir >= 0 && f.step(); x += dir {
			f.leaf(v + wj[x] + wl[u-x])
		}
		return
	}
	ev := math.Exp(lv + f.gMax - f.T) // e^(leaf weight + gMax - T)
	iL := lastAtMost(f.gL, f.c-lv)
	iR := lastAtMost(f.gR, f.c-lv)
	for x := from; ; {
		if !f.step() {
			return
		}
		cv := f.c - (v + wj[x] + wl[u-x])
		for iL+1 < len(f.gL) && f.gL[iL+1] <= cv {
			iL++
		}
		for iR+1 < len(f.gR) && f.gR[iR+1] <= cv {
			iR++
		}
		var t float64
		if iL >= 0 {
			t += f.eL[iL]
		}
		if iR >= 0 {
			t += f.eR[iR]
		}
		f.lin += ev * t
		if x == to {
			return
		}
		// ev(x+dir)/ev(x) = C(n_j, x') C(n_l, u-x') / (C(n_j, x) C(n_l, u-x)).
		fx := float64(x)
		if dir > 0 {
			ev *= (nj - fx) / (fx + 1) * ((uu - fx) / (nl - uu + fx + 1))
		} else {
			ev *= fx / (nj - fx + 1) * ((nl - uu + fx) / (uu - fx + 1))
		}
		x += dir
	}
}

// pairMax returns the largest weight of the final pair with r successes.
func (f *fh) pairMax(r int64) float64 {
	na, nb := f.n[f.m], f.n[f.m+1]
	yLo, yHi := max(0, r-nb), min(na, r)
	y := (r + 1) * (na + 1) / (na + nb + 2) // the hypergeometric mode
	y = min(max(y, yLo), yHi)
	wa, wb := f.w[f.m], f.w[f.m+1]
	g := wa[y] + wb[r-y]
	for _, z := range []int64{y - 1, y + 1} {
		if z >= yLo && z <= yHi {
			g = math.Max(g, wa[z]+wb[r-z])
		}
	}
	return g
}

// setPair tabulates the final pair's weights g(y) = w_a[y] + w_b[r-y] and
// the tail sums of its two monotone sides for remainder r.
func (f *fh) setPair(r int64) {
	f.work += min(f.n[f.m], r) / 8 // the tabulation below, in steps
	if err := argerr.Canceled(f.fn, f.ctx); err != nil && f.err == nil {
		f.err = err
	}
	f.r = r
	na, nb := f.n[f.m], f.n[f.m+1]
	wa, wb := f.w[f.m], f.w[f.m+1]
	f.yLo, f.yHi = max(0, r-nb), min(na, r)
	mode, gm := f.yLo, math.Inf(-1)
	for y := f.yLo; y <= f.yHi; y++ {
		if g := wa[y] + wb[r-y]; g > gm {
			mode, gm = y, g
		}
	}
	f.yMode, f.gMax = mode, gm
	f.gTot = halfDist(na + nb).LogProb(r)
	f.gL, f.rhoL = f.gL[:0], f.rhoL[:0]
	// ratio(y) = P(y-1)/P(y) for P(y) proportional to C(na, y) C(nb, r-y).
	ratio := func(y int64) float64 {
		return float64(y) / float64(na-y+1) * (float64(nb-r+y) / float64(r-y+1))
	}
	rho := 0.0
	for y := f.yLo; y <= mode; y++ {
		if y == f.yLo {
			rho = 1
		} else {
			rho = 1 + rho*ratio(y)
		}
		f.gL = append(f.gL, wa[y]+wb[r-y])
		f.rhoL = append(f.rhoL, rho)
	}
	f.gR, f.rhoR = f.gR[:0], f.rhoR[:0]
	for y := f.yHi; y > mode; y-- {
		if y == f.yHi {
			rho = 1
		} else {
			rho = 1 + rho/ratio(y+1)
		}
		f.gR = append(f.gR, wa[y]+wb[r-y])
		f.rhoR = append(f.rhoR, rho)
	}
	// e^(g(y) - gMax) by the same ratios, from the mode outward.
	f.eL, f.eR = f.eL[:0], f.eR[:0]
	f.eL = append(f.eL, make([]float64, len(f.gL))...)
	f.eR = append(f.eR, make([]float64, len(f.gR))...)
	e := 1.0
	for i := len(f.gL) - 1; i >= 0; i-- {
		y := f.yLo + int64(i)
		if y < mode {
			e *= ratio(y + 1)
		}
		f.eL[i] = e * f.rhoL[i]
	}
	e = 1.0
	for i := len(f.gR) - 1; i >= 0; i-- {
		y := f.yHi - int64(i)
		e /= ratio(y)
		f.eR[i] = e * f.rhoR[i]
	}
	f.gMin = math.Min(f.gL[0], math.Inf(1))
	if len(f.gR) > 0 {
		f.gMin = math.Min(f.gMin, f.gR[0])
	}
}

// leaf adds the final pair's tables of weight v + g(y) <= c.
func (f *fh) leaf(v float64) {
	if !f.step() {
		return
	}
	cv := f.c - v
	if cv < f.gMin {
		return
	}
	if i := lastAtMost(f.gL, cv); i >= 0 {
		f.lin += math.Exp(v+f.gL[i]-f.T) * f.rhoL[i]
	}
	if i := lastAtMost(f.gR, cv); i >= 0 {
		f.lin += math.Exp(v+f.gR[i]-f.T) * f.rhoR[i]
	}
}

// lastAtMost returns the last index i of the nondecreasing g with
// g[i] <= c, or -1.
func lastAtMost(g []float64, c float64) int {
	lo, hi := 0, len(g) // g[:lo] <= c, g[hi:] > c
	for lo < hi {
		mid := int(uint(lo+hi) >> 1)
		if g[mid] <= c {
			lo = mid + 1
		} else {
			hi = mid
		}
	}
	return lo - 1
}

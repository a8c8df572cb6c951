package power

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/onesample"
	"github.com/kofnlab/kofn/internal/root"
	"github.com/kofnlab/kofn/internal/xmath"
	"github.com/kofnlab/kofn/test"
)

// This file keeps the exact two-sample sample-size search as it was before
// its regions were built incrementally and its power summed by row (each
// group size's rejection region built from scratch, each decision a call
// of the test package, Fisher's power summed table by table), unchanged
// but for the names, as the reference oracle of exact_two_oracle_check_test.go.

func oracleTwoSampleN(ctx context.Context, p1, p2 float64, o TwoSampleOptions) (ExactSize, error) {
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
	power := func(n1 int64) (float64, error) {
		n2 := n2Of(n1)
		if err := checkGroups(fn, n1, n2); err != nil {
			return 0, err
		}
		sz := sizePoints(n1, n2, p1, p2, s)
		reg, err := oracleBuildRegion(ctx, fn, n1, n2, s.alpha, o, append([][2]float64{{p1, p2}}, sz...))
		if err != nil {
			return 0, err
		}
		sizes[n1] = oracleTwoSize(reg, sz)
		pw := oracleProb(reg, p1, p2)
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

func oracleBuildRegion(ctx context.Context, fn string, n1, n2 int64, alpha float64, o TwoSampleOptions, pts [][2]float64) (*twoRegion, error) {
	sp := spanOf(n1, n2, pts, nil)
	var r *twoRegion
	var err error
	switch {
	case o.Hypothesis != Equality:
		r, err = marginRegion(ctx, fn, n1, n2, alpha, o.Hypothesis, o.Margin, sp)
	case o.Test == BarnardExactTest:
		r, err = oracleBarnardRegion(ctx, fn, n1, n2, alpha, o.Alternative)
	case o.Test == ZPooledTest:
		r, err = oracleZRegion(ctx, fn, n1, n2, alpha, o.Alternative, sp)
	default:
		r, err = oracleFisherRegion(ctx, fn, n1, n2, alpha, o.Alternative, sp)
	}
	if err != nil {
		return nil, err
	}
	r.ctx, r.fn = ctx, fn
	return r, nil
}

func oracleFisherRegion(ctx context.Context, fn string, n1, n2 int64, alpha float64, alt test.Alternative, sp span) (*twoRegion, error) {
	N := n1 + n2
	r := &twoRegion{n1: n1, n2: n2, bySum: true, a: make([]int64, N+1), b: make([]int64, N+1)}
	for s := int64(0); s <= N; s++ { // accept all outside the span
		r.a[s], r.b[s] = 0, N
	}
	la := xmath.Log(alpha)
	oalt := onesample.TwoSided
	switch alt {
	case test.Higher:
		oalt = onesample.Higher
	case test.Lower:
		oalt = onesample.Lower
	}
	ga, gb := int64(0), int64(-1)
	for s := sp.s0; s <= sp.s1; s++ {
		if s&15 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return nil, err
			}
		}
		h := binom.Hyper{Total: N, Successes: n1, Draws: s}
		lo, hi := h.Support()
		if lo == hi {
			r.a[s], r.b[s] = lo, hi // one table: p = 1
			ga, gb = lo, hi
			continue
		}
		ok := func(x int64) bool {
			return onesample.LogPValueOf(h, lo, hi, x, onesample.PointProbability, false, oalt) >= la
		}
		// As s grows by one both ends move up by about n1/N: start from the
		// previous interval, certified by two decisions when the test is
		// two-sided (see certifyInterval), walked otherwise.
		a, b, done := int64(0), int64(-1), false
		if alt == test.TwoSided {
			a, b, done = certifyInterval(ok, h.LogProb, lo, hi, min(max(ga, lo), hi), min(max(gb, lo), hi))
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
		r.a[s], r.b[s] = a, b
		ga, gb = a, b
	}
	return r, nil
}

func oracleZRegion(ctx context.Context, fn string, n1, n2 int64, alpha float64, alt test.Alternative, sp span) (*twoRegion, error) {
	r := &twoRegion{n1: n1, n2: n2, a: make([]int64, n1+1), b: make([]int64, n1+1)}
	for x1 := range r.b { // accept all outside the span
		r.b[x1] = n2
	}
	la := xmath.Log(alpha)
	opt := test.TwoSampleOptions{Method: test.ZPooled, Alternative: alt}
	ga, gb := int64(0), n2
	for x1 := sp.r0; x1 <= sp.r1; x1++ {
		if x1&63 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return nil, err
			}
		}
		ok := func(x2 int64) bool {
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
		r.a[x1], r.b[x1] = a, b
		ga, gb = a, b
	}
	return r, nil
}

func oracleBarnardRegion(ctx context.Context, fn string, n1, n2 int64, alpha float64, alt test.Alternative) (*twoRegion, error) {
	key := func(x1, x2 int64) float64 {
		z := pooledZ(x1, n1, x2, n2)
		switch alt {
		case test.Lower:
			return -z
		case test.TwoSided:
			return math.Abs(z)
		}
		return z
	}
	// cuts returns, for row x1, the last x2 with z >= c (-1 if none) and
	// the first x2 with z <= -c (n2+1 if none); with the key, the row's
	// tables with key >= c are [0, p] for test.Higher, [q, n2] for test.Lower, both
	// for two-sided (c > 0 there, so the two do not meet).
	cuts := func(x1 int64, c float64) (p, q int64) {
		p, q = -1, n2+1
		if alt != test.Lower {
			p = root.SmallestInt(func(x2 int64) bool { return pooledZ(x1, n1, x2, n2) < c }, 0, n2) - 1
		}
		if alt != test.Higher {
			q = root.SmallestInt(func(x2 int64) bool { return pooledZ(x1, n1, x2, n2) <= -c }, 0, n2)
		}
		return p, q
	}
	tie := func(k float64) float64 { return 1e-12 * math.Abs(k) }
	// nearest returns the table with the smallest key >= c and below hi
	// (above), or with the largest key < c and above lo (below).
	nearest := func(c, lo, hi float64) (t [2]int64, kt float64, ok bool, above bool) {
		best, bestB := math.Inf(1), math.Inf(-1)
		var tb [2]int64
		okB := false
		for x1 := int64(0); x1 <= n1; x1++ {
			if x1%4096 == 0 && ctx.Err() != nil {
				return t, 0, false, false // the caller reports the error
			}
			p, q := cuts(x1, c)
			for _, x2 := range []int64{p, q} { // at or above c
				if x2 >= 0 && x2 <= n2 {
					if k := key(x1, x2); k >= c && k < hi && k < best {
						best, t, ok = k, [2]int64{x1, x2}, true
					}
				}
			}
			for _, x2 := range []int64{p + 1, q - 1} { // below c
				if x2 >= 0 && x2 <= n2 {
					if k := key(x1, x2); k < c && k > lo && k > bestB {
						bestB, tb, okB = k, [2]int64{x1, x2}, true
					}
				}
			}
		}
		if ok {
			return t, best, true, true
		}
		return tb, bestB, okB, false
	}
	la := xmath.Log(alpha)
	opt := test.UnconditionalOptions{Alternative: alt}
	zc := -zq(alpha) // the normal critical value: the first probe
	if alt == test.TwoSided {
		zc = -zq(alpha / 2)
	}
	ka, kr := math.Inf(-1), math.Inf(1) // keys <= ka accepted, keys >= kr rejected
	c := zc
	for iter := 0; ; iter++ {
		if err := argerr.Canceled(fn, ctx); err != nil {
			return nil, err
		}
		t, kt, ok, _ := nearest(c, ka, kr)
		if !ok || iter > 400 {
			break
		}
		res, err := test.Barnard(ctx, t[0], n1, t[1], n2, opt)
		if err != nil {
			return nil, &argerr.Error{Func: fn, Reason: "Barnard's test failed: " + err.Error(), Err: err}
		}
		if res.LogPValue < la {
			kr = kt - tie(kt)
		} else {
			ka = kt + tie(kt)
		}
		switch {
		case math.IsInf(kr, 1):
			c = ka + math.Max(1, math.Abs(ka))
		case math.IsInf(ka, -1):
			c = kr - math.Max(1, math.Abs(kr))
		default:
			c = ka + (kr-ka)/2
		}
	}
	if err := argerr.Canceled(fn, ctx); err != nil {
		return nil, err
	}
	r := &twoRegion{n1: n1, n2: n2, a: make([]int64, n1+1), b: make([]int64, n1+1)}
	for x1 := int64(0); x1 <= n1; x1++ {
		if x1%4096 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return nil, err
			}
		}
		if math.IsInf(kr, 1) {
			r.a[x1], r.b[x1] = 0, n2 // nothing rejected
			continue
		}
		p, q := cuts(x1, kr)
		r.a[x1], r.b[x1] = p+1, q-1
	}
	return r, nil
}

func oracleProb(r *twoRegion, p1, p2 float64) float64 {
	l1, b1 := pmfWindow(r.n1, p1, nil)
	l2, b2 := pmfWindow(r.n2, p2, nil)
	h1, h2 := l1+int64(len(b1))-1, l2+int64(len(b2))-1
	sum := 0.0
	if r.bySum {
		for x1 := l1; x1 <= h1; x1++ {
			if (x1-l1)%256 == 0 && r.canceled() {
				return 0
			}
			row := 0.0
			for x2 := l2; x2 <= h2; x2++ {
				s := x1 + x2
				if x1 < r.a[s] || x1 > r.b[s] {
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
		a, b := r.a[x1], r.b[x1]
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

func oracleTwoSize(reg *twoRegion, pts [][2]float64) float64 {
	size := 0.0
	for _, p := range pts {
		size = math.Max(size, oracleProb(reg, p[0], p[1]))
	}
	return size
}

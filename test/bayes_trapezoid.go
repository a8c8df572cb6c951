package test

import (
	"context"
	"errors"
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/beta"
	"github.com/kofnlab/kofn/internal/xmath"
)

// The trapezoidal rule in the log-odds, with a certified error bound.
//
// Compare (when no posterior shape is an integer) and ProbBest need, for
// arms with independent Beta(a_i, b_i) posteriors,
//
//	P(arm j best) = integral f_j(t) dt,  f_j(t) = g_j(t) prod_{i != j} F_i(t),
//
// over the log-odds t of x (x = 1/(1+e^-t)), with g_i(t) = x^a_i (1-x)^b_i /
// B(a_i, b_i) the density of arm i's log-odds and F_i(t) = I_x(a_i, b_i) its
// distribution function. With two arms f_1 is the integrand of P(p1 > p2).
//
// 1. Analyticity and growth. x^a (1-x)^b = (1+e^-t)^-a (1+e^t)^-b, and for
// |Im t| < pi neither 1+e^-t nor 1+e^t meets (-inf, 0], so g is analytic in
// the strip |Im t| < pi (principal powers). With u = e^-t > 0,
// |1+e^-(t+iy)|^2 = 1 + 2u cos y + u^2, and
//
//	(1+u)^2 / (1 + 2u cos y + u^2) = 1 + 2(1 - cos y) / (u + 1/u + 2 cos y)
//
// is largest at u = 1, where it is 2/(1 + cos y) = sec^2(y/2); the same
// holds for 1+e^t. So |g(t+iy)| <= sec(y/2)^(a+b) g(t). F continues
// analytically as the integral of g along the horizontal line from
// -inf+iy to t+iy (Cauchy's theorem; the integrand vanishes like e^(a Re s)
// at the far end), so |F(t+iy)| <= sec(y/2)^(a+b) F(t). Hence, with N the
// sum of all the arms' shapes,
//
//	|f_j(t+iy)| <= sec(y/2)^N f_j(t)   for |y| < pi.
//
// 2. Discretisation. For 0 < a < pi, f_j is analytic in |Im t| < a, tends
// to 0 uniformly there as |Re t| grows, and integral |f_j(t+iy)| dt <=
// M = sec(a/2)^N I_j for |y| < a (I_j the integral). Theorem 5.1 of
// Trefethen LN, Weideman JAC (2014), "The exponentially convergent
// trapezoidal rule", SIAM Review 56(3) (recalled; its conditions are these
// three) bounds the trapezoidal sum on the whole line, T = h sum_k
// f_j(t0 + k h) for any t0, by |T - I_j| <= 2M / (e^(2 pi a/h) - 1), so
//
//	|T - I_j| <= eps I_j,   eps = 2 sec(a/2)^N / (e^(2 pi a/h) - 1),
//
// a bound relative to the answer, as good for a probability of 1e-300 as
// for one of 1/2. newLogOddsRule picks a to make h largest for eps below
// 2^-53: it maximises 2 pi a / (ln(2^54) + N ln sec(a/2)), whose maximiser
// solves ln(2^54) + N ln sec(a/2) = (N/2) a tan(a/2) (about sqrt(300/N)
// for large N, between 2.5 and 3 for N up to 10); h is then rounded down to j 2^-m
// with 8 <= j < 16, so that every node t0 + k h (t0 a multiple of 2^-m) is
// exact in floating point, and eps is evaluated at that h.
//
// 3. Truncation and skipping. Each f_j is log-concave in t: ln g is
// -a ln(1+e^-t) - b ln(1+e^t) + const, and a distribution function of a
// log-concave density is log-concave (Prekopa A (1973), "On logarithmic
// concave measures and functions", Acta Sci. Math. 34; Bagnoli M,
// Bergstrom T (2005), "Log-concave probability and its applications",
// Economic Theory 26(2), Theorem 1), and so is a product of log-concave
// functions. So ln f at the nodes is a concave sequence: beyond node K it
// lies below the secant through any earlier node P and K, extended, and
// between two nodes K and L above their chord. Hence, with s the secant's
// slope per node, the terms beyond K sum to at most f_K e^s/(1 - e^s) once
// s < 0; and the terms strictly between K and L = K + J lie between the
// geometric sums of the chord and of the secant. The walk runs outward from
// a node near the modes, right then left; once past every integrand's
// mode it tries to jump J nodes (16 at first, doubled after a success,
// halved after a failure), adding the midpoint of the two sums and
// counting their half-width as error, when that half-width is below 2^-52
// of the sum (or four times the nodes' own error bounds of the skipped
// sum: the bounds cannot be closer); it stops when for every integrand the
// bound on the rest falls below 1e-17 of its sum, and at |t| = 700
// whatever happens (x stays a normal double; the remaining bound is then
// reported, not dropped). Every bound uses the values' error bounds, so
// it holds for the true values.
//
// 4. Rounding. Every term is positive; each is evaluated with a bound on
// the error of its logarithm: internal/beta's stated accuracies (LogCDF:
// 1e-14 relative to max(1, |ln I|), taken for the smaller tail, the other
// being its complement, whose error shrinks by the factor S/F;
// LogDensityXY: a few ulp relative to its size, taken as 16 ulp of the sum
// of the magnitudes of its terms); the rounding of x and y by beta.XY (at
// most 4 units of 2^-53 each, taken as 8), through the first-order
// sensitivity of the evaluation as implemented to ln x and ln y, summed
// with signs over the factors of a term since they share x and y (see
// logCDF); and the sums, differences and exponentials that form the term.
// Terms are added by Neumaier's compensated sum, whose error is at most 2
// ulp of the total plus n^2 ulp^2. The rounding part rho is the mean of the
// terms' bounds weighted by the terms, plus these.
//
// The parts combine exactly: with T~ the computed sum (rho relative to it),
// tau the truncation and skipping bounds relative to it, and I the
// integral, |T~ - I| <= rho T~ + tau T~ + eps I and I <= T~ (1 + rho +
// tau)/(1 - eps), so
//
//	|T~ - I| <= (rho + tau + eps (1 + rho + tau)/(1 - eps)) T~.
//
// The result is a bound relative to internal/beta's stated accuracy: it
// holds as far as those statements do.

// trapezoidMethod is the Method of results the rule computes.
const trapezoidMethod = "trapezoidal rule in the log-odds"

const (
	unitRound   = 0x1p-53 // unit roundoff of float64
	betaCDFAcc  = 1e-14   // internal/beta: LogCDF's stated accuracy relative to max(1, |ln I|)
	xyError     = 8 * unitRound
	discTarget  = 0x1p-53 // the discretisation bound aimed at
	truncTarget = 1e-17   // the truncation bound aimed at, relative to the sum
	skipTarget  = 0x1p-52 // half-width of a skipped stretch's bounds allowed, relative to the sum
	walkLimit   = 700.0   // |t| beyond which the walk never goes
)

// errWalkTooLong reports a walk that reached its limit of nodes.
var errWalkTooLong = errors.New("the trapezoidal rule's walk reached its limit of nodes")

// trapezoidSteps returns the width of the arms' window in the log-odds,
// from the lowest to the highest mode ln(a/b) -+ 6 sqrt(1/a + 1/b), in
// steps of the rule for their total shape: a measure of the walk's length
// (the nodes actually evaluated were between 0.5 and 1.2 times it in
// trials with shapes from 0.1 to 1e5, jumps bridging the tails).
func trapezoidSteps(a, b []float64) float64 {
	lo, hi, n := math.Inf(1), math.Inf(-1), 0.0
	for i := range a {
		m, sd := math.Log(a[i]/b[i]), math.Sqrt(1/a[i]+1/b[i])
		lo, hi = math.Min(lo, m-6*sd), math.Max(hi, m+6*sd)
		n += a[i] + b[i]
	}
	return (hi - lo) / newLogOddsRule(n).h
}

// logOddsRule is a trapezoidal rule in the log-odds: step h = j 2^-m and
// the discretisation bound eps relative to the integral.
type logOddsRule struct {
	h, grid, eps float64
}

// newLogOddsRule returns the rule for integrands bounded by sec(y/2)^n in
// the strip (see above).
func newLogOddsRule(n float64) logOddsRule {
	L := math.Log(2 / discTarget)
	lnSec := func(a float64) float64 { return -math.Log(math.Cos(a / 2)) }
	psi := func(a float64) float64 { return L + n*lnSec(a) - n/2*a*math.Tan(a/2) }
	lo, hi := 0.0, 3.1
	if psi(hi) > 0 {
		lo = hi
	} else {
		for range 40 {
			mid := (lo + hi) / 2
			if psi(mid) > 0 {
				lo = mid
			} else {
				hi = mid
			}
		}
	}
	return ruleWith(n, lo, 2*math.Pi*lo/(L+n*lnSec(lo)))
}

// ruleWith returns the rule with the largest step j 2^-m (8 <= j < 16) not
// above hOpt, with its discretisation bound for the strip |Im t| < a.
func ruleWith(n, a, hOpt float64) logOddsRule {
	frac, e := math.Frexp(hOpt)
	grid := math.Ldexp(1, e-4)
	h := math.Floor(frac*16) * grid
	return logOddsRule{h: h, grid: grid, eps: discBound(n, a, h)}
}

// discBound returns 2 sec(a/2)^n / (e^(2 pi a/h) - 1), rounded up.
func discBound(n, a, h float64) float64 {
	return math.Exp(math.Ln2-n*math.Log(math.Cos(a/2))-math.Log(math.Expm1(2*math.Pi*a/h))) * (1 + 1e-12)
}

// logCDF returns ln F = ln I_x(a, b), a bound on its absolute error for
// the given x and y (beta.LogCDF's stated accuracy, taken for the smaller
// tail, the other being its complement, whose error shrinks by the factor
// S/F), and the first-order sensitivities dx = d ln F / d ln x and dy =
// d ln F / d ln y of the evaluation as implemented (x and y are separate
// arguments, each carrying its own rounding). lg = ln g is the log-odds
// density at x. The prefactor x^a y^b / B in Loader's form moves by
// (a y - b x) d ln x - (a y - b x) d ln y; the continued fraction, a
// function of x alone (of y alone for the upper tail), by its slope in
// t = ln x - ln y times d ln x / y (times -d ln y / x).
func logCDF(a, b, x, y, lg float64) (l, err, dx, dy float64) {
	ayBx := a*y - b*x
	if x*(a+b+2) < a+1 {
		l = beta.LogCDF(a, b, x, y)
		rho := math.Exp(lg - l) // d ln F / dt
		return l, betaCDFAcc*math.Max(1, math.Abs(l)) + unitRound*math.Abs(l), ayBx + (rho-ayBx)/y, -ayBx
	}
	ls := beta.LogCDF(b, a, y, x) // ln S, S = P(B > x)
	l = xmath.Log1mExp(math.Min(0, ls))
	hz := math.Exp(lg - ls) // -d ln S / dt
	w := math.Exp(ls - l)   // S/F = -d ln F / d ln S
	ds := betaCDFAcc * math.Max(1, math.Abs(ls))
	return l, math.Expm1(ds)*w + 4*unitRound*(1+math.Abs(l)), -w * ayBx, -w * (-ayBx + (hz+ayBx)/x)
}

// bestSums returns, for arms with Beta(a[j], b[j]) posteriors, ln P(arm j
// best) and a bound on the relative error of P(arm j best) (see the comment
// above), and the number of nodes evaluated. ctx is checked every 4 nodes.
func bestSums(ctx context.Context, fn string, a, b []float64, maxNodes int) (logP, rel []float64, nodes int, err error) {
	n := 0.0
	for i := range a {
		n += a[i] + b[i]
	}
	logP, rel, nodes, err = ruleSums(ctx, fn, a, b, newLogOddsRule(n), maxNodes)
	for _, e := range rel {
		if err == nil && !(e < 1e-3) {
			err = argerr.NoSolution(fn, "the trapezoidal rule's error bound is not small; the posterior shapes are outside what it serves")
		}
	}
	return logP, rel, nodes, err
}

// ruleSums is bestSums with the rule given.
func ruleSums(ctx context.Context, fn string, a, b []float64, rule logOddsRule, maxNodes int) (logP, rel []float64, nodes int, err error) {
	m := len(a)
	tc := 0.0
	cg := make([]float64, m) // magnitudes of the terms LogDensityXY adds
	for i := range a {
		tc += math.Log(a[i] / b[i]) // the mode of arm i's log-odds
		cg[i] = 1 + math.Abs(math.Log(a[i]/(a[i]+b[i]))) + math.Abs(math.Log(b[i]))
	}
	tc = math.Max(-walkLimit/2, math.Min(walkLimit/2, tc/float64(m)))
	tc = math.Round(tc/rule.grid) * rule.grid

	lg, dg := make([]float64, m), make([]float64, m)
	lF, dF := make([]float64, m), make([]float64, m)
	gx, Fx, Fy := make([]float64, m), make([]float64, m), make([]float64, m)
	lf, del := make([]float64, m), make([]float64, m)
	eval := func(t float64) {
		x, y := beta.XY(t)
		sumF, sumAbs, sumDF, sumX, sumY := 0.0, 0.0, 0.0, 0.0, 0.0
		for i := range a {
			lg[i] = beta.LogDensityXY(a[i], b[i], x, y)
			dg[i] = 32 * unitRound * (math.Abs(lg[i]) + cg[i])
			gx[i] = a[i]*y - b[i]*x // d ln g / d ln x = -d ln g / d ln y
			lF[i], dF[i], Fx[i], Fy[i] = logCDF(a[i], b[i], x, y, lg[i])
			sumF += lF[i]
			sumAbs += math.Abs(lF[i])
			sumDF += dF[i]
			sumX += Fx[i]
			sumY += Fy[i]
		}
		for j := range a {
			sx := gx[j] + sumX - Fx[j]
			sy := -gx[j] + sumY - Fy[j]
			d := dg[j] + (sumDF - dF[j]) + xyError*(math.Abs(sx)+math.Abs(sy)) +
				float64(m+2)*unitRound*(sumAbs+math.Abs(lg[j])+sumDF)
			lf[j], del[j] = lg[j]+sumF-lF[j], d
		}
	}

	// Per integrand: the log of the reference scale, Neumaier's sum and its
	// compensation in that scale, the error-weighted sum, the rounding of
	// rescalings, and the log of the tail bounds.
	ref := make([]float64, m)
	sum, comp, wdel := make([]float64, m), make([]float64, m), make([]float64, m)
	rescale := make([]float64, m)
	skipErr := make([]float64, m) // absolute error of the skipped sums, scaled
	ltail := make([]float64, m)
	for i := range ref {
		ref[i], ltail[i] = math.Inf(-1), math.Inf(-1)
	}
	add := func(i int, l, d float64) {
		if math.IsInf(ref[i], -1) {
			ref[i] = l
		} else if l > ref[i]+600 {
			f := math.Exp(ref[i] - l)
			sum[i] *= f
			comp[i] *= f
			wdel[i] *= f
			skipErr[i] *= f
			rescale[i] += 4*unitRound + unitRound*(l-ref[i])
			ref[i] = l
		}
		v := math.Exp(l - ref[i])
		d += unitRound*math.Abs(l-ref[i]) + 2*unitRound // the difference and the exponential
		s := sum[i] + v
		if math.Abs(sum[i]) >= v {
			comp[i] += (sum[i] - s) + v
		} else {
			comp[i] += (v - s) + sum[i]
		}
		sum[i] = s
		e := math.Expm1(d)
		wdel[i] += v * e / (1 - e) // the true term is v/(1 + theta), theta <= e
	}
	// slope bounds the slope per node of the true ln f beyond node K (log
	// value l, error d) from the secant through node P, q nodes back (lp,
	// dp): ln f is concave, so it lies below that secant extended.
	slope := func(l, d, lp, dp, q float64) float64 { return (l - lp + 2*(d+dp)) / q }
	// tailLog bounds ln of the sum of all terms beyond node K: +Inf unless
	// the slope bound is negative.
	tailLog := func(l, d, s float64) float64 {
		if !(s < 0) {
			return math.Inf(1)
		}
		return l + d + s - math.Log(-math.Expm1(s))
	}
	// geo returns ln sum_{j=1}^{n} e^(l0 + j s), -Inf for n < 1.
	geo := func(l0, s, n float64) float64 {
		if n < 1 {
			return math.Inf(-1)
		}
		if s == 0 {
			return l0 + math.Log(n)
		}
		return l0 + s + math.Log(math.Expm1(n*s)/math.Expm1(s))
	}
	// skip bounds the sum of the J-1 terms strictly between node K (lK, dK;
	// per-node slope bound s beyond it) and node L = K+J (lL, dL) by
	// concavity: above the chord from K to L, below the secant bound from
	// K. It returns the midpoint and the half-width of the bounds, scaled
	// like sum[i], with the rounding of the closed forms (a few ulp of each
	// exponent) in the half-width.
	skip := func(i int, J, lK, dK, s, lL, dL float64) (mid, half float64) {
		lo0, lo1 := lK-dK, lL-dL
		lower := geo(lo0, (lo1-lo0)/J, J-1)
		upper := geo(lK+dK, s, J-1)
		eu := math.Exp(upper - ref[i])
		el := math.Exp(lower - ref[i])
		if !(el <= eu) {
			el = eu
		}
		slack := 8 * unitRound * (2 + J*(math.Abs(s)+math.Abs(lo1-lo0)/J) + math.Abs(lK) + math.Abs(lL-ref[i]))
		return (eu + el) / 2, (eu-el)/2 + slack*eu
	}

	prvL, prvD := make([]float64, m), make([]float64, m) // node P
	curL, curD := make([]float64, m), make([]float64, m) // node K, q nodes beyond P
	q := 1.0
	startL, startD := make([]float64, m), make([]float64, m)
	mids, halves := make([]float64, m), make([]float64, m)
	atDone := make([]float64, m)
	done := make([]bool, m)
	// node evaluates node k into lf, del; false beyond the walk's limit.
	node := func(k int) (bool, error) {
		t := tc + float64(k)*rule.h
		if math.Abs(t) > walkLimit {
			return false, nil
		}
		nodes++
		if maxNodes > 0 && nodes > maxNodes {
			return false, errWalkTooLong
		}
		if nodes%4 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return false, err
			}
		}
		eval(t)
		for i := range a {
			if !(math.Abs(lf[i]) <= math.MaxFloat64) || !(del[i] < 1e-3) {
				return false, argerr.NoSolution(fn, "the integrand is not finite or not accurate at a node of the trapezoidal rule")
			}
		}
		return true, nil
	}
	// step adds the node in lf, del, gap nodes beyond the current one, and
	// makes it the current one; it reports whether every integrand's tail
	// beyond it is now small (check: the previous node is of this walk).
	step := func(gap float64, check bool) bool {
		all := true
		for i := range a {
			add(i, lf[i], del[i])
			prvL[i], prvD[i] = curL[i], curD[i]
			curL[i], curD[i] = lf[i], del[i]
			if check && !done[i] {
				lt := tailLog(curL[i], curD[i], slope(curL[i], curD[i], prvL[i], prvD[i], gap))
				if lt < math.Log(truncTarget)+ref[i]+math.Log(sum[i]+comp[i]) {
					done[i], atDone[i] = true, lt
				}
			}
			all = all && done[i]
		}
		q = gap
		return all
	}
	for _, dir := range [2]int{1, -1} {
		k, check := 0, false
		if dir < 0 {
			k, check = -1, true
			copy(curL, startL)
			copy(curD, startD)
		}
		for i := range done {
			done[i], atDone[i] = false, math.Inf(1)
		}
		// The first jump is tried after 8 nodes in this direction, so
		// that the previous and current nodes are both of this walk.
		J, wait := 16, 8
		for {
			if wait--; wait < 0 {
				// Past every integrand's mode: try to jump J nodes ahead,
				// bounding the terms skipped (doubling J on success,
				// halving it on failure).
				past := true
				for i := range a {
					past = past && slope(curL[i], curD[i], prvL[i], prvD[i], q) < 0
				}
				ok := past
				if ok {
					var err error
					if ok, err = node(k + dir*(J-1)); err != nil {
						return nil, nil, nodes, err
					}
				}
				for i := 0; ok && i < m; i++ {
					s := slope(curL[i], curD[i], prvL[i], prvD[i], q)
					mids[i], halves[i] = skip(i, float64(J), curL[i], curD[i], s, lf[i], del[i])
					ok = halves[i] <= skipTarget*(sum[i]+comp[i])+4*(curD[i]+prvD[i]+del[i])*mids[i]
				}
				if ok {
					for i := range a {
						v := mids[i]
						s := sum[i] + v
						if math.Abs(sum[i]) >= v {
							comp[i] += (sum[i] - s) + v
						} else {
							comp[i] += (v - s) + sum[i]
						}
						sum[i] = s
						skipErr[i] += halves[i]
					}
					k += dir * J
					if step(float64(J), true) {
						break
					}
					J, wait = min(2*J, 1<<20), 0
					continue
				}
				if past {
					J /= 2
				}
				if J < 4 || !past {
					J, wait = max(J, 4), 4
				}
			}
			ok, err := node(k)
			if err != nil {
				return nil, nil, nodes, err
			}
			if !ok {
				break
			}
			if k == 0 {
				copy(startL, lf)
				copy(startD, del)
			}
			if step(1, check) {
				break
			}
			check = true
			k += dir
		}
		// The tails beyond the last node: the bound from its own secant
		// (no larger than at the node where the integrand was done, which
		// covers the terms added since as well), whichever is less.
		for i := range a {
			lt := math.Min(atDone[i], tailLog(curL[i], curD[i], slope(curL[i], curD[i], prvL[i], prvD[i], q)))
			if math.IsInf(lt, 1) || math.IsInf(ltail[i], 1) {
				ltail[i] = math.Inf(1)
			} else {
				ltail[i] = xmath.LogAddExp(ltail[i], lt)
			}
		}
	}

	logP, rel = make([]float64, m), make([]float64, m)
	fn2 := float64(nodes)
	for i := range a {
		s := sum[i] + comp[i]
		lnS := math.Log(s)
		logP[i] = ref[i] + lnS + math.Log(rule.h)
		round := wdel[i]/s*(1+1e-12) + 4*unitRound + fn2*fn2*unitRound*unitRound + rescale[i] +
			fn2*0x1p-1074/s + 4*unitRound*(1+math.Abs(ref[i])+math.Abs(lnS)+math.Abs(math.Log(rule.h)))
		tau := math.Exp(ltail[i]-ref[i]-lnS)*(1+1e-9) + skipErr[i]/s
		e := round + tau + rule.eps*(1+round+tau)/(1-rule.eps)
		rel[i] = e
	}
	return logP, rel, nodes, nil
}

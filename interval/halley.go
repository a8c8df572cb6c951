package interval

import "math"

// The exact limits of Clopper-Pearson and Jeffreys are quantiles of beta
// distributions: in the log-odds t of p they solve F(t) = ln a, where F is
// the log of a Beta(A, B-A) tail (B = A + the second parameter) and
// increases in t. Writing H = F' (the beta density times pq over the tail),
// both satisfy the pair of differential equations
//
//	p' = p (1-p),   H' = H (A - B p - s H),
//
// with s = +1 for the lower tail ln I_p and s = -1 for minus the upper tail
// -ln(1 - I_p). One exact evaluation of F and H at a point thus gives the
// whole Taylor series of F about it from the recurrences for p and H, and
// the series solves F = ln a to about 1e-14 from a start that is off by a
// few percent; a second exact evaluation at the solution certifies it by
// the mean-value theorem (f changes by at least 0.9 H per unit of t near
// it), to within 2e-13 in t, below 1e-12 relative in p.

// betaRootTol is the largest absolute tolerance in t of tailRoot's
// certified bracket: a width of 2 betaRootTol in t moves p by at most 4e-13
// relative (dp/p = (1-p) dt), within the 1e-12 the limits promise.
const betaRootTol = 2e-13

// seriesOrder is the number of Taylor coefficients of H summed.
const seriesOrder = 16

// tailODE holds the constants A, B, s of the differential equation above.
type tailODE struct{ A, B, s float64 }

// tailRoot returns the root of f(t) = F(t) - ln a, F increasing, from the
// guess t0, where eval returns f and, when asked, H = F' at t (a point
// placed only to close a bracket needs f alone), and ode gives the
// differential equation of H. Each step is a Taylor-series solve (or,
// where the series has not converged, a Halley step). The answer is
// returned only once it is certified to lie within tol of the root, where
// tol is betaRootTol or less (small enough that f changes by at most 1e-12
// across it, but at least a few units in the last place of t): by the
// mean-value theorem at an evaluated point (|f| <= 0.45 H tol, with H's
// own change over tol bounded through H'/H = A - B p - s H), or by f seen
// with opposite signs at two points at most 2 tol apart. The tails
// themselves carry about 1e-13 relative error, which moves the root by
// about 1e-13 / H in t either way. When an evaluation is not finite, H is
// not positive, or 12 evaluations have not certified a root, it returns
// the root found by solveIncreasingStep (Brent's method on a bracket) from
// the best point so far.
func tailRoot(eval func(t float64, withH bool) (f, h float64), ode tailODE, t0 float64) float64 {
	lo, hi := float64(-tMax), float64(tMax) // the root lies in [lo, hi]
	t := math.Max(-tMax, math.Min(tMax, t0))
	tol, closing := betaRootTol, false
	hNext := math.NaN() // H at t from the last series solve, if any
	for i := 0; i < 12; i++ {
		f, h := eval(t, !closing && !(hNext > 0))
		if hNext > 0 {
			h = hNext // the series' H, to about 1e-14 relative
		}
		if f == 0 {
			return t
		}
		if math.IsNaN(f) || math.IsInf(f, 0) {
			break
		}
		if f < 0 {
			lo = t
		} else {
			hi = t
		}
		// A closing point was placed with the previous point's tolerance.
		if hi-lo <= 2*tol {
			return lo + (hi-lo)/2
		}
		if closing {
			_, h = eval(t, true)
		}
		if !(h > 0) || math.IsInf(h, 0) {
			break
		}
		tol = math.Max(math.Min(betaRootTol, 5e-13/h), 4*ulp(t))
		if hi-lo <= 2*tol {
			return lo + (hi-lo)/2
		}
		// Mean-value certificate: over |x - t| <= tol the derivative
		// H(x) >= H(t) e^(-|H'/H| tol) >= 0.9 h (H'/H = A - B p - s H),
		// so when |f| <= 0.45 h tol the root lies within |f| / (0.9 h)
		// <= tol/2 of t, and within tol of the Newton point t - f/h.
		if p, _ := pq(t); math.Abs(f) <= 0.45*h*tol && math.Abs(ode.A-ode.B*p-ode.s*h)*tol <= 0.1 {
			return t - f/h
		}
		step, hs := ode.step(t, f, h)
		hNext = hs
		next := t + step
		closing = math.Abs(step) < tol
		if closing {
			// t is within tol of the root: step just past it to the other
			// side to close the bracket.
			next = t + math.Copysign(tol, step) + step
			hNext = math.NaN()
		}
		if !(next > lo && next < hi) {
			next = lo + (hi-lo)/2
			hNext = math.NaN()
		}
		t = next
	}
	return solveIncreasingStep(func(x float64) float64 { f, _ := eval(x, false); return f }, t, 1e-4*(1+math.Abs(t)))
}

// step returns the change of t that solves f(t + step) = 0, where
// f(t) = f and f'(t) = h. Halley's step d0 = -f / (h - f H_1 / h) is off by
// about d0^3; when that exceeds 1e-15 the Taylor series of f about t is
// used instead, with the coefficients of p and H from the recurrences
//
//	(j+1) p_{j+1} = p_j (q_0 - p_0) - sum_{i=1}^{j-1} p_i p_{j-i},
//	(j+1) H_{j+1} = (A - B p_0) H_j - sum_{i=1}^{j} (B p_i + s H_i) H_{j-i} - s H_0 H_j,
//
// summed until the terms at twice Halley's step fall below 1e-17 |f|, and
// Newton's method on f + sum_j H_j d^(j+1)/(j+1) = 0 from d0. Where the
// series does not converge so (at most seriesOrder terms) Halley's step is
// taken, clamped to +-2. hAt is the series' H at t + d (NaN after a
// Halley step): the next point needs no density evaluation of its own.
func (o tailODE) step(t, f, h float64) (d, hAt float64) {
	p0, q0 := pq(t)
	c0 := o.A - o.B*p0
	h1 := h * (c0 - o.s*h)
	halley := -f / h
	if den := h - f*h1/(2*h); den > h/2 && !math.IsInf(den, 0) {
		halley = -f / den
	}
	halley = math.Max(-2, math.Min(2, halley))
	if math.Abs(halley) < 1e-5 {
		return halley, math.NaN()
	}
	var pc, hc [seriesOrder + 1]float64
	pc[0], hc[0], pc[1], hc[1] = p0, h, p0*q0, h1
	r := 2 * math.Abs(halley)
	rj := r * r // r^(j+1) for the term H_j d^(j+1)
	m := 1
	for ; m < seriesOrder; m++ {
		if math.Abs(hc[m])*rj < 1e-17*math.Abs(f) {
			break
		}
		j := m
		s := pc[j] * (q0 - p0)
		for i := 1; i < j; i++ {
			s -= pc[i] * pc[j-i]
		}
		pc[j+1] = s / float64(j+1)
		s = c0*hc[j] - o.s*hc[0]*hc[j]
		for i := 1; i <= j; i++ {
			s -= (o.B*pc[i] + o.s*hc[i]) * hc[j-i]
		}
		hc[j+1] = s / float64(j+1)
		rj *= r
	}
	if m == seriesOrder && math.Abs(hc[m])*rj >= 1e-17*math.Abs(f) {
		return halley, math.NaN()
	}
	d = halley
	for it := 0; it < 8; it++ {
		g, dg := 0.0, 0.0
		for j := m; j >= 0; j-- {
			g = g*d + hc[j]/float64(j+1)
			dg = dg*d + hc[j]
		}
		g = f + g*d
		if !(dg > 0) {
			return halley, math.NaN()
		}
		nd := d - g/dg
		done := math.Abs(nd-d) <= 1e-16*math.Abs(nd)
		d = nd
		if done {
			break
		}
	}
	if !(math.Abs(d) <= r) { // outside the radius the terms were checked at
		return halley, math.NaN()
	}
	for j := m; j >= 0; j-- {
		hAt = hAt*d + hc[j]
	}
	return d, hAt
}

// ulp returns the spacing of float64 values at x.
func ulp(x float64) float64 {
	x = math.Abs(x)
	return math.Nextafter(x, math.Inf(1)) - x
}

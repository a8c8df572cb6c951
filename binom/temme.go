package binom

import (
	"math"
	"sync"

	"github.com/kofnlab/kofn/internal/xmath"
)

// The uniform asymptotic expansion of the regularized incomplete beta
// function for large parameters, after Temme NM, "Incomplete Laplace
// integrals: uniform asymptotic expansion with application to the
// incomplete beta function", SIAM J. Math. Anal. 18:1638-1663 (1987; year
// and pages recalled), in a form derived here for the binomial tails and
// checked against mpmath (testdata/binom_golden.tsv), against an exact
// math/big oracle, and against the continued fraction where both apply.
//
// With a = N-k, b = k+1, mu = a+b = N+1, x0 = a/mu, y0 = b/mu and
// sigma = sqrt(x0 y0), the substitution t = x0 + sigma u and
//
//	-eta^2/2 = x0 ln(t/x0) + y0 ln((1-t)/y0),  sign(eta) = sign(t-x0),
//
// turns I_x(a, b) into a Gaussian integral over eta whose amplitude is
// H(eta) = eta/u(eta) = sum_j g_j eta^j. In the scaled variable u the phase
// is -eta^2/2 = sum_{j>=2} (-1)^(j+1) U_{j-1}(omega) u^j / j, where
// omega = (y0-x0)/sigma and U_m are the Fibonacci polynomials
// (U_0 = 0, U_1 = 1, U_{m+1} = omega U_m + U_{m-1}), so each g_j is a
// polynomial in omega; Lagrange inversion gives, with
// V(u) = (eta/u)^2 = sum_{m>=0} 2 (-1)^m U_{m+1}(omega) u^m / (m+2),
//
//	g_0 = 1,  g_1 = -omega/3,  g_n = [u^n] V(u)^(-(n-1)/2) / (1-n).
//
// Integrating term by term (Watson's lemma) with z = eta sqrt(mu):
//
//	I_x(a, b) = Phi(z) - phi(z) S / D,  S = sum_{j>=1} g_j mu^(-j/2) P_j(z),
//
// where P_0 = 0, P_1 = 1, P_j = z^(j-1) + (j-1) P_{j-2}, and
// D = Gamma*(a) Gamma*(b) / Gamma*(mu) (Gamma* the gamma function over its
// Stirling approximation, exp(stirlerr)) is the exact value of the series
// the even terms would give for the complete integral. The exponent is a
// sum of two deviance terms, z^2/2 = bd0(a, mu x) + bd0(b, mu (1-x)), so
// both tails come out directly: P(X <= k) = I_q(a, b) and
// P(X > k) = Phi(-z) + phi(z) S / D, each through erfc of |z|.
//
// The terms behave like (|z| / sqrt(min(a, b)))^j, so the expansion serves
// the bulk of a distribution with a large standard deviation, exactly where
// the continued fraction is slow.

// temmeOrder is the highest power of mu^(-1/2) the expansion sums.
const temmeOrder = 40

var (
	temmeOnce sync.Once
	// temmeG[j][l] is the coefficient of omega^(j-2l) in g_j.
	temmeG [temmeOrder + 1][]float64
)

// polyMulAcc adds s*a*b to dst (polynomials by ascending power), dropping
// powers beyond len(dst).
func polyMulAcc(dst, a, b []float64, s float64) {
	for i, ai := range a {
		if ai == 0 {
			continue
		}
		for j, bj := range b {
			if i+j >= len(dst) {
				break
			}
			dst[i+j] += s * ai * bj
		}
	}
}

// temmeInit fills temmeG from the formulas above.
func temmeInit() {
	const J = temmeOrder
	// Fibonacci polynomials U_0..U_{J+1}.
	u := make([][]float64, J+2)
	u[0] = []float64{0}
	u[1] = []float64{1}
	for m := 1; m <= J; m++ {
		next := make([]float64, m+1)
		for i, c := range u[m] {
			next[i+1] += c
		}
		for i, c := range u[m-1] {
			next[i] += c
		}
		u[m+1] = next
	}
	// V_m = 2 (-1)^m U_{m+1} / (m+2).
	v := make([][]float64, J+1)
	for m := 0; m <= J; m++ {
		s := 2 / float64(m+2)
		if m%2 == 1 {
			s = -s
		}
		v[m] = make([]float64, len(u[m+1]))
		for i, c := range u[m+1] {
			v[m][i] = s * c
		}
	}
	temmeG[0] = []float64{1}
	temmeG[1] = []float64{-1.0 / 3} // omega^1
	f := make([][]float64, J+1)
	for n := 2; n <= J; n++ {
		// F = V^s, s = -(n-1)/2, by Miller's recurrence
		// F_m = (1/m) sum_{i=1..m} ((s+1) i - m) V_i F_{m-i}.
		s := -float64(n-1) / 2
		f[0] = []float64{1}
		for m := 1; m <= n; m++ {
			fm := make([]float64, m+1)
			for i := 1; i <= m; i++ {
				polyMulAcc(fm, v[i], f[m-i], ((s+1)*float64(i)-float64(m))/float64(m))
			}
			f[m] = fm
		}
		// g_n = F_n / (1-n); keep the powers of parity n, highest first.
		g := make([]float64, 0, n/2+1)
		for l := 0; 2*l <= n; l++ {
			g = append(g, f[n][n-2*l]/float64(1-n))
		}
		temmeG[n] = g
	}
	// temmeG[1] by the same layout: coefficient of omega^1.
}

// temmeTail returns ln of the smaller tail of the binomial at k
// (0 <= k < N, 0 < P < 1) by the uniform expansion, the tail itself (0 if
// it is below about 1e-190, where its complement rounds to 1), and
// whether it is the lower one, P(X <= k). ok is false where the series has
// not converged to double precision within temmeOrder terms (the caller
// then uses the continued fraction or the term sums).
func (d Dist) temmeTail(k int64) (lnSmall, small float64, lower, ok bool) {
	lnSmall, small, _, lower, ok = d.temmeSmall(k, false)
	if ok && math.IsNaN(lnSmall) {
		lnSmall = xmath.Log(small)
	}
	return lnSmall, small, lower, ok
}

// temmeSmall is temmeTail with lnSmall left NaN where the plain tail is
// at hand (above about 1e-190), for callers that may not need it, and
// if withPMF, with b(k) = P(X = k) from the same parts where they give it
// (0 elsewhere): with a = N-k, b = k+1, mu = N+1,
//
//	b(k) = x^a (1-x)^b / (a P B(a, b)) = phi(z) sqrt(b / (a mu)) / (P D)
//
// by Stirling's formula for 1/B(a, b) = sqrt(a b / (2 pi mu)) mu^mu /
// (a^a b^b D), the same deviance and D as the tail.
func (d Dist) temmeSmall(k int64, withPMF bool) (lnSmall, small, pmf float64, lower, ok bool) {
	temmeOnce.Do(temmeInit)
	fa := float64(d.N - k)
	fb := float64(k + 1)
	mu := float64(d.N) + 1
	mpHi, mpLo, mqHi, mqLo := compMeans(mu, d.P)
	dev := bd0(fa, mqHi, mqLo) + bd0(fb, mpHi, mpLo) // z^2/2
	z := math.Sqrt(2 * dev)
	lower = (fb-mpHi)-mpLo < 0 // eta < 0: k+1 < (N+1)P
	if lower {
		z = -z
	}
	az := math.Abs(z)
	// A lower bound on Mills' ratio Phi(-|z|)/phi(z) (Birnbaum 1942) sets
	// the truncation: terms below 1e-17 of it no longer count.
	tol := 2e-17 / (az + math.Sqrt(az*az+4))
	// One division for every reciprocal below (a, b, mu >= 25).
	rab := 1 / (fa * fb * mu)
	e := rab * fa * fb // mu^(-1)
	sr := math.Sqrt(rab)
	w := (fb - fa) * sr // omega mu^(-1/2) = (b-a)/sqrt(a b mu)
	w2 := w * w
	var epow [temmeOrder/2 + 1]float64
	epow[0] = 1
	// S = sum_j G_j P_j(z), G_j = g_j(omega) mu^(-j/2)
	//   = w^(j mod 2) sum_l c_{j,l} w^(j-2l-j mod 2) e^l.
	var s float64
	pPrev, pCur := 0.0, 1.0 // P_{j-1}, P_j at j = 1
	zpow := 1.0             // z^(j-1)
	prevAbs := math.Inf(1)
	converged := false
	for j := 1; j <= temmeOrder; j++ {
		if j > 1 {
			zpow *= z
			pPrev, pCur = pCur, zpow+float64(j-1)*pPrev
		}
		c := temmeG[j]
		h := len(c) - 1
		if epow[h] == 0 {
			epow[h] = epow[h-1] * e
		}
		ep := epow[:h+1]
		acc := c[0]
		for l := 1; l < len(c) && l < len(ep); l++ {
			acc = acc*w2 + c[l]*ep[l]
		}
		if j%2 == 1 {
			acc *= w
		}
		t := acc * pCur
		s += t
		at := math.Abs(t)
		if at+prevAbs <= tol {
			converged = true
			break
		}
		prevAbs = at
	}
	if !converged {
		return 0, 0, 0, lower, false
	}
	// D = Gamma*(a) Gamma*(b) / Gamma*(mu) = e^x with |x| < 0.007 (a, b >=
	// 25): Taylor to x^6 is exact to 1e-19.
	x := stirlerrSeries(fa, rab*fb*mu) + stirlerrSeries(fb, rab*fa*mu) - stirlerrSeries(mu, e)
	dd := 1 + x*(1+x/2*(1+x/3*(1+x/4*(1+x/5*(1+x/6)))))
	corr := s / dd
	if lower {
		corr = -corr
	}
	lnPhi := -dev - 0.5*ln2pi
	if az < 30 {
		// Tail = Phi(-|z|) -+ phi(z) S/D, both terms from erfc and exp.
		ePhi := math.Exp(lnPhi)
		small = 0.5*math.Erfc(az/math.Sqrt2) + ePhi*corr
		if withPMF {
			pmf = ePhi * (fb * sr) / (d.P * dd)
		}
		return math.NaN(), small, pmf, lower, true
	}
	lnSmall = lnPhi + math.Log(millsRatio(az)+corr)
	return lnSmall, math.Exp(lnSmall), 0, lower, true
}

// millsRatio returns Phi(-x)/phi(x) for x >= 30 by its asymptotic series
// 1/x (1 - 1/x^2 + 3/x^4 - 15/x^6 + ...), where nine terms reach 1e-17.
func millsRatio(x float64) float64 {
	r := 1 / (x * x)
	s, t := 1.0, 1.0
	for j := 1.0; j <= 9; j++ {
		t *= -(2*j - 1) * r
		s += t
	}
	return s / x
}

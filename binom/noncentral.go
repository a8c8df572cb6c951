package binom

import (
	"math"
	"math/big"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/xmath"
)

// NoncentralHyper is Fisher's noncentral hypergeometric distribution: the
// distribution of the top-left cell X of a 2x2 table with fixed margins
// (grand total N = Total, column total K = Successes, row total n = Draws)
// when the table's odds ratio is psi = OddsRatio,
//
//	P(X = x) = C(K, x) C(N-K, n-x) psi^x / sum_j C(K, j) C(N-K, n-j) psi^j
//
// over the hypergeometric support max(0, n-(N-K)) <= x <= min(n, K). It is
// the conditional distribution behind the exact conditional (Cornfield)
// interval for the odds ratio and the conditional maximum-likelihood
// estimate, which solves Mean(psi) = observed x. psi = 1 is Hyper.
//
// Limits: psi = 0 puts all mass on the bottom of the support and psi = +Inf
// all on the top (the limits of the formula as psi goes to 0 or +Inf).
//
// Build it with NewNoncentralHyper, which validates; a NoncentralHyper
// built by hand outside that domain makes every method return NaN (-1 for
// Mode); no method panics. The domain includes the spread bound
// MaxHyperStdDev, checked on the standard deviation at the mode (see
// NewNoncentralHyper); Support answers whatever the spread.
//
// Source: Fisher RA (1935), The logic of inductive inference, J. Roy.
// Statist. Soc. 98:39-82; Johnson NL, Kemp AW, Kotz S (2005), Univariate
// Discrete Distributions, 3rd ed., section 6.11.
type NoncentralHyper struct {
	Total     int64   // grand total N, 0 <= N <= MaxN
	Successes int64   // first column total K, 0 <= K <= N
	Draws     int64   // first row total n, 0 <= n <= N
	OddsRatio float64 // odds ratio psi, 0 <= psi <= +Inf
}

// NewNoncentralHyper returns Fisher's noncentral hypergeometric
// distribution. It fails with ErrInvalidArgument when a count is negative,
// successes or draws exceeds total, or oddsRatio is negative or NaN, and
// with ErrTooLarge when total > MaxN or when the standard deviation
// exceeds MaxHyperStdDev. For psi = 1 that is the central one; otherwise
// the standard deviation at the mode m (from the PMF's second log
// difference there),
//
//	sigma^2 ~ 1 / (1/(m+1/2) + 1/(K-m+1/2) + 1/(n-m+1/2) + 1/(N-K-n+m+1/2)),
//
// within a few percent of the true one at sizes where the bound matters.
func NewNoncentralHyper(total, successes, draws int64, oddsRatio float64) (NoncentralHyper, error) {
	const fn = "binom.NewNoncentralHyper"
	if err := checkHyper(fn, total, successes, draws); err != nil {
		return NoncentralHyper{}, err
	}
	if !(oddsRatio >= 0) {
		return NoncentralHyper{}, argerr.Invalid(fn, "oddsRatio", oddsRatio, "is not an odds ratio in [0, +Inf]")
	}
	d := NoncentralHyper{Total: total, Successes: successes, Draws: draws, OddsRatio: oddsRatio}
	if v := d.spread(); !spreadOK(v) {
		return NoncentralHyper{}, spreadError(fn, "draws", draws, v)
	}
	return d, nil
}

func (d NoncentralHyper) hyper() Hyper {
	return Hyper{Total: d.Total, Successes: d.Successes, Draws: d.Draws}
}

// spread returns the variance checked against MaxHyperStdDev: the central
// one for psi = 1, otherwise the curvature estimate at the mode (see
// NewNoncentralHyper); 0 for a point mass. The counts must be in the domain.
func (d NoncentralHyper) spread() float64 {
	h := d.hyper()
	if d.OddsRatio == 1 {
		return h.varianceFloat()
	}
	if _, ok := d.pointMass(); ok {
		return 0
	}
	m := float64(d.mode())
	K, n, N := float64(h.Successes), float64(h.Draws), float64(h.Total)
	return 1 / (1/(m+0.5) + 1/(K-m+0.5) + 1/(n-m+0.5) + 1/(N-K-n+m+0.5))
}

func (d NoncentralHyper) valid() bool {
	return d.hyper().inDomain() && d.OddsRatio >= 0 && spreadOK(d.spread())
}

// Support returns the smallest and largest values of positive
// probability for 0 < psi < +Inf, the hypergeometric support (see the type
// doc for psi = 0 and +Inf); (-1, -1) for counts outside
// NewNoncentralHyper's domain. It answers whatever the spread.
func (d NoncentralHyper) Support() (lo, hi int64) {
	if !d.hyper().inDomain() || !(d.OddsRatio >= 0) {
		return -1, -1
	}
	return d.hyper().Support()
}

// pointMass returns the single value carrying all probability when the
// distribution is degenerate (one-point support, psi = 0 or +Inf).
func (d NoncentralHyper) pointMass() (x int64, ok bool) {
	lo, hi := d.hyper().Support()
	switch {
	case lo == hi || d.OddsRatio == 0:
		return lo, true
	case math.IsInf(d.OddsRatio, 1):
		return hi, true
	}
	return 0, false
}

// Mode returns a most probable value: the largest x with
// P(X = x) >= P(X = x-1), found from the root of the quadratic
// psi (K-x+1)(n-x+1) = x (N-K-n+x) and checked against the PMF ratios.
// -1 for an invalid distribution.
func (d NoncentralHyper) Mode() int64 {
	if !d.valid() {
		return -1
	}
	return d.mode()
}

// mode is Mode for counts in the domain and psi >= 0, whatever the spread.
func (d NoncentralHyper) mode() int64 {
	if x, ok := d.pointMass(); ok {
		return x
	}
	h := d.hyper()
	if d.OddsRatio == 1 {
		return h.Mode()
	}
	lo, hi := h.Support()
	psi := d.OddsRatio
	K, n, N := float64(h.Successes), float64(h.Draws), float64(h.Total)
	// A x^2 + B x + C = 0, scaled by 1/psi when psi > 1 against overflow.
	A, B, C := psi-1, -(psi*(K+n+2) + (N - K - n)), psi*(K+1)*(n+1)
	if psi > 1 {
		A, B, C = 1-1/psi, -((K + n + 2) + (N-K-n)/psi), (K+1)*(n+1)
	}
	sq := math.Sqrt(math.Max(0, B*B-4*A*C)) // real roots; guard the rounding
	var x float64
	if B <= 0 {
		x = 2 * C / (sq - B)
	} else {
		x = -(B + sq) / (2 * A)
	}
	m := lo
	if x > float64(hi) {
		m = hi
	} else if x > float64(lo) {
		m = int64(x)
	}
	for m < hi && h.ratioUp(m)*psi >= 1 {
		m++
	}
	for m > lo && h.ratioDown(m)/psi > 1 {
		m--
	}
	return m
}

// weights returns the normalised weights of a non-degenerate distribution
// with the given mode (d.Mode()): one outward summation from the mode,
// O(standard deviation) terms; visit, when not nil, sees each term.
//
// The log weights come from a two-binomial form of Loader's (2000)
// identity: for any p1, p2 in (0, 1) with odds ratio
// psi' = p1 (1-p2) / ((1-p1) p2),
//
//	C(K, j) C(N-K, n-j) psi^j  ∝  b(j; K, p1) b(n-j; N-K, p2) (psi/psi')^j.
//
// With p1 = (m + 1/2)/(K + 1) at the mode m and p2 solving psi' = psi (or
// p2 = (n-m+1/2)/(N-K+1) and p1 from psi, whichever binomial has its mode
// farther from the ends of its range), both binomial terms sit near their
// own modes, so their logarithms are small and keep their absolute
// accuracy; the residual ln(psi/psi'), of the order of one rounding, is
// computed from an exact numerator (logOddsResidual). Odds ratios so
// extreme that p1 or p2 would leave the normal floating-point range use
// the plain form instead: the central PMF times psi^(j-m). (That form
// in general loses digits in proportion to
// |ln P_central(m)|, 1e5 and more at totals of 1e6.)
func (d NoncentralHyper) weights(mode int64, visit func(j int64, t float64)) hyperWeights {
	h := d.hyper()
	w := hyperWeights{h: h, psi: d.OddsRatio, lnPsi: xmath.Log(d.OddsRatio), mode: mode}
	psi := d.OddsRatio
	m, K, N, n := w.mode, h.Successes, h.Total, h.Draws
	var p1, p2 float64
	if min(m, K-m) >= min(n-m, N-K-n+m) {
		// Centre the first binomial; the second follows from the odds.
		p1 = (float64(m) + 0.5) / (float64(K) + 1)
		p2 = p1 / (p1 + psi*(1-p1))
	} else {
		p2 = (float64(n-m) + 0.5) / (float64(N-K) + 1)
		p1 = psi * p2 / (psi*p2 + (1 - p2))
	}
	// Far from the normal range (psi beyond about 1e+-290) the plain form
	// below serves: the distribution is then a near point mass.
	if p1 >= 1e-290 && p1 < 1 && p2 >= 1e-290 && p2 < 1 {
		w.tilt, w.p1, w.p2, w.delta = true, p1, p2, logOddsResidual(psi, p1, p2)
	}
	lo, hi := h.Support()
	w.logZ = w.logRangeAtMode(lo, hi, visit)
	return w
}

// LogProb returns ln P(X = x): -Inf outside the support (and off the point
// mass when psi is 0 or +Inf), NaN only for an invalid distribution.
//
// The normalising sum is taken over the terms around the mode that matter
// (outward by the PMF ratio recurrence until the rest is below 1e-17
// relative), so one call costs O(standard deviation), not O(support).
// Accuracy: within about 1e-14 of the true value relative to
// max(1, |ln P|), checked against mpmath. psi = 1 is Hyper.LogProb.
func (d NoncentralHyper) LogProb(x int64) float64 {
	if !d.valid() {
		return math.NaN()
	}
	if m, ok := d.pointMass(); ok {
		if x == m {
			return 0
		}
		return math.Inf(-1)
	}
	lo, hi := d.Support()
	if x < lo || x > hi {
		return math.Inf(-1)
	}
	if d.OddsRatio == 1 {
		return d.hyper().LogProb(x)
	}
	w := d.weights(d.mode(), nil)
	return w.logTerm(x) - w.logZ
}

// Prob returns P(X = x) = exp(LogProb(x)).
func (d NoncentralHyper) Prob(x int64) float64 { return math.Exp(d.LogProb(x)) }

// LogProbRange returns ln P(lo <= X <= hi), -Inf for an empty range or one
// missing the support. Each tail is summed directly (as for Hyper), never
// as a complement of a larger one. Accuracy as LogProb; cost
// O(standard deviation).
func (d NoncentralHyper) LogProbRange(lo, hi int64) float64 {
	if !d.valid() {
		return math.NaN()
	}
	if m, ok := d.pointMass(); ok {
		if lo <= m && m <= hi {
			return 0
		}
		return math.Inf(-1)
	}
	if d.OddsRatio == 1 {
		return d.hyper().LogProbRange(lo, hi)
	}
	slo, shi := d.Support()
	lo, hi, v, done := clipRange(lo, hi, slo, shi)
	if done {
		return v
	}
	w := d.weights(d.mode(), nil)
	return min(0, w.logRange(lo, hi)) // rounding never lifts a probability above 1
}

// ProbRange returns P(lo <= X <= hi) = exp(LogProbRange(lo, hi)).
func (d NoncentralHyper) ProbRange(lo, hi int64) float64 { return math.Exp(d.LogProbRange(lo, hi)) }

// LogCDF returns ln P(X <= k), computed directly.
func (d NoncentralHyper) LogCDF(k int64) float64 {
	return d.LogProbRange(math.MinInt64, k)
}

// LogSurvival returns ln P(X > k), computed directly (never as a complement
// of the CDF).
func (d NoncentralHyper) LogSurvival(k int64) float64 {
	if k == math.MaxInt64 {
		if !d.valid() {
			return math.NaN()
		}
		return math.Inf(-1)
	}
	return d.LogProbRange(k+1, math.MaxInt64)
}

// CDF returns P(X <= k) = exp(LogCDF(k)).
func (d NoncentralHyper) CDF(k int64) float64 { return math.Exp(d.LogCDF(k)) }

// Survival returns P(X > k) = exp(LogSurvival(k)).
func (d NoncentralHyper) Survival(k int64) float64 { return math.Exp(d.LogSurvival(k)) }

// moments returns the mean and variance by one outward summation from the
// mode, with offsets from the mode so that no large numbers cancel.
func (d NoncentralHyper) moments() (mean, variance float64) {
	if m, ok := d.pointMass(); ok {
		return float64(m), 0
	}
	var s0, s1, s2 float64
	m := d.mode()
	d.weights(m, func(j int64, t float64) {
		u := float64(j - m)
		s0 += t
		s1 += t * u
		s2 += t * u * u
	})
	e := s1 / s0
	return float64(m) + e, math.Max(0, s2/s0-e*e)
}

// Mean returns the conditional mean E[X; psi], the function whose root in
// psi is the conditional maximum-likelihood estimate of the odds ratio. It
// increases strictly with psi from the bottom of the support (psi = 0) to
// its top (psi = +Inf). Accuracy: about 1e-15 relative; cost
// O(standard deviation). NaN only for an invalid distribution.
func (d NoncentralHyper) Mean() float64 {
	if !d.valid() {
		return math.NaN()
	}
	if d.OddsRatio == 1 {
		return d.hyper().Mean()
	}
	mean, _ := d.moments()
	return mean
}

// Variance returns Var[X; psi] (0 for a point mass), which is also the
// derivative of Mean with respect to ln psi. Accuracy: about 1e-14
// relative; cost O(standard deviation). NaN only for an invalid
// distribution.
func (d NoncentralHyper) Variance() float64 {
	if !d.valid() {
		return math.NaN()
	}
	if d.OddsRatio == 1 {
		return d.hyper().Variance()
	}
	_, v := d.moments()
	return v
}

// logOddsResidual returns ln(psi / psi') for psi' = p1 (1-p2) / ((1-p1) p2),
// the exact odds ratio of the two doubles p1 and p2, evaluated as
// log1p((psi (1-p1) p2 - p1 (1-p2)) / (p1 (1-p2))). The numerator cancels
// nearly equal products; it is formed in double-double arithmetic (exact
// products by math.FMA, exact 1-p by TwoSum), or in big.Float where the
// products are so small that their low parts would be subnormal.
func logOddsResidual(psi, p1, p2 float64) float64 {
	q1h, q1l := oneMinus(p1)
	q2h, q2l := oneMinus(p2)
	xh := psi * q1h
	xl := math.FMA(psi, q1h, -xh) + psi*q1l
	ah := xh * p2
	al := math.FMA(xh, p2, -ah) + xl*p2
	bh := p1 * q2h
	bl := math.FMA(p1, q2h, -bh) + p1*q2l
	if !(ah > 1e-200 && bh > 1e-200 && ah < 1e200 && bh < 1e200) {
		return logOddsResidualBig(psi, p1, p2)
	}
	// ah and bh agree to within a factor 2, so ah - bh is exact (Sterbenz).
	return math.Log1p(((ah - bh) + (al - bl)) / bh)
}

// oneMinus returns 1 - p as an unevaluated sum hi + lo, exactly (TwoSum).
func oneMinus(p float64) (hi, lo float64) {
	hi = 1 - p
	bv := hi - 1
	lo = (1 - (hi - bv)) + (-p - bv)
	return hi, lo
}

// logOddsResidualBig is logOddsResidual in 256-bit big.Float arithmetic,
// for extreme magnitudes.
func logOddsResidualBig(psi, p1, p2 float64) float64 {
	const prec = 256
	f := func(x float64) *big.Float { return new(big.Float).SetPrec(prec).SetFloat64(x) }
	one := f(1)
	q1 := new(big.Float).SetPrec(prec).Sub(one, f(p1))
	q2 := new(big.Float).SetPrec(prec).Sub(one, f(p2))
	a := new(big.Float).SetPrec(prec).Mul(f(psi), q1)
	a.Mul(a, f(p2))
	b := new(big.Float).SetPrec(prec).Mul(f(p1), q2)
	den, _ := b.Float64()
	a.Sub(a, b)
	num, _ := a.Float64()
	return math.Log1p(num / den)
}

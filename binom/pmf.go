package binom

import (
	"math"

	"github.com/kofnlab/kofn/internal/xmath"
)

// ln2pi is ln(2 pi).
const ln2pi = 1.8378770664093454835606594728112

// stirlerrTable holds stirlerr(n) for n = 0..15, computed with mpmath at 40
// digits (lgamma(n+1) - (n+1/2) ln n + n - ln sqrt(2 pi)); entry 0 is unused.
var stirlerrTable = [16]float64{
	0,
	0.08106146679532725822,
	0.041340695955409294094,
	0.027677925684998339149,
	0.020790672103765093112,
	0.016644691189821192163,
	0.013876128823070747999,
	0.011896709945891770095,
	0.010411265261972096497,
	0.0092554621827127329177,
	0.0083305634333628712565,
	0.007573675487951840795,
	0.0069428401072095298657,
	0.0064089941880042070684,
	0.0059513701127588477356,
	0.005554733551962801371,
}

// stirlerr returns the error of Stirling's formula for n!,
//
//	ln n! - (n + 1/2) ln n + n - ln sqrt(2 pi),
//
// for integer n >= 1: a table up to 15, then the asymptotic series
// 1/(12n) - 1/(360n^3) + 1/(1260n^5) - 1/(1680n^7) + 1/(1188n^9), truncated
// where the next term is below 1e-17 relative (Loader 2000, section 2).
func stirlerr(n float64) float64 {
	if n <= 15 {
		return stirlerrTable[int(n)]
	}
	return stirlerrSeries(n, 1/n)
}

// stirlerrSeries is stirlerr for n > 15 given r = 1/n, so that callers can
// share one division among several arguments.
func stirlerrSeries(n, r float64) float64 {
	const (
		s0 = 1.0 / 12
		s1 = 1.0 / 360
		s2 = 1.0 / 1260
		s3 = 1.0 / 1680
		s4 = 1.0 / 1188
	)
	rr := r * r
	switch {
	case n > 500:
		return (s0 - s1*rr) * r
	case n > 80:
		return (s0 - (s1-s2*rr)*rr) * r
	case n > 35:
		return (s0 - (s1-(s2-s3*rr)*rr)*rr) * r
	default:
		return (s0 - (s1-(s2-(s3-s4*rr)*rr)*rr)*rr) * r
	}
}

// invOdd[i] is 1/(2i+3), the weights of bd0's series.
var invOdd = [...]float64{1.0 / 3, 1.0 / 5, 1.0 / 7, 1.0 / 9, 1.0 / 11, 1.0 / 13, 1.0 / 15, 1.0 / 17,
	1.0 / 19, 1.0 / 21, 1.0 / 23, 1.0 / 25, 1.0 / 27, 1.0 / 29, 1.0 / 31, 1.0 / 33, 1.0 / 35, 1.0 / 37}

// bd0 returns the deviance term x ln(x/m) + m - x for x >= 0 and m > 0,
// where m = mHi + mLo is held as an unevaluated sum (a compensated
// product n*p). Near x = m it sums the series in v = (x-m)/(x+m) to avoid
// cancellation (Loader 2000, section 3) with x-m taken to the low part of
// m; elsewhere the low part enters through the first-order term
// mLo (1 - x/m), exact to rounding.
func bd0(x, mHi, mLo float64) float64 {
	if d := (x - mHi) - mLo; math.Abs(d) < 0.1*(x+mHi) {
		return bd0Series(x, mHi, mLo, d)
	}
	r := x / mHi
	return x*math.Log(r) + mHi - x + mLo*(1-r)
}

// bd0Series is bd0 near the mean, for d = (x - mHi) - mLo with
// |d| < 0.1 (x + mHi).
func bd0Series(x, mHi, mLo, d float64) float64 {
	// x - mHi is exact here (Sterbenz), so d carries the low part and
	// the series is relative-accurate even when x - m is far below
	// the rounding unit of m (the deviance is then (x-m)^2/(2m), and
	// its square root, the signed distance the uniform expansion
	// needs, is first order in mLo). |v| < 0.1: the terms fall by
	// v^2 < 0.01, and 18 of them reach 1e-36.
	v := d / (x + mHi + mLo)
	s := d * v
	ej := 2 * x * v
	v2 := v * v
	for _, w := range invOdd {
		ej *= v2
		s1 := s + ej*w
		if s1 == s {
			break
		}
		s = s1
	}
	return s
}

// bd0Log is bd0 for a caller that holds r = x/mHi and l = ln r already.
func bd0Log(x, mHi, mLo, r, l float64) float64 {
	if d := (x - mHi) - mLo; math.Abs(d) < 0.1*(x+mHi) {
		return bd0Series(x, mHi, mLo, d)
	}
	return x*l + mHi - x + mLo*(1-r)
}

// compMeans returns m p and m (1-p) as unevaluated sums hi + lo, accurate
// to about 2^-106 relative: m p by math.FMA and m - m p by an exact TwoSum,
// so 1-p is never rounded (it would be for p < 1/2).
func compMeans(m, p float64) (mpHi, mpLo, mqHi, mqLo float64) {
	mpHi = m * p
	mpLo = math.FMA(m, p, -mpHi)
	s := m - mpHi
	bb := s - m
	err := (m - (s - bb)) + (-mpHi - bb)
	lo := err - mpLo
	mqHi = s + lo
	mqLo = lo - (mqHi - s)
	return
}

// LogProb returns ln P(X = k): -Inf outside 0..N (and where the probability
// is exactly 0 at P = 0 or 1), NaN only for an invalid Dist.
//
// It uses the saddle-point form of Loader (2000), "Fast and accurate
// computation of binomial probabilities":
//
//	ln b(k) = stirlerr(N) - stirlerr(k) - stirlerr(N-k)
//	          - bd0(k, NP) - bd0(N-k, N(1-P)) - (1/2) ln(2 pi k (N-k)/N)
//
// with k = 0 and k = N in closed form (N ln(1-P) by log1p, N ln P). N P and
// N (1-P) are compensated sums (math.FMA and an exact TwoSum), so neither
// the product nor 1-P is rounded into the deviance. For N <= smallN the
// Stirling errors and ln(k (N-k)/N) come from tables of stirlerr(i) and
// ln i, so that only the deviance terms away from the mean take a
// logarithm.
// Accuracy: within 1e-13 of the true value relative to max(1, |ln b|) for
// N up to 1e12 and P in [1e-15, 1-1e-15]; worst measured error 5e-15 over
// the 6046 mpmath values of testdata/binom_golden.tsv. Cost: O(1), no
// allocation, at most three logarithms (two for N <= smallN; measured
// figures in the README).
func (d Dist) LogProb(k int64) float64 {
	if v, ok := d.pmfSpecial(k); ok {
		return v
	}
	lc, lv := d.pmfParts(k)
	return lc - 0.5*lv
}

// pmfSpecial returns ln P(X = k) where it needs no formula: an invalid
// Dist (NaN), k outside 0..N, P = 0 or 1, k = 0 and k = N.
func (d Dist) pmfSpecial(k int64) (float64, bool) {
	if !d.valid() {
		return math.NaN(), true
	}
	if k < 0 || k > d.N {
		return math.Inf(-1), true
	}
	n, p := d.N, d.P
	switch {
	case p == 0:
		if k == 0 {
			return 0, true
		}
		return math.Inf(-1), true
	case p == 1:
		if k == n {
			return 0, true
		}
		return math.Inf(-1), true
	case k == 0:
		return float64(n) * math.Log1p(-p), true
	case k == n:
		return float64(n) * xmath.Log(p), true
	case p < tinyP:
		return d.tinyLogProb(k), true
	}
	return 0, false
}

// tinyP is the success probability below which N P (at most 2^53 P < 1e-184)
// can underflow inside Loader's form. There the PMF is computed from the
// exact identity
//
//	ln b(k; P) = ln b(k; P') + k (ln P - ln P') + (N-k) (ln(1-P) - ln(1-P'))
//
// with the reference P' = k/N, where ln b(k; P') sits at the mode and is
// accurate; the remaining terms are dominated by k ln P, so nothing
// cancels and the result keeps the package's relative accuracy.
const tinyP = 1e-200

// tinyLogProb returns ln P(X = k) for 0 < k < N and 0 < P < tinyP by the
// identity on tinyP.
func (d Dist) tinyLogProb(k int64) float64 {
	ref := Dist{N: d.N, P: float64(k) / float64(d.N)}
	lc, lv := ref.pmfParts(k)
	fk, fnk := float64(k), float64(d.N-k)
	return lc - 0.5*lv + fk*(xmath.Log(d.P)-math.Log(ref.P)) + fnk*(math.Log1p(-d.P)-math.Log1p(-ref.P))
}

// smallN is the largest N whose Stirling errors and logarithms of
// integers LogProb takes from tables (16 KiB in all).
const smallN = 1024

// lnInt[i] is ln i and stirTab[i] is stirlerr(i) for 1 <= i <= smallN
// (entry 0 unused): the mpmath values below 16, the series above, exactly
// the values stirlerr returns.
var lnInt, stirTab = func() (ln, st [smallN + 1]float64) {
	for i := 1; i <= smallN; i++ {
		ln[i] = math.Log(float64(i))
		st[i] = stirlerr(float64(i))
	}
	return
}()

// pmfParts returns the two parts of Loader's form for 0 < k < N and
// 0 < P < 1: ln P(X = k) = lc - lv/2 with lv = ln(2 pi k (N-k)/N).
func (d Dist) pmfParts(k int64) (lc, lv float64) {
	if d.N <= smallN {
		return d.smallParts(k)
	}
	lc, v := d.loaderParts(k)
	return lc, math.Log(v)
}

// smallParts is pmfParts for N <= smallN, from the tables: ln(2 pi k
// (N-k)/N) is a sum of four terms of size ln N at most, good to a few
// 1e-16 absolute, and both sums are symmetric in k and N-k, bit for bit.
// The log branches of the two deviance terms are bd0's, written out
// (the same operations in the same order) to save the calls.
func (d Dist) smallParts(k int64) (lc, lv float64) {
	fk, fnk := float64(k), float64(d.N-k)
	npHi, npLo, nqHi, nqLo := compMeans(float64(d.N), d.P)
	var b1, b2 float64
	if e := (fk - npHi) - npLo; math.Abs(e) < 0.1*(fk+npHi) {
		b1 = bd0Series(fk, npHi, npLo, e)
	} else {
		r := fk / npHi
		b1 = fk*math.Log(r) + npHi - fk + npLo*(1-r)
	}
	if e := (fnk - nqHi) - nqLo; math.Abs(e) < 0.1*(fnk+nqHi) {
		b2 = bd0Series(fnk, nqHi, nqLo, e)
	} else {
		r := fnk / nqHi
		b2 = fnk*math.Log(r) + nqHi - fnk + nqLo*(1-r)
	}
	lc = stirTab[d.N] - (stirTab[k] + stirTab[d.N-k]) - (b1 + b2)
	return lc, (lnInt[k] + lnInt[d.N-k]) - (lnInt[d.N] - ln2pi)
}

// loaderParts returns Loader's form for N > smallN as ln P(X = k) =
// lc - ln(v)/2 with v = 2 pi k (N-k)/N, for 0 < k < N and 0 < P < 1.
func (d Dist) loaderParts(k int64) (lc, v float64) {
	fk, fn := float64(k), float64(d.N)
	fnk := float64(d.N - k)
	npHi, npLo, nqHi, nqLo := compMeans(fn, d.P)
	var rn float64 // 1/N
	if fk > 15 && fnk > 15 {
		// One division for the three reciprocals the Stirling terms need.
		r := 1 / (fk * fnk * fn)
		rn = r * fk * fnk
		lc = stirlerrSeries(fn, rn) - stirlerrSeries(fk, r*fnk*fn) - stirlerrSeries(fnk, r*fk*fn)
	} else {
		rn = 1 / fn
		lc = stirlerr(fn) - stirlerr(fk) - stirlerr(fnk)
	}
	lc -= bd0(fk, npHi, npLo) + bd0(fnk, nqHi, nqLo)
	// (N-k)/N is formed from the exact N-k, so nothing cancels at k near N.
	return lc, 2 * math.Pi * fk * (fnk * rn)
}

// Prob returns P(X = k): 0 outside 0..N. It is exp(LogProb(k)) computed as
// e^lc / sqrt(2 pi k (N-k)/N) from the same parts (the square root is
// cheaper than the logarithm, and e^lc >= P(X = k) cannot underflow where
// P(X = k) does not); for N <= smallN as one exponential of the tabulated
// form. The exponential is the table-driven one of fastExp (Tang 1989),
// within about 1.5 units in the last place, a short chain of steps where
// math.Exp's is long.
// Accuracy: relative 1e-13 * max(1, |ln P(X = k)|) wherever the value is at
// least 1e-300 (the exponent's rounding alone costs that much; worst
// measured 4.6e-15); exactly 0 only where the true value rounds to 0.
// Cost: that of LogProb and one exponential, O(1), no allocation.
func (d Dist) Prob(k int64) float64 {
	if v, ok := d.pmfSpecial(k); ok {
		return math.Exp(v)
	}
	return d.prob(k)
}

// prob is Prob for 0 < k < N, 0 < P < 1 and P >= tinyP.
func (d Dist) prob(k int64) float64 {
	if d.N <= smallN {
		lc, lv := d.smallParts(k)
		return fastExp(lc - 0.5*lv)
	}
	lc, v := d.loaderParts(k)
	return fastExp(lc) / math.Sqrt(v)
}

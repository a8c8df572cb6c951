package binom

import (
	"math"

	"github.com/kofnlab/kofn/internal/xmath"
)

// farMinLog is the largest log target farStart takes, and farMinProb
// = e^farMinLog: nearer the bulk (tails above e^-8, within about 3.4
// standard deviations on the normal scale) the normal start of guess is
// as good and no dearer.
const (
	farMinLog  = -8
	farMinProb = 3.3546262790251185e-4 // e^-8

	farMinLogComp = -0.000335518908076820173938 // ln(1 - e^-8)
)

// farMaxRatio is the largest PMF ratio r_k toward the far end at the
// answer for which farStart answers: below it the bound on the tail's
// sum of ratios is within a few tenths of a trial.
const farMaxRatio = 0.6

// farStart returns a starting point for a quantile of a Dist with
// 0 < P < 1 and N <= smallN whose target lies far out on the smaller
// tail: lt is the natural log of the target on that tail, lower tells
// whether it is the lower tail P(X <= k) (the answer is then the
// smallest k with ln P(X <= k) >= lt) or the upper one P(X > k) (the
// smallest k with ln P(X > k) <= lt). ok is false where it does not
// apply (N > smallN, lt > farMinLog, or an answer nearer the bulk than
// farMaxRatio); the caller then starts from the normal quantile.
//
// There the normal start (the Cornish-Fisher expansion, refined on the
// uniform expansion only where both beta parameters are at least
// temmeMinAB) is weakest, and each refining step costs two logarithms.
// This start works on the log PMF instead, from the table lnFactTab of
// ln k! (no logarithm per step) and two logarithms in all, ln P and
// ln(1-P): with the upper tail read as the lower tail of N - X, which is
// binomial (N, 1-P),
//
//	ln b(k) = ln N! - ln k! - ln (N-k)! + k ln P + (N-k) ln(1-P),
//	P(X <= k) = b(k) S(k),  S(k) = 1 + r_k + r_k r_{k-1} + ...,
//	r_j = b(j-1)/b(j) = j (1-P) / ((N-j+1) P).
//
// Integer Newton steps on ln b find the smallest k with ln b(k) >= lt
// inside a bracket below the mode: a step up from a k short of lt,
// ceil(-f/g) for the gap f and the exact forward difference
// g = ln((N-k) P / ((k+1)(1-P))), does not pass that k (ln b is concave,
// so its differences fall), and a step down from a k past it, by the
// backward difference, lands below it. The first step is from k = 0; where
// it is longer than 16, the start moves on to where a normal curve through
// the mode reaches lt, if that is further; typically two to four steps. The
// answer is at most that k, since the tail exceeds b(k); steps down follow
// while ln b(k-1) + ln S(k-1) >= lt, with S bounded above by
// 1 + r_k/(1 - r_{k-1}) (the ratios fall away from the mode) and
// ln(1 + u) bracketed by 2u/(2+u) and u, so that a logarithm is taken only
// where the bracket straddles the target. Cost O(1): a few table look-ups
// and divisions per step, at most 12 steps. A start, not a result: locate
// decides every k on the exact tail.
func (d Dist) farStart(lt float64, lower bool, slack float64) (int64, bool) {
	n := d.N
	if n > smallN || !(lt <= farMinLog) {
		return 0, false
	}
	p, q := d.P, 1-d.P
	// ln(1-P) from the rounded 1-P: off by 1.2e-16 at most, 1.2e-13 in
	// ln b at N = smallN, nothing for a start.
	lp, lq := xmath.Log(p), math.Log(q)
	if !lower {
		p, q, lp, lq = q, p, lq, lp
	}
	fn := float64(n)
	dlq := lp - lq
	c := lnFactTab[n] + fn*lq
	lnb := func(k int64) float64 { return c - lnFactTab[k] - lnFactTab[n-k] + float64(k)*dlq }
	// The bracket (lo, hi] holds the smallest k with ln b(k) >= lt, which
	// is below the mode m (ln b(m) > -4 > lt for every N <= smallN). The
	// first step is from k = 0; where it is long, the start moves on to
	// where a normal curve through the mode reaches lt, if that is further.
	m := min(int64((fn+1)*p), n)
	f0 := fn*lq - lt // ln b(0) - lt
	if f0 >= 0 {
		return d.farAnswer(0, lower), true
	}
	lo, hi := int64(0), m
	k := int64(math.Ceil(-f0 / (lnInt[n] + dlq)))
	if k > 16 {
		if lbm := lnb(m); lbm > lt {
			k = max(k, m-int64(math.Sqrt(2*fn*p*q*(lbm-lt))))
		}
	}
	if hi-lo > 1 {
		k = min(max(k, lo+1), hi-1)
	}
	for it := 0; hi-lo > 1; it++ {
		if it == 12 || k < 0 {
			return 0, false
		}
		f := lnb(k) - lt
		var next int64
		if f < 0 {
			lo = k
			g := lnInt[n-k] - lnInt[k+1] + dlq // ln(b(k+1)/b(k)): the forward step falls short of the root
			if !(g > 0) {
				return 0, false
			}
			next = k + int64(math.Ceil(-f/g))
		} else {
			hi = k
			if k == 0 {
				break
			}
			g := lnInt[n-k+1] - lnInt[k] + dlq // ln(b(k)/b(k-1)): the backward step passes the root
			next = k - int64(f/g) - 1
		}
		k = min(max(next, lo+1), hi-1)
	}
	k = hi
	if fk := float64(k); fk*q > farMaxRatio*(fn-fk+1)*p { // r_k > farMaxRatio
		return 0, false
	}
	tol := 1e-9*math.Max(1, -lt) + slack
	for k > 0 {
		j := k - 1
		lbj := lnb(j)
		// S(j) <= 1 + u, u = r_j / (1 - r_{j-1}) <= 0.6/0.4 (the ratios
		// fall toward 0, and r_k <= farMaxRatio).
		if lbj+1.5 < lt-tol {
			break
		}
		u := 0.0
		if j > 0 {
			fj := float64(j)
			a := fn - fj + 1
			u = fj * q * (a + 1) / (a * ((a+1)*p - (fj-1)*q))
		}
		if lbj+u < lt-tol {
			break // even the bound on the tail at j falls short
		}
		if lbj+2*u/(2+u) < lt-tol && lbj+math.Log(1+u) < lt-tol {
			break
		}
		k = j
	}
	return d.farAnswer(k, lower), true
}

// farAnswer maps farStart's k on the lower tail of X or of N - X back to k.
func (d Dist) farAnswer(k int64, lower bool) int64 {
	if lower {
		return k
	}
	return d.N - 1 - k
}

// lnFactTab[k] is ln k! for 0 <= k <= smallN (8 KiB), from the tables of
// ln i and Stirling's errors: stirlerr(k) + (k + 1/2) ln k - k +
// ln sqrt(2 pi), good to a few units of 1e-16 times k ln k.
var lnFactTab = func() (t [smallN + 1]float64) {
	for k := 1; k <= smallN; k++ {
		fk := float64(k)
		t[k] = stirTab[k] + (fk+0.5)*lnInt[k] - fk + 0.5*ln2pi
	}
	return
}()

// farFromProb is farStart for a target u > 0 on the smaller tail given as a
// plain probability; it takes the logarithm only where u <= farMinProb.
// A u that is the complement 1 - q of a plain target q > 1/2 carries q's
// rounding, up to 2^-53 absolute: that much relative to u (at most 1/2)
// widens the steps' tolerance.
//
//go:noinline
func (d Dist) farFromProb(u float64, lower, complement bool) (int64, bool) {
	if d.N > smallN || !(u <= farMinProb) {
		return 0, false
	}
	slack := 0.0
	if complement {
		slack = math.Min(0.5, 0x1p-53/u)
	}
	return d.farStart(xmath.Log(u), lower, slack)
}

// farFromLog is farStart for a log target lq <= 0 of the lower tail (if
// lowerTarget) or the upper one: the target itself where lq <= ln(1/2),
// else its complement 1 - e^lq, on the other tail.
// The complement is taken only where it can be at most farMinProb, for
// lq >= farMinLogComp. Kept out of line (as farFromProb), so that the
// quantiles' other paths stay as short as they were; they call it only
// for a target beyond the thresholds.
//
//go:noinline
func (d Dist) farFromLog(lq float64, lowerTarget bool) (int64, bool) {
	switch {
	case lq <= -math.Ln2:
		return d.farStart(lq, lowerTarget, 0)
	case lq < farMinLogComp:
		return 0, false
	}
	return d.farFromProb(-math.Expm1(lq), !lowerTarget, false)
}

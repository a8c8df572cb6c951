package binom

import (
	"math"
	"math/rand/v2"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/beta"
	"github.com/kofnlab/kofn/internal/xmath"
)

// MaxBetaBinomN is the largest number of trials a BetaBinom accepts: 2^21
// (2097152). Its tails and quantiles are sums of PMF terms whose count can
// reach N when the mixing Beta is flat or U-shaped (A + B small), so the
// limit keeps every call under about 10 ms.
const MaxBetaBinomN int64 = 1 << 21

// MaxShape is the largest Beta shape parameter accepted (1e15): beyond it
// the shapes of a posterior could no longer hold a count added to them
// exactly, and the distribution is a binomial to working precision.
const MaxShape = 1e15

// MinShape is the smallest Beta shape parameter accepted (1e-150): below
// it the product of two shapes inside the PMF falls under the smallest
// normal double (2.2e-308), and the end terms were lost (P(X = 0) came out
// 0 instead of about 1/2 for shapes of 1e-160, and the quantiles with it);
// nearer the edge of the range the ratios underflow altogether. A shape
// that small is a point mass at 0 or N to any precision.
const MinShape = 1e-150

// BetaBinom is the beta-binomial distribution: the number of successes X in
// N trials whose success probability is itself drawn from a Beta(A, B)
// distribution,
//
//	P(X = k) = C(N, k) B(k + A, N - k + B) / B(A, B),  k = 0, ..., N.
//
// It is the prior (and posterior) predictive distribution of a binomial
// count under a Beta prior: after x successes in n trials with a
// Beta(a, b) prior, the successes among m further trials follow
// BetaBinom{m, a + x, b + n - x}.
//
// Build it with NewBetaBinom, which validates. A BetaBinom built by hand
// with N outside [0, MaxBetaBinomN] or A, B outside [MinShape, MaxShape]
// makes every method return NaN (or -1 for the integer-valued ones).
type BetaBinom struct {
	N int64   // number of trials, 0 <= N <= MaxBetaBinomN
	A float64 // first shape of the mixing Beta, in [MinShape, MaxShape]
	B float64 // second shape of the mixing Beta, in [MinShape, MaxShape]
}

// NewBetaBinom returns the beta-binomial distribution with n trials and
// mixing Beta(a, b). It fails with ErrInvalidArgument when n < 0 or a or b
// is not in [MinShape, MaxShape] (NaN included), and with ErrTooLarge when
// n > MaxBetaBinomN.
func NewBetaBinom(n int64, a, b float64) (BetaBinom, error) {
	const fn = "binom.NewBetaBinom"
	if err := argerr.Count(fn, "n", n); err != nil {
		return BetaBinom{}, err
	}
	if n > MaxBetaBinomN {
		return BetaBinom{}, argerr.TooLarge(fn, "n", n, "exceeds 2^21, the limit that keeps the tail sums under 10 ms")
	}
	if !(a >= MinShape && a <= MaxShape) {
		return BetaBinom{}, argerr.Invalid(fn, "a", a, "must lie in [1e-150, 1e15]")
	}
	if !(b >= MinShape && b <= MaxShape) {
		return BetaBinom{}, argerr.Invalid(fn, "b", b, "must lie in [1e-150, 1e15]")
	}
	return BetaBinom{N: n, A: a, B: b}, nil
}

func (d BetaBinom) valid() bool {
	return d.N >= 0 && d.N <= MaxBetaBinomN && d.A >= MinShape && d.A <= MaxShape && d.B >= MinShape && d.B <= MaxShape
}

// Mean returns N A / (A + B); NaN only for an invalid BetaBinom.
func (d BetaBinom) Mean() float64 {
	if !d.valid() {
		return math.NaN()
	}
	return float64(d.N) * (d.A / (d.A + d.B))
}

// Variance returns N A B (A + B + N) / ((A + B)^2 (A + B + 1)), a few ulp;
// NaN only for an invalid BetaBinom.
func (d BetaBinom) Variance() float64 {
	if !d.valid() {
		return math.NaN()
	}
	n, s := float64(d.N), d.A+d.B
	return n * (d.A / s) * (d.B / s) * (s + n) / (s + 1)
}

// StdDev returns the square root of Variance.
func (d BetaBinom) StdDev() float64 { return math.Sqrt(d.Variance()) }

// Skewness returns the third standardized moment,
//
//	(A + B + 2N)(B - A) / (A + B + 2) * sqrt((1 + A + B) / (N A B (N + A + B))),
//
// 0 for A = B; NaN for N = 0 (a point mass: 0/0) and for an invalid
// BetaBinom. Accuracy: a few ulp (the difference B - A is exact or rounded
// once).
func (d BetaBinom) Skewness() float64 {
	if !d.valid() || d.N == 0 {
		return math.NaN()
	}
	n, a, b := float64(d.N), d.A, d.B
	s := a + b
	// sqrt(a) and sqrt(b) apart: n a b underflows for subnormal shapes.
	return (s + 2*n) * (b - a) / (s + 2) * math.Sqrt((1+s)/(n*(n+s))) / math.Sqrt(a) / math.Sqrt(b)
}

// LogProb returns ln P(X = k); -Inf for k outside 0..N, NaN only for an
// invalid BetaBinom. It uses the exact product of three binomial densities
// extended to real arguments (f(x; m, p) = Gamma(m+1)/(Gamma(x+1)
// Gamma(m-x+1)) p^x (1-p)^(m-x)), in which the powers of p cancel for every p,
//
//	P(X = k) = f(k; N, p) f(A; A+B, p) / f(k+A; N+A+B, p)
//	           * (N+A+B) A B / ((k+A) (N-k+B) (A+B)),
//
// taken at p = (k+A)/(N+A+B), where the denominator's deviance is zero;
// each density is in Loader's (2000) saddle-point form (deviance and
// Stirling-error terms), the same trick Loader's product form uses for the
// hypergeometric. Both numerator densities are at most about 1, so no large
// logarithms cancel (differences of lgamma would lose about N A B ulp).
// Accuracy: about 1e-14 relative to max(1, |ln P|) (tested against mpmath
// at 50 digits, testdata/betabinom_golden.tsv). Cost O(1): three
// saddle-point densities.
func (d BetaBinom) LogProb(k int64) float64 {
	if !d.valid() {
		return math.NaN()
	}
	if k < 0 || k > d.N {
		return math.Inf(-1)
	}
	if d.N == 0 {
		return 0
	}
	n, a, b, x := float64(d.N), d.A, d.B, float64(k)
	m := n + a + b
	xa, yb := x+a, (n-x)+b
	p, q := xa/m, yb/m
	l := beta.LogBinomReal(x, n-x, p, q) + beta.LogBinomReal(a, b, p, q) - beta.LogBinomReal(xa, yb, p, q)
	return l + math.Log(m/xa) + math.Log(a/yb) + math.Log(b/(a+b))
}

// pmfLog evaluates LogProb for many k of one BetaBinom with the Stirling
// errors of the shapes (the part of LogBinomReal(A, B, p, q) that does not
// depend on k) computed once.
type pmfLog struct {
	d   BetaBinom
	cab float64 // beta.LogBinomRealShapes(A, B)
}

func (d BetaBinom) pmfLog() pmfLog {
	return pmfLog{d: d, cab: beta.LogBinomRealShapes(d.A, d.B)}
}

// at returns LogProb(k) for 0 <= k <= N by LogProb's formula.
func (c pmfLog) at(k int64) float64 {
	d := c.d
	if d.N == 0 {
		return 0
	}
	n, a, b, x := float64(d.N), d.A, d.B, float64(k)
	m := n + a + b
	xa, yb := x+a, (n-x)+b
	p, q := xa/m, yb/m
	l := beta.LogBinomReal(x, n-x, p, q) + beta.LogBinomRealFrom(c.cab, a, b, p, q) - beta.LogBinomReal(xa, yb, p, q)
	return l + math.Log(m/xa) + math.Log(a/yb) + math.Log(b/(a+b))
}

// Prob returns P(X = k) = exp(LogProb(k)).
func (d BetaBinom) Prob(k int64) float64 { return math.Exp(d.LogProb(k)) }

// ratioUp returns P(X = j+1) / P(X = j).
func (d BetaBinom) ratioUp(j int64) float64 {
	x := float64(j)
	return (float64(d.N-j) * (x + d.A)) / ((x + 1) * (float64(d.N-j-1) + d.B))
}

// ratioDown returns P(X = j-1) / P(X = j).
func (d BetaBinom) ratioDown(j int64) float64 {
	x := float64(j)
	return (x * (float64(d.N-j) + d.B)) / ((float64(d.N - j + 1)) * (x - 1 + d.A))
}

// logConcave reports whether the PMF is log-concave (A >= 1 and B >= 1):
// then the ratios of consecutive terms are monotone and a geometric series
// bounds every remainder.
func (d BetaBinom) logConcave() bool { return d.A >= 1 && d.B >= 1 }

// block is the number of terms summed by the ratio recurrence between
// exact re-anchorings on LogProb: each ratio carries at most about 3 ulp
// of rounding, so the last term of a block is within 1e-13 of its exact
// value in the worst case and typically within a few 1e-15 (the errors
// are not all of one sign); the goldens pass at 1e-13.
const block = 128

// logSum returns ln of sum_{j = from, from+dir, ..., to} P(X = j) (dir = +1
// or -1), with to beyond from in the direction dir; -Inf for an empty range.
// The terms are summed in blocks of 128 by the ratio recurrence, each block
// anchored on an exact LogProb and added in log space, so neither underflow
// nor the recurrence's rounding accumulates. For a log-concave PMF the sum
// stops once the terms decrease and the geometric bound t r/(1 - r) on the
// remainder (r the current ratio, which bounds all later ones) falls below
// 2^-62 of the block's partial sum (and, between blocks, of the total).
// Cost: one multiply-divide per term plus one LogProb per 64 terms.
func (d BetaBinom) logSum(from, to int64, dir int64) float64 {
	if (to-from)*dir < 0 {
		return math.Inf(-1)
	}
	total := math.Inf(-1)
	stop := d.logConcave()
	pl := d.pmfLog()
	j := from
	for {
		anchor := math.Inf(-1)
		if j >= 0 && j <= d.N {
			anchor = pl.at(j)
		}
		if math.IsInf(anchor, -1) {
			return total
		}
		s, t := 0.0, 1.0
		last := false
		for i := 0; i < block; i++ {
			s += t
			if j == to {
				last = true
				break
			}
			var r float64
			if dir > 0 {
				r = d.ratioUp(j)
			} else {
				r = d.ratioDown(j)
			}
			j += dir
			t *= r
			// For a log-concave PMF, r bounds every later ratio in this
			// direction, so the terms from j on sum to at most t/(1-r).
			if stop && r < 1 && t < 0x1p-62*(1-r)*s {
				last = true
				break
			}
		}
		total = xmath.LogAddExp(total, anchor+math.Log(s))
		if last {
			return total
		}
		// j is the first term of the next block, anchor + ln t its
		// logarithm by the recurrence (accurate enough for the bound).
		if stop && d.nextNegligible(j, dir, anchor+math.Log(t), total) {
			return total
		}
	}
}

// nextNegligible reports whether, from term j on in direction dir, the
// remaining sum of a log-concave PMF is below 2^-62 of e^total; lj is
// ln P(X = j).
func (d BetaBinom) nextNegligible(j, dir int64, lj, total float64) bool {
	var r float64
	if dir > 0 {
		if j >= d.N {
			return false
		}
		r = d.ratioUp(j)
	} else {
		if j <= 0 {
			return false
		}
		r = d.ratioDown(j)
	}
	if r >= 1 {
		return false
	}
	return lj-math.Log1p(-r) < total-62*math.Ln2
}

// tails returns ln P(X <= k) and ln P(X > k) for 0 <= k < N, the smaller
// one summed directly and the other as its complement by Log1mExp. The
// side summed first is the one lowerFirst guesses smaller; if it turns out
// above 0.6 the other is summed (a complement of a tail up to 0.6 keeps
// 1.5 times its relative accuracy, so a sum at the median is not repeated
// on the other side).
func (d BetaBinom) tails(k int64) (lower, upper float64) {
	if d.lowerFirst(k) {
		lower = d.logSum(k, 0, -1)
		if lower <= lnComplementOK {
			return lower, xmath.Log1mExp(lower)
		}
		upper = d.logSum(k+1, d.N, 1)
		return xmath.Log1mExp(math.Min(upper, 0)), upper
	}
	upper = d.logSum(k+1, d.N, 1)
	if upper <= lnComplementOK {
		return xmath.Log1mExp(upper), upper
	}
	lower = d.logSum(k, 0, -1)
	return lower, xmath.Log1mExp(math.Min(lower, 0))
}

// lnComplementOK is ln 0.6: tails takes the complement of a tail up to 0.6.
var lnComplementOK = math.Log(0.6)

// sideGuessN is the number of trials from which tails picks the side to
// sum from the Beta approximation rather than from the mean (for shapes
// totalling at most 1e4, where the incomplete beta function costs at most
// about a hundred continued-fraction steps; larger shapes concentrate the
// distribution, and the mean serves).
const sideGuessN = 4096

// lowerFirst reports whether tails should sum the lower tail of k first:
// below sideGuessN (or for A + B > 1e4) when k is below the mean; otherwise when the Beta(A, B)
// probability below (k + 1/2)/N, the large-N limit of P(X <= k), is below
// 1/2. The guess only saves work: at the median of a wide distribution
// (shapes near 1 and N = 2^21, half a million terms on each side) summing
// the larger side first costs a second sum.
func (d BetaBinom) lowerFirst(k int64) bool {
	if d.N < sideGuessN || d.A+d.B > 1e4 {
		return float64(k) < d.Mean()
	}
	x := (float64(k) + 0.5) / float64(d.N)
	return beta.LogCDF(d.A, d.B, x, 1-x) < -math.Ln2
}

// LogCDF returns ln P(X <= k): -Inf for k < 0, 0 for k >= N, NaN only for
// an invalid BetaBinom. The smaller of the two tails is summed directly
// from k outward (see logSum), the larger is the complement of the smaller,
// so a tail of 1e-300 or e^-1e5 is as accurate as one near 1/2.
// Accuracy: about 1e-14 relative to max(1, |ln P|) (mpmath goldens,
// testdata/betabinom_golden.tsv, pass at 1e-13). Cost: the terms that
// matter for a log-concave PMF (A, B >= 1), a few times the standard
// deviation; up to N terms (N <= 2^21, under 10 ms) otherwise.
func (d BetaBinom) LogCDF(k int64) float64 {
	switch {
	case !d.valid():
		return math.NaN()
	case k < 0:
		return math.Inf(-1)
	case k >= d.N:
		return 0
	}
	l, _ := d.tails(k)
	return l
}

// LogSurvival returns ln P(X > k): 0 for k < 0, -Inf for k >= N, NaN only
// for an invalid BetaBinom; computed as LogCDF with the tails exchanged,
// never as the complement of a CDF near 1. Accuracy and cost as LogCDF.
func (d BetaBinom) LogSurvival(k int64) float64 {
	switch {
	case !d.valid():
		return math.NaN()
	case k < 0:
		return 0
	case k >= d.N:
		return math.Inf(-1)
	}
	_, u := d.tails(k)
	return u
}

// CDF returns P(X <= k) = exp(LogCDF(k)).
func (d BetaBinom) CDF(k int64) float64 { return math.Exp(d.LogCDF(k)) }

// Survival returns P(X > k) = exp(LogSurvival(k)), computed directly.
func (d BetaBinom) Survival(k int64) float64 { return math.Exp(d.LogSurvival(k)) }

// Quantile returns the smallest k with P(X <= k) >= q. q <= 0 gives 0,
// q >= 1 gives N; NaN or an invalid BetaBinom give -1. Cost: as LogQuantile.
func (d BetaBinom) Quantile(q float64) int64 {
	if !d.valid() || math.IsNaN(q) {
		return -1
	}
	if q <= 0 {
		return 0
	}
	if q >= 1 {
		return d.N
	}
	return d.LogQuantile(xmath.Log(q))
}

// LogQuantile returns the smallest k with ln P(X <= k) >= lq, for lq <= 0
// (lq = -Inf gives 0, lq >= 0 gives N; NaN gives -1). It reaches tails far
// below the smallest double. Below the median (lq <= -ln 2) it walks the
// cumulative sum up from 0; above, it walks the upper tail down from N
// until P(X > k) would exceed 1 - e^lq. Where the target lies within
// 1e-11 of the walk's sums the boundary is then settled on LogCDF itself,
// so LogQuantile(LogCDF(k)) == k wherever P(X = k) is not lost in rounding
// against P(X <= k) (see settle for the flat ties of shapes far below 1).
// Cost: the walk (up to N terms, a few nanoseconds each) and at most
// settleCalls tail sums, under 10 ms at N = MaxBetaBinomN on the project's
// machine (BenchmarkBetaBinomWide).
func (d BetaBinom) LogQuantile(lq float64) int64 {
	if !d.valid() || math.IsNaN(lq) {
		return -1
	}
	if math.IsInf(lq, -1) {
		return 0
	}
	if lq >= 0 {
		return d.N
	}
	var k int64
	var prev, at float64 // the walk's ln P(X <= k-1), ln P(X <= k)
	var flat bool
	if lq <= -math.Ln2 {
		k, prev, at = d.walkUp(lq)
		flat = walkFlat(lq, prev, at)
	} else {
		lu := xmath.Log1mExp(lq)
		var uAt, uPrev float64
		k, uAt, uPrev = d.walkDown(lu)
		prev, at = xmath.Log1mExp(math.Min(uPrev, 0)), xmath.Log1mExp(math.Min(uAt, 0))
		flat = walkFlat(-lu, -uPrev, -uAt)
	}
	if flat || walkDecided(lq, prev, at) {
		return k
	}
	// The walk's running sum and LogCDF round differently; near the
	// boundary settle it on LogCDF itself so that LogQuantile(LogCDF(k)) == k.
	return settle(k, d.N, func(j int64) bool { return d.LogCDF(j) >= lq })
}

// walkDecided reports whether a quantile walk's answer k needs no check on
// the tail functions: its values below and at k (logarithms of the
// cumulative probability, increasing) straddle the target lq with a margin
// of 1e-11 max(1, |lq|), a thousand times the stated accuracy of both the
// walk and LogCDF / LogSurvival, so both place the boundary alike.
func walkDecided(lq, below, at float64) bool {
	tol := 1e-11 * math.Max(1, math.Abs(lq))
	return below < lq-tol && at >= lq+tol
}

// walkFlat reports whether the step of a quantile walk at its answer,
// from below to at (the logarithms of the tail the walk summed, which is
// the smaller one, so the step is measured where it shows most), is within
// twice walkDecided's margin of the walk's target lq: P(X = k) is then
// lost in rounding against both tails, as across the flat middle of shapes
// far below 1, so k, k-1 and their neighbours tie at the target at the
// accuracy of any tail sum, and the walk's k stands without a check.
func walkFlat(lq, below, at float64) bool {
	return at-below <= 2e-11*math.Max(1, math.Abs(lq))
}

// settleCalls bounds the tail evaluations of settle: each can sum up to N
// terms (N <= 2^21), so a quantile makes at most this many besides its
// walk.
const settleCalls = 6

// settle returns the smallest j in [0, n] with ok(j), for ok false then
// true (monotone), starting from a guess k that is rarely wrong (the walk's
// answer, which only comes here when the target lies within 1e-11 of the
// walk's sums): it gallops away from k in doubling steps until the answer
// is bracketed, then bisects, with at most settleCalls calls of ok. Where
// the cumulative probability is flat to within rounding over a wide range
// (shapes far below 1 put almost all mass at 0 and N, and every value in
// between is a tie at the target), ok is not monotone in floating point
// and the calls run out: the guess k is returned, as good as any value of
// the tie.
func settle(k, n int64, ok func(int64) bool) int64 {
	calls := 0
	try := func(j int64) (bool, bool) {
		if calls == settleCalls {
			return false, false
		}
		calls++
		return ok(j), true
	}
	lo, hi := int64(-1), n // ok(lo) false (lo = -1: none), ok(hi) true
	v, _ := try(k)
	if v {
		hi = k
		for step := int64(1); hi > 0; step *= 2 {
			j := max(hi-step, 0)
			v, more := try(j)
			if !more {
				return k
			}
			if !v {
				lo = j
				break
			}
			hi = j
			if j == 0 {
				break
			}
		}
	} else {
		lo = k
		for step := int64(1); lo < n; step *= 2 {
			j := min(lo+step, n)
			v, more := try(j)
			if !more {
				return k
			}
			if v {
				hi = j
				break
			}
			lo = j
		}
	}
	for hi-lo > 1 {
		mid := lo + (hi-lo)/2
		v, more := try(mid)
		if !more {
			return k
		}
		if v {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi
}

// UpperQuantile returns the smallest k with P(X > k) <= q; q >= 1 gives 0,
// q <= 0 gives N; NaN or an invalid BetaBinom give -1.
func (d BetaBinom) UpperQuantile(q float64) int64 {
	if !d.valid() || math.IsNaN(q) {
		return -1
	}
	if q >= 1 {
		return 0
	}
	if q <= 0 {
		return d.N
	}
	return d.LogUpperQuantile(xmath.Log(q))
}

// LogUpperQuantile returns the smallest k with ln P(X > k) <= lq, lq <= 0
// (lq >= 0 gives 0, lq = -Inf gives N, NaN gives -1), walking the upper
// tail down from N when e^lq <= 1/2 and the lower tail up from 0 otherwise.
func (d BetaBinom) LogUpperQuantile(lq float64) int64 {
	if !d.valid() || math.IsNaN(lq) {
		return -1
	}
	if lq >= 0 {
		return 0
	}
	if math.IsInf(lq, -1) {
		return d.N
	}
	var k int64
	var uPrev, uAt float64 // the walk's ln P(X > k-1), ln P(X > k)
	var flat bool
	if lq <= -math.Ln2 {
		k, uAt, uPrev = d.walkDown(lq)
		flat = walkFlat(-lq, -uPrev, -uAt)
	} else {
		// P(X > k) <= q  <=>  P(X <= k) >= 1 - q.
		ll := xmath.Log1mExp(lq)
		var prev, at float64
		k, prev, at = d.walkUp(ll)
		uPrev, uAt = xmath.Log1mExp(math.Min(prev, 0)), xmath.Log1mExp(math.Min(at, 0))
		flat = walkFlat(ll, prev, at)
	}
	// The upper tail decreases: negate to use the same margin test.
	if flat || walkDecided(-lq, -uPrev, -uAt) {
		return k
	}
	// Settle the boundary on LogSurvival itself (see LogQuantile).
	return settle(k, d.N, func(j int64) bool { return d.LogSurvival(j) <= lq })
}

// walkUp returns the smallest k with ln P(X <= k) >= lq, with the walk's
// values of ln P(X <= k-1) (-Inf at k = 0) and ln P(X <= k), accumulating
// the PMF from 0:
// blocks of 128 terms by the ratio recurrence in linear scale relative to
// an exact anchor, each term compared with the target rescaled to that
// anchor, and the blocks added in log space.
func (d BetaBinom) walkUp(lq float64) (k int64, prev, at float64) {
	pl := d.pmfLog()
	total := math.Inf(-1) // ln P(X <= k-1)
	for k <= d.N {
		anchor := pl.at(k)
		// s (the block's sum so far, relative to the anchor) reaches the
		// target when s >= e^(lq - anchor) - e^(total - anchor), formed
		// without cancellation (total < lq here).
		need := math.Exp(lq-anchor) * -math.Expm1(total-lq)
		s, t := 0.0, 1.0
		for i := 0; i < block && k <= d.N; i++ {
			prev := s
			s += t
			if s >= need {
				return k, xmath.LogAddExp(total, anchor+math.Log(prev)), xmath.LogAddExp(total, anchor+math.Log(s))
			}
			if k < d.N {
				t *= d.ratioUp(k)
			}
			k++
		}
		total = xmath.LogAddExp(total, anchor+math.Log(s))
	}
	return d.N, total, total
}

// walkDown returns the smallest k with ln P(X > k) <= lq, with the walk's
// values of ln P(X > k) and ln P(X > k-1): it adds P(X = k) for k = N, N-1, ... while
// the upper tail P(X > k-1) stays at or below e^lq, in blocks as walkUp.
func (d BetaBinom) walkDown(lq float64) (k int64, at, prev float64) {
	pl := d.pmfLog()
	upper := math.Inf(-1) // ln P(X > k) for the current k
	for k = d.N; k > 0; {
		anchor := pl.at(k)
		need := math.Exp(lq-anchor) * -math.Expm1(upper-lq) // as in walkUp
		s, t := 0.0, 1.0
		for i := 0; i < block && k > 0; i++ {
			prev := s
			s += t
			if s > need { // P(X > k-1) would exceed e^lq
				return k, xmath.LogAddExp(upper, anchor+math.Log(prev)), xmath.LogAddExp(upper, anchor+math.Log(s))
			}
			t *= d.ratioDown(k)
			k--
		}
		upper = xmath.LogAddExp(upper, anchor+math.Log(s))
	}
	return 0, upper, 0
}

// Rand returns a beta-binomial variate drawn with r: a success probability
// from Beta(A, B) as G1 / (G1 + G2) with gamma variates of shapes A and B
// (Marsaglia G, Tsang WW (2000), "A simple method for generating gamma
// variables", ACM TOMS 26:363-372, with the boost G(s) = G(s+1) U^(1/s) for
// s < 1, kept in logs so tiny shapes do not underflow), then a binomial
// variate (Dist.Rand). Cost O(1) in N. An invalid BetaBinom gives -1; a nil
// r draws from math/rand/v2's top-level generator.
func (d BetaBinom) Rand(r *rand.Rand) int64 {
	if !d.valid() {
		return -1
	}
	r = orDefault(r) // nil: math/rand/v2's top-level generator, as Dist.Rand
	lx, ly := logGamma(r, d.A), logGamma(r, d.B)
	p := 1 / (1 + math.Exp(ly-lx))
	return Dist{N: d.N, P: p}.Rand(r)
}

// logGamma returns the logarithm of a Gamma(s, 1) variate.
func logGamma(r *rand.Rand, s float64) float64 {
	boost := 0.0
	if s < 1 {
		u := 1 - r.Float64() // in (0, 1]
		boost = math.Log(u) / s
		s++
	}
	dd := s - 1.0/3
	c := 1 / math.Sqrt(9*dd)
	for {
		x := r.NormFloat64()
		v := 1 + c*x
		if v <= 0 {
			continue
		}
		v = v * v * v
		u := 1 - r.Float64()
		if math.Log(u) < 0.5*x*x+dd-dd*v+dd*math.Log(v) {
			return math.Log(dd*v) + boost
		}
	}
}

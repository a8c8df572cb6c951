package binom

import (
	"math"
	"math/bits"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/xmath"
)

// Hyper is the hypergeometric distribution: the number X of successes among
// Draws items drawn without replacement from a population of Total items of
// which Successes are successes,
//
//	P(X = x) = C(K, x) C(N-K, n-x) / C(N, n),  max(0, n-(N-K)) <= x <= min(n, K),
//
// with N = Total, K = Successes, n = Draws. It is the conditional
// distribution of the top-left cell of a 2x2 table given both margins
// (row total n, column total K, grand total N), on which Fisher's exact
// test rests.
//
// Build it with NewHyper, which validates. A Hyper built by hand outside
// that domain makes every method return NaN (or -1 for the integer-valued
// ones, (-1, -1) for Support); no method panics. The domain includes a
// bound on the spread, MaxHyperStdDev, beyond which Support and Mode still
// answer but every other method returns NaN (or -1).
type Hyper struct {
	Total     int64 // population size N, 0 <= N <= MaxN
	Successes int64 // successes in the population K, 0 <= K <= N
	Draws     int64 // items drawn n, 0 <= n <= N
}

// NewHyper returns the hypergeometric distribution of the successes among
// draws items drawn from total items of which successes are successes. It
// fails with ErrInvalidArgument when a count is negative or successes or
// draws exceeds total, and with ErrTooLarge when total > MaxN or when the
// standard deviation exceeds MaxHyperStdDev.
func NewHyper(total, successes, draws int64) (Hyper, error) {
	const fn = "binom.NewHyper"
	if err := checkHyper(fn, total, successes, draws); err != nil {
		return Hyper{}, err
	}
	h := Hyper{Total: total, Successes: successes, Draws: draws}
	if !spreadOK(h.varianceFloat()) {
		return Hyper{}, spreadError(fn, "draws", draws, h.varianceFloat())
	}
	return h, nil
}

// MaxHyperStdDev bounds the standard deviation of the hypergeometric and
// Fisher noncentral hypergeometric distributions that NewHyper and
// NewNoncentralHyper accept: 2^15 = 32768. Tails, quantiles, the entropy,
// the noncentral moments and the variates sum O(standard deviation) terms
// (a few nanoseconds each), so this bound keeps every method within about
// 10 ms (a tail about 1 ms, a quantile a few ms, the entropy about 10 ms on
// one core of the project's machine). The spread only gets that large for
// populations of billions with both margins in the millions or more
// (balanced margins need a total above 1.7e10); there the normal
// approximation with Mean and Variance is accurate to O(1/standard
// deviation), and when draws are a small fraction of total the binomial
// Dist{N: draws, P: successes/total} answers in O(1).
const MaxHyperStdDev = 1 << 15

// spreadOK reports whether a variance is within MaxHyperStdDev^2.
func spreadOK(v float64) bool { return v <= float64(MaxHyperStdDev)*float64(MaxHyperStdDev) }

// spreadError is the ErrTooLarge error of a distribution whose variance v
// exceeds the bound.
func spreadError(fn, arg string, value int64, v float64) error {
	return argerr.TooLarge(fn, arg, value, "gives a standard deviation of "+argerr.Format(float64(float32(math.Sqrt(v))))+
		", beyond MaxHyperStdDev = 32768: tails and quantiles would sum that many terms; at this size use the normal approximation from Mean and Variance, or Dist (binomial) when draws are a small fraction of total")
}

// varianceFloat returns the variance n (K/N) ((N-K)/N) ((N-n)/(N-1)) in
// floating point (a few roundings), for the spread bound; 0 when N <= 1.
func (h Hyper) varianceFloat() float64 {
	N, K, n := float64(h.Total), float64(h.Successes), float64(h.Draws)
	if N <= 1 {
		return 0
	}
	return n * (K / N) * ((N - K) / N) * ((N - n) / (N - 1))
}

// checkHyper validates hypergeometric parameters for function fn.
func checkHyper(fn string, total, successes, draws int64) error {
	if err := argerr.Count(fn, "total", total); err != nil {
		return err
	}
	if total > MaxN {
		return argerr.TooLarge(fn, "total", total, "exceeds 2^53, the largest count held exactly in float64")
	}
	if err := argerr.KN(fn, "successes", "total", successes, total); err != nil {
		return err
	}
	return argerr.KN(fn, "draws", "total", draws, total)
}

// inDomain reports whether h's counts are in the domain NewHyper accepts,
// whatever the spread.
func (h Hyper) inDomain() bool {
	return h.Total >= 0 && h.Total <= MaxN &&
		h.Successes >= 0 && h.Successes <= h.Total &&
		h.Draws >= 0 && h.Draws <= h.Total
}

// valid reports whether h's parameters are in the domain NewHyper accepts,
// the spread bound included.
func (h Hyper) valid() bool {
	return h.inDomain() && spreadOK(h.varianceFloat())
}

// Support returns the smallest and largest possible values,
// lo = max(0, n - (N-K)) and hi = min(n, K); (-1, -1) for counts outside
// NewHyper's domain. It answers whatever the spread (MaxHyperStdDev).
func (h Hyper) Support() (lo, hi int64) {
	if !h.inDomain() {
		return -1, -1
	}
	lo = h.Draws - (h.Total - h.Successes)
	if lo < 0 {
		lo = 0
	}
	return lo, min(h.Draws, h.Successes)
}

// Mode returns floor((n+1)(K+1)/(N+2)), a most probable value, computed in
// exact integer arithmetic. When (n+1)(K+1)/(N+2) is an integer m, both m-1
// and m are modes and Mode returns m. -1 for counts outside NewHyper's
// domain; it answers whatever the spread (MaxHyperStdDev).
func (h Hyper) Mode() int64 {
	if !h.inDomain() {
		return -1
	}
	hi, lo := bits.Mul64(uint64(h.Draws+1), uint64(h.Successes+1))
	q, _ := bits.Div64(hi, lo, uint64(h.Total+2)) // hi < N+2, so no overflow
	return int64(q)
}

// logProb returns ln P(X = x) for x strictly inside a support of more than
// one point, by the binomial saddle-point products of Loader (2000),
// "Fast and accurate computation of binomial probabilities", section 5:
//
//	P(X = x) = b(x; K, p) b(n-x; N-K, p) / b(n; N, p),
//
// which holds for every p in (0, 1); p = n/N puts the denominator at its
// mode. Each b is Dist.LogProb, accurate in log space at any size. When
// n > N/2 it uses the undrawn items instead (X = K - X', X' hypergeometric
// with N-n draws), so that p <= 1/2 and 1-p carries no rounding.
func (h Hyper) logProb(x int64) float64 {
	n := h.Draws
	if 2*n > h.Total {
		n, x = h.Total-n, h.Successes-x
	}
	p := float64(n) / float64(h.Total)
	a := Dist{N: h.Successes, P: p}.LogProb(x)
	b := Dist{N: h.Total - h.Successes, P: p}.LogProb(n - x)
	c := Dist{N: h.Total, P: p}.LogProb(n)
	return a + b - c
}

// LogProb returns ln P(X = x): -Inf outside the support, 0 when the support
// is a single point, NaN only for an invalid Hyper.
//
// It is computed from three binomial saddle-point terms (Loader 2000,
// section 5; see the formula on logProb), not from differences of lgamma,
// so it keeps its digits at totals of 1e12 and in tails far below 1e-300.
// Accuracy: within 1e-13 of the true value relative to max(1, |ln P|),
// checked against mpmath in testdata/hyper_golden.tsv. Cost: O(1).
func (h Hyper) LogProb(x int64) float64 {
	if !h.valid() {
		return math.NaN()
	}
	lo, hi := h.Support()
	switch {
	case x < lo || x > hi:
		return math.Inf(-1)
	case lo == hi:
		return 0
	}
	return h.logProb(x)
}

// Prob returns P(X = x) = exp(LogProb(x)); 0 outside the support.
// Accuracy: relative 1e-13 * max(1, |ln P|) where P >= 1e-300.
func (h Hyper) Prob(x int64) float64 { return math.Exp(h.LogProb(x)) }

// ratioDown returns P(X = j-1) / P(X = j) = j (N-K-n+j) / ((K-j+1)(n-j+1)),
// for lo < j <= hi.
func (h Hyper) ratioDown(j int64) float64 {
	fj := float64(j)
	return fj * float64(h.Total-h.Successes-h.Draws+j) /
		(float64(h.Successes-j+1) * float64(h.Draws-j+1))
}

// ratioUp returns P(X = j+1) / P(X = j) = (K-j)(n-j) / ((j+1)(N-K-n+j+1)),
// for lo <= j < hi.
func (h Hyper) ratioUp(j int64) float64 {
	return float64(h.Successes-j) * float64(h.Draws-j) /
		((float64(j) + 1) * float64(h.Total-h.Successes-h.Draws+j+1))
}

// Tail summation constants: the remainder bound below which summation
// stops (relative to the partial sum), and how often a term obtained from
// the ratio recurrence is replaced by a freshly computed one, which keeps
// the rounding of the recurrence to a few units in the last place.
// Moments (with visit) use momentTol: a term t at distance u from the mode
// enters the second moment as t u^2, and the square of sumTol keeps even
// u = 40 standard deviations of a near point mass well below 1e-17 of it.
const (
	sumTol      = 1e-17
	momentTol   = sumTol * sumTol
	reanchorLen = 64
)

// hyperWeights describes the weights of the central (psi = 1) or Fisher
// noncentral hypergeometric distribution,
//
//	w(j) = P_central(X = j) psi^(j - mode) / Z,
//
// with mode a most probable value and Z the normalising sum (logZ = 0 for
// the central one). The summation routines below serve both.
type hyperWeights struct {
	h          Hyper
	psi, lnPsi float64
	mode       int64
	logZ       float64
	// tilt, when set, gives the weights as two binomial terms centred on
	// the mode (see NoncentralHyper.weights): b(j; K, p1) b(n-j; N-K, p2)
	// e^((j-mode) delta).
	tilt   bool
	p1, p2 float64
	delta  float64
}

// centralWeights returns the weights of the central distribution h.
func (h Hyper) centralWeights() hyperWeights {
	return hyperWeights{h: h, psi: 1, mode: h.Mode()}
}

// logTerm returns ln(Z w(j)) for j in the support.
func (w *hyperWeights) logTerm(j int64) float64 {
	switch {
	case w.tilt:
		h := w.h
		return Dist{N: h.Successes, P: w.p1}.LogProb(j) +
			Dist{N: h.Total - h.Successes, P: w.p2}.LogProb(h.Draws-j) +
			float64(j-w.mode)*w.delta
	case w.lnPsi == 0:
		return w.h.logProb(j)
	}
	return w.h.logProb(j) + float64(j-w.mode)*w.lnPsi
}

// sumAway returns the sum of Z w(j) / e^l0 over j = start, start+dir, ...
// up to end (inclusive), where t = Z w(start) / e^l0 and the terms do not
// increase in direction dir (start is at or beyond the mode on that side).
//
// The weights are log-concave, so the ratio of successive terms only falls
// moving away from the mode: after a term t whose ratio to its predecessor
// is r < 1, the rest sum to at most t r / (1-r). Summation stops once that
// bound is below sumTol times the partial sum, or at end. A non-nil visit
// sees every term (j and t) summed, for moments, down to momentTol. Cost:
// the number of terms above 1e-17 of the first, O(standard deviation)
// near the mode and fewer out in a tail. Sums are compensated (Fast2Sum).
func (w *hyperWeights) sumAway(l0 float64, start, end, dir int64, t float64, visit func(j int64, t float64)) float64 {
	s, c := t, 0.0
	j := start
	tol := sumTol
	if visit != nil {
		visit(j, t)
		tol = momentTol
	}
	// The ratio of term j+dir to term j is (fa fb) / (fc fd) times f; the
	// four factors are integers (exact in float64) that step by one.
	h := w.h
	nkn := h.Total - h.Successes - h.Draws
	var fa, fb, fc, fd, f float64
	if dir < 0 {
		fa, fb, fc, fd, f = float64(j), float64(nkn+j), float64(h.Successes-j+1), float64(h.Draws-j+1), 1/w.psi
	} else {
		fa, fb, fc, fd, f = float64(h.Successes-j), float64(h.Draws-j), float64(j+1), float64(nkn+j+1), w.psi
	}
	for step := 1; j != end; step++ {
		r := fa * fb / (fc * fd) * f
		fa, fb, fc, fd = fa-1, fb-1, fc+1, fd+1
		j += dir
		if step%reanchorLen == 0 {
			t = math.Exp(w.logTerm(j) - l0)
		} else {
			t *= r
		}
		// Compensated addition (Fast2Sum: the terms never exceed s).
		ns := s + t
		c += (s - ns) + t
		s = ns
		if visit != nil {
			visit(j, t)
		}
		if t == 0 || (r < 1 && t*r < tol*(1-r)*s) {
			break
		}
	}
	return s + c
}

// logRange returns ln of the sum of w(j) over lo <= a <= j <= b <= hi, in a
// support of more than one point, summing terms outward from the mode or
// from the range end nearest to it; the result is never a difference of
// sums larger than itself.
func (w *hyperWeights) logRange(a, b int64) float64 {
	lo, hi := w.h.Support()
	m := w.mode
	switch {
	case b < m:
		l0 := w.logTerm(b)
		return l0 + math.Log(w.sumAway(l0, b, a, -1, 1, nil)) - w.logZ
	case a > m:
		l0 := w.logTerm(a)
		return l0 + math.Log(w.sumAway(l0, a, b, +1, 1, nil)) - w.logZ
	}
	// The range holds the mode. When both outside tails are small, their
	// sum T (each computed directly, at cost set by how far out they lie)
	// gives the range as 1 - T without loss: T <= 1/2 costs at most a
	// factor 2 in relative error.
	lt, ut := math.Inf(-1), math.Inf(-1)
	if a > lo {
		lt = w.logRange(lo, a-1)
	}
	if b < hi && lt < -math.Ln2 {
		ut = w.logRange(b+1, hi)
	}
	if t := xmath.LogAddExp(lt, ut); t < -math.Ln2 {
		return xmath.Log1mExp(t)
	}
	return w.logRangeAtMode(a, b, nil) - w.logZ
}

// logRangeAtMode returns ln of the unnormalised sum Z w(j) over a..b, a
// range that holds the mode, summed outward from the mode both ways; visit,
// when not nil, sees each term j with its weight relative to the mode's.
func (w *hyperWeights) logRangeAtMode(a, b int64, visit func(j int64, t float64)) float64 {
	m := w.mode
	l0 := w.logTerm(m)
	s := w.sumAway(l0, m, a, -1, 1, visit)
	if m < b {
		s += w.sumAway(l0, m+1, b, +1, w.h.ratioUp(m)*w.psi, visit)
	}
	return l0 + math.Log(s)
}

// LogProbRange returns ln P(lo <= X <= hi); -Inf when the range is empty or
// misses the support. NaN only for an invalid Hyper.
//
// The terms are summed directly, outward from the end of the range nearest
// the mode (or from the mode when the range holds it, unless both outside
// tails are below 1/2 together, when it is 1 minus their directly summed
// total), using the PMF ratio recurrence with exact re-anchoring every 64
// terms and a geometric bound on the remainder to stop. Accuracy: within
// 1e-13 relative to max(1, |ln P|) (largest error seen against the mpmath
// golden, totals up to 1e6: 3.3e-15). Cost: the terms above 1e-17 of the
// largest in the range, a few nanoseconds each: about 9 standard
// deviations' worth per side when the range reaches the bulk (about 2,000
// terms at a total of 1e6 with balanced margins, 2e6 at 1e12 and 2e8,
// seconds, at 2^53), and about 40/z standard deviations' worth z standard
// deviations out in a tail. The quantiles multiply this by the few tail
// evaluations their search needs (two to six from the normal start).
func (h Hyper) LogProbRange(lo, hi int64) float64 {
	if !h.valid() {
		return math.NaN()
	}
	slo, shi := h.Support()
	lo, hi, v, done := clipRange(lo, hi, slo, shi)
	if done {
		return v
	}
	w := h.centralWeights()
	return min(0, w.logRange(lo, hi)) // rounding never lifts a probability above 1
}

// clipRange clips lo..hi to the support slo..shi and, when no summation is
// needed, reports the log-probability: -Inf for an empty range, 0 for the
// whole support.
func clipRange(lo, hi, slo, shi int64) (a, b int64, v float64, done bool) {
	a, b = max(lo, slo), min(hi, shi)
	switch {
	case a > b:
		return a, b, math.Inf(-1), true
	case a == slo && b == shi:
		return a, b, 0, true
	}
	return a, b, 0, false
}

// ProbRange returns P(lo <= X <= hi) = exp(LogProbRange(lo, hi)).
func (h Hyper) ProbRange(lo, hi int64) float64 { return math.Exp(h.LogProbRange(lo, hi)) }

// LogCDF returns ln P(X <= k): -Inf below the support, 0 from its top on.
// Both tails are summed directly (see LogProbRange); a tiny tail is never
// a complement. Accuracy and cost as LogProbRange.
func (h Hyper) LogCDF(k int64) float64 {
	if !h.valid() {
		return math.NaN()
	}
	lo, _ := h.Support()
	return h.LogProbRange(lo, k)
}

// LogSurvival returns ln P(X > k): 0 below the support, -Inf from its top
// on. Accuracy and cost as LogProbRange.
func (h Hyper) LogSurvival(k int64) float64 {
	if !h.valid() {
		return math.NaN()
	}
	if k == math.MaxInt64 {
		return math.Inf(-1)
	}
	_, hi := h.Support()
	return h.LogProbRange(k+1, hi)
}

// CDF returns P(X <= k) = exp(LogCDF(k)).
func (h Hyper) CDF(k int64) float64 { return math.Exp(h.LogCDF(k)) }

// Survival returns P(X > k) = exp(LogSurvival(k)), computed directly, so a
// survival of 1e-35 is returned as such, not as 1 - CDF = 0.
func (h Hyper) Survival(k int64) float64 { return math.Exp(h.LogSurvival(k)) }

package binom

import (
	"math"

	"github.com/kofnlab/kofn/internal/xmath"
)

// quantileTarget describes one quantile search: the smallest k in [0, N]
// at which ok(k) holds, where ok is monotone (false ... false true ... true)
// and true at N.
type quantileTarget struct {
	upper bool    // upper-tail quantile: ok(k) is "tail(k) <= target"
	plain bool    // compare plain probabilities (q) rather than logs (lq)
	q, lq float64 // target probability and its natural log
}

// eval returns, at k in [0, N], the decision ok(k), made on the same
// computation as CDF, Survival, LogCDF and LogSurvival (so the quantiles
// invert them exactly), and a residual f(k) that increases with k and
// changes sign at the answer. The residual is taken on the tail whose
// target is at most 1/2: ln CDF(k) - ln c (concave in k) or
// ln c - ln Survival(k) (convex), c being the target or its complement; a
// log tail near 0 would be nearly flat and slow the steps. l and s are
// ln P(X <= k) and ln P(X > k), for slope.
func (d Dist) eval(t *quantileTarget, k int64) (ok bool, f, l, s float64) {
	if k >= d.N {
		l, s = 0, math.Inf(-1)
	} else {
		l, s = d.bothTails(k)
	}
	if !t.upper {
		if t.plain {
			ok = math.Exp(l) >= t.q
		} else {
			ok = l >= t.lq
		}
	} else {
		if t.plain {
			ok = math.Exp(s) <= t.q
		} else {
			ok = s <= t.lq
		}
	}
	c := t.lq
	if t.lq > -math.Ln2 {
		c = xmath.Log1mExp(t.lq)
	}
	if t.lowerResidual() {
		return ok, l - c, l, s
	}
	return ok, c - s, l, s
}

// lowerResidual reports whether eval's residual is on the lower tail.
func (t *quantileTarget) lowerResidual() bool { return t.upper == (t.lq > -math.Ln2) }

// slope returns the backward difference f(k) - f(k-1) of eval's residual,
// from ln P(X = k) without another tail evaluation; l and s are the log
// tails at k.
func (d Dist) slope(t *quantileTarget, k int64, l, s float64) float64 {
	lb := d.LogProb(k)
	if t.lowerResidual() {
		// ln CDF(k-1) = l + ln(1 - b(k)/CDF(k)); where b(k) is all of
		// CDF(k) to rounding, ln(b(k)/b(k-1)) bounds the difference from
		// below (log-concavity).
		if lb-l < -1e-12 {
			return -xmath.Log1mExp(lb - l)
		}
		return d.logRatioDown(k)
	}
	// ln Survival(k-1) = s + ln(1 + b(k)/Survival(k)).
	if math.IsInf(s, -1) {
		return math.Inf(1)
	}
	return log1pexp(lb - s)
}

// logRatioDown returns ln(b(k)/b(k-1)) = ln((N-k+1) P / (k (1-P))),
// +Inf at k = 0.
func (d Dist) logRatioDown(k int64) float64 {
	if k <= 0 {
		return math.Inf(1)
	}
	return math.Log(float64(d.N-k+1)/float64(k)) + xmath.Log(d.P) - math.Log1p(-d.P)
}

// log1pexp returns ln(1 + e^x) without overflow or loss for small e^x.
func log1pexp(x float64) float64 {
	if x > 36 {
		return x + math.Exp(-x)
	}
	return math.Log1p(math.Exp(x))
}

// search returns the smallest k in [0, N] with ok(k), starting at guess.
// Each step is a secant (Newton) step on the residual f with the backward
// difference from the PMF; the residual is concave or convex in k for the
// log-concave binomial, so the steps approach the answer from one side.
// A bracket [lo, hi] guards them: proposals outside it bisect, and where
// the residual cannot guide (a third unit step in the same direction in a
// row, as where plain subnormal targets round coarsely) the steps double.
// With the Cornish-Fisher start the answer takes two to four tail
// evaluations; at most about 2 log2(N) + 10 in any case, and never more
// than 300.
func (d Dist) search(t *quantileTarget, guess int64) int64 {
	lo, hi := int64(-1), d.N // ok(hi) holds; ok(lo) does not (lo = -1: none)
	k := guess
	var lastStep, run int64 = 0, 1
	units := 0 // unit steps in the same direction in a row
	for it := 0; it < 300 && hi-lo > 1; it++ {
		if k <= lo || k >= hi {
			k = lo + (hi-lo)/2
		}
		ok, f, lk, sk := d.eval(t, k)
		if ok {
			hi = k
		} else {
			lo = k
		}
		if hi-lo <= 1 {
			break
		}
		step := -f / d.slope(t, k, lk, sk) // predicted distance to the sign change of f
		var next int64
		switch {
		case math.IsNaN(step):
			next = lo + (hi-lo)/2
		case step >= float64(hi-k):
			next = hi - 1
		case step <= float64(lo-k):
			next = lo + 1
		default:
			next = k + int64(math.Ceil(step))
		}
		if ok && next >= k {
			next = k - 1
		}
		if !ok && next <= k {
			next = k + 1
		}
		if st := next - k; (st == 1 || st == -1) && st == lastStep {
			units++
		} else {
			units = 0
		}
		lastStep = next - k
		if units >= 2 {
			run *= 2
			next = k + lastStep*run
		} else {
			run = 1
		}
		k = next
	}
	return hi
}

// normalQuantileLog returns z with Phi(z) = e^lq for lq <= ln(1/2):
// math.Erfinv down to Phi = 0.02, below that the asymptotic inversion of
// Mills' ratio refined by two Newton steps on ln Phi (math.Erfc), good to
// about 1e-12; below z = -37, where erfc underflows, the asymptotic
// inversion alone (relative 1e-6). A starting point, not a result.
func normalQuantileLog(lq float64) float64 {
	if lq > math.Log(0.02) {
		return math.Sqrt2 * math.Erfinv(2*math.Exp(lq)-1)
	}
	// ln Phi(z) ~ -z^2/2 - ln(-z sqrt(2 pi)) - ln(1 - 1/z^2), z < 0.
	z := -math.Sqrt(-2 * lq)
	for range 4 {
		z2 := -2*lq - ln2pi - 2*math.Log(-z) - 2*math.Log1p(-1/(z*z))
		z = -math.Sqrt(math.Max(z2, 1))
	}
	if z < -37 {
		return z
	}
	for range 2 {
		phiTail := 0.5 * math.Erfc(-z/math.Sqrt2)
		// d ln Phi / dz = phi(z)/Phi(z).
		z -= (math.Log(phiTail) - lq) * phiTail / math.Exp(-0.5*z*z-0.5*ln2pi)
	}
	return z
}

// guess returns an estimate of the lower-tail quantile at standard normal
// deviate z (CDF(k) = Phi(z)), clamped to [0, N]: the Cornish-Fisher
// expansion (skewness and kurtosis terms, continuity correction), and
// beyond 2.5 standard deviations two Newton steps on the leading terms of
// the uniform expansion, P(X <= k) ~ Phi(z_k + w_k/3) with z_k the signed
// root of twice the deviance and w_k = (b-a)/sqrt(a b (a+b)) for the beta
// parameters a = N-k, b = k+1 (temme.go), which follows the skewed far
// tails that the moment expansion misses.
func (d Dist) guess(z float64) int64 {
	n := float64(d.N)
	v := n * d.P * (1 - d.P)
	if !(v > 0) {
		return 0
	}
	sd := math.Sqrt(v)
	g1 := (1 - 2*d.P) / sd
	g2 := (1 - 6*d.P*(1-d.P)) / v
	z2 := z * z
	w := z + g1*(z2-1)/6 + g2*z*(z2-3)/24 - g1*g1*z*(2*z2-5)/36
	x := n*d.P + sd*w - 0.5
	if (x-n*d.P)*z < 0 {
		x = n*d.P + sd*z // the expansion has turned over: start plainly
	}
	if math.Abs(z) > 2.5 && v >= temmeMinVar && !math.IsInf(z, 0) {
		mu := n + 1
		mpHi, mpLo, mqHi, mqLo := compMeans(mu, d.P)
		for range 2 {
			x = math.Min(math.Max(x, 0), n-1)
			a, b := n-x, x+1
			if b < temmeMinAB || a < temmeMinAB {
				break
			}
			// The deviance by bd0, whose series keeps its digits near the
			// mean (a ln(a/mq) + b ln(b/mp) would cancel them).
			dev := bd0(a, mqHi, mqLo) + bd0(b, mpHi, mpLo)
			la, lb := math.Log(a/mqHi), math.Log(b/mpHi)
			zk := math.Copysign(math.Sqrt(2*dev), b-mpHi)
			res := zk + (b-a)/math.Sqrt(a*b*mu)/3 - z
			slope := (lb - la) / zk // d z_k / d k
			if !(slope > 0) {
				break
			}
			x -= res / slope
		}
	}
	// The answer is the smallest k >= x; rounding instead of ceil costs
	// nothing for a generic target and saves a step where the target is a
	// tail value itself (x then sits just above an integer).
	switch {
	case !(x > 0):
		return 0
	case x >= n:
		return d.N
	}
	return int64(math.Round(x))
}

// Quantile returns the smallest k with CDF(k) >= q, the comparison made on
// the value CDF returns, so that Quantile(CDF(k)) == k wherever
// CDF(k-1) < CDF(k) < 1 as computed. Special cases: q <= 0 gives 0; q = 1
// gives the smallest k with P(X <= k) = 1 exactly (N for 0 < P < 1, 0 for
// P = 0); q > 1 or NaN gives -1 (no such k), as does an invalid Dist.
// Cost: a start from the Cornish-Fisher expansion refined on the uniform
// expansion's leading terms (within one of the answer almost everywhere),
// then secant steps on the log tail: usually two tail evaluations, at most
// about 2 log2(N) + 10; 400-1400 ns of CPU per call measured at N = 10 to
// 1e12 in bulk and tails (BenchmarkQuantile, shared machine under load).
func (d Dist) Quantile(q float64) int64 {
	if !d.valid() || math.IsNaN(q) || q > 1 {
		return -1
	}
	switch {
	case q <= 0 || d.N == 0 || d.P == 0:
		return 0
	case q == 1 || d.P == 1:
		return d.N
	}
	t := quantileTarget{plain: true, q: q, lq: xmath.Log(q)}
	return d.search(&t, d.guess(zFromLog(t.lq)))
}

// LogQuantile returns the smallest k with LogCDF(k) >= lq, for lq <= 0; it
// reaches far below the smallest double (lq = -1e5 is fine), with the same
// exact inversion of LogCDF as Quantile has of CDF. lq > 0 or NaN gives -1;
// lq = -Inf gives 0; lq = 0 gives N (0 for P = 0).
func (d Dist) LogQuantile(lq float64) int64 {
	if !d.valid() || math.IsNaN(lq) || lq > 0 {
		return -1
	}
	switch {
	case math.IsInf(lq, -1) || d.N == 0 || d.P == 0:
		return 0
	case lq == 0 || d.P == 1:
		return d.N
	}
	t := quantileTarget{lq: lq, q: math.Exp(lq)}
	return d.search(&t, d.guess(zFromLog(lq)))
}

// UpperQuantile returns the smallest k with Survival(k) <= q, the comparison
// made on the value Survival returns (computed directly, never as 1 - CDF),
// so it is exact for every q down to the smallest positive double and
// UpperQuantile(Survival(k)) == k wherever 0 < Survival(k) < Survival(k-1).
// Special cases: q >= 1 gives 0; q = 0 gives the smallest k with
// P(X > k) = 0 exactly (N for 0 < P <= 1, 0 for P = 0); q < 0 or NaN gives
// -1, as does an invalid Dist. Cost as Quantile.
func (d Dist) UpperQuantile(q float64) int64 {
	if !d.valid() || math.IsNaN(q) || q < 0 {
		return -1
	}
	switch {
	case q >= 1 || d.N == 0 || d.P == 0:
		return 0
	case q == 0 || d.P == 1:
		return d.N
	}
	t := quantileTarget{upper: true, plain: true, q: q, lq: xmath.Log(q)}
	return d.search(&t, d.guess(-zFromLog(t.lq)))
}

// LogUpperQuantile returns the smallest k with LogSurvival(k) <= lq, for
// lq <= 0, inverting LogSurvival exactly; it reaches tails far beyond the
// smallest double. lq > 0 or NaN gives -1; lq = 0 gives 0; lq = -Inf gives
// the smallest k with P(X > k) = 0 exactly (N for 0 < P <= 1, 0 for P = 0).
func (d Dist) LogUpperQuantile(lq float64) int64 {
	if !d.valid() || math.IsNaN(lq) || lq > 0 {
		return -1
	}
	switch {
	case lq == 0 || d.N == 0 || d.P == 0:
		return 0
	case math.IsInf(lq, -1) || d.P == 1:
		return d.N
	}
	t := quantileTarget{upper: true, lq: lq, q: math.Exp(lq)}
	return d.search(&t, d.guess(-zFromLog(lq)))
}

// zFromLog returns the standard normal quantile for the lower-tail log
// probability lq <= 0 (40 for lq >= 0), accurate enough for a starting
// guess; other searches in the package start from it.
func zFromLog(lq float64) float64 {
	switch {
	case lq >= 0:
		return 40
	case lq <= -math.Ln2:
		return normalQuantileLog(lq)
	}
	return -normalQuantileLog(xmath.Log1mExp(lq))
}

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
	q, lq float64 // target probability and its natural log (lqUnset: not yet taken)
}

// lqUnset marks a plain target whose logarithm only the secant search
// needs; it is taken on the way there.
const lqUnset = 1

// search2 is search for a target whose logarithm may not be taken yet.
func (d Dist) search2(t *quantileTarget, guess int64) int64 {
	if t.lq == lqUnset {
		t.lq = xmath.Log(t.q)
	}
	return d.search(t, guess)
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
		ok = true
	} else {
		tv := d.smallTail(k)
		l, s = tv.logLower(), tv.logUpper()
		switch {
		case !t.upper && t.plain:
			ok = tv.linLower() >= t.q
		case !t.upper:
			ok = l >= t.lq
		case t.plain:
			ok = tv.linUpper() <= t.q
		default:
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

// walkMax is the most unit steps locate takes by PMF ratios before it
// hands over to the secant search.
const walkMax = 24

// walkTiny is the smallest tail or target value locate walks on in plain
// arithmetic; smaller ones go to the secant search, which works in logs.
const walkTiny = 1e-280

// locate returns the smallest k in [0, N] with ok(k), starting at guess.
// It evaluates the tail exactly (by the computation CDF, Survival, LogCDF
// or LogSurvival makes) at the guess and then steps to the neighbours by
// the PMF ratio recurrence,
//
//	P(X <= j-1) = P(X <= j) - b(j),  P(X > j-1) = P(X > j) + b(j),
//	b(j+1) = b(j) (N-j) P / ((j+1)(1-P)),
//
// carrying a bound on the rounding of every step. A decision is taken
// from a stepped value only where the target lies outside that bound
// widened by 1e-12 max(1, |ln target|) relative, ten times the stated
// accuracy of the tails on either side, so that it is the decision the
// exact evaluation would make; inside it the tail is evaluated exactly
// again. With the Cornish-Fisher start, one or two exact evaluations and a
// few steps; a start more than walkMax steps off, or a tail below
// walkTiny, goes to search.
func (d Dist) locate(t *quantileTarget, guess int64) int64 {
	n := d.N
	k := min(max(guess, 0), n)
	if k >= n {
		return d.search2(t, guess)
	}
	// The walk runs on the tail whose value at the answer is at most
	// about 1/2 (the target's complement where the target exceeds 1/2),
	// so that plain arithmetic keeps its relative accuracy.
	// A plain target above 1/2 is compared with a tail near 1, whose
	// rounding (half an ulp of 1) the margin must also hold.
	upperW, qv := t.upper, t.q
	absTol := 0.0
	if qv > 0.5 {
		upperW = !t.upper
		if t.plain {
			qv = 1 - qv // exact (Sterbenz)
			absTol = 0x1p-52
		} else {
			qv = -math.Expm1(t.lq)
		}
	}
	if !(qv >= walkTiny) {
		return d.search2(t, guess)
	}
	relTol := 1e-12 * logBound(qv)
	okK, tk, b := d.decide(t, k, upperW, true)
	if !(tk >= walkTiny) || !(b > 0) {
		return d.search2(t, guess)
	}
	errT := 1e-12 * logBound(tk) * tk
	errB := 1e-12 * logBound(b) // relative
	fn := float64(n)
	qp := (1 - d.P) / d.P
	pq := d.P / (1 - d.P)
	const eps = 0x1p-52
	for range walkMax {
		var j int64
		if okK {
			j = k - 1
			if j < 0 {
				return k
			}
			// Down: the lower tail loses b(k), the upper one gains it.
			if upperW {
				tk += b
			} else {
				tk -= b
			}
			errT += b*errB + 2*eps*(math.Abs(tk)+b)
			fk := float64(k)
			b *= fk * qp / (fn - fk + 1)
		} else {
			j = k + 1
			if j >= n {
				return n
			}
			fk := float64(k)
			b *= (fn - fk) * pq / (fk + 1)
			// Up: the lower tail gains b(k+1), the upper one loses it.
			if upperW {
				tk -= b
			} else {
				tk += b
			}
			errT += b*errB + 2*eps*(math.Abs(tk)+b)
		}
		errB += 4 * eps
		delta := errT + relTol*math.Max(math.Abs(tk), qv) + absTol
		// ok(j) is "walked tail <= qv" on the upper tail, ">= qv" on the
		// lower one.
		var okJ bool
		switch {
		case upperW && tk <= qv-delta, !upperW && tk >= qv+delta:
			okJ = true
		case upperW && tk >= qv+delta, !upperW && tk <= qv-delta:
			okJ = false
		default:
			// Too close to call from the stepped value: evaluate.
			okJ, tk, _ = d.decide(t, j, upperW, false)
			if !(tk >= walkTiny) {
				return d.search2(t, j)
			}
			errT = relTol * tk
		}
		if okK != okJ {
			if okK {
				return k
			}
			return j
		}
		k = j
	}
	return d.search2(t, k)
}

// logBound returns max(1, |ln x|) rounded up, from the binary exponent of
// x > 0 (no logarithm).
func logBound(x float64) float64 {
	e := int(math.Float64bits(x)>>52&0x7ff) - 1022 // x = f 2^e, 1/2 <= f < 1
	if e == -1022 {
		e = -1074 // subnormal: at most this
	}
	return math.Max(1, float64(max(e, 1-e))*math.Ln2)
}

// decide returns ok(k) for 0 <= k < N, made on exactly the computation of
// the function the target inverts, the plain value of the upper tail (if
// upperW) or the lower one and, if withPMF, b(k) = P(X = k) (from the
// tail's own PMF factor where it has one).
func (d Dist) decide(t *quantileTarget, k int64, upperW, withPMF bool) (ok bool, tail, b float64) {
	tv := d.smallTailPMF(k, withPMF)
	if tv.form == formLog {
		// Rare (tiny P, or an expansion tail below 1e-190): the methods.
		if withPMF {
			b = d.Prob(k)
		}
		switch {
		case !t.upper && t.plain:
			ok = tv.linLower() >= t.q
		case !t.upper:
			ok = tv.logLower() >= t.lq
		case t.plain:
			ok = tv.linUpper() <= t.q
		default:
			ok = tv.logUpper() <= t.lq
		}
		if upperW {
			return ok, tv.linUpper(), b
		}
		return ok, tv.linLower(), b
	}
	// The plain smaller tail once, by the very operations of linSmall (so
	// bit for bit what CDF and Survival return), its e^lb shared with b(k).
	var small float64
	if tv.form == formProd && tv.lb > -700 {
		e := math.Exp(tv.lb)
		small = e * tv.f
		if withPMF {
			b = e
			if !tv.lower {
				// tv.lb is ln b(k+1); b(k) = b(k+1) (k+1)(1-P) / ((N-k) P).
				b = e * (float64(k+1) * (1 - d.P) / (float64(d.N-k) * d.P))
			}
		}
	} else {
		small = tv.linSmall()
		if withPMF {
			b = 0
			if tv.form == formLin {
				b = tv.f
			}
			if !(b > 0) {
				b = d.Prob(k)
			}
		}
	}
	lo, up := small, 1-small // linLower, linUpper when the smaller tail is the lower one
	if !tv.lower {
		lo, up = up, lo
	}
	switch {
	case !t.upper && t.plain:
		ok = lo >= t.q
	case !t.upper:
		l := tv.logSmall()
		if !tv.lower {
			l = math.Log1p(-small) // logLarge
		}
		ok = l >= t.lq
	case t.plain:
		ok = up <= t.q
	default:
		l := tv.logSmall()
		if tv.lower {
			l = math.Log1p(-small) // logLarge
		}
		ok = l <= t.lq
	}
	if upperW {
		return ok, up, b
	}
	return ok, lo, b
}

// ln002 is ln 0.02.
const ln002 = -3.9120230054281460586

// normalQuantileLog returns z with Phi(z) = e^lq for lq <= ln(1/2):
// math.Erfinv down to Phi = 0.02, below that the asymptotic inversion of
// Mills' ratio refined by two Newton steps on ln Phi (math.Erfc), good to
// about 1e-12; below z = -37, where erfc underflows, the asymptotic
// inversion alone (relative 1e-6). A starting point, not a result.
func normalQuantileLog(lq float64) float64 {
	if lq > ln002 {
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
// the uniform expansion (the second only where the first moved by half a
// trial or more), P(X <= k) ~ Phi(z_k + w_k/3) with z_k the signed
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
			ra, rb := a/mqHi, b/mpHi
			la, lb := math.Log(ra), math.Log(rb)
			dev := bd0Log(a, mqHi, mqLo, ra, la) + bd0Log(b, mpHi, mpLo, rb, lb)
			zk := math.Copysign(math.Sqrt(2*dev), b-mpHi)
			res := zk + (b-a)/math.Sqrt(a*b*mu)/3 - z
			slope := (lb - la) / zk // d z_k / d k
			if !(slope > 0) {
				break
			}
			step := res / slope
			x -= step
			if math.Abs(step) < 0.5 {
				break // Newton's next step would be of order step^2
			}
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
// expansion's leading terms (within one of the answer almost everywhere;
// for N <= 1024 and a tail below e^-8, integer Newton steps on the
// tabulated log PMF instead, see farStart), one tail evaluation there and steps by PMF ratios to the answer, with a
// second evaluation where a stepped value is too close to the target to
// decide (see locate); a start more than 24 steps off goes on by secant
// steps on the log tail, at most about 2 log2(N) + 10 evaluations.
// Measured figures are in the README.
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
	t := quantileTarget{plain: true, q: q, lq: lqUnset}
	if d.N <= smallN && (q <= farMinProb || q >= 1-farMinProb) {
		if k, ok := d.farFromProb(min(q, 1-q), q <= 0.5, q > 0.5); ok {
			return d.locate(&t, k)
		}
	}
	return d.locate(&t, d.guess(zFromProb(q, d.zNeed())))
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
	if d.N <= smallN && (lq <= farMinLog || lq >= farMinLogComp) {
		if k, ok := d.farFromLog(lq, true); ok {
			return d.locate(&t, k)
		}
	}
	return d.locate(&t, d.guess(zFromLogNeed(lq, d.zNeed())))
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
	t := quantileTarget{upper: true, plain: true, q: q, lq: lqUnset}
	if d.N <= smallN && (q <= farMinProb || q >= 1-farMinProb) {
		if k, ok := d.farFromProb(min(q, 1-q), q > 0.5, q > 0.5); ok {
			return d.locate(&t, k)
		}
	}
	return d.locate(&t, d.guess(-zFromProb(q, d.zNeed())))
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
	if d.N <= smallN && (lq <= farMinLog || lq >= farMinLogComp) {
		if k, ok := d.farFromLog(lq, false); ok {
			return d.locate(&t, k)
		}
	}
	return d.locate(&t, d.guess(-zFromLogNeed(lq, d.zNeed())))
}

// zNeed returns the precision in z a quantile start needs: a quarter of
// a trial in k (locate walks the rest).
func (d Dist) zNeed() float64 { return 0.25 / math.Max(1, math.Sqrt(d.Variance())) }

// zFromProb returns the standard normal quantile for the lower-tail
// probability 0 < q < 1, a starting point good to about need (see
// normalTail).
func zFromProb(q, need float64) float64 {
	if q <= 0.5 {
		return normalTail(q, math.NaN(), need)
	}
	return -normalTail(1-q, math.NaN(), need) // 1-q is exact (Sterbenz)
}

// zFromLogNeed is zFromProb for the log probability lq <= 0.
func zFromLogNeed(lq, need float64) float64 {
	switch {
	case lq >= 0:
		return 40
	case lq <= -math.Ln2:
		u := math.NaN()
		if lq >= lnErfinvMin {
			u = math.Exp(lq)
		}
		return normalTail(u, lq, need)
	}
	u := -math.Expm1(lq)
	return -normalTail(u, math.NaN(), need)
}

// lnErfinvMin is ln erfinvMin.
const lnErfinvMin = -20.723265836946411156

// erfinvMin is the smallest tail probability normalTail inverts with
// math.Erfinv: 2u - 1 carries an absolute rounding error of 1e-16, which
// moves z by less than 1e-16 / (u |z|) < 2e-8 there.
const erfinvMin = 1e-9

// normalTail returns z <= 0 with Phi(z) = u for a lower-tail probability
// u <= 1/2, given as u (NaN if not at hand) or by its logarithm lu (NaN if
// not at hand): math.Erfinv down to u = erfinvMin; below, the asymptotic
// inversion of Mills' ratio,
//
//	ln Phi(z) = -t/2 - ln(2 pi t)/2 + ln S(1/t),  t = z^2,
//	ln S(r) = -r + 5/2 r^2 - 37/3 r^3 + 353/4 r^4 + O(r^5)
//
// (the logarithm of the series 1 - r + 3 r^2 - 15 r^3 + 105 r^4 - ... of
// Mills' ratio times |z|), solved for t by fixed-point steps
// t <- -2 lu - ln(2 pi t) + 2 ln S(1/t) from t = -2 lu, each of which
// shrinks the error by about 1/t < 1/36, until the change in z is below
// need. The truncated series is good to about 1e3/t^5 in ln Phi, so
// 1e3/(t^5 |z|) < 1e-8 in z; where need is finer than that, one Newton
// step on ln Phi by math.Erfc (above z = -37, where it does not underflow)
// brings it to about 1e-11. A starting point, not a result.
func normalTail(u, lu, need float64) float64 {
	if u >= erfinvMin {
		return math.Sqrt2 * math.Erfinv(2*u-1)
	}
	if math.IsNaN(lu) {
		lu = xmath.Log(u)
	}
	l2 := -2 * lu
	t, lt := l2, math.Log(2*math.Pi*l2) // t and ln(2 pi t)
	for range 6 {
		r := 1 / t
		next := l2 - lt + 2*r*(-1+r*(2.5+r*(-37.0/3+r*(353.0/4))))
		x := (next - t) / t
		if math.Abs(x) < 0.03 {
			// ln(1+x) to x^5: within 1.2e-10, below what the steps need
			// (|x| < 1e-3 after the first, where it is within 2e-19).
			lt += x * (1 - x*(0.5-x*(1.0/3-x*(0.25-x*0.2))))
		} else {
			lt += math.Log1p(x)
		}
		t = next
		// The next step would move t by about x (1 - ...): z by
		// |x| t / (2 |z|) = |x| |z| / 2.
		if math.Abs(x)*math.Sqrt(t) < need {
			break
		}
	}
	z := -math.Sqrt(t)
	if z < -37 || 1e3/(t*t*t*t*t)/-z <= need {
		return z
	}
	phiTail := 0.5 * math.Erfc(-z/math.Sqrt2)
	// d ln Phi / dz = phi(z)/Phi(z).
	return z - (math.Log(phiTail)-lu)*phiTail/math.Exp(-0.5*z*z-0.5*ln2pi)
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

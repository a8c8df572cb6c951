// Package strata holds what the stratified analyses of interval and test
// share: the validation of a list of 2x2 strata and the exact conditional
// distribution of the sum of the strata's first cells given every
// stratum's margins, by convolution of the strata's hypergeometric
// distributions.
package strata

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/root"
	"github.com/kofnlab/kofn/internal/xmath"
)

// Table is one stratum: K1 successes of N1 in group 1, K2 of N2 in group 2.
// In the usual 2x2 notation a = K1, b = N1 - K1, c = K2, d = N2 - K2.
type Table struct {
	K1, N1, K2, N2 int64
}

// MaxStrata bounds the number of strata a call accepts.
const MaxStrata = 1_000_000

// MaxSupport bounds the support of the conditional distribution of the
// sum (the sum over strata of each stratum's number of possible first
// cells); the convolution costs about the square of it divided by the
// number of strata, a second at the limit.
const MaxSupport = 200_000

// Check validates strata for function fn: at least one stratum, counts
// 0 <= K <= N, totals that fit in float64 exactly, and the sums of counts
// without overflow.
func Check(fn string, ts []Table) error {
	if len(ts) == 0 {
		return argerr.Invalid(fn, "strata", 0, "is empty; give at least one stratum")
	}
	if len(ts) > MaxStrata {
		return argerr.TooLarge(fn, "strata", len(ts), "exceeds the limit of 1e6 strata")
	}
	var total float64
	for i, t := range ts {
		if t.K1 < 0 || t.K1 > t.N1 || t.K2 < 0 || t.K2 > t.N2 || t.N1 > binom.MaxN-t.N2 {
			name := "strata[" + argerr.Format(i) + "]"
			if err := argerr.KN(fn, name+".K1", name+".N1", t.K1, t.N1); err != nil {
				return err
			}
			if err := argerr.KN(fn, name+".K2", name+".N2", t.K2, t.N2); err != nil {
				return err
			}
			return argerr.TooLarge(fn, name+".N1", t.N1, "plus N2 = "+argerr.Format(t.N2)+" exceeds 2^53")
		}
		total += float64(t.N1 + t.N2)
	}
	if total > float64(binom.MaxN) {
		return argerr.TooLarge(fn, "strata", len(ts), "hold more than 2^53 trials in all")
	}
	return nil
}

// Conditional is the distribution of S = sum of the strata's K1 given every
// stratum's margins, as log weights: P(S = Lo + j | psi) is proportional to
// exp(LogW[j] + (Lo + j) ln psi), psi the common odds ratio. LogW[j] is -Inf
// for an impossible sum. Obs is the observed S.
type Conditional struct {
	Lo   int64
	LogW []float64
	Obs  int64
}

// NewConditional convolves the strata's central hypergeometric
// distributions (binom.Hyper of the first cell given the margins). The
// convolution runs in linear space on each stratum's probabilities scaled
// to their largest, rescaling the running result to its largest after each
// stratum, so no weight within 1e-300 of the largest underflows; weights
// below that are kept in log space by a second, log-space convolution only
// when the observed sum lies there. ctx is checked after every stratum.
func NewConditional(ctx context.Context, fn string, ts []Table) (Conditional, error) {
	var width int64
	var obs, lo int64
	for _, t := range ts {
		m := t.K1 + t.K2
		l, h := max(0, m-t.N2), min(m, t.N1)
		width += h - l
		lo += l
		obs += t.K1
	}
	if width+1 > MaxSupport {
		return Conditional{}, argerr.TooLarge(fn, "strata", len(ts), "give a conditional distribution with "+argerr.Format(width+1)+
			" possible sums, above the limit of 200000; use the asymptotic test (Exact false), which is accurate at this size")
	}
	w := []float64{1}
	logScale := 0.0
	for i, t := range ts {
		if i&15 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return Conditional{}, err
			}
		}
		v := stratumWeights(t)
		if len(v) == 1 {
			continue
		}
		out := make([]float64, len(w)+len(v)-1)
		for a, x := range w {
			if x == 0 {
				continue
			}
			for b, y := range v {
				out[a+b] += x * y
			}
		}
		mx := 0.0
		for _, x := range out {
			mx = math.Max(mx, x)
		}
		for j := range out {
			out[j] /= mx
		}
		logScale += math.Log(mx)
		w = out
	}
	c := Conditional{Lo: lo, LogW: make([]float64, len(w)), Obs: obs}
	for j, x := range w {
		c.LogW[j] = xmath.Log(x) + logScale
	}
	if w[obs-lo] == 0 || underflowTail(w, int(obs-lo)) {
		return logConditional(ctx, fn, ts, lo, obs)
	}
	return c, nil
}

// underflowTail reports whether the weights next to the observed sum have
// underflowed, so that a tail sum from it would miss terms.
func underflowTail(w []float64, j int) bool {
	return (j > 0 && w[j-1] == 0 && w[0] != 0) || (j+1 < len(w) && w[j+1] == 0 && w[len(w)-1] != 0)
}

// stratumWeights returns the stratum's hypergeometric probabilities of the
// first cell over its support, scaled to their largest.
func stratumWeights(t Table) []float64 {
	m := t.K1 + t.K2
	l, h := max(0, m-t.N2), min(m, t.N1)
	if l == h {
		return []float64{1}
	}
	hy := binom.Hyper{Total: t.N1 + t.N2, Successes: t.N1, Draws: m}
	lp := make([]float64, h-l+1)
	mx := math.Inf(-1)
	for x := l; x <= h; x++ {
		lp[x-l] = hy.LogProb(x)
		mx = math.Max(mx, lp[x-l])
	}
	v := make([]float64, len(lp))
	for j, x := range lp {
		v[j] = math.Exp(x - mx)
	}
	return v
}

// logConditional is the convolution in log space (log-add-exp of every
// pair), for observed sums whose weight underflows in linear space.
func logConditional(ctx context.Context, fn string, ts []Table, lo, obs int64) (Conditional, error) {
	w := []float64{0}
	for i, t := range ts {
		if i&3 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return Conditional{}, err
			}
		}
		m := t.K1 + t.K2
		l, h := max(0, m-t.N2), min(m, t.N1)
		if l == h {
			continue
		}
		hy := binom.Hyper{Total: t.N1 + t.N2, Successes: t.N1, Draws: m}
		out := make([]float64, len(w)+int(h-l))
		for j := range out {
			out[j] = math.Inf(-1)
		}
		for a, x := range w {
			if math.IsInf(x, -1) {
				continue
			}
			for b := l; b <= h; b++ {
				out[a+int(b-l)] = xmath.LogAddExp(out[a+int(b-l)], x+hy.LogProb(b))
			}
		}
		w = out
	}
	return Conditional{Lo: lo, LogW: w, Obs: obs}, nil
}

// Hi is the largest possible sum.
func (c Conditional) Hi() int64 { return c.Lo + int64(len(c.LogW)) - 1 }

// terms returns the log weights at log odds ratio lpsi and their largest.
func (c Conditional) terms(lpsi float64) ([]float64, float64) {
	t := make([]float64, len(c.LogW))
	mx := math.Inf(-1)
	for j, x := range c.LogW {
		t[j] = x + float64(c.Lo+int64(j))*lpsi
		if math.IsInf(x, -1) {
			t[j] = math.Inf(-1)
		}
		mx = math.Max(mx, t[j])
	}
	return t, mx
}

// logTerms returns the log weights at log odds ratio lpsi, and their log
// total.
func (c Conditional) logTerms(lpsi float64) ([]float64, float64) {
	t, mx := c.terms(lpsi)
	sum := 0.0
	for _, x := range t {
		sum += math.Exp(x - mx)
	}
	return t, mx + math.Log(sum)
}

// LogTails returns ln P(S <= s), ln P(S >= s) and ln P(S = s) at log odds
// ratio lpsi; a mid-p tail subtracts half the point probability.
func (c Conditional) LogTails(s int64, lpsi float64) (lower, upper, point float64) {
	t, mx := c.terms(lpsi)
	j := int(s - c.Lo)
	var lo, up, total float64
	for i, x := range t {
		e := math.Exp(x - mx)
		total += e
		if i <= j {
			lo += e
		}
		if i >= j {
			up += e
		}
	}
	// The smaller tail is summed on its own terms, so a tail far below
	// the total keeps its digits (no difference of sums is formed).
	lt := math.Log(total)
	point = math.Inf(-1)
	if j >= 0 && j < len(t) {
		point = t[j] - mx - lt
	}
	return min(0, xmath.Log(lo)-lt), min(0, xmath.Log(up)-lt), point
}

// Mean returns E[S] at log odds ratio lpsi.
func (c Conditional) Mean(lpsi float64) float64 {
	t, total := c.logTerms(lpsi)
	m := 0.0
	for j, x := range t {
		m += float64(c.Lo+int64(j)) * math.Exp(x-total)
	}
	return m
}

// Null is the conditional distribution of S at odds ratio 1 with its
// tails precomputed, in the method set onesample.Discrete asks for, so
// the exact stratified test shares the one-sample exact tests' two-sided
// rules.
type Null struct {
	c           Conditional
	lp, lc, lsv []float64 // ln P(S = s), ln P(S <= s), ln P(S > s), index s - Lo
	mode        int64
}

// NewNull normalises c at odds ratio 1 and sums its tails from both ends.
func (c Conditional) NewNull() Null {
	t, total := c.logTerms(0)
	n := Null{c: c, lp: make([]float64, len(t)), lc: make([]float64, len(t)), lsv: make([]float64, len(t))}
	best := math.Inf(-1)
	acc := math.Inf(-1)
	for j, x := range t {
		n.lp[j] = x - total
		if n.lp[j] > best {
			best, n.mode = n.lp[j], c.Lo+int64(j)
		}
		acc = xmath.LogAddExp(acc, n.lp[j])
		n.lc[j] = min(acc, 0)
	}
	acc = math.Inf(-1)
	for j := len(t) - 1; j >= 0; j-- {
		n.lsv[j] = min(acc, 0)
		acc = xmath.LogAddExp(acc, n.lp[j])
	}
	return n
}

// LogProb returns ln P(S = s).
func (n Null) LogProb(s int64) float64 {
	if s < n.c.Lo || s > n.c.Hi() {
		return math.Inf(-1)
	}
	return n.lp[s-n.c.Lo]
}

// LogCDF returns ln P(S <= s).
func (n Null) LogCDF(s int64) float64 {
	switch {
	case s < n.c.Lo:
		return math.Inf(-1)
	case s >= n.c.Hi():
		return 0
	}
	return n.lc[s-n.c.Lo]
}

// LogSurvival returns ln P(S > s).
func (n Null) LogSurvival(s int64) float64 {
	switch {
	case s < n.c.Lo:
		return 0
	case s >= n.c.Hi():
		return math.Inf(-1)
	}
	return n.lsv[s-n.c.Lo]
}

// Mode returns a most probable sum.
func (n Null) Mode() int64 { return n.mode }

// MLE returns the conditional maximum-likelihood estimate of the common
// odds ratio: the psi with E[S | psi] = Obs (0 or +Inf at the ends, NaN
// when only one sum is possible), by Brent's method on ln psi.
func (c Conditional) MLE() float64 {
	switch {
	case c.Lo == c.Hi():
		return math.NaN()
	case c.Obs == c.Lo:
		return 0
	case c.Obs == c.Hi():
		return math.Inf(1)
	}
	s := float64(c.Obs)
	f := func(l float64) float64 { return c.Mean(l) - s }
	lo, hi := bracketLog(f)
	l, err := root.Brent(f, lo, hi, 1e-13, 1e-13)
	if err != nil {
		return math.NaN()
	}
	return math.Exp(l)
}

// bracketLog finds lo < hi with f(lo) < 0 < f(hi) for an increasing f of
// ln psi, starting from [-1, 1] and doubling.
func bracketLog(f func(float64) float64) (float64, float64) {
	lo, hi := -1.0, 1.0
	for i := 0; i < 12 && f(lo) > 0; i++ {
		lo *= 2
	}
	for i := 0; i < 12 && f(hi) < 0; i++ {
		hi *= 2
	}
	return lo, hi
}

// Limit solves P(S >= Obs | psi) = tail (lower limit) or
// P(S <= Obs | psi) = tail (upper), mid-p halving the point, on ln psi, by
// Brent's method to 1e-13 relative.
func (c Conditional) Limit(tail float64, mid, lower bool) float64 {
	lt := math.Log(tail)
	g := func(l float64) float64 {
		lo, up, pt := c.LogTails(c.Obs, l)
		v := up
		if !lower {
			v = lo
		}
		if mid {
			v = logMinusHalf(v, pt)
		}
		if lower {
			return v - lt // increasing in ln psi
		}
		return lt - v // P(S <= s) decreases in ln psi
	}
	lo, hi := bracketLog(g)
	l, err := root.Brent(g, lo, hi, 1e-13, 1e-13)
	if err != nil {
		return math.NaN()
	}
	return math.Exp(l)
}

// logMinusHalf returns ln(e^a - e^b / 2) for b <= a.
func logMinusHalf(a, b float64) float64 {
	d := math.Exp(b-a) / 2
	if d >= 1 {
		return math.Inf(-1)
	}
	return a + math.Log1p(-d)
}

// MHSums holds the Mantel-Haenszel sums over the strata with trials in
// both groups and at least two trials (the others carry no information on
// a contrast), in the notation a = K1, b = N1 - K1, c = K2, d = N2 - K2,
// n = N1 + N2.
type MHSums struct {
	R, S                float64 // sum a d / n, sum b c / n
	PR, PSQR, QS        float64 // Robins-Breslow-Greenland: sum P R, sum (P S + Q R), sum Q S
	RRNum, RRDen, RRVar float64 // sum a N2 / n, sum c N1 / n, Greenland-Robins numerator
	RDNum, W            float64 // sum (a N2 - c N1)/n, sum N1 N2 / n
	SatoP, SatoQ        float64 // Sato's P and Q
	GRRD                float64 // Greenland-Robins risk-difference variance numerator
	Used                int     // strata that entered
}

// MH returns the Mantel-Haenszel sums of valid strata.
func MH(ts []Table) MHSums {
	var m MHSums
	for _, t := range ts {
		n1, n2 := float64(t.N1), float64(t.N2)
		n := n1 + n2
		if t.N1 == 0 || t.N2 == 0 || n < 2 {
			continue
		}
		m.Used++
		a, c := float64(t.K1), float64(t.K2)
		b, d := n1-a, n2-c
		R, S := a*d/n, b*c/n
		P, Q := (a+d)/n, (b+c)/n
		m.R += R
		m.S += S
		m.PR += P * R
		m.PSQR += P*S + Q*R
		m.QS += Q * S
		m.RRNum += a * n2 / n
		m.RRDen += c * n1 / n
		m.RRVar += (n1*n2*(a+c) - a*c*n) / (n * n)
		m.RDNum += (a*n2 - c*n1) / n
		m.W += n1 * n2 / n
		m.SatoP += (n1*n1*c - n2*n2*a + n1*n2*(n2-n1)/2) / (n * n)
		m.SatoQ += (a*(n2-c) + c*(n1-a)) / (2 * n)
		m.GRRD += (a*b*n2*n2*n2 + c*d*n1*n1*n1) / (n1 * n2 * n * n)
	}
	return m
}

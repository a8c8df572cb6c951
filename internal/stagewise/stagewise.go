// Package stagewise computes the exact distribution of a multi-stage
// one-proportion study with planned looks: a Simon two-stage design or a
// group-sequential design with futility and efficacy stopping counts. It
// is shared by power (design and evaluation), test (the stage-wise
// ordering p-value) and interval (the stage-wise ordering confidence
// interval).
//
// At look k the cumulative number of successes S_k among the first N_k
// trials is compared with two counts: the study stops for futility when
// S_k <= Futility_k and stops rejecting H0 (for efficacy) when S_k >=
// Efficacy_k; otherwise it goes on to look k+1. At the final look every
// outcome stops (Efficacy = Futility + 1). The sub-density of S_k on the
// paths that reach look k is computed by dynamic programming over the
// count: the density continuing from look k-1 convolved with the
// binomial(N_k - N_{k-1}, p) probabilities of the new trials (Jennison C,
// Turnbull BW (2000), Group Sequential Methods with Applications to
// Clinical Trials, Chapman & Hall/CRC, section 12.1, for binary data).
//
// The stage-wise ordering (Jennison and Turnbull 2000, section 8.4;
// Koyama T, Chen H (2008), Proper inference from Simon's two-stage
// designs, Statistics in Medicine 27:3145-3154, for the two-stage case)
// ranks an outcome (k', s') above (k, s) when it stops for efficacy at an
// earlier look, or stops at the same look with a larger count, or when
// (k, s) stops for futility and (k', s') goes further. For every outcome
// the upper tail is then
//
//	P_p(outcome >= (k, s)) = sum_{j<k} P_p(efficacy stop at j) + P_p(reach k, S_k >= s)
//
// and the lower tail P_p(outcome <= (k, s)) is the same with futility stops
// and S_k <= s. Both are computed directly as sums of positive terms (no
// complement), so small tails keep their relative accuracy; when a tail
// falls below 1e-280 the same recursion is repeated in log space.
package stagewise

import (
	"context"
	"math"
	"strconv"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/xmath"
)

// MaxN is the largest final cumulative size accepted: the exact
// recursion costs O(N_K^2) operations at worst, which keeps a call to
// about a second at the limit.
const MaxN int64 = 20000

// Look is one planned analysis of a multi-stage one-proportion study.
type Look struct {
	// N is the cumulative number of trials at this look (strictly
	// increasing over the looks, N >= 1 at the first).
	N int64 `json:"n"`
	// Futility: the study stops, not rejecting H0, when the cumulative
	// count of successes is at most Futility; -1 means no futility stop.
	Futility int64 `json:"futility"`
	// Efficacy: the study stops rejecting H0 when the cumulative count
	// is at least Efficacy; N + 1 means no efficacy stop at this look. At
	// the final look Efficacy = Futility + 1.
	Efficacy int64 `json:"efficacy"`
}

// Validate checks a list of looks for function fn: at least one look, N
// strictly increasing from at least 1 up to MaxN, -1 <= Futility <
// Efficacy <= N + 1, a non-empty continuation region (Futility + 1 <
// Efficacy) before the last look and none at the last (Efficacy =
// Futility + 1).
func Validate(fn string, looks []Look) error {
	if len(looks) == 0 {
		return argerr.Invalid(fn, "looks", 0, "looks: need at least one look")
	}
	var prev int64
	for i, l := range looks {
		name := "looks[" + strconv.Itoa(i) + "]"
		if l.N <= prev {
			return argerr.Invalid(fn, name+".N", l.N, "must exceed the previous look's N = "+strconv.FormatInt(prev, 10))
		}
		if l.N > MaxN {
			return argerr.TooLarge(fn, name+".N", l.N, "exceeds the limit of "+strconv.FormatInt(MaxN, 10)+" trials")
		}
		if l.Futility < -1 || l.Futility > l.N {
			return argerr.Invalid(fn, name+".Futility", l.Futility, "must lie in [-1, N] (-1: no futility stop)")
		}
		if l.Efficacy <= l.Futility || l.Efficacy > l.N+1 {
			return argerr.Invalid(fn, name+".Efficacy", l.Efficacy, "must lie in (Futility, N+1] (N+1: no efficacy stop)")
		}
		last := i == len(looks)-1
		if last && l.Efficacy != l.Futility+1 {
			return argerr.Invalid(fn, name+".Efficacy", l.Efficacy, "must equal Futility + 1 at the final look, so that every outcome stops")
		}
		if !last && l.Efficacy == l.Futility+1 {
			return argerr.Invalid(fn, name+".Efficacy", l.Efficacy, "equals Futility + 1 before the final look: the later looks would never be reached")
		}
		prev = l.N
	}
	return nil
}

// Dist is the exact distribution of the stopping outcome at one p.
type Dist struct {
	Looks []Look
	P     float64
	// H[k][i] = P(reach look k and S_k = Lo[k] + i).
	H  [][]float64
	Lo []int64
	// Low[k], High[k]: probability of a futility / efficacy stop at look k
	// (at the last look High is the rejection and Low the acceptance).
	Low, High []float64
}

// PMF returns b(j; m, p) for j = 0..m, each from binom's log-space
// density (so that small terms keep their relative accuracy).
func PMF(m int64, p float64) []float64 { return pmfRow(m, p) }

func pmfRow(m int64, p float64) []float64 {
	d := binom.Dist{N: m, P: p}
	w := make([]float64, m+1)
	for j := int64(0); j <= m; j++ {
		w[j] = math.Exp(d.LogProb(j))
	}
	return w
}

// Convolve returns h[i] = sum_j g[j] w[i-j] (len(g) + len(w) - 1 terms),
// checking ctx every few rows.
func Convolve(ctx context.Context, g, w []float64) ([]float64, error) {
	if len(g) == 0 {
		return nil, nil
	}
	h := make([]float64, len(g)+len(w)-1)
	for i, gi := range g {
		if i%ctxEvery == ctxEvery-1 && ctx.Err() != nil {
			return nil, ctx.Err()
		}
		if gi == 0 {
			continue
		}
		row := h[i : i+len(w)]
		for j, wj := range w {
			row[j] += gi * wj
		}
	}
	return h, nil
}

// ctxEvery is how many inner-loop rows pass between context checks.
const ctxEvery = 64

// New computes the distribution of the outcome of the design at p. The
// looks must have passed Validate. Cost O(sum_k width_k * m_k) where
// width_k is the continuation width; ctx is checked every few rows.
func New(ctx context.Context, looks []Look, p float64) (*Dist, error) {
	d := &Dist{Looks: looks, P: p}
	K := len(looks)
	d.H = make([][]float64, K)
	d.Lo = make([]int64, K)
	d.Low = make([]float64, K)
	d.High = make([]float64, K)
	g := []float64{1} // sub-density of the count entering the look
	var glo, prevN int64
	for k, l := range looks {
		m := l.N - prevN
		w := pmfRow(m, p)
		h := make([]float64, len(g)+int(m))
		for i, gi := range g {
			if i%ctxEvery == ctxEvery-1 && ctx.Err() != nil {
				return nil, ctx.Err()
			}
			if gi == 0 {
				continue
			}
			row := h[i : i+len(w)]
			for j, wj := range w {
				row[j] += gi * wj
			}
		}
		d.H[k], d.Lo[k] = h, glo
		// Stop probabilities, summed from the small end of each tail.
		var low, high float64
		for s := min(l.Futility, glo+int64(len(h))-1); s >= glo; s-- {
			low += h[s-glo]
		}
		for s := glo + int64(len(h)) - 1; s >= max(l.Efficacy, glo); s-- {
			high += h[s-glo]
		}
		d.Low[k], d.High[k] = low, high
		// Continuation region (Futility, Efficacy) for the next look.
		a, b := max(l.Futility+1, glo), min(l.Efficacy-1, glo+int64(len(h))-1)
		if a > b {
			g, glo = nil, a
		} else {
			g, glo = h[a-glo:b-glo+1], a
		}
		prevN = l.N
	}
	return d, nil
}

// Reach returns P(reach look k): the sum of its sub-density.
func (d *Dist) Reach(k int) float64 {
	var s float64
	for i := len(d.H[k]) - 1; i >= 0; i-- {
		s += d.H[k][i]
	}
	return s
}

// ExpectedN returns the expected number of trials, sum_k N_k P(stop at k).
func (d *Dist) ExpectedN() float64 {
	var e float64
	for k, l := range d.Looks {
		e += float64(l.N) * (d.Low[k] + d.High[k])
	}
	return e
}

// Reject returns the probability of rejecting H0: the efficacy stops
// over all looks.
func (d *Dist) Reject() float64 {
	var r float64
	for _, h := range d.High {
		r += h
	}
	return r
}

// Upper returns P(outcome >= (k, s)) in the stage-wise ordering.
func (d *Dist) Upper(k int, s int64) float64 {
	var t float64
	for j := 0; j < k; j++ {
		t += d.High[j]
	}
	h, lo := d.H[k], d.Lo[k]
	var u float64
	for x := lo + int64(len(h)) - 1; x >= max(s, lo); x-- {
		u += h[x-lo]
	}
	return t + u
}

// Lower returns P(outcome <= (k, s)) in the stage-wise ordering.
func (d *Dist) Lower(k int, s int64) float64 {
	var t float64
	for j := 0; j < k; j++ {
		t += d.Low[j]
	}
	h, lo := d.H[k], d.Lo[k]
	var u float64
	for x := lo; x <= min(s, lo+int64(len(h))-1); x++ {
		u += h[x-lo]
	}
	return t + u
}

// CheckOutcome validates an observed outcome: the study stopped at look
// index k (0-based) with cumulative count s, which must be a stopping
// count there.
func CheckOutcome(fn string, looks []Look, k int, s int64) error {
	if k < 0 || k >= len(looks) {
		return argerr.Invalid(fn, "look", k+1, "is not a look of the design (1 to "+strconv.Itoa(len(looks))+")")
	}
	l := looks[k]
	if err := argerr.KN(fn, "k", "n", s, l.N); err != nil {
		return err
	}
	if s > l.Futility && s < l.Efficacy {
		return argerr.Invalid(fn, "k", s, "does not stop the study at look "+strconv.Itoa(k+1)+
			" (it continues for counts "+strconv.FormatInt(l.Futility+1, 10)+" to "+strconv.FormatInt(l.Efficacy-1, 10)+")")
	}
	return nil
}

// Tail selects the stage-wise upper or lower tail.
type Tail int

const (
	UpperTail Tail = iota // P(outcome >= observed)
	LowerTail             // P(outcome <= observed)
)

// LogTail returns the log of the stage-wise tail probability of the
// observed outcome (k, s) at p, repeating the recursion in log space when
// the linear-space value is below 1e-280. Valid looks and outcome assumed.
func LogTail(ctx context.Context, looks []Look, k int, s int64, p float64, t Tail) (float64, error) {
	d, err := New(ctx, looks[:k+1], p)
	if err != nil {
		return 0, err
	}
	var v float64
	if t == UpperTail {
		v = d.Upper(k, s)
	} else {
		v = d.Lower(k, s)
	}
	if v >= 1e-280 {
		return math.Min(0, math.Log(v)), nil
	}
	return logTail(ctx, looks[:k+1], k, s, p, t)
}

// logTail is the log-space form of the recursion for one tail.
func logTail(ctx context.Context, looks []Look, k int, s int64, p float64, t Tail) (float64, error) {
	g := []float64{0}
	var glo, prevN int64
	acc := math.Inf(-1)
	for j, l := range looks {
		m := l.N - prevN
		dist := binom.Dist{N: m, P: p}
		w := make([]float64, m+1)
		for i := range w {
			w[i] = dist.LogProb(int64(i))
		}
		h := make([]float64, len(g)+int(m))
		for i := range h {
			h[i] = math.Inf(-1)
		}
		for i, gi := range g {
			if i%ctxEvery == ctxEvery-1 && ctx.Err() != nil {
				return 0, ctx.Err()
			}
			if math.IsInf(gi, -1) {
				continue
			}
			for jj, wj := range w {
				h[i+jj] = xmath.LogAddExp(h[i+jj], gi+wj)
			}
		}
		hi := glo + int64(len(h)) - 1
		sum := func(a, b int64) float64 {
			r := math.Inf(-1)
			for x := max(a, glo); x <= min(b, hi); x++ {
				r = xmath.LogAddExp(r, h[x-glo])
			}
			return r
		}
		if j == k {
			if t == UpperTail {
				return math.Min(0, xmath.LogAddExp(acc, sum(s, hi))), nil
			}
			return math.Min(0, xmath.LogAddExp(acc, sum(glo, s))), nil
		}
		if t == UpperTail {
			acc = xmath.LogAddExp(acc, sum(l.Efficacy, hi))
		} else {
			acc = xmath.LogAddExp(acc, sum(glo, l.Futility))
		}
		a, b := max(l.Futility+1, glo), min(l.Efficacy-1, hi)
		if a > b {
			g, glo = nil, a
		} else {
			g, glo = h[a-glo:b-glo+1], a
		}
		prevN = l.N
	}
	return acc, nil
}

// Extreme reports whether the observed outcome (k, s) is the smallest
// outcome in the stage-wise ordering (the one reached at p = 0, for which
// the upper tail is 1 at every p) or the largest (reached at p = 1).
func Extreme(looks []Look, k int, s int64) (smallest, largest bool) {
	return pathStop(looks, 0) == [2]int64{int64(k), s}, pathStop(looks, 1) == [2]int64{int64(k), s}
}

// pathStop returns the stopping look and count of the all-failure (p = 0)
// or all-success (p = 1) path.
func pathStop(looks []Look, p int) [2]int64 {
	for k, l := range looks {
		s := int64(0)
		if p == 1 {
			s = l.N
		}
		if s <= l.Futility || s >= l.Efficacy {
			return [2]int64{int64(k), s}
		}
	}
	return [2]int64{-1, -1}
}

package test

import (
	"context"
	"math"
	"sort"
	"strconv"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/beta"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/interval"
	"gonum.org/v1/gonum/integrate/quad"
)

// MaxArms is the largest number of arms ProbBest accepts.
const MaxArms = 64

// BestArm holds the posterior probability that each of k arms has the
// highest success probability, under independent Beta priors (all stated).
type BestArm struct {
	Priors []interval.Prior `json:"priors"` // prior of each arm, with its shapes
	A      []float64        `json:"a"`      // posterior first shapes, Priors[i].A + k[i]
	B      []float64        `json:"b"`      // posterior second shapes, Priors[i].B + n[i] - k[i]
	// ProbBest[i] is P(p_i > p_j for every j != i | data).
	ProbBest []float64 `json:"prob_best"`
	// ErrorBound estimates the largest absolute error of ProbBest: the
	// panel-wise difference of the 40- and 20-point Gauss-Legendre rules
	// plus the mass of every arm outside the integration window (about
	// 2e-18 each, more for shapes far below 1) plus |sum of ProbBest - 1|.
	// It is an estimate, not a proof.
	ErrorBound float64  `json:"error_bound"`
	Method     string   `json:"method"` // "quadrature"
	Warnings   []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the result through jsonfloat.
func (r BestArm) MarshalJSON() ([]byte, error) {
	type plain BestArm
	return jsonfloat.Marshal(plain(r))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (r *BestArm) UnmarshalJSON(b []byte) error {
	type plain BestArm
	return jsonfloat.Unmarshal(b, (*plain)(r))
}

// ProbBest returns, for arms with k[i] successes in n[i] trials, the
// posterior probability that each arm's success probability is the
// largest,
//
//	P(arm i best) = integral f_i(x) prod_{j != i} F_j(x) dx,
//
// f_i and F_i the density and distribution function of arm i's Beta
// posterior, by one-dimensional quadrature: 40-point Gauss-Legendre rules
// on panels in the log-odds of x, eight per arm between its 1e-18
// quantiles, merged over the arms so that a sharp posterior is resolved
// as well as a broad one; ErrorBound reports the estimated error (see
// BestArm). priors gives one prior for every arm, or one for all, or none
// (Jeffreys for all). With two arms the value agrees with Compare.
//
// Cost: about 8k panels x 60 nodes x 2k tail evaluations for k arms, so
// O(k^2) incomplete beta evaluations; ctx is checked between panels. Errors:
// fewer than two or more than MaxArms arms, mismatched lengths, bad counts
// (naming k[i] or n[i]), bad priors, total shapes over MaxQuadratureShapes
// per arm times the arms (ErrTooLarge), a posterior shape below
// MinQuadratureShape, or a cancelled ctx.
func ProbBest(ctx context.Context, k, n []int64, priors []interval.Prior) (BestArm, error) {
	const fn = "test.ProbBest"
	m := len(k)
	if m < 2 || m > MaxArms {
		return BestArm{}, argerr.Invalid(fn, "k", m, "must hold between 2 and 64 arms")
	}
	if len(n) != m {
		return BestArm{}, argerr.Invalid(fn, "n", len(n), "must have as many entries as k ("+strconv.Itoa(m)+")")
	}
	if len(priors) != 0 && len(priors) != 1 && len(priors) != m {
		return BestArm{}, argerr.Invalid(fn, "priors", len(priors), "must hold 0, 1 or len(k) priors")
	}
	r := BestArm{Priors: make([]interval.Prior, m), A: make([]float64, m), B: make([]float64, m), ProbBest: make([]float64, m), Method: "quadrature"}
	var total float64
	for i := range k {
		var p interval.Prior
		switch len(priors) {
		case 1:
			p = priors[0]
		case m:
			p = priors[i]
		}
		ki, ni := "k["+strconv.Itoa(i)+"]", "n["+strconv.Itoa(i)+"]"
		pr, a, b, err := p.Update(fn, ki, ni, k[i], n[i])
		if err != nil {
			return BestArm{}, err
		}
		if err := quadShapes(fn, "priors["+strconv.Itoa(min(i, len(priors)-1))+"]", a, b); err != nil && len(priors) > 0 {
			return BestArm{}, err
		} else if err != nil {
			return BestArm{}, argerr.Invalid(fn, ki, k[i], "gives a posterior shape below 0.1")
		}
		r.Priors[i], r.A[i], r.B[i] = pr, a, b
		total += a + b
	}
	if total > MaxQuadratureShapes*float64(m) {
		return BestArm{}, argerr.TooLarge(fn, "n", total, "(the total posterior shapes) exceeds 1e5 per arm, beyond which the quadrature would take over a second")
	}
	// Panel boundaries: eight per arm across its 1e-18 quantile window.
	var cuts []float64
	lo, hi := math.Inf(1), math.Inf(-1)
	for i := range k {
		l := beta.Quantile(r.A[i], r.B[i], math.Log(1e-18), false)
		h := beta.Quantile(r.A[i], r.B[i], math.Log(1e-18), true)
		for j := 0; j <= 8; j++ {
			cuts = append(cuts, l+(h-l)*float64(j)/8)
		}
		lo, hi = math.Min(lo, l), math.Max(hi, h)
	}
	sort.Float64s(cuts)
	var xs40, ws40, xs20, ws20 [40]float64
	lcdf := make([]float64, m)
	ldens := make([]float64, m)
	s40, s20 := make([]float64, m), make([]float64, m)
	eval := func(t float64, w float64, acc []float64) {
		x, y := beta.XY(t)
		sum := 0.0
		for i := range k {
			lcdf[i] = beta.LogCDF(r.A[i], r.B[i], x, y)
			ldens[i] = beta.LogDensityXY(r.A[i], r.B[i], x, y)
			sum += lcdf[i]
		}
		for i := range k {
			acc[i] += w * math.Exp(ldens[i]+sum-lcdf[i])
		}
	}
	var errEst float64
	for c := 0; c+1 < len(cuts); c++ {
		if err := argerr.Canceled(fn, ctx); err != nil {
			return BestArm{}, err
		}
		l, h := cuts[c], cuts[c+1]
		if !(h > l) {
			continue
		}
		for i := range s40 {
			s40[i], s20[i] = 0, 0
		}
		quad.Legendre{}.FixedLocations(xs40[:], ws40[:], l, h)
		quad.Legendre{}.FixedLocations(xs20[:20], ws20[:20], l, h)
		for j := range xs40 {
			eval(xs40[j], ws40[j], s40)
		}
		for j := 0; j < 20; j++ {
			eval(xs20[j], ws20[j], s20)
		}
		for i := range k {
			r.ProbBest[i] += s40[i]
			errEst = math.Max(errEst, math.Abs(s40[i]-s20[i]))
		}
	}
	sum := 0.0
	for i := range r.ProbBest {
		r.ProbBest[i] = math.Min(1, math.Max(0, r.ProbBest[i]))
		sum += r.ProbBest[i]
	}
	// Mass outside the window [lo, hi] (more than 1e-18 where a quantile
	// was clamped at the end of the doubles for a shape far below 1).
	outside := 0.0
	xl, yl := beta.XY(lo)
	xh, yh := beta.XY(hi)
	for i := range k {
		outside += math.Exp(beta.LogCDF(r.A[i], r.B[i], xl, yl)) + math.Exp(beta.LogUpper(r.A[i], r.B[i], xh, yh))
	}
	r.ErrorBound = float64(len(cuts))*errEst + outside + math.Abs(sum-1)
	return r, nil
}

package test

import (
	"context"
	"math"
	"strconv"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/interval"
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
	// ErrorBound bounds the absolute error of every ProbBest[i]: a
	// certified bound of the trapezoidal rule (see ProbBest), the sum of
	// its discretisation, truncation and rounding parts, valid as far as
	// the stated accuracy of the incomplete beta evaluations it relies on.
	// It is relative: it is eps max_i ProbBest[i], eps the largest of the
	// probabilities' relative bounds, so each ProbBest[i] is within eps
	// ProbBest[i] of the true value.
	ErrorBound float64  `json:"error_bound"`
	Method     string   `json:"method"` // "trapezoidal rule in the log-odds"
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
// posterior, by the trapezoidal rule in the log-odds t of x with a
// certified error bound, as Compare's (see Compare and the derivation in
// bayes_trapezoid.go): each integrand g_i(t) prod_{j != i} F_j(t) is
// analytic in |Im t| < pi, grows there by at most sec(Im t / 2)^N with N
// the sum of all the shapes, and is log-concave; all k are summed on one
// walk of shared nodes. Each probability is computed on its own, so
// their sum minus 1 is a check. priors gives one prior for every arm, or
// one for all, or none (Jeffreys for all). With two arms the values are
// Compare's P(p1 > p2) and P(p2 > p1).
//
// Cost: each node evaluates k densities and k incomplete beta functions,
// plus O(k^2) additions; the nodes number 40 to 60 for arms with all shapes
// above a few and close together, more for broad posteriors (shapes below
// 1: thousands near 1e5 trials) or arms far apart; ctx is checked every 4
// nodes. Memory O(k). Errors: fewer than two or more than MaxArms arms,
// mismatched lengths, bad counts (naming k[i] or n[i]), bad priors, total
// shapes over MaxQuadratureShapes per arm times the arms (ErrTooLarge), a
// posterior shape below MinQuadratureShape, or a cancelled ctx.
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
	r := BestArm{Priors: make([]interval.Prior, m), A: make([]float64, m), B: make([]float64, m), ProbBest: make([]float64, m), Method: trapezoidMethod}
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
		return BestArm{}, argerr.TooLarge(fn, "n", total, "(the total posterior shapes) exceeds MaxQuadratureShapes = 1e5 per arm, the size the trapezoidal rule serves")
	}
	lp, rel, _, err := bestSums(ctx, fn, r.A, r.B, 0)
	if err != nil {
		return BestArm{}, err
	}
	eps, pmax := 0.0, 0.0
	for i := range lp {
		r.ProbBest[i] = math.Exp(math.Min(0, lp[i]))
		eps, pmax = math.Max(eps, rel[i]), math.Max(pmax, r.ProbBest[i])
	}
	r.ErrorBound = eps * pmax * (1 + 4*unitRound)
	return r, nil
}

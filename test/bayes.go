package test

import (
	"context"
	"errors"
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/beta"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/internal/xmath"
	"github.com/kofnlab/kofn/interval"
)

// MaxQuadratureShapes is the largest total of the four posterior shapes
// (about the total number of trials) for which Compare integrates
// numerically when no shape is an integer (ProbBest allows as much per
// arm): the rule's step shrinks like 1/sqrt(total), and each node
// evaluates incomplete beta functions whose cost grows with the shapes.
const MaxQuadratureShapes = 1e5

// MaxTrapezoidSteps bounds the walk of Compare's trapezoidal rule (no
// integer shape): Compare refuses with ErrTooLarge, before it starts, a
// comparison whose window in the log-odds, from the lower of the two
// modes ln(a/b) - 6 sqrt(1/a + 1/b) to the higher of ln(a/b) + 6 sqrt(1/a
// + 1/b), spans more than MaxTrapezoidSteps steps of the rule (the step is
// about 1.4/sqrt(a1+b1+a2+b2)), and stops with ErrTooLarge should its walk
// reach twice as many nodes (it took 0.5 to 1.2 nodes a step in trials).
// Reaching it takes a posterior shape below about 0.2 beside totals of
// tens of thousands of trials (every Jeffreys posterior up to
// MaxQuadratureShapes passes); near the limit a comparison takes about
// 8 ms (BenchmarkCompareTrapezoidLimit: about 11,000 nodes). ProbBest,
// which takes a context, has no such limit.
const MaxTrapezoidSteps = 12288

// ArmComparison is the Bayesian answer to "which arm is better": the
// posterior probability that each arm's success probability exceeds the
// other's, and the expected loss of choosing each arm, under independent
// Beta priors (both stated).
type ArmComparison struct {
	Prior1 interval.Prior `json:"prior1"` // prior of arm 1, with its shapes
	Prior2 interval.Prior `json:"prior2"` // prior of arm 2
	A1     float64        `json:"a1"`     // posterior shapes of arm 1: Prior1.A + k1, Prior1.B + n1 - k1
	B1     float64        `json:"b1"`
	A2     float64        `json:"a2"` // posterior shapes of arm 2
	B2     float64        `json:"b2"`
	// ProbFirstBetter is P(p1 > p2 | data); LogProbFirstBetter its
	// logarithm, finite where the value underflows.
	ProbFirstBetter    float64 `json:"prob_first_better"`
	LogProbFirstBetter float64 `json:"log_prob_first_better"`
	// ProbSecondBetter is P(p2 > p1 | data), computed on its own (not as
	// 1 - ProbFirstBetter where that would cancel); the two sum to 1.
	ProbSecondBetter    float64 `json:"prob_second_better"`
	LogProbSecondBetter float64 `json:"log_prob_second_better"`
	// LossFirst is the expected loss of choosing arm 1, E[max(p2 - p1, 0)]
	// (how much success probability is given up, on average, by picking
	// arm 1); LossSecond that of choosing arm 2, E[max(p1 - p2, 0)].
	// LossFirst - LossSecond = E[p2] - E[p1].
	LossFirst  float64 `json:"loss_first"`
	LossSecond float64 `json:"loss_second"`
	// Method is "closed-form sum" (an integer shape allows the exact finite
	// sum) or "trapezoidal rule in the log-odds" (no integer shape; see
	// Compare).
	Method string `json:"method"`
	// ErrorBound bounds the absolute error of each of ProbFirstBetter and
	// ProbSecondBetter: the truncation bound of the closed-form sums (2^-60)
	// or, for the trapezoidal rule, a certified bound, the sum of its
	// discretisation, truncation and rounding parts, valid as far as the
	// stated accuracy of the incomplete beta evaluations it relies on (see
	// Compare). The rule's bound is relative: it is eps max(ProbFirstBetter,
	// ProbSecondBetter), eps the larger of the two probabilities' relative
	// bounds, so each is within eps times itself of the true value and its
	// logarithm within about eps: a tiny probability is as good as a large
	// one.
	ErrorBound float64  `json:"error_bound"`
	Warnings   []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the comparison through jsonfloat.
func (c ArmComparison) MarshalJSON() ([]byte, error) {
	type plain ArmComparison
	return jsonfloat.Marshal(plain(c))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (c *ArmComparison) UnmarshalJSON(b []byte) error {
	type plain ArmComparison
	return jsonfloat.Unmarshal(b, (*plain)(c))
}

// CompareOptions sets the priors of Compare; the zero value puts the
// Jeffreys prior on both arms.
type CompareOptions struct {
	Prior1, Prior2 interval.Prior
}

// Compare returns the posterior probability that arm 1's success
// probability exceeds arm 2's and the reverse, and the expected loss of
// choosing each arm, after k1 of n1 and k2 of n2 successes, under
// independent Beta priors. With posteriors p1 ~ Beta(a1, b1), p2 ~ Beta(a2, b2):
//
//	P(p1 > p2) = sum_{i=0}^{a1-1} Gamma(b1+i) / (Gamma(b1) i!) B(a2+i, b1+b2) / B(a2, b2)
//
// when a1 is an integer (expand 1 - I_x(a1, b1) as a negative binomial sum
// and integrate against the Beta(a2, b2) density; the terms are a
// beta-negative-binomial PMF). By the symmetries p -> 1-p and 1 <-> 2 an
// integer shape on either side gives one of P(p1 > p2), P(p2 > p1) as such
// a sum; with the uniform prior every shape is an integer and both are
// summed directly, so a tail of 1e-300 is exact and the identity
// P(p1 > p2) + P(p2 > p1) = 1 is a check, not a construction. The terms are
// unimodal in i; the sum runs outward from the mode with each term in
// Loader's saddle-point product form every 64 terms (ratio recurrence in
// between) and stops when a geometric bound on the remainder falls below
// 2^-62 of the sum, so its cost grows like the square root of the counts
// (see Cost).
//
// Otherwise (no integer shape, as under the Jeffreys prior) it sums the
// trapezoidal rule in the log-odds t of x (x = 1/(1+e^-t)),
//
//	P(p1 > p2) = integral g1(t) F2(t) dt,  P(p2 > p1) = integral g2(t) F1(t) dt,
//
// g the density of an arm's log-odds, x^a (1-x)^b / B(a, b), and F its
// distribution function I_x(a, b), each probability on its own (their sum
// minus 1 is a check). The integrands are analytic in the strip |Im t| <
// pi and grow there by at most sec(Im t / 2)^N, N = a1+b1+a2+b2, so the
// rule on the whole line has a discretisation error below 2 sec(a/2)^N /
// (e^(2 pi a/h) - 1) of the answer (Trefethen and Weideman 2014, Theorem
// 5.1); they are log-concave, so the sum can stop with a rigorous bound on
// what it leaves out, and skip stretches of the tails between bounds from
// chords and secants. With rounding bounded term by term, ErrorBound is a
// certified bound relative to the answer (see ArmComparison.ErrorBound and
// the derivation in bayes_trapezoid.go): 4e-14 to 4e-13 of the
// probability for the invented posteriors of testdata/test_bayes_bound.tsv
// (40-digit mpmath quadrature; shapes 0.1 to totals of 1e5), more for tiny
// probabilities, whose incomplete beta functions are accurate to about
// 1e-14 of their logarithms (1.4e-12 at e^-168, 1.1e-11 at e^-1522); the
// actual errors there were at most 0.06 of ErrorBound.
//
// The expected losses follow in closed form from the two probabilities
// (see losses): E[max(p2 - p1, 0)] = (m2 - m1) P(p2 > p1) + H (1/(a1+b1) +
// 1/(a2+b2)) with H = B(a1+a2, b1+b2)/(B(a1, b1) B(a2, b2)).
//
// Cost: one sum of O(sqrt(n)) terms (the losses are in closed form), a few
// hundred thousand at counts of 1e7; the trapezoidal rule takes 40 to 60
// nodes (two densities and two incomplete beta functions each) for
// posteriors with all shapes above a few, and more for shapes below 1,
// whose broad log-odds densities span a wide window: about 4,000 nodes for
// two Jeffreys posteriors after 0 of 5e4, at most about 2 MaxTrapezoidSteps
// (BenchmarkCompare*; the README gives the measured figures).
//
// Errors: counts as for the other two-sample functions (k <= n, n >= 0),
// invalid priors, posterior shapes above 1e15; for the trapezoidal rule a
// total beyond MaxQuadratureShapes or a window beyond MaxTrapezoidSteps
// (ErrTooLarge), or a shape below MinQuadratureShape.
func Compare(k1, n1, k2, n2 int64, opt CompareOptions) (ArmComparison, error) {
	const fn = "test.Compare"
	pr1, a1, b1, err := opt.Prior1.Update(fn, "k1", "n1", k1, n1)
	if err != nil {
		return ArmComparison{}, err
	}
	pr2, a2, b2, err := opt.Prior2.Update(fn, "k2", "n2", k2, n2)
	if err != nil {
		return ArmComparison{}, err
	}
	if !isInt(a1) && !isInt(b1) && !isInt(a2) && !isInt(b2) && a1+b1+a2+b2 > MaxQuadratureShapes {
		return ArmComparison{}, argerr.TooLarge(fn, "n1", n1, "with n2 needs quadrature (no integer posterior shape) beyond its size limit of 1e5 trials in all; use the uniform prior or another prior with an integer shape, for which the exact sum serves any size")
	}
	if !isInt(a1) && !isInt(b1) && !isInt(a2) && !isInt(b2) {
		if err := quadShapes(fn, "Prior1", a1, b1); err != nil {
			return ArmComparison{}, err
		}
		if err := quadShapes(fn, "Prior2", a2, b2); err != nil {
			return ArmComparison{}, err
		}
		if trapezoidSteps([]float64{a1, a2}, []float64{b1, b2}) > MaxTrapezoidSteps {
			return ArmComparison{}, argerr.TooLarge(fn, "n1", n1, "with n2 and the priors gives posteriors whose window spans more than MaxTrapezoidSteps = 12288 steps of the trapezoidal rule (a shape below 1 beside totals of tens of thousands of trials); use ProbBest, which takes a context, or the uniform prior, whose exact sum serves any size")
		}
	}
	c := ArmComparison{Prior1: pr1, Prior2: pr2, A1: a1, B1: b1, A2: a2, B2: b2}
	l12, l21, bound, method, err := probGreater(fn, a1, b1, a2, b2)
	if errors.Is(err, errWalkTooLong) {
		return ArmComparison{}, argerr.TooLarge(fn, "n1", n1, "with n2 and the priors needs more than 2 MaxTrapezoidSteps nodes of the trapezoidal rule; use ProbBest, which takes a context, or the uniform prior, whose exact sum serves any size")
	}
	if err != nil {
		return ArmComparison{}, err
	}
	c.LogProbFirstBetter, c.LogProbSecondBetter = l12, l21
	c.ProbFirstBetter, c.ProbSecondBetter = math.Exp(l12), math.Exp(l21)
	c.ErrorBound, c.Method = bound, method
	c.LossFirst, c.LossSecond = losses(a1, b1, a2, b2, c.ProbFirstBetter, c.ProbSecondBetter)
	if n1 == 0 || n2 == 0 {
		c.Warnings = append(c.Warnings, "an arm without trials: its posterior is its prior")
	}
	return c, nil
}

// MinQuadratureShape is the smallest posterior shape the trapezoidal rule
// of Compare and ProbBest accepts: the integrands fall like e^(-shape |t|)
// in the log-odds t, and the rule's walk ends at |t| = 700 (x near e^-700,
// still a normal double), where at shape 0.1 they are below e^-70 of their
// peak; much smaller shapes put mass beyond the doubles altogether
// (P(p < 1e-300) = 0.03 for shape 0.005).
const MinQuadratureShape = 0.1

// quadShapes checks a posterior's shapes against MinQuadratureShape,
// naming the prior field (a shape that small comes from the prior with a
// count of 0).
func quadShapes(fn, prior string, a, b float64) error {
	if a < MinQuadratureShape {
		return argerr.Invalid(fn, prior+".A", a, "gives a posterior shape below 0.1, too small for the quadrature (no shape is an integer); use a larger or integer prior shape")
	}
	if b < MinQuadratureShape {
		return argerr.Invalid(fn, prior+".B", b, "gives a posterior shape below 0.1, too small for the quadrature (no shape is an integer); use a larger or integer prior shape")
	}
	return nil
}

// isInt reports whether v is an integer.
func isInt(v float64) bool { return v == math.Trunc(v) }

// probGreater returns ln P(X > Y) and ln P(Y > X) for X ~ Beta(a1, b1),
// Y ~ Beta(a2, b2), with an absolute error bound and the method name.
func probGreater(fn string, a1, b1, a2, b2 float64) (l12, l21, bound float64, method string, err error) {
	// The smaller probability is summed directly (the larger is its
	// complement, which loses nothing). Sums for P(X > Y) exist when a1 is
	// an integer (first = X) or b2 is (1-Y > 1-X: first 1-Y ~ Beta(b2, a2),
	// other 1-X ~ Beta(b1, a1)); for P(Y > X) when a2 or b1 is.
	direct12 := func() float64 {
		switch {
		case isInt(a1):
			return bnbSum(a1, b1, a2, b2)
		case isInt(b2):
			return bnbSum(b2, a2, b1, a1)
		}
		return math.NaN()
	}
	direct21 := func() float64 {
		switch {
		case isInt(a2):
			return bnbSum(a2, b2, a1, b1)
		case isInt(b1):
			return bnbSum(b1, a1, b2, a2)
		}
		return math.NaN()
	}
	m1, m2 := a1/(a1+b1), a2/(a2+b2)
	first, second := direct12, direct21
	if m1 > m2 { // P(p2 > p1) is likely the smaller
		first, second = direct21, direct12
	}
	lsmall := first()
	swapped := m1 > m2
	if math.IsNaN(lsmall) || lsmall > -math.Ln2 {
		if l := second(); !math.IsNaN(l) && (math.IsNaN(lsmall) || l < lsmall) {
			lsmall, swapped = l, !swapped
		}
	}
	if math.IsNaN(lsmall) {
		lp, rel, _, err := bestSums(context.Background(), fn, []float64{a1, a2}, []float64{b1, b2}, 2*MaxTrapezoidSteps)
		if err != nil {
			return 0, 0, 0, "", err
		}
		l12, l21 = math.Min(0, lp[0]), math.Min(0, lp[1])
		bound = math.Max(rel[0], rel[1]) * math.Max(math.Exp(l12), math.Exp(l21)) * (1 + 4*unitRound)
		return l12, l21, bound, trapezoidMethod, nil
	}
	llarge := xmath.Log1mExp(math.Min(0, lsmall))
	if swapped {
		return llarge, lsmall, 0x1p-60, "closed-form sum", nil
	}
	return lsmall, llarge, 0x1p-60, "closed-form sum", nil
}

// losses returns E[max(p2 - p1, 0)] and E[max(p1 - p2, 0)] from the two
// probabilities by the closed form
//
//	E[max(p2 - p1, 0)] = (m2 - m1) P(p2 > p1) + H (1/(a1+b1) + 1/(a2+b2)),
//	H = B(a1+a2, b1+b2) / (B(a1, b1) B(a2, b2)),
//
// m the posterior means, which follows from E[p2 1{p2 > p1}] = m2 P(p2' > p1)
// with p2' ~ Beta(a2+1, b2) and the recurrence P(p2' > p1) = P(p2 > p1) +
// H / a2 (and the same with the arms exchanged); the tests check it against
// the shifted probabilities computed directly. H is formed in Loader's
// product form (logH), not from differences of log-Beta functions.
func losses(a1, b1, a2, b2, p12, p21 float64) (first, second float64) {
	m1, m2 := a1/(a1+b1), a2/(a2+b2)
	h := math.Exp(logH(a1, b1, a2, b2)) * (1/(a1+b1) + 1/(a2+b2))
	first = math.Max(0, (m2-m1)*p21+h)
	second = math.Max(0, (m1-m2)*p12+h)
	return first, second
}

// logH returns ln B(a1+a2, b1+b2) - ln B(a1, b1) - ln B(a2, b2) as
//
//	ln[(A+B)/(A B) * a1 b1/(a1+b1) * a2 b2/(a2+b2) * f(a1; b1) f(a2; b2) / f(A; B)],
//
// A = a1+a2, B = b1+b2, f(x; y) the real-argument binomial density at
// p = A/(A+B) (the powers of p cancel for every p), so nothing of order
// a + b cancels.
func logH(a1, b1, a2, b2 float64) float64 {
	A, B := a1+a2, b1+b2
	p, q := A/(A+B), B/(A+B)
	l := beta.LogBinomReal(a1, b1, p, q) + beta.LogBinomReal(a2, b2, p, q) - beta.LogBinomReal(A, B, p, q)
	return l + math.Log((A+B)/A) - math.Log(B) + math.Log(a1/(a1+b1)) + math.Log(b1) + math.Log(a2/(a2+b2)) + math.Log(b2)
}

// logTerm returns ln T_i of bnbSum in Loader's product form,
//
//	T_i = b1/(b1+i) * M/((a2+i)(b1+b2)) * a2 b2/(a2+b2)
//	      * f(i; b1) f(a2; b2) / f(a2+i; b1+b2),  M = a2+i+b1+b2,
//
// f(x; y) the binomial density with real arguments (x successes, y
// failures) at p = (a2+i)/M, where the last density's deviance vanishes.
func logTerm(i, b1, a2, b2 float64) float64 {
	m := a2 + i + b1 + b2
	p, q := (a2+i)/m, (b1+b2)/m
	l := beta.LogBinomReal(i, b1, p, q) + beta.LogBinomReal(a2, b2, p, q) - beta.LogBinomReal(a2+i, b1+b2, p, q)
	return l + math.Log(b1/(b1+i)) + math.Log(m/(a2+i)) - math.Log(b1+b2) + math.Log(a2/(a2+b2)) + math.Log(b2)
}

// bnbSum returns ln sum_{i=0}^{a1-1} T_i, with a1 a positive integer,
// T_{i+1}/T_i = (b1+i)(a2+i) / ((i+1)(a2+b1+b2+i)).
func bnbSum(a1, b1, a2, b2 float64) float64 {
	J := a1 - 1
	s := a2 + b1 + b2
	c := b1*a2 - a2 - b1 - b2
	mode := math.Ceil(c / (1 + b2))
	mode = math.Max(0, math.Min(J, mode))
	ratio := func(i float64) float64 { return (b1 + i) * (a2 + i) / ((i + 1) * (s + i)) }
	const logEps = -62 * math.Ln2
	total := math.Inf(-1)
	// Upward from the mode to J: ratios below 1; the largest on [j, J-1]
	// is at an end, which bounds the remainder T_j / (1 - rmax).
	rEnd := ratio(J - 1)
	for j := mode; j <= J; {
		anchor := logTerm(j, b1, a2, b2)
		sum, t, r := 0.0, 1.0, 0.0
		for k := 0; k < 64 && j <= J; k++ {
			sum += t
			r = ratio(j)
			j++
			t *= r
		}
		total = xmath.LogAddExp(total, anchor+math.Log(sum))
		// t is now T_j / T_anchor for the next j: the remainder is at most
		// T_j / (1 - rmax).
		if rmax := math.Max(r, rEnd); j > J || (rmax < 1 && anchor+math.Log(t)-math.Log1p(-rmax) < total+logEps) {
			break
		}
	}
	// Downward from mode-1 to 0: T_{i-1}/T_i = 1/r_{i-1}, which shrinks as
	// i decreases, so the current one bounds the rest.
	for j := mode - 1; j >= 0; {
		anchor := logTerm(j, b1, a2, b2)
		sum, t, rho := 0.0, 1.0, 0.0
		for k := 0; k < 64 && j >= 0; k++ {
			sum += t
			if j == 0 {
				j--
				break
			}
			rho = 1 / ratio(j-1)
			j--
			t *= rho
		}
		total = xmath.LogAddExp(total, anchor+math.Log(sum))
		if j < 0 || (rho < 1 && anchor+math.Log(t)-math.Log1p(-rho) < total+logEps) {
			break
		}
	}
	return math.Min(total, 0)
}

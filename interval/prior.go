package interval

import (
	"fmt"
	"math"

	"github.com/kofnlab/kofn/binom"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/enum"
	"github.com/kofnlab/kofn/internal/jsonfloat"
)

// PriorKind names a Beta prior for a binomial proportion.
type PriorKind int

const (
	// PriorJeffreys is Beta(1/2, 1/2), the Jeffreys prior of a binomial
	// proportion (Jeffreys H (1946), "An invariant form for the prior
	// probability in estimation problems", Proc. R. Soc. A 186:453-461). It
	// is the zero value because it is invariant under reparametrisation,
	// adds only one trial's worth of information, and its equal-tailed
	// interval has coverage close to the level at every n (Brown, Cai and
	// DasGupta 2001, Statistical Science 16:101-133, who recommend it).
	PriorJeffreys PriorKind = iota
	// PriorUniform is Beta(1, 1), the uniform prior of Bayes and Laplace,
	// common in reports of "the probability that B beats A".
	PriorUniform
	// PriorBeta is an informative Beta(A, B) prior with the shapes given in
	// Prior.A and Prior.B: A - 1 prior successes and B - 1 prior failures,
	// or, loosely, a prior mean A/(A+B) worth A+B trials.
	PriorBeta
)

var priorKindNames = enum.New[PriorKind]("interval.PriorKind", []string{"Jeffreys", "uniform", "beta"},
	map[string]PriorKind{"flat": PriorUniform, "bayes-laplace": PriorUniform, "informative": PriorBeta})

// String returns "Jeffreys", "uniform" or "beta".
func (k PriorKind) String() string { return priorKindNames.String(k) }

// MarshalText encodes the kind by its String form.
func (k PriorKind) MarshalText() ([]byte, error) { return priorKindNames.MarshalText(k) }

// UnmarshalText decodes a kind written by MarshalText (ParsePriorKind).
func (k *PriorKind) UnmarshalText(b []byte) error { return priorKindNames.UnmarshalText(k, b) }

// ParsePriorKind accepts the String forms case-insensitively, and also
// "flat" and "bayes-laplace" for the uniform prior and "informative" for
// beta.
func ParsePriorKind(s string) (PriorKind, error) {
	return priorKindNames.Parse("interval.ParsePriorKind", s)
}

// PriorKindValues returns every PriorKind in order.
func PriorKindValues() []PriorKind { return priorKindNames.Values() }

// MaxShape is the largest Beta shape accepted, prior or posterior (1e15).
const MaxShape = 1e15

// Prior is a Beta(A, B) prior for a binomial proportion. The zero value is
// the Jeffreys prior. For PriorJeffreys and PriorUniform the shapes are
// implied (A and B may be left 0); for PriorBeta they must be given, each
// in (0, 1e15]. Every result that depends on a prior carries the resolved
// Prior (its kind and both shapes), so the prior is always stated.
type Prior struct {
	Kind PriorKind `json:"kind"`
	A    float64   `json:"a"` // first shape: prior successes + 1, loosely
	B    float64   `json:"b"` // second shape: prior failures + 1, loosely
}

// JeffreysPrior, UniformPrior and BetaPrior build the three kinds.
func JeffreysPrior() Prior { return Prior{Kind: PriorJeffreys, A: 0.5, B: 0.5} }

// UniformPrior returns the Beta(1, 1) prior.
func UniformPrior() Prior { return Prior{Kind: PriorUniform, A: 1, B: 1} }

// BetaPrior returns the informative Beta(a, b) prior (validated where it is
// used).
func BetaPrior(a, b float64) Prior { return Prior{Kind: PriorBeta, A: a, B: b} }

// String gives the prior as a reader sees it: "Jeffreys Beta(0.5, 0.5)",
// "uniform Beta(1, 1)", "beta Beta(2, 8)".
func (p Prior) String() string {
	r, err := p.Resolve("interval.Prior.String")
	if err != nil {
		return fmt.Sprintf("%v Beta(%v, %v) (invalid)", p.Kind, argerr.Format(p.A), argerr.Format(p.B))
	}
	return fmt.Sprintf("%v Beta(%v, %v)", r.Kind, argerr.Format(r.A), argerr.Format(r.B))
}

// MarshalJSON encodes the prior as {"kind", "a", "b"}.
func (p Prior) MarshalJSON() ([]byte, error) {
	type plain Prior
	return jsonfloat.Marshal(plain(p))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (p *Prior) UnmarshalJSON(b []byte) error {
	type plain Prior
	return jsonfloat.Unmarshal(b, (*plain)(p))
}

// Resolve returns the prior with its shapes filled in and checked, for
// function fn's error messages: PriorJeffreys and PriorUniform take their
// fixed shapes (A and B must be 0 or equal to them), PriorBeta needs A and B
// in [binom.MinShape, MaxShape].
func (p Prior) Resolve(fn string) (Prior, error) {
	var a, b float64
	switch p.Kind {
	case PriorJeffreys:
		a, b = 0.5, 0.5
	case PriorUniform:
		a, b = 1, 1
	case PriorBeta:
		if !(p.A >= binom.MinShape && p.A <= MaxShape) {
			return Prior{}, argerr.Invalid(fn, "Prior.A", p.A, "must lie in [1e-150, 1e15] (binom.MinShape: below it the predictive distribution loses its end terms)")
		}
		if !(p.B >= binom.MinShape && p.B <= MaxShape) {
			return Prior{}, argerr.Invalid(fn, "Prior.B", p.B, "must lie in [1e-150, 1e15] (binom.MinShape: below it the predictive distribution loses its end terms)")
		}
		return p, nil
	default:
		return Prior{}, argerr.Invalid(fn, "Prior.Kind", int(p.Kind), "is not a prior kind; use PriorJeffreys, PriorUniform or PriorBeta")
	}
	if (p.A != 0 && p.A != a) || math.IsNaN(p.A) {
		return Prior{}, argerr.Invalid(fn, "Prior.A", p.A, "contradicts the "+p.Kind.String()+" prior; use BetaPrior for other shapes")
	}
	if (p.B != 0 && p.B != b) || math.IsNaN(p.B) {
		return Prior{}, argerr.Invalid(fn, "Prior.B", p.B, "contradicts the "+p.Kind.String()+" prior; use BetaPrior for other shapes")
	}
	return Prior{Kind: p.Kind, A: a, B: b}, nil
}

// Update returns the posterior shapes a + k, b + n - k after k successes in
// n trials, checking the counts (kArg, nArg name them in errors) and that
// the shapes stay within MaxShape.
func (p Prior) Update(fn, kArg, nArg string, k, n int64) (Prior, float64, float64, error) {
	r, err := p.Resolve(fn)
	if err != nil {
		return Prior{}, 0, 0, err
	}
	if err := argerr.KN(fn, kArg, nArg, k, n); err != nil {
		return Prior{}, 0, 0, err
	}
	if n > 1<<49 {
		return Prior{}, 0, 0, argerr.TooLarge(fn, nArg, n, "exceeds 2^49, beyond which posterior shapes lose the counts' last digits")
	}
	a, b := r.A+float64(k), r.B+float64(n-k)
	if a > MaxShape || b > MaxShape {
		return Prior{}, 0, 0, argerr.TooLarge(fn, nArg, n, "makes a posterior shape exceed 1e15")
	}
	return r, a, b, nil
}

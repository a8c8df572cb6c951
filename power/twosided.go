package power

// TwoSidedMethod selects how an exact one-sample test turns the two tails
// into a two-sided p-value. The zero value, MinLikelihood, is the default:
// it is the usual "exact binomial test" rule (sum of the probabilities no
// larger than the observed one) and never exceeds twice the smaller tail.
type TwoSidedMethod int

const (
	// MinLikelihood sums the probabilities of all outcomes no more likely
	// than the observed one under H0 (relative tolerance 1e-7).
	MinLikelihood TwoSidedMethod = iota
	// Central doubles the smaller one-sided p-value (capped at 1): the
	// test whose inversion is the Clopper-Pearson interval.
	Central
)

// Package binom provides the binomial distribution, and the hypergeometric
// distribution that the conditional analysis of 2x2 tables needs, computed
// in log space first so that tail probabilities far below the smallest
// double (ln P = -1e5 and beyond) stay finite and accurate.
//
// A binomial X counts the successes in N independent trials, each a success
// with probability P (a Bernoulli trial). The sample proportion X/N is the
// usual estimate of P; ProportionWithin gives the exact probability that it
// lands within a distance of the truth, which is how the precision of the
// estimate tightens as N grows.
//
// Methods:
//   - the probability mass function by the saddle-point form of Loader (2000),
//     "Fast and accurate computation of binomial probabilities", with its
//     deviance (bd0) and Stirling-error terms, never by differences of lgamma;
//   - both tails directly, through the regularized incomplete beta
//     P(X <= k) = I_{1-P}(N-k, k+1) with a log-space prefactor; a tiny upper
//     tail is never computed as 1 - CDF;
//   - lower and upper quantiles, with log-probability forms for tails beyond
//     1e-300.
//
// Every constructor validates its arguments and returns a typed *Error that
// names the bad argument; methods never panic.
package binom

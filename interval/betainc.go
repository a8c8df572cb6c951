package interval

import "github.com/kofnlab/kofn/internal/beta"

// The Jeffreys interval needs the regularized incomplete beta function
// I_x(a, b) at the half-integer parameters k + 1/2, n - k + 1/2 (package
// binom covers the integer parameters of binomial tails only). gonum's
// mathext.RegIncBeta forms the prefactor from differences of lgamma, which
// at a + b = 1e12 loses about 1e-3 absolute in the logarithm; the shared
// internal/beta uses Loader's (2000) saddle-point form with real
// arguments instead, and the Bayesian summaries use the same functions.

const lnSqrt2Pi = 0.91893853320467274178032973640562

// logBetaDensity returns ln(x^a y^b / B(a, b)), y = 1 - x given.
func logBetaDensity(a, b, x, y float64) float64 { return beta.LogDensityXY(a, b, x, y) }

// logBetaCDF returns ln I_x(a, b), y = 1 - x given.
func logBetaCDF(a, b, x, y float64) float64 { return beta.LogCDF(a, b, x, y) }

// logBetaUpper returns ln(1 - I_x(a, b)), the upper tail, computed
// directly.
func logBetaUpper(a, b, x, y float64) float64 { return beta.LogUpper(a, b, x, y) }

// Package score holds the asymptotic score machinery for comparing two
// independent binomial proportions p1 = x1/n1 and p2 = x2/n2 against a
// hypothesized difference, ratio or odds ratio: the maximum-likelihood
// estimates of (p1, p2) restricted to the null value, and the score
// statistics built from them, of Miettinen and Nurminen (1985),
// "Comparative analysis of two rates", Statistics in Medicine 4:213-226,
// and Farrington and Manning (1990), "Test statistics and sample size
// formulae for comparative binomial trials with null hypothesis of
// non-zero risk difference or non-unity relative risk", Statistics in
// Medicine 9:1447-1454.
//
// Package interval inverts the statistics into confidence intervals
// (Miettinen-Nurminen, Mee, Koopman); package test uses them for
// non-inferiority, superiority and equivalence tests with a margin.
//
// Every statistic is signed: Z > 0 when the observed contrast exceeds the
// null value. Under the null hypothesis Z is approximately standard normal.
// The Miettinen-Nurminen variant multiplies the restricted variance by
// N/(N-1), N = n1 + n2; the Farrington-Manning (and Mee, Koopman) variant
// does not.
//
// Arguments are not validated here (callers validate and report errors):
// counts satisfy 0 <= x <= n, n >= 1, and the null value lies inside its
// parameter space (-1 < delta < 1, rho > 0, psi > 0).
package score

import "math"

// Variance selects the variance estimate of the restricted score statistic.
type Variance int

const (
	// MiettinenNurminen multiplies the restricted variance by N/(N-1)
	// (Miettinen and Nurminen 1985), which corrects its bias.
	MiettinenNurminen Variance = iota
	// FarringtonManning uses the restricted variance as it is (Farrington
	// and Manning 1990; Mee 1984 for the difference; Koopman 1984 for the
	// ratio).
	FarringtonManning
)

// Weights selects the stratum weights of the stratified statistics.
type Weights int

const (
	// MantelHaenszelWeights: w_i = n1_i n2_i / (n1_i + n2_i), fixed.
	MantelHaenszelWeights Weights = iota
	// InverseVarianceWeights: w_i = 1 / V_i at the null value, V_i the
	// stratum's restricted variance there (the iterative weights of
	// Miettinen and Nurminen 1985; recalled).
	InverseVarianceWeights
)

// factor returns the multiplier of the variance: N/(N-1) or 1.
func (v Variance) factor(n1, n2 int64) float64 {
	if v == MiettinenNurminen {
		n := float64(n1 + n2)
		if n > 1 {
			return n / (n - 1)
		}
	}
	return 1
}

// zRatio returns num / sqrt(v) with the conventions 0/0 = 0 and
// num/0 = +-Inf: a null value that fits the data perfectly has Z = 0, one
// that the data exclude with certainty has an infinite Z.
func zRatio(num, v float64) float64 {
	if num == 0 {
		return 0
	}
	if !(v > 0) {
		return math.Copysign(math.Inf(1), num)
	}
	return num / math.Sqrt(v)
}

// clamp01 keeps a restricted estimate inside [0, 1] against rounding.
func clamp01(p float64) float64 { return math.Max(0, math.Min(1, p)) }

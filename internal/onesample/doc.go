// Package onesample computes exact p-values of one-sample binomial tests in
// log space, and the acceptance regions of those tests, for the packages
// that test, invert or plan with them (test, interval, power).
//
// Given k successes in n trials and the null hypothesis P = p0, the
// one-sided p-values are the tails
//
//	less:    P(X <= k)        greater:  P(X >= k)
//
// and the two-sided p-value is one of three published definitions:
//
//   - PointProbability: the total probability of the outcomes no more
//     likely than the observed one, P(f(X) <= f(k)), where "no more likely"
//     allows a relative tolerance RelTol (f(j) <= f(k) (1 + RelTol)), so
//     outcomes equally likely in exact arithmetic are counted even when
//     rounding separates them (Fisher's "as or less likely"; the test whose
//     inversion is Sterne's (1954) interval).
//   - Central: twice the smaller tail, capped at 1 (the test whose
//     inversion is the Clopper-Pearson interval).
//   - Blaker: Blaker's (2000) acceptability: with t(j) = min(P(X <= j),
//     P(X >= j)), the p-value is P(t(X) <= t(k)), that is the observed
//     smaller tail plus the largest opposite tail not exceeding it (again
//     with the relative tolerance RelTol). Blaker H (2000), Confidence
//     curves and improved exact confidence intervals for discrete
//     distributions, Canadian Journal of Statistics 28:783-798.
//
// Each has a mid-p variant: the probability of the strictly more extreme
// outcomes plus half the probability of the outcomes exactly as extreme as
// the observed one (equal within RelTol) under the test's own ordering. For
// the central test this is twice the smaller mid-p tail
// P(X < k) + f(k)/2. The mid-p value goes back to Lancaster HO (1961),
// Significance tests in discrete distributions, JASA 56:223-234; see also
// Agresti A (2002), Categorical Data Analysis, 2nd ed., chapter 1, on the
// mid-P value (recalled). It is not guaranteed to keep the size at or
// below alpha.
// One-sided p-values do not depend on the two-sided definition.
//
// Every p-value is returned as its natural logarithm, finite and accurate
// where the p-value itself underflows a float64 (as far as the binom tails
// are accurate: 1e-13 relative to max(1, |ln P|)).
//
// Convention: a test at level alpha rejects when p < alpha, so the
// acceptance region is {k : p(k) >= alpha}. This is the convention under
// which the closed confidence intervals that invert these tests (Sterne,
// Clopper-Pearson, Blaker) contain p0 exactly when p0 is not rejected.
package onesample

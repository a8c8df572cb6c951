// Package test provides hypothesis tests for binomial data: one sample (k
// successes in n trials), two independent samples (k1 of n1 against k2 of
// n2), differences and ratios against a margin, and paired data.
//
// In use (an invented comparison: 7 of 15 infected with a new treatment,
// 12 of 15 without it):
//
//	r, err := test.Fisher(7, 15, 12, 15, test.FisherOptions{Alternative: test.Lower})
//	if err != nil {
//		return err // names the bad argument: test.Fisher: k1 = 16 exceeds n1 = 15
//	}
//	fmt.Printf("%s, %s: p = %.4f\n", r.Method, r.Alternative, r.PValue)
//
// Every function and value of the package is safe for concurrent use: the
// functions keep no state and the results are plain values. The words of
// a hypothesis (Alternative, TwoSidedRule, MidP, Level, Alpha) are the
// same in interval, test, power and the shell.
//
// # Entry points
//
//   - Binomial: H0 P = p0 for one sample; exact tests (point-probability,
//     central, Blaker, and the mid-p version of each), the score test with
//     and without continuity correction and the likelihood-ratio test,
//     each with the confidence interval that inverts it (Sterne's,
//     Clopper-Pearson, mid-p, Blaker's, Wilson, Wilson with continuity
//     correction, likelihood ratio).
//   - Fisher: the conditional exact test of p1 = p2 (point-probability or
//     central two-sided, mid-p).
//   - Barnard and Boschloo: unconditional exact tests of p1 = p2, the
//     supremum over the common proportion located by a grid and local
//     refinement, optionally restricted to a Berger-Boos interval.
//   - TwoSample: the pooled and unpooled z tests and Pearson's chi-square
//     with and without Yates's correction.
//   - DifferenceMargin, RatioMargin, DifferenceEquivalence,
//     RatioEquivalence: non-inferiority, superiority and equivalence (two
//     one-sided tests) of p1 - p2 or p1/p2 with the Miettinen-Nurminen or
//     Farrington-Manning score statistic.
//   - McNemar: paired proportions from the discordant counts, exact
//     conditional, mid-p, asymptotic with and without continuity
//     correction.
//   - NewSPRT, NewPairedSPRT: Wald's sequential probability ratio test of
//     p = p0 against p = p1 (or, for pairs, on the discordant pairs), with
//     its decision lines and the decision at any look; exact error rates
//     and expected sample numbers are in power.SPRTOperating.
//   - NewMixtureSequence, NewDifferenceSequence: always-valid p-values and
//     confidence sequences for one proportion (exact) and for p1 - p2
//     (exact product method, or the asymptotic normal mixture of Johari et
//     al. 2022), valid at every look of a look schedule chosen freely. The
//     hypotheses, levels and mixtures must still be fixed in advance.
//   - StageWise: H0 P = p0 at the end of a multi-stage study (a Simon
//     two-stage or a group-sequential design, given by its looks), the
//     exact p-value of the stage-wise ordering (Jennison and Turnbull
//     2000, section 8.4; Koyama and Chen 2008), with interval.StageWise.
//   - EqualProportions: p_1 = ... = p_k for k groups, by Pearson's
//     chi-square, the likelihood-ratio G or the exact Freeman-Halton test
//     (a dynamic programme over the columns, with mid-p); Pairwise and
//     VersusControl compare all pairs or each group with a control, with
//     a multiplicity adjustment (KSampleResult, ComparisonsResult).
//   - SampleRatio: the sample-ratio check of an experiment's allocation
//     (chi-square, G, exact multinomial), with observed against intended
//     shares and the warning that a mismatch invalidates the comparison.
//   - AdjustPValues, AdjustPValuesInto, Adjust: Holm, Bonferroni, Sidak,
//     Hochberg, Hommel, Benjamini-Hochberg and Benjamini-Yekutieli
//     adjusted p-values and decisions for a slice of any length (O(m)
//     radix order; O(m log m) for Hommel); FamilyLevel and SelectedLevel
//     give the per-interval levels of a family of intervals.
//
// Every function returns a Result with the statistic, the p-value and its
// natural logarithm (finite where the p-value underflows: at totals of
// 1e6 a modest effect has p-values far below 1e-308), the method's
// published name, the alternative and warnings.
//
// # Exact and asymptotic
//
// An exact test computes its p-value from the discrete distribution of
// the data under the null hypothesis itself, so a test at level alpha
// rejects a true null with probability at most alpha (it is usually
// conservative: the achieved size is below alpha because the p-value
// takes only a finite set of values). An asymptotic test refers its
// statistic to the normal or chi-square limit; it is cheap and often
// closer to the nominal level on average, but at small or lopsided counts
// its size can exceed alpha considerably. The mid-p value (Lancaster
// 1961) counts only half the probability of the outcomes exactly as
// extreme as the observed one; it removes most of the conservatism of the
// exact tests but no longer guarantees the size.
//
// # Conditional and unconditional
//
// With two independent binomial samples the null hypothesis p1 = p2
// leaves the common proportion unknown (a nuisance parameter). Fisher's
// test removes it by conditioning on the total number of successes, which
// makes the null distribution hypergeometric and free of it, at the price
// of a coarser distribution and a more conservative test. The
// unconditional tests of Barnard (1947) and Boschloo (1970) keep both
// margins free and take the supremum of the p-value over the nuisance
// parameter; they are exact and usually more powerful, and cost more to
// compute (see MaxUnconditionalTotal). Mehta and Senchaudhuri (2003),
// Conditional versus unconditional exact tests for comparing two
// binomials, compare the two approaches.
//
// # Two-sided p-values
//
// For an asymmetric discrete distribution "as or more extreme" in both
// directions has more than one definition; this package offers:
//
//   - point probability: the total probability of the outcomes no more
//     probable than the observed one (Fisher's definition, the usual one
//     for Fisher's test and the one-sample exact test);
//   - central: twice the smaller one-sided p-value, capped at 1 (it
//     matches the equal-tailed Clopper-Pearson interval);
//   - Blaker's acceptability (one sample): the smaller tail plus the
//     largest opposite tail not exceeding it (Blaker 2000), which is never
//     larger than the central p-value and gives nested intervals;
//   - for the statistic-based tests (score, Barnard, the asymptotic ones):
//     |statistic| at least the observed one.
//
// Probabilities and p-values that decide "as extreme" are compared with a
// relative tolerance of 1e-7 (common practice), so outcomes that are
// equally extreme in exact arithmetic count together even when rounding
// separates them; Barnard's pooled score statistics are compared exactly
// in integer arithmetic. A test at level alpha rejects when p < alpha.
//
// # Cautions
//
// These tests answer a precise question about a model of independent
// trials with constant probability. Where the result steers a decision
// that can hurt someone (a clinical study, a safety-critical acceptance,
// a regulatory submission) the choice of test, margin, alternative and
// level belongs in a protocol written before the data are seen, with
// qualified statisticians and the applicable regulations, standards and
// local practice; no default in this package replaces that.
//
// # Sources
//
// Agresti A (2002), Categorical Data Analysis, 2nd ed., Wiley, chapters 1
// and 3; Barnard GA (1947), Biometrika 34:123-138; Berger RL, Boos DD
// (1994), JASA 89:1012-1016; Blaker H (2000), Canadian Journal of
// Statistics 28:783-798; Boschloo RD (1970), Statistica Neerlandica
// 24:1-35; Fagerland MW, Lydersen S, Laake P (2013), BMC Medical Research
// Methodology 13:91; Farrington CP, Manning G (1990), Statistics in
// Medicine 9:1447-1454; Fisher RA (1935), The Design of Experiments;
// Lancaster HO (1961), JASA 56:223-234; McNemar Q (1947), Psychometrika
// 12:153-157; Mehta CR, Senchaudhuri P (2003), Conditional versus
// unconditional exact tests for comparing two binomials (Cytel); Miettinen
// O, Nurminen M (1985), Statistics in Medicine 4:213-226; Schuirmann DJ
// (1987), Journal of Pharmacokinetics and Biopharmaceutics 15:657-680;
// Sterne TE (1954), Biometrika 41:275-278; Freeman GH, Halton JH (1951),
// Biometrika 38:141-149; Mehta CR, Patel NR (1983), JASA 78:427-434; Holm S
// (1979), Scand J Statist 6:65-70; Hochberg Y (1988), Biometrika
// 75:800-802; Hommel G (1988), Biometrika 75:383-386; Benjamini Y, Hochberg
// Y (1995), JRSS B 57:289-300; Benjamini Y, Yekutieli D (2001), Ann Statist
// 29:1165-1188; Kohavi R, Tang D, Xu Y (2020), Trustworthy Online
// Controlled Experiments, chapter 21.
//
// # Which arm is better, the Bayesian way
//
// Compare answers the question a two-sample test answers, "is arm 1 better
// than arm 2?", with posterior probabilities instead of a p-value:
// P(p1 > p2 | data), P(p2 > p1 | data) and the expected loss of choosing
// each arm, under stated Beta priors (interval.Prior). It lives here, beside
// the frequentist two-sample tests it is an alternative to, rather than in
// interval (which holds the credible intervals themselves: interval.Credible)
// so that a reader choosing how to compare two arms finds every way in one
// package. Exact finite sums serve any size when a posterior shape is an
// integer (uniform priors, or informative priors with integer shapes);
// the trapezoidal rule with a certified error bound serves the rest up to
// MaxQuadratureShapes. These probabilities are not p-values, and a decision
// between treatments that can hurt someone needs a qualified statistician.
package test

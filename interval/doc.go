// Package interval computes confidence intervals for binomial proportions:
// one proportion (Proportion), the difference, ratio and odds ratio of two
// independent proportions (Difference, Ratio, OddsRatio, OddsRatioCMLE),
// the difference of paired proportions and the ratio of the discordant
// cells of a matched table (PairedDifference, DiscordantRatio), and the
// exact coverage and expected width of any one-proportion method
// (Coverage, CoverageCurve, CoverageOverN).
// StageWise gives the exact interval for p after a multi-stage study (a
// Simon two-stage or group-sequential design, described by its Looks) by
// the stage-wise ordering, which the plain interval for k of n is not
// after a design that may stop early.
//
// In use (an invented sign-up test: 17 of 40 visitors converted):
//
//	iv, err := interval.Proportion(17, 40, interval.Options{Method: interval.Wilson, Level: 0.95})
//	if err != nil {
//		return err // names the bad argument: interval.Proportion: k = 41 exceeds n = 40
//	}
//	fmt.Printf("%s %.0f%%: [%.3f, %.3f]\n", iv.Method, 100*iv.Level, iv.Lower, iv.Upper)
//
// Every function and value of the package is safe for concurrent use: the
// functions keep no state and the results are plain values.
//
// # Watching counts as they arrive
//
// ConfidenceSequence is the time-uniform interval for one proportion from
// the beta-binomial mixture martingale (Robbins 1970; Howard, Ramdas,
// McAuliffe, Sekhon 2021): the probability that it ever excludes the true
// p, at any n, is at most 1 - Level, so it may be read after every
// observation and the watching stopped at any look. A fixed-n interval
// re-read at every look has no such guarantee. SequenceErrorProb computes
// the exact probability of ever missing p up to a horizon.
//
// # Families of intervals
//
// Multinomial gives simultaneous intervals for the category probabilities
// of one multinomial sample (Sison-Glaz, Quesenberry-Hurst, Goodman), and
// VersusControl for the differences of k - 1 groups against a control
// (Bonferroni or Sidak levels): all the intervals of a Family hold
// together with its Level.
//
// # Coverage
//
// A 95% interval method promises that, over repeated samples, 95% of its
// intervals contain the true proportion. For a binomial count the actual
// coverage at a true p and n,
//
//	C(n, p) = sum over k of P(X = k) 1{L(k) <= p <= U(k)},
//
// is a saw-tooth function of p and n, because k takes only n+1 values.
// Coverage computes it exactly. Brown, Cai and DasGupta (2001), "Interval
// estimation for a binomial proportion", Statistical Science 16:101-133,
// show that the textbook Wald interval p^ +- z sqrt(p^(1-p^)/n) covers far
// less than promised even at large n (0.792 at n = 592, p = 0.005) and
// returns [0, 0] at k = 0.
//
// # Exact versus approximate
//
// Exact methods (Clopper-Pearson, Blaker, the Cornfield odds-ratio
// interval, the exact discordant ratio) invert exact tests: their coverage
// is at least the level at every p, at the price of wider intervals, since
// discreteness makes the achieved coverage exceed the level, often by a
// few points at small n. Approximate methods (Wilson, Agresti-Coull,
// Jeffreys, mid-p, the score intervals for two samples) aim at coverage
// near the level on average and dip below it at some p.
//
// # Which method when
//
// One proportion: Wilson (the default) or Jeffreys for general use, as
// Newcombe (1998, Statistics in Medicine 17:857-872) and Brown, Cai and
// DasGupta (2001) recommend; Agresti-Coull for a simple hand formula at
// n >= 40; Clopper-Pearson or Blaker when the coverage must never fall
// below the level (acceptance and safety demonstrations; Blaker is never
// longer than Clopper-Pearson); mid-p for coverage close to the level with
// an exact-test flavour. Wald is offered for comparison only.
//
// Two proportions: Newcombe's hybrid score interval (the default; Newcombe
// 1998, Statistics in Medicine 17:873-890) or Miettinen-Nurminen for the
// difference; Koopman's score interval for the ratio; Miettinen-Nurminen
// for the odds ratio, or Cornfield's exact conditional interval (and its
// mid-p version) when exactness is required. Fagerland, Lydersen and
// Laake (2015, Statistical Methods in Medical Research 24:224-254) compare
// these (recalled).
//
// Paired proportions: Newcombe's paired hybrid score interval (the
// default) or Tango's score interval (Fagerland, Lydersen and Laake 2014,
// Statistics in Medicine 33:2850-2875, recalled); DiscordantRatio with
// ClopperPearson for the exact conditional interval of q12/q21.
//
// # Conventions
//
// At k = 0 every one-proportion method's lower limit is 0 and at k = n its
// upper limit is 1. One-sided exact bounds at the ends are closed forms:
// 1 - a^(1/n) at k = 0 (the "rule of three" is its approximation 3/n at
// a = 0.05). Limits of Wald-type methods outside the parameter range are
// clipped, with Interval.Clipped set and a warning; no other method leaves
// the range. Ratios and odds ratios may have limits 0 or +Inf (encoded as
// "+Inf" in JSON).
//
// # Accuracy
//
// Root-found limits (Clopper-Pearson, mid-p, Jeffreys, likelihood ratio,
// Blaker, the score and exact two-sample and paired intervals) are
// searched by bracketed root finding to 1e-15 relative and checked in the
// tests by inversion (the test's p-value at the limit equals the tail
// probability to 1e-10) and against SciPy and mpmath goldens to 1e-12
// relative. See the Proportion doc for the known limits at n above 1e10.
//
// # Sources
//
// Brown LD, Cai TT, DasGupta A (2001), Statistical Science 16:101-133;
// Newcombe RG (1998), Statistics in Medicine 17:857-872 (one proportion)
// and 17:873-890 (difference); Clopper CJ, Pearson ES (1934), Biometrika
// 26:404-413; Wilson EB (1927), JASA 22:209-212; Agresti A, Coull BA
// (1998), The American Statistician 52:119-126; Blaker H (2000), Canadian
// Journal of Statistics 28:783-798; Miettinen O, Nurminen M (1985),
// Statistics in Medicine 4:213-226; Koopman PAR (1984), Biometrics
// 40:513-517; Cornfield J (1956), Proceedings of the Third Berkeley
// Symposium 4:135-148; Tango T (1998), Statistics in Medicine 17:891-908;
// Sison CP, Glaz J (1995), JASA 90:366-369; Quesenberry CP, Hurst DC
// (1964), Technometrics 6:191-195; Goodman LA (1965), Technometrics
// 7:247-254.
// Each function's comment names the source of its method.
//
// # Credible intervals
//
// Credible returns Bayesian credible intervals (equal-tailed or highest
// posterior density) for one proportion under a stated Beta prior (Prior:
// Jeffreys, the zero value, uniform or informative); NewPosterior gives the
// posterior's mean, median, mode, spread and tail probabilities P(p > c).
// Every credible interval carries its prior (Interval.Prior). A credible
// interval is a statement about the posterior, not a coverage guarantee.
//
// # Caution
//
// Results in clinical studies, safety-critical acceptance or other
// decisions that can hurt someone must be reviewed by a qualified
// statistician against the applicable regulations, standards and local
// practice; this package computes the published methods accurately, it
// does not choose the design or the method for you.
package interval

// Package power plans binomial studies before the data exist: the power
// of tests and the sample sizes they need, the precision of an estimated
// proportion, the number of trials that demonstrates a reliability, and
// acceptance sampling plans by attributes. Exact calculations are the
// default wherever the discreteness of binomial data matters; the
// textbook normal approximations are offered beside them for comparison.
//
// In use (an invented plan: detect a rise of a 5% error rate to 10%):
//
//	r, err := power.TwoSampleNormalN(0.05, 0.10, power.TwoSampleOptions{Alpha: 0.05, Power: 0.80})
//	if err != nil {
//		return err // names the bad argument: power.TwoSampleNormalN: p1 = 1.2 ...
//	}
//	fmt.Println(r.N, "per group by", r.Method)
//
// Every function and value of the package is safe for concurrent use: the
// functions keep no state (searches take a context.Context) and the
// results are plain values. The options name the test package's words
// (test.Alternative, test.TwoSidedRule, MidP, test.McNemarMethod), so a
// plan names the test that test will run with the same values.
//
// # Power and the sawtooth
//
// The power of a test is the probability that it rejects the null
// hypothesis when a stated alternative is true: for the exact one-sample
// test of H0: p = p0 with n trials,
//
//	power(n) = P(X in the rejection region), X ~ Binomial(n, p1).
//
// With discrete data the rejection region can only grow by whole outcomes,
// so the attained size (the rejection probability under H0) jumps below
// alpha and back as n grows, and the power follows it: it is a sawtooth,
// not a smooth increasing curve. The first n whose power reaches the
// target can be followed by larger n that fall short. OneSampleN,
// PairedN, TwoSampleN, PrecisionN and WorstPrecisionN therefore report
// both the first n and the stable n, the smallest n from which every
// larger n (through a documented horizon) keeps the target, together with
// the whole curve of (n, power) points they computed for plotting. Plan on
// the stable n unless the protocol fixes n exactly. (Chernick MR, Liu CY
// (2002), The saw-toothed behavior of power versus sample size and
// software solutions: single binomial proportion using exact methods, The
// American Statistician 56:149-155, describe the phenomenon; recalled.)
//
// The exact powers use the decisions of the tests in package test (and its
// shared core internal/onesample): one-sample exact binomial tests with
// the point-probability, central or Blaker two-sided definitions and their
// mid-p variants; Fisher's exact test, Barnard's unconditional test and the
// pooled z test for two groups, by enumeration of every 2x2 table; the
// exact conditional and mid-p McNemar tests for pairs, by enumeration of
// the number of discordant pairs. A test at level alpha rejects when its
// p-value is below alpha.
//
// # Normal approximations
//
// OneSampleNormalN, TwoSampleNormalN (Fleiss' pooled formula with the
// Casagrande-Pike-Smith correction, or unpooled; any allocation ratio;
// non-inferiority and equivalence margins after Blackwelder) and
// PairedNormalN (Connor 1987) are the published closed forms. They are
// close to the exact answers for large samples and can be wrong in either
// direction for small ones. Sources: Fleiss JL (1981), Statistical Methods
// for Rates and Proportions, 2nd ed.; Casagrande JT, Pike MC, Smith PG
// (1978), Biometrics 34:483-486; Fleiss JL, Tytun A, Ury HK (1980),
// Biometrics 36:343-346; Blackwelder WC (1982), Controlled Clinical Trials
// 3:345-353; Schuirmann DJ (1987), J Pharmacokinet Biopharm 15:657-680;
// Connor RJ (1987), Biometrics 43:207-211.
//
// # Precision
//
// PrecisionN gives the smallest n for which the sample proportion lands
// within eps of p with a stated probability, exactly (binom's
// ProportionWithin), for a planning value of p; WorstPrecisionN does the
// same for the least favourable p. ExpectedWidthN and AssuranceN plan on
// the half-width of a confidence interval of package interval: its
// expected value, or the probability that it is at most d. MarginOfErrorN
// is the common-practice formula z^2 p (1-p) / d^2.
//
// # Reliability demonstration
//
// DemonstrationTrials gives the trials needed to demonstrate reliability R
// at confidence C when at most c failures are allowed (the success-run
// formula n = ln(1-C)/ln R for c = 0); DemonstratedReliability gives the
// exact lower confidence bound on reliability from an observed outcome.
// Hanley JA, Lippman-Hand A (1983), JAMA 249:1743-1745 explain the rule of
// three that the zero-failure bound refines.
//
// # Acceptance sampling by attributes
//
// A single sampling plan (n, c) inspects n items of a lot and accepts it
// when at most c are defective. Its operating characteristic Pa(p) is the
// probability of acceptance at defect rate p (binomial for large lots,
// AcceptProb; hypergeometric for a finite lot, AcceptProbLot). The
// producer's risk alpha is the probability of rejecting a lot of
// acceptable quality (AQL): 1 - Pa(AQL). The consumer's risk beta is the
// probability of accepting a lot of rejectable quality (RQL, also called
// LTPD): Pa(RQL). DesignPlan finds, by an exact search, the plan with the
// smallest n meeting both. Under rectifying inspection (rejected lots are
// screened and defectives replaced) Rectify gives the average outgoing
// quality AOQ = Pa p (N-n)/N and the average total inspection ATI = n + (1
// - Pa)(N - n), and AOQL their worst case over p. Source: Montgomery DC,
// Introduction to Statistical Quality Control, chapter on acceptance
// sampling (single sampling plans, OC curves, rectifying inspection).
//
// # Sequential designs and monitoring
//
// SPRTOperating computes the exact operating characteristic and expected
// sample number of Wald's SPRT (truncated or not) by recursion over the
// continuation band, beside Wald's approximations. NewCUSUM and
// CUSUMForARL build the Bernoulli CUSUM chart of Reynolds and Stoumbos
// (1999) for an increase or a decrease of a rate, item by item;
// CUSUMRunLength gives its exact average run length in and out of control
// by the Markov chain of Brook and Evans (1972).
// DifferenceSequenceErrorProb gives the exact time-uniform error of the
// two-sample confidence sequences of package test.
//
// # Multi-stage designs
//
// Simon finds Simon's (1989) optimal and minimax two-stage designs for a
// single-arm study, and the admissible designs between them (Jung, Lee,
// Kim and George 2004), by an exact search with pruning that never drops a
// candidate; EvaluateTwoStage gives the early-stopping probability,
// expected size and rejection probability of any design, and
// EvaluateStages the same look by look for any multi-stage design given by
// its looks. SequentialOne
// designs a group-sequential test of one proportion with Lan-DeMets error
// spending (OBrienFleming, Pocock, PowerFamily) and optional futility
// bounds from beta spending (binding or non-binding), with exact stopping
// counts found by dynamic programming over the count; SequentialOneN sizes
// it. SequentialTwo designs the two-proportion version on the normal
// approximation (SpendingBounds gives the normal-theory bounds) and checks
// the attained size and power exactly by enumerating both groups' counts.
// The inference at the end of a one-proportion multi-stage study is
// test.StageWise and interval.StageWise, which take the Looks of a design
// (TwoStage.Looks, SequentialOneDesign.StageLooks). Sources: Simon R
// (1989), Controlled Clinical Trials 10:1-10; Jung SH, Lee T, Kim K,
// George SL (2004), Statistics in Medicine 23:561-569; Lan KKG, DeMets DL
// (1983), Biometrika 70:659-663; Kim K, DeMets DL (1987), Biometrika
// 74:149-154; Jennison C, Turnbull BW (2000), Group Sequential Methods with
// Applications to Clinical Trials, Chapman & Hall/CRC.
//
// # Predictive probability
//
// PredictiveAtLeast gives the posterior predictive probability that a
// single-arm study reaches a number of successes at its final size, from
// the beta-binomial distribution of the remaining trials under a stated
// prior. PredictiveDesign is the monitoring design of Lee JJ, Liu DD
// (2008), Clinical Trials 5:93-106, which stops for futility when that
// probability of a convincing final result is low; its OC method gives the
// exact frequentist operating characteristics (rejection probability,
// early stopping, expected size) at any true rate by forward recursion,
// which is what a protocol must report for a Bayesian design.
//
// # Limits and errors
//
// Every search and enumeration takes a context.Context, checks it in its
// loop, and has a documented size limit (DefaultMaxN, MaxSearchN,
// MaxTwoSampleTotal, DefaultMaxPlanN, ...) beyond which it returns ErrTooLarge.
// Impossible requests (a target power that no n up to the limit reaches,
// an alternative on the null side, a plan that cannot meet both risks)
// return ErrNoSolution with the reason. Bad arguments return
// ErrInvalidArgument naming the argument. Results marshal to JSON with
// non-finite numbers written as strings.
//
// # Sources
//
// Fleiss JL (1981), Statistical Methods for Rates and Proportions, 2nd
// ed.; Casagrande JT, Pike MC, Smith PG (1978), Biometrics 34:483-486;
// Fleiss JL, Tytun A, Ury HK (1980), Biometrics 36:343-346; Connor RJ
// (1987), Biometrics 43:207-211; Chernick MR, Liu CY (2002), The American
// Statistician 56:149-155; Montgomery DC, Introduction to Statistical
// Quality Control; Hanley JA, Lippman-Hand A (1983), JAMA 249:1743-1745.
// Each function's comment names the source of its method.
//
// # Caution
//
// These numbers are planning aids, not approvals. A sample size for a
// clinical study, or an acceptance or demonstration plan for a
// safety-critical product, carries consequences for people: have it
// reviewed by a qualified statistician, and follow the regulations,
// standards (for example the acceptance sampling standards in force for
// the product) and local practice that apply. The power of a test holds
// only under its assumptions (independent trials with a common
// probability); clustering, drop-out and multiple endpoints change the
// answer, and interim looks must be planned (see Multi-stage designs), not
// added to a single-stage plan.
package power

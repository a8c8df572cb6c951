package test

import (
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/enum"
	"github.com/kofnlab/kofn/internal/jsonfloat"
)

// Decision is the state of a sequential test after a look.
//
// The zero value, Continue, is "no decision yet: take more observations",
// the state before any data.
type Decision int

// The decisions of a sequential test.
const (
	Continue   Decision = iota // no boundary crossed: keep observing
	RejectNull                 // the upper boundary is crossed: reject H0 in favour of H1
	AcceptNull                 // the lower boundary is crossed: accept H0 (reject H1)
)

var decisionNames = enum.New[Decision]("test.Decision", []string{"continue", "reject H0", "accept H0"},
	map[string]Decision{"reject": RejectNull, "accept": AcceptNull})

// String returns "continue", "reject H0" or "accept H0".
func (d Decision) String() string { return decisionNames.String(d) }

// MarshalText encodes the decision by its name.
func (d Decision) MarshalText() ([]byte, error) { return decisionNames.MarshalText(d) }

// UnmarshalText decodes a name accepted by ParseDecision.
func (d *Decision) UnmarshalText(b []byte) error { return decisionNames.UnmarshalText(d, b) }

// ParseDecision returns the decision whose String() is s, ignoring case;
// "reject" and "accept" are accepted too.
func ParseDecision(s string) (Decision, error) { return decisionNames.Parse("test.ParseDecision", s) }

// DecisionValues returns the decisions in order.
func DecisionValues() []Decision { return decisionNames.Values() }

// SPRTOptions are the options of NewSPRT and NewPairedSPRT; the zero value
// is the untruncated test.
type SPRTOptions struct {
	// MaxN truncates the test: at n = MaxN observations a test that has
	// crossed neither boundary decides by the sign of the log likelihood
	// ratio (reject H0 when it is positive, accept H0 otherwise; Wald 1947,
	// section 3.8, recalled). 0 means no maximum. The exact error rates and
	// expected sample number of a truncated test are computed by
	// power.SPRTOperating.
	MaxN int64
}

// SPRT is Wald's sequential probability ratio test of H0: p = P0 against
// H1: p = P1 for independent Bernoulli observations, with nominal error
// rates Alpha (rejecting a true H0) and Beta (accepting H0 when H1 is
// true). After n observations with k successes the log likelihood ratio
// is
//
//	Z(k, n) = k ln(P1/P0) + (n - k) ln((1 - P1)/(1 - P0))
//
// and the test rejects H0 once Z >= LogUpper = ln((1 - Beta)/Alpha),
// accepts H0 once Z <= LogLower = ln(Beta/(1 - Alpha)), and continues in
// between (Wald 1945, 1947). Wald's boundaries guarantee, for the
// untruncated test, alpha' <= Alpha/(1 - Beta), beta' <= Beta/(1 - Alpha)
// and alpha' + beta' <= Alpha + Beta for the achieved error rates; the
// overshoot of the discrete walk usually makes both smaller than nominal.
// Exact rates come from power.SPRTOperating.
//
// A value is built by NewSPRT or NewPairedSPRT and is safe for concurrent
// use; Decide costs O(1).
//
// Source: Wald A (1945), Sequential tests of statistical hypotheses,
// Annals of Mathematical Statistics 16:117-186; Wald A (1947), Sequential
// Analysis, Wiley, chapter 5 (the binomial case).
type SPRT struct {
	P0    float64 `json:"p0"`    // success probability under H0
	P1    float64 `json:"p1"`    // success probability under H1, different from P0
	Alpha float64 `json:"alpha"` // nominal probability of rejecting a true H0
	Beta  float64 `json:"beta"`  // nominal probability of accepting H0 when H1 holds
	// MaxN is the truncation (0: none).
	MaxN int64 `json:"max_n,omitempty"`
	// Paired reports a test on discordant pairs (NewPairedSPRT): the
	// observations are the discordant pairs, a success is an n12 pair.
	Paired bool `json:"paired,omitempty"`
	// LogUpper = ln((1 - Beta)/Alpha) and LogLower = ln(Beta/(1 - Alpha))
	// are Wald's boundaries for Z.
	LogUpper float64 `json:"log_upper"`
	LogLower float64 `json:"log_lower"`
	// Success and Failure are the increments of Z per observation:
	// ln(P1/P0) and ln((1 - P1)/(1 - P0)).
	Success float64 `json:"success"`
	Failure float64 `json:"failure"`
	// Lines are the decision lines in the (n, k) plane.
	Lines DecisionLines `json:"lines"`
}

// DecisionLines are the SPRT's boundaries drawn in the plane of n
// (observations) and k (successes): two parallel lines
//
//	k = Reject + Slope n,   k = Accept + Slope n,
//	Slope  = ln((1-P0)/(1-P1)) / D,   D = ln(P1 (1-P0) / (P0 (1-P1))),
//	Reject = LogUpper / D,   Accept = LogLower / D.
//
// For P1 > P0 (D > 0) H0 is rejected when k >= Reject + Slope n and
// accepted when k <= Accept + Slope n; for P1 < P0 (D < 0) the
// inequalities turn around (the Reject line then lies below the Accept
// line). The slope lies strictly between P0 and P1.
type DecisionLines struct {
	Slope  float64 `json:"slope"`
	Reject float64 `json:"reject"`
	Accept float64 `json:"accept"`
}

// MarshalJSON encodes the test with non-finite floats as strings.
func (s SPRT) MarshalJSON() ([]byte, error) {
	type plain SPRT
	return jsonfloat.Marshal(plain(s))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (s *SPRT) UnmarshalJSON(b []byte) error {
	type plain SPRT
	return jsonfloat.Unmarshal(b, (*plain)(s))
}

// NewSPRT returns Wald's SPRT of H0: p = p0 against H1: p = p1.
//
// Domain: p0 and p1 in (0, 1), p0 != p1; alpha and beta in (0, 1) with
// alpha + beta < 1; opt.MaxN >= 0. Errors name the bad argument.
func NewSPRT(p0, p1, alpha, beta float64, opt SPRTOptions) (SPRT, error) {
	return newSPRT("test.NewSPRT", "p0", "p1", p0, p1, alpha, beta, opt)
}

// NewPairedSPRT returns the SPRT for paired binary data on the discordant
// pairs: conditionally on the number of discordant pairs d = n12 + n21,
// n12 is Binomial(d, theta) with theta = p12 / (p12 + p21), and p12 = p21
// is theta = 1/2. The test is the one-proportion SPRT of H0: theta = 1/2
// against H1: theta = theta1 on the stream of discordant pairs (concordant
// pairs carry no information and are skipped); MaxN counts discordant
// pairs. Use DecidePaired at each look. The expected number of all pairs
// is the expected number of discordant pairs divided by p12 + p21
// (power.SPRTOperating reports both).
//
// Domain: theta1 in (0, 1), theta1 != 1/2; alpha, beta as for NewSPRT.
//
// Source: Wald (1947), section 5.3 (recalled); the conditioning on
// discordant pairs is McNemar's (1947).
func NewPairedSPRT(theta1, alpha, beta float64, opt SPRTOptions) (SPRT, error) {
	s, err := newSPRT("test.NewPairedSPRT", "", "theta1", 0.5, theta1, alpha, beta, opt)
	s.Paired = err == nil
	return s, err
}

func newSPRT(fn, p0Arg, p1Arg string, p0, p1, alpha, beta float64, opt SPRTOptions) (SPRT, error) {
	if p0Arg != "" {
		if err := argerr.OpenProb(fn, p0Arg, p0); err != nil {
			return SPRT{}, err
		}
	}
	if err := argerr.OpenProb(fn, p1Arg, p1); err != nil {
		return SPRT{}, err
	}
	if p1 == p0 {
		return SPRT{}, argerr.Invalid(fn, p1Arg, p1, "equals the null value; the two hypotheses must differ")
	}
	if err := argerr.OpenProb(fn, "alpha", alpha); err != nil {
		return SPRT{}, err
	}
	if err := argerr.OpenProb(fn, "beta", beta); err != nil {
		return SPRT{}, err
	}
	if !(alpha+beta < 1) {
		return SPRT{}, argerr.Invalid(fn, "beta", beta, "plus alpha = "+argerr.Format(alpha)+" is not below 1; the boundaries would cross")
	}
	if opt.MaxN < 0 {
		return SPRT{}, argerr.Invalid(fn, "MaxN", opt.MaxN, "is negative; use 0 for no maximum")
	}
	s := SPRT{P0: p0, P1: p1, Alpha: alpha, Beta: beta, MaxN: opt.MaxN}
	s.LogUpper = math.Log1p(-beta) - math.Log(alpha)
	s.LogLower = math.Log(beta) - math.Log1p(-alpha)
	s.Success = math.Log(p1) - math.Log(p0)
	s.Failure = math.Log1p(-p1) - math.Log1p(-p0)
	d := s.Success - s.Failure
	s.Lines = DecisionLines{Slope: -s.Failure / d, Reject: s.LogUpper / d, Accept: s.LogLower / d}
	return s, nil
}

// LogRatio returns Z(k, n), the log likelihood ratio of H1 to H0 after k
// successes in n observations (no validation; see Decide).
func (s SPRT) LogRatio(k, n int64) float64 {
	return float64(k)*s.Success + float64(n-k)*s.Failure
}

// boundaryTol is the relative tolerance with which Z is compared with a
// boundary: a Z within it of the boundary counts as on it (and so as
// crossing it), so that rounding cannot decide a tie differently in
// Decide and in the exact operating characteristic.
const boundaryTol = 1e-12

// crossing classifies (k, n) by the two boundaries alone; it is the one
// rule both Decide and the exact operating characteristic use.
func (s SPRT) crossing(k, n int64) (Decision, float64) {
	z := s.LogRatio(k, n)
	scale := boundaryTol * (math.Abs(float64(k)*s.Success) + math.Abs(float64(n-k)*s.Failure) + math.Abs(s.LogUpper) + math.Abs(s.LogLower))
	switch {
	case z >= s.LogUpper-scale:
		return RejectNull, z
	case z <= s.LogLower+scale:
		return AcceptNull, z
	}
	return Continue, z
}

// decide is crossing followed by the truncation rule at MaxN.
func (s SPRT) decide(k, n int64) Decision {
	d, z := s.crossing(k, n)
	if d == Continue && s.MaxN > 0 && n >= s.MaxN {
		return s.truncate(z)
	}
	return d
}

// truncate is the decision at MaxN for a Z between the boundaries.
func (s SPRT) truncate(z float64) Decision {
	if z > 0 {
		return RejectNull
	}
	return AcceptNull
}

// Decision returns the decision at k successes in n observations, the
// same rule Decide applies (no validation; k and n must satisfy
// 0 <= k <= n <= MaxN). It lets a caller (an exact calculation, a plot)
// classify many points without building a look for each.
func (s SPRT) Decision(k, n int64) Decision { return s.decide(k, n) }

// SPRTLook is the state of an SPRT at one look.
type SPRTLook struct {
	N int64 `json:"n"` // observations so far (discordant pairs for a paired test)
	K int64 `json:"k"` // successes so far (n12 pairs for a paired test)
	// LogRatio is Z(K, N), the log likelihood ratio of H1 to H0.
	LogRatio float64 `json:"log_ratio"`
	// Decision is the decision at this look.
	Decision Decision `json:"decision"`
	// Truncated reports a decision forced by reaching MaxN.
	Truncated bool `json:"truncated,omitempty"`
	// RejectAt and AcceptAt are the success counts at N on the decision
	// lines (Lines.Reject + Slope N and Lines.Accept + Slope N).
	RejectAt float64 `json:"reject_at"`
	AcceptAt float64 `json:"accept_at"`
}

// MarshalJSON encodes the look with non-finite floats as strings.
func (l SPRTLook) MarshalJSON() ([]byte, error) {
	type plain SPRTLook
	return jsonfloat.Marshal(plain(l))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (l *SPRTLook) UnmarshalJSON(b []byte) error {
	type plain SPRTLook
	return jsonfloat.Unmarshal(b, (*plain)(l))
}

// Decide returns the SPRT's state after k successes in n observations
// (cumulative counts; a look can come after any number of observations).
// It costs O(1). A look schedule need not be fixed in advance, but a
// boundary crossed between two looks is noticed only at the later one, so
// the error rates of power.SPRTOperating assume a look after every
// observation; with sparser looks the test can only stop later.
//
// Errors: k < 0, k > n, or n > MaxN for a truncated test.
func (s SPRT) Decide(k, n int64) (SPRTLook, error) {
	const fn = "test.SPRT.Decide"
	if s.Alpha == 0 {
		return SPRTLook{}, argerr.Invalid(fn, "s", "SPRT{}", "is not built; use NewSPRT or NewPairedSPRT")
	}
	if err := argerr.KN(fn, "k", "n", k, n); err != nil {
		return SPRTLook{}, err
	}
	if s.MaxN > 0 && n > s.MaxN {
		return SPRTLook{}, argerr.Invalid(fn, "n", n, "exceeds the test's maximum MaxN = "+argerr.Format(s.MaxN))
	}
	l := SPRTLook{N: n, K: k, LogRatio: s.LogRatio(k, n), Decision: s.decide(k, n)}
	l.RejectAt = s.Lines.Reject + s.Lines.Slope*float64(n)
	l.AcceptAt = s.Lines.Accept + s.Lines.Slope*float64(n)
	if d, _ := s.crossing(k, n); d == Continue && s.MaxN > 0 && n == s.MaxN {
		l.Truncated = true
	}
	return l, nil
}

// DecidePaired is Decide for a paired test from the discordant counts:
// n12 pairs with a success in the first and a failure in the second
// member, n21 the reverse (Decide(n12, n12 + n21)).
func (s SPRT) DecidePaired(n12, n21 int64) (SPRTLook, error) {
	const fn = "test.SPRT.DecidePaired"
	if err := argerr.Count(fn, "n12", n12); err != nil {
		return SPRTLook{}, err
	}
	if err := argerr.Count(fn, "n21", n21); err != nil {
		return SPRTLook{}, err
	}
	if n12 > math.MaxInt64-n21 {
		return SPRTLook{}, argerr.TooLarge(fn, "n21", n21, "plus n12 overflows int64")
	}
	return s.Decide(n12, n12+n21)
}

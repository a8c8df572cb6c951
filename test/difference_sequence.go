package test

import (
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/enum"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/interval"
)

// SequenceMethod selects the always-valid comparison of two proportions.
//
// The zero value, ProductSequence, is the default because it is the one
// whose guarantee holds exactly at every sample size; NormalMixtureSequence
// is narrower once both groups have many successes and failures, and its
// guarantee holds only in the limit.
type SequenceMethod int

// The two-sample sequence methods.
const (
	// ProductSequence (exact): the one-proportion confidence sequences of
	// the two groups at level 1 - Alpha/2 each (beta-binomial mixtures,
	// interval.ConfidenceSequence) combined by the union bound into
	// [L1 - U2, U1 - L2] for p1 - p2. P(ever excluding the true p1 - p2)
	// <= Alpha at every sample size, for any allocation and any look
	// schedule; conservative (the bound adds two error rates).
	ProductSequence SequenceMethod = iota
	// NormalMixtureSequence (asymptotic): the mixture SPRT of Johari,
	// Koomen, Pekelis and Walsh with a normal mixing distribution of
	// variance Tau2 on the difference and the plug-in variance of the
	// estimate, whose inversion is the asymptotic confidence sequence of
	// Waudby-Smith, Arbour, Sinha, Kennedy and Ramdas. Valid only as the
	// counts grow: at small counts or rare events its error can exceed
	// Alpha (power.DifferenceSequenceErrorProb computes it exactly).
	NormalMixtureSequence
)

var sequenceMethodNames = enum.New[SequenceMethod]("test.SequenceMethod",
	[]string{"product of beta-binomial mixtures", "normal mixture SPRT"},
	map[string]SequenceMethod{"product": ProductSequence, "normal": NormalMixtureSequence, "mixture": NormalMixtureSequence})

// String returns "product of beta-binomial mixtures" or "normal mixture SPRT".
func (m SequenceMethod) String() string { return sequenceMethodNames.String(m) }

// MarshalText encodes the method by its name.
func (m SequenceMethod) MarshalText() ([]byte, error) { return sequenceMethodNames.MarshalText(m) }

// UnmarshalText decodes a name accepted by ParseSequenceMethod.
func (m *SequenceMethod) UnmarshalText(b []byte) error {
	return sequenceMethodNames.UnmarshalText(m, b)
}

// ParseSequenceMethod returns the method whose String() is s, ignoring case;
// "product" and "normal" are accepted as short forms.
func ParseSequenceMethod(s string) (SequenceMethod, error) {
	return sequenceMethodNames.Parse("test.ParseSequenceMethod", s)
}

// SequenceMethodValues returns the methods in order.
func SequenceMethodValues() []SequenceMethod { return sequenceMethodNames.Values() }

// DifferenceSequenceOptions are the options of NewDifferenceSequence; the
// zero value is the exact product method with the default priors, tuned
// for 1000 observations per group.
type DifferenceSequenceOptions struct {
	Method SequenceMethod
	// Tau2 is the variance of the normal mixing distribution of the
	// normal mixture method (on the scale of p1 - p2); 0 means the value
	// tuned for PlannedN per group at p1 = p2 = 1/2 (TunedTau2).
	Tau2 float64
	// Prior chooses the beta-binomial mixtures of the product method (its
	// PlannedN, PlannedP also tune Tau2; PlannedP is not used there).
	Prior interval.SequenceOptions
}

// DifferenceSequence is an always-valid test of H0: p1 - p2 = Delta0 for
// two independent groups observed in parallel, with the confidence
// sequence for p1 - p2 that inverts it. Observations may arrive in any
// allocation; each look gives the cumulative counts of both groups.
//
// ProductSequence: the always-valid p-value after a look is
//
//	min(1, 2 / min over p2 of max(M1(p2 + Delta0), M2(p2))),
//
// the smallest alpha at which [L1 - U2, U1 - L2] excludes Delta0 (M1, M2
// the one-proportion mixture martingales), kept as a running minimum.
// Exact.
//
// NormalMixtureSequence: with d = k1/n1 - k2/n2 and the plug-in variance
// v = p1^(1 - p1^)/n1 + p2^(1 - p2^)/n2,
//
//	Lambda = sqrt(v / (v + Tau2)) exp(Tau2 (d - Delta0)^2 / (2 v (v + Tau2))),
//	sequence: d +/- sqrt(2 v (v + Tau2) / Tau2 (ln(1/Alpha) + ln(1 + Tau2/v) / 2)),
//
// and the p-value is the running minimum of min(1, 1/Lambda) (Johari et
// al. 2022, section 4, with n Tau2 as their mixing variance per
// observation pair for balanced groups; Waudby-Smith et al. 2024,
// Theorem 2.2's Gaussian-mixture boundary with the plug-in variance).
// Asymptotic: Lambda would be an exact martingale for normal data of known
// variance; the binomial counts and the estimated variance make the
// guarantee hold only as the counts grow. Until a group has seen both a
// success and a failure v may be 0 and the look carries no evidence (the
// sequence is [-1, 1] and the p-value stays).
//
// Sources: Johari R, Koomen P, Pekelis L, Walsh D (2022), Always valid
// inference: continuous monitoring of A/B tests, Operations Research
// 70:1806-1821 (first circulated 2017); Waudby-Smith I, Arbour D, Sinha R,
// Kennedy EH, Ramdas A (2024), Time-uniform central limit theory and
// asymptotic confidence sequences, Annals of Statistics 52:2613-2640;
// Robbins H (1970) for the mixture method.
type DifferenceSequence struct {
	Delta0 float64        `json:"delta0"` // the null difference p1 - p2, in (-1, 1)
	Alpha  float64        `json:"alpha"`  // the significance level, in (0, 1)
	Method SequenceMethod `json:"method"`
	// Tau2 is the mixing variance (normal mixture method only).
	Tau2 float64 `json:"tau2,omitempty"`
	// Mix is the beta-binomial mixture of each group at level
	// 1 - Alpha/2 (product method only).
	Mix interval.Mixture `json:"mixture"`
}

// MarshalJSON encodes the value with non-finite floats as strings.
func (s DifferenceSequence) MarshalJSON() ([]byte, error) {
	type plain DifferenceSequence
	return jsonfloat.Marshal(plain(s))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (s *DifferenceSequence) UnmarshalJSON(b []byte) error {
	type plain DifferenceSequence
	return jsonfloat.Unmarshal(b, (*plain)(s))
}

// DifferenceLook is the state of a DifferenceSequence after a look.
type DifferenceLook struct {
	N1 int64 `json:"n1"`
	K1 int64 `json:"k1"`
	N2 int64 `json:"n2"`
	K2 int64 `json:"k2"`
	// LogStatistic is ln of the look's evidence against H0: ln Lambda for
	// the normal mixture, ln(min over p2 of max(M1, M2)) - ln 2 for the
	// product method.
	LogStatistic float64 `json:"log_statistic"`
	// PValue is the always-valid p-value (running minimum), LogPValue its
	// logarithm.
	PValue    float64 `json:"p_value"`
	LogPValue float64 `json:"log_p_value"`
	// Interval is the confidence sequence for p1 - p2 at level 1 - Alpha at
	// this look; Running the intersection over the looks so far.
	Interval interval.Interval `json:"interval"`
	Running  interval.Interval `json:"running"`
	// Decision is RejectNull from the first look with PValue <= Alpha on.
	Decision Decision `json:"decision"`
	Warnings []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the look with non-finite floats as strings.
func (l DifferenceLook) MarshalJSON() ([]byte, error) {
	type plain DifferenceLook
	return jsonfloat.Marshal(plain(l))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (l *DifferenceLook) UnmarshalJSON(b []byte) error {
	type plain DifferenceLook
	return jsonfloat.Unmarshal(b, (*plain)(l))
}

// TunedTau2 returns the mixing variance of the normal mixture method
// whose sequence at level 1 - alpha is narrowest when both groups have n
// observations at p1 = p2 = 1/2: Tau2 = x v, v = 1/(2n), x minimizing
// (1 + 1/x)(2 ln(1/alpha) + ln(1 + x)) (golden section, 1e-12). Domain:
// alpha in (0, 1), n >= 1.
func TunedTau2(alpha float64, n int64) (float64, error) {
	const fn = "test.TunedTau2"
	if err := argerr.OpenProb(fn, "alpha", alpha); err != nil {
		return 0, err
	}
	if n < 1 {
		return 0, argerr.Invalid(fn, "n", n, "must be at least 1")
	}
	return tunedX(alpha) / (2 * float64(n)), nil
}

func tunedX(alpha float64) float64 {
	l2 := -2 * math.Log(alpha)
	g := func(lx float64) float64 { x := math.Exp(lx); return (1 + 1/x) * (l2 + math.Log1p(x)) }
	a, b := math.Log(1e-6), math.Log(1e9)
	r := (math.Sqrt(5) - 1) / 2
	x1, x2 := b-r*(b-a), a+r*(b-a)
	f1, f2 := g(x1), g(x2)
	for i := 0; i < 200 && b-a > 1e-12; i++ {
		if f1 < f2 {
			b, x2, f2 = x2, x1, f1
			x1 = b - r*(b-a)
			f1 = g(x1)
		} else {
			a, x1, f1 = x1, x2, f2
			x2 = a + r*(b-a)
			f2 = g(x2)
		}
	}
	return math.Exp(0.5 * (a + b))
}

// NewDifferenceSequence returns the always-valid test of H0: p1 - p2 =
// delta0 at level alpha. Domain: delta0 in (-1, 1), alpha in (0, 1);
// Tau2 >= 0 and finite; Prior as interval.SequenceOptions.
func NewDifferenceSequence(delta0, alpha float64, opt DifferenceSequenceOptions) (DifferenceSequence, error) {
	const fn = "test.NewDifferenceSequence"
	if !(delta0 > -1 && delta0 < 1) {
		return DifferenceSequence{}, argerr.Invalid(fn, "delta0", delta0, "must lie strictly between -1 and 1")
	}
	if err := argerr.OpenProb(fn, "alpha", alpha); err != nil {
		return DifferenceSequence{}, err
	}
	s := DifferenceSequence{Delta0: delta0, Alpha: alpha, Method: opt.Method}
	switch opt.Method {
	case ProductSequence:
		if opt.Tau2 != 0 {
			return DifferenceSequence{}, argerr.Invalid(fn, "Tau2", opt.Tau2, "applies to the normal mixture method only")
		}
		mx, err := interval.SequenceMixture(1-alpha/2, opt.Prior)
		if err != nil {
			return DifferenceSequence{}, err
		}
		s.Mix = mx
	case NormalMixtureSequence:
		if !(opt.Tau2 >= 0 && opt.Tau2 < math.Inf(1)) {
			return DifferenceSequence{}, argerr.Invalid(fn, "Tau2", opt.Tau2, "must be positive and finite (0 means tuned)")
		}
		s.Tau2 = opt.Tau2
		if s.Tau2 == 0 {
			n := opt.Prior.PlannedN
			if n < 0 {
				return DifferenceSequence{}, argerr.Invalid(fn, "PlannedN", n, "is negative; use 0 for the default")
			}
			if n == 0 {
				n = interval.DefaultPlannedN
			}
			s.Tau2 = tunedX(alpha) / (2 * float64(n))
		}
	default:
		return DifferenceSequence{}, argerr.Invalid(fn, "Method", int(opt.Method), "is not a sequence method; use ProductSequence or NormalMixtureSequence")
	}
	return s, nil
}

// Look returns the state after a look at the cumulative counts k1 of n1
// and k2 of n2; prev is the previous look (nil at the first). Counts and
// failures must not decrease. Cost O(1) in the counts: the product method
// does four root searches and a 100-step golden-section search; the
// normal mixture a closed form (BenchmarkSequentialLook measures both).
func (s DifferenceSequence) Look(prev *DifferenceLook, k1, n1, k2, n2 int64) (DifferenceLook, error) {
	const fn = "test.DifferenceSequence.Look"
	if !(s.Alpha > 0 && s.Alpha < 1) {
		return DifferenceLook{}, argerr.Invalid(fn, "s", "DifferenceSequence{}", "is not built; use NewDifferenceSequence")
	}
	var p DifferenceLook
	if prev != nil {
		p = *prev
	}
	if err := checkLook(fn, p.N1, p.K1, k1, n1, "k1", "n1"); err != nil {
		return DifferenceLook{}, err
	}
	if err := checkLook(fn, p.N2, p.K2, k2, n2, "k2", "n2"); err != nil {
		return DifferenceLook{}, err
	}
	l := DifferenceLook{N1: n1, K1: k1, N2: n2, K2: k2}
	iv := interval.Interval{Level: 1 - s.Alpha, Side: interval.TwoSided, Method: s.Method.String(),
		Parameter: "p1 - p2", Lower: -1, Upper: 1, Estimate: math.NaN()}
	if n1 > 0 && n2 > 0 {
		iv.Estimate = float64(k1)/float64(n1) - float64(k2)/float64(n2)
	}
	iv.Lower, iv.Upper = s.Limits(k1, n1, k2, n2)
	switch s.Method {
	case ProductSequence:
		l.LogStatistic = s.productEvidence(k1, n1, k2, n2)
	case NormalMixtureSequence:
		var lo, hi float64
		l.LogStatistic, lo, hi = s.normalEvidence(k1, n1, k2, n2)
		if l.LogStatistic == 0 && lo == -1 && hi == 1 {
			l.Warnings = append(l.Warnings, "a group has no variance yet (no observations, or only successes or only failures): this look carries no evidence")
		}
		iv.Clipped = lo < -1 || hi > 1
	}
	l.Interval = iv
	l.Running = iv
	l.Running.Warnings = nil
	l.LogPValue = math.Min(0, -l.LogStatistic)
	if prev != nil {
		l.LogPValue = math.Min(l.LogPValue, prev.LogPValue)
		l.Running.Lower = math.Max(l.Running.Lower, prev.Running.Lower)
		l.Running.Upper = math.Min(l.Running.Upper, prev.Running.Upper)
	}
	l.PValue = math.Exp(l.LogPValue)
	if l.LogPValue <= math.Log(s.Alpha) {
		l.Decision = RejectNull
	}
	if l.Running.Lower > l.Running.Upper {
		l.Warnings = append(l.Warnings, "the running intersection is empty: no constant pair of proportions fits every look at this level")
	}
	return l, nil
}

// Limits returns the confidence sequence for p1 - p2 at level 1 - Alpha
// after k1 of n1 and k2 of n2 (clipped to [-1, 1]), the interval of a
// Look without its running intersection, p-value or validation: the
// counts must satisfy 0 <= k <= n. Cost O(1): four root searches for the
// product method, a square root for the normal mixture.
func (s DifferenceSequence) Limits(k1, n1, k2, n2 int64) (float64, float64) {
	switch s.Method {
	case ProductSequence:
		a := interval.SequenceInterval(k1, n1, 1-s.Alpha/2, s.Mix)
		b := interval.SequenceInterval(k2, n2, 1-s.Alpha/2, s.Mix)
		return a.Lower - b.Upper, a.Upper - b.Lower
	case NormalMixtureSequence:
		_, lo, hi := s.normalEvidence(k1, n1, k2, n2)
		return math.Max(lo, -1), math.Min(hi, 1)
	}
	return -1, 1
}

// normalEvidence returns ln Lambda and the sequence's limits (unclipped).
func (s DifferenceSequence) normalEvidence(k1, n1, k2, n2 int64) (float64, float64, float64) {
	if n1 == 0 || n2 == 0 {
		return 0, -1, 1
	}
	p1, p2 := float64(k1)/float64(n1), float64(k2)/float64(n2)
	v := p1*(1-p1)/float64(n1) + p2*(1-p2)/float64(n2)
	if !(v > 0) {
		return 0, -1, 1
	}
	d := p1 - p2
	t := s.Tau2
	e := d - s.Delta0
	logL := 0.5*math.Log(v/(v+t)) + t*e*e/(2*v*(v+t))
	hw := math.Sqrt(2 * v * (v + t) / t * (-math.Log(s.Alpha) + 0.5*math.Log1p(t/v)))
	return logL, d - hw, d + hw
}

// productEvidence returns ln(min over p2 of max(M1(p2 + Delta0), M2(p2))) -
// ln 2, the product method's log evidence against H0 at one look.
func (s DifferenceSequence) productEvidence(k1, n1, k2, n2 int64) float64 {
	lo, hi := math.Max(0, -s.Delta0), math.Min(1, 1-s.Delta0)
	f := func(p2 float64) float64 {
		a, _ := interval.SequenceLogMartingale(k1, n1, p2+s.Delta0, s.Mix)
		b, _ := interval.SequenceLogMartingale(k2, n2, p2, s.Mix)
		return math.Max(a, b)
	}
	// golden section on the quasi-convex max of two quasi-convex functions
	lo, hi = lo+1e-15*(hi-lo), hi-1e-15*(hi-lo)
	g := (math.Sqrt(5) - 1) / 2
	x1, x2 := hi-g*(hi-lo), lo+g*(hi-lo)
	f1, f2 := f(x1), f(x2)
	for i := 0; i < 100 && hi-lo > 1e-14; i++ {
		if f1 < f2 {
			hi, x2, f2 = x2, x1, f1
			x1 = hi - g*(hi-lo)
			f1 = f(x1)
		} else {
			lo, x1, f1 = x1, x2, f2
			x2 = lo + g*(hi-lo)
			f2 = f(x2)
		}
	}
	return math.Min(f1, f2) - math.Ln2
}

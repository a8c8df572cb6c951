package power

import (
	"math"

	"github.com/kofnlab/kofn/internal/enum"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/test"
)

// Variance selects the variance used under H0 by the two-sample normal
// formulas. The zero value, PooledNull, is the Fleiss formula behind the
// published sample size tables (Fleiss 1981, Table A.3), which is also the
// variance of the usual pooled z (chi-square) test.
type Variance int

const (
	// PooledNull uses the pooled proportion (p1 + r p2)/(1 + r) under H0
	// and the separate variances under H1 (Fleiss 1981, eq. 3.14).
	PooledNull Variance = iota
	// Unpooled uses p1 q1 + p2 q2 / r under both hypotheses (the Wald
	// test; Blackwelder 1982 for a non-zero margin).
	Unpooled
)

var varianceNames = enum.New[Variance]("power.Variance", []string{"pooled", "unpooled"}, nil)

// String returns "pooled" or "unpooled".
func (v Variance) String() string { return varianceNames.String(v) }

// MarshalText encodes the value by its String form.
func (v Variance) MarshalText() ([]byte, error) { return varianceNames.MarshalText(v) }

// UnmarshalText decodes any spelling ParseVariance accepts.
func (v *Variance) UnmarshalText(b []byte) error { return varianceNames.UnmarshalText(v, b) }

// ParseVariance converts a String form (case insensitive) to a value.
func ParseVariance(s string) (Variance, error) { return varianceNames.Parse("power.ParseVariance", s) }

// VarianceValues lists the values in order.
func VarianceValues() []Variance { return varianceNames.Values() }

// Correction selects the continuity correction of the two-sample normal
// sample size. The zero value, CPS, is the default because the corrected
// size is the one that matches the exact (Fisher) test's power and the
// published tables (Fleiss 1981, Table A.3).
type Correction int

const (
	// CPS is the Casagrande-Pike-Smith correction in Fleiss' closed form,
	// generalized to allocation ratio r by Fleiss, Tytun and Ury (1980):
	//	n1 = n1'/4 [1 + sqrt(1 + 2 (r+1) / (r n1' |p1 - p2|))]^2.
	CPS Correction = iota
	// NoCorrection reports the uncorrected size n1'.
	NoCorrection
)

var correctionNames = enum.New[Correction]("power.Correction", []string{"cps", "none"}, map[string]Correction{"fleiss": CPS, "casagrande-pike-smith": CPS, "uncorrected": NoCorrection})

// String returns "cps" or "none".
func (v Correction) String() string { return correctionNames.String(v) }

// MarshalText encodes the value by its String form.
func (v Correction) MarshalText() ([]byte, error) { return correctionNames.MarshalText(v) }

// UnmarshalText decodes any spelling ParseCorrection accepts.
func (v *Correction) UnmarshalText(b []byte) error { return correctionNames.UnmarshalText(v, b) }

// ParseCorrection converts a String form (case insensitive) to a value (also the spellings listed beside the table).
func ParseCorrection(s string) (Correction, error) {
	return correctionNames.Parse("power.ParseCorrection", s)
}

// CorrectionValues lists the values in order.
func CorrectionValues() []Correction { return correctionNames.Values() }

// Hypothesis is the form of the null hypothesis about the difference
// d = p1 - p2 of two proportions. The zero value, Equality, is the
// ordinary test of no difference.
type Hypothesis int

const (
	// Equality: H0: d = 0, against the options' Alternative.
	Equality Hypothesis = iota
	// NonInferiority: H0: d <= -Margin against H1: d > -Margin (group 1
	// is not worse than group 2 by more than Margin, larger proportions
	// being better), a one-sided test at Alpha. Swap the groups when
	// smaller is better.
	NonInferiority
	// Equivalence: H0: |d| >= Margin against H1: |d| < Margin, by two
	// one-sided tests each at Alpha (Schuirmann 1987).
	Equivalence
)

var hypothesisNames = enum.New[Hypothesis]("power.Hypothesis", []string{"equality", "non-inferiority", "equivalence"}, map[string]Hypothesis{"noninferiority": NonInferiority, "noninf": NonInferiority, "equiv": Equivalence})

// String returns "equality", "non-inferiority" or "equivalence".
func (v Hypothesis) String() string { return hypothesisNames.String(v) }

// MarshalText encodes the value by its String form.
func (v Hypothesis) MarshalText() ([]byte, error) { return hypothesisNames.MarshalText(v) }

// UnmarshalText decodes any spelling ParseHypothesis accepts.
func (v *Hypothesis) UnmarshalText(b []byte) error { return hypothesisNames.UnmarshalText(v, b) }

// ParseHypothesis converts a String form (case insensitive) to a value (also the spellings listed beside the table).
func ParseHypothesis(s string) (Hypothesis, error) {
	return hypothesisNames.Parse("power.ParseHypothesis", s)
}

// HypothesisValues lists the values in order.
func HypothesisValues() []Hypothesis { return hypothesisNames.Values() }

// TwoSampleOptions configures the two-sample functions. The zero value
// means: test of equality, two-sided, alpha 0.05, power 0.80, equal
// groups, pooled null variance with the CPS correction, Fisher's exact
// test for exact power, search limit DefaultMaxN2 per group.
type TwoSampleOptions struct {
	// Alpha is the significance level in (0, 1); 0 means 0.05. For
	// Equivalence it is the level of each one-sided test.
	Alpha float64
	// Power is the target power in (0, 1); 0 means 0.80.
	Power float64
	// Alternative is the direction for Equality (ignored otherwise).
	Alternative test.Alternative
	// Ratio is the allocation ratio r = n2/n1 > 0; 0 means 1.
	Ratio float64
	// Variance selects the null variance of the normal formulas
	// (Equality only; margins always use Unpooled).
	Variance Variance
	// Correction selects the continuity correction of the normal
	// formulas (Equality only).
	Correction Correction
	// Hypothesis is the form of the null hypothesis.
	Hypothesis Hypothesis
	// Margin is the non-inferiority or equivalence margin, > 0, required
	// for those hypotheses and ignored for Equality.
	Margin float64
	// Test selects the exact test for exact power and its searches
	// (Equality only; with a margin the score test with that margin is
	// enumerated).
	Test ExactTest
	// MaxN bounds the size of group 1 in searches; 0 means DefaultMaxN2.
	MaxN int64
}

// twoSetup holds validated two-sample inputs.
type twoSetup struct {
	p1, p2, alpha, pw, r, margin float64
	alt                          test.Alternative
	hyp                          Hypothesis
}

func (o TwoSampleOptions) setup(fn string, p1, p2 float64, needEffect bool) (twoSetup, error) {
	s := twoSetup{p1: p1, p2: p2, alt: o.Alternative, hyp: o.Hypothesis, margin: o.Margin}
	if err := argerr.Prob(fn, "p1", p1); err != nil {
		return s, err
	}
	if err := argerr.Prob(fn, "p2", p2); err != nil {
		return s, err
	}
	if err := checkAlternative(fn, o.Alternative); err != nil {
		return s, err
	}
	var err error
	if s.alpha, s.pw, err = alphaPower(fn, o.Alpha, o.Power); err != nil {
		return s, err
	}
	s.r = orDefault(o.Ratio, 1)
	if !(s.r > 0 && s.r <= 1e6) {
		return s, argerr.Invalid(fn, "Ratio", o.Ratio, "must be a finite allocation ratio n2/n1 in (0, 1e6]")
	}
	if o.Variance < PooledNull || o.Variance > Unpooled {
		return s, argerr.Invalid(fn, "Variance", int(o.Variance), "is not a defined Variance")
	}
	if o.Correction < CPS || o.Correction > NoCorrection {
		return s, argerr.Invalid(fn, "Correction", int(o.Correction), "is not a defined Correction")
	}
	if err := exactTestNames.Check(fn, "Test", o.Test); err != nil {
		return s, err
	}
	d := p1 - p2
	switch o.Hypothesis {
	case Equality:
		if needEffect {
			if p1 == p2 {
				return s, argerr.Invalid(fn, "p2", p2, "equals p1: a sample size needs an effect to detect")
			}
			if (s.alt == test.Higher && d < 0) || (s.alt == test.Lower && d > 0) {
				return s, argerr.NoSolution(fn, "p1 - p2 = "+argerr.Format(d)+" lies on the null side for the "+s.alt.String()+" alternative: the power never exceeds alpha")
			}
		}
	case NonInferiority, Equivalence:
		if !(o.Margin > 0 && o.Margin < 1) {
			return s, argerr.Invalid(fn, "Margin", o.Margin, "must lie in (0, 1) for a "+o.Hypothesis.String()+" hypothesis")
		}
		if needEffect && o.Hypothesis == NonInferiority && d <= -o.Margin {
			return s, argerr.NoSolution(fn, "p1 - p2 = "+argerr.Format(d)+" is inferior by the margin or more: H0 is true and the power never exceeds alpha")
		}
		if needEffect && o.Hypothesis == Equivalence && math.Abs(d) >= o.Margin {
			return s, argerr.NoSolution(fn, "|p1 - p2| = "+argerr.Format(math.Abs(d))+" is not inside the equivalence margin: H0 is true and the power never exceeds alpha")
		}
	default:
		return s, argerr.Invalid(fn, "Hypothesis", int(o.Hypothesis), "is not a defined Hypothesis")
	}
	if needEffect && s.pw <= s.alpha {
		return s, argerr.Invalid(fn, "Power", s.pw, "does not exceed Alpha = "+argerr.Format(s.alpha)+"; a test reaches that without data")
	}
	return s, nil
}

// TwoSampleNormalN returns the normal-approximation size of group 1 (and
// group 2 = ceil(Ratio n1)) for comparing two independent proportions.
//
// Equality, pooled null variance (Fleiss 1981, eq. 3.14; Fleiss, Tytun,
// Ury 1980 for r != 1), with pbar = (p1 + r p2)/(1 + r):
//
//	n1' = [ z_a sqrt((1 + 1/r) pbar qbar) + z_b sqrt(p1 q1 + p2 q2 / r) ]^2 / (p1 - p2)^2
//
// unpooled: n1' = (z_a + z_b)^2 (p1 q1 + p2 q2 / r) / (p1 - p2)^2; the CPS
// correction then gives n1 = n1'/4 [1 + sqrt(1 + 2 (r+1)/(r n1' |p1-p2|))]^2
// (Casagrande, Pike, Smith 1978). Example (Fleiss 1981, Table A.3):
// p1 = 0.05, p2 = 0.10, two-sided 0.05, power 0.80 gives 434.43
// uncorrected, 473.59 corrected, n = 474.
//
// NonInferiority (margin m, one-sided z_{1-alpha}) and Equivalence
// (two one-sided tests) use the unpooled variance (Blackwelder 1982):
//
//	NI: n1 = (z_a + z_b)^2 V / (d + m)^2,  V = p1 q1 + p2 q2 / r, d = p1 - p2
//
// and for equivalence the smallest real n1 at which the TOST normal power
// Phi((m - d)/se - z_a) + Phi((m + d)/se - z_a) - 1 reaches the target
// (for d = 0 this is (z_a + z_{(1+power)/2})^2 V / m^2). No continuity
// correction is applied with a margin.
func TwoSampleNormalN(p1, p2 float64, o TwoSampleOptions) (NormalSize, error) {
	const fn = "power.TwoSampleNormalN"
	s, err := o.setup(fn, p1, p2, true)
	if err != nil {
		return NormalSize{}, err
	}
	v := p1*(1-p1) + p2*(1-p2)/s.r
	d := p1 - p2
	zb := zq(s.pw)
	var res NormalSize
	switch s.hyp {
	case Equality:
		za := zAlpha(s.alpha, s.alt)
		var num float64
		if o.Variance == PooledNull {
			pb := (p1 + s.r*p2) / (1 + s.r)
			num = za*math.Sqrt((1+1/s.r)*pb*(1-pb)) + zb*math.Sqrt(v)
			res.Method = "Fleiss (pooled null variance)"
		} else {
			num = (za + zb) * math.Sqrt(v)
			res.Method = "unpooled (Wald) variance"
		}
		if num <= 0 {
			return NormalSize{}, argerr.NoSolution(fn, "the formula gives no positive n (target power below one half with degenerate proportions)")
		}
		n1 := num * num / (d * d)
		res.Uncorrected, res.Real = n1, n1
		if o.Correction == CPS {
			a := 2 * (s.r + 1) / (s.r * n1 * math.Abs(d))
			c := 1 + math.Sqrt(1+a)
			res.Real = n1 / 4 * c * c
			res.Method += " with Casagrande-Pike-Smith correction"
		}
	case NonInferiority:
		za := -zq(s.alpha)
		g := d + s.margin
		res.Real = (za + zb) * (za + zb) * v / (g * g)
		res.Uncorrected = res.Real
		res.Method = "non-inferiority, unpooled variance (Blackwelder)"
	case Equivalence:
		res.Real = equivalenceNormalN(d, s.margin, v, s.alpha, s.pw)
		res.Uncorrected = res.Real
		res.Method = "equivalence (TOST), unpooled variance"
	}
	if v == 0 {
		return NormalSize{}, argerr.NoSolution(fn, "both proportions are 0 or 1: the normal variance is zero; use the exact power")
	}
	if err := checkRealN(fn, res.Real); err != nil {
		return NormalSize{}, err
	}
	res.N = ceilN(res.Real)
	res.N2 = ceilN(s.r * float64(res.N))
	if err := checkRealN(fn, s.r*float64(res.N)); err != nil {
		return NormalSize{}, err
	}
	res.Power = twoNormalPower(float64(res.N), s.r*float64(res.N), s, o.Variance, o.Correction)
	if res.N < 30 || res.N2 < 30 {
		res.Warnings = append(res.Warnings, smallSampleWarning)
	}
	return res, nil
}

// equivalenceNormalN solves the TOST normal power equation for real n1 by
// bisection on the power, which increases with n1.
func equivalenceNormalN(d, m, v, alpha, pw float64) float64 {
	za := -zq(alpha)
	pow := func(n float64) float64 {
		se := math.Sqrt(v / n)
		return math.Max(0, phi((m-d)/se-za)+phi((m+d)/se-za)-1)
	}
	lo, hi := 0.0, 1.0
	for pow(hi) < pw {
		lo, hi = hi, 2*hi
	}
	for i := 0; i < 200 && hi-lo > 1e-10*hi; i++ {
		mid := 0.5 * (lo + hi)
		if pow(mid) >= pw {
			hi = mid
		} else {
			lo = mid
		}
	}
	return hi
}

// TwoSampleNormalPower returns the normal-approximation power for groups
// of n1 and n2 at true proportions p1 and p2, the inverse of
// TwoSampleNormalN: for Equality (upper side shown, two-sided adds the
// mirror)
//
//	Phi( (|d| - c - z_a s0) / s1 ),  s0^2 = pbar qbar (1/n1 + 1/n2),  s1^2 = p1 q1/n1 + p2 q2/n2
//
// with c = (1/n1 + 1/n2)/2 under the CPS correction (0 without) and s0 =
// s1 for the Unpooled variance; margins as in TwoSampleNormalN. o.Ratio
// is ignored (n2 is given). Proportions may be equal (power near alpha).
func TwoSampleNormalPower(n1, n2 int64, p1, p2 float64, o TwoSampleOptions) (float64, error) {
	const fn = "power.TwoSampleNormalPower"
	if n1 < 1 {
		return 0, argerr.Invalid(fn, "n1", n1, "must be at least 1")
	}
	if n2 < 1 {
		return 0, argerr.Invalid(fn, "n2", n2, "must be at least 1")
	}
	o.Ratio = 0
	s, err := o.setup(fn, p1, p2, false)
	if err != nil {
		return 0, err
	}
	return twoNormalPower(float64(n1), float64(n2), s, o.Variance, o.Correction), nil
}

func twoNormalPower(n1, n2 float64, s twoSetup, v Variance, c Correction) float64 {
	p1, p2 := s.p1, s.p2
	d := p1 - p2
	s1 := math.Sqrt(p1*(1-p1)/n1 + p2*(1-p2)/n2)
	ratio := func(num float64) float64 {
		if s1 == 0 {
			if num > 0 {
				return 1
			}
			return 0
		}
		return phi(num / s1)
	}
	switch s.hyp {
	case NonInferiority:
		return ratio(d + s.margin - (-zq(s.alpha))*s1)
	case Equivalence:
		za := -zq(s.alpha)
		return math.Max(0, ratio(s.margin-d-za*s1)+ratio(s.margin+d-za*s1)-1)
	}
	za := zAlpha(s.alpha, s.alt)
	s0 := s1
	if v == PooledNull {
		pb := (n1*p1 + n2*p2) / (n1 + n2)
		s0 = math.Sqrt(pb * (1 - pb) * (1/n1 + 1/n2))
	}
	cc := 0.0
	if c == CPS {
		cc = (1/n1 + 1/n2) / 2
	}
	side := func(e float64) float64 { return ratio(e - cc - za*s0) }
	switch s.alt {
	case test.Higher:
		return side(d)
	case test.Lower:
		return side(-d)
	}
	return math.Min(1, side(d)+side(-d))
}

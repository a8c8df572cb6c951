package power

import (
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/test"
)

// PairedOptions configures the paired (McNemar) functions. The zero value
// means: exact conditional test, two-sided, alpha 0.05, power 0.80,
// search limit DefaultMaxN.
type PairedOptions struct {
	// Alpha is the significance level in (0, 1); 0 means 0.05.
	Alpha float64
	// Power is the target power in (0, 1); 0 means 0.80.
	Power float64
	// Alternative is the direction for p12 - p21; the zero value is test.TwoSided.
	Alternative test.Alternative
	// Method selects the McNemar test that test.McNemar will run: the zero
	// value, test.McNemarExact, is the default for planning because its
	// size never exceeds alpha; test.McNemarAsymptotic is the chi-square
	// test without continuity correction, planned by Connor's (1987)
	// normal formula (PairedNormalPower) or, with Enumerate, by its exact
	// power. test.McNemarAsymptoticCC is not planned.
	Method test.McNemarMethod
	// MidP selects the mid-p version of the exact test (more powerful,
	// its size only approximately at most Alpha; Fagerland, Lydersen and
	// Laake 2013), as test.McNemarOptions.MidP.
	MidP bool
	// Enumerate, with test.McNemarAsymptotic, replaces Connor's formula by
	// the exact power of the chi-square test, enumerated like the others.
	Enumerate bool
	// MaxN bounds the number of pairs in exact searches; 0 means DefaultMaxN.
	MaxN int64
}

// pairedCheck validates the discordant probabilities and the options.
func (o PairedOptions) check(fn string, p12, p21 float64, needEffect bool) (alpha, pw float64, err error) {
	if err = argerr.Prob(fn, "p12", p12); err != nil {
		return
	}
	if err = argerr.Prob(fn, "p21", p21); err != nil {
		return
	}
	if !(p12+p21 <= 1) {
		err = argerr.Invalid(fn, "p21", p21, "plus p12 = "+argerr.Format(p12)+" exceeds 1")
		return
	}
	if err = checkAlternative(fn, o.Alternative); err != nil {
		return
	}
	if alpha, pw, err = alphaPower(fn, o.Alpha, o.Power); err != nil {
		return
	}
	if !needEffect {
		return
	}
	if p12 == p21 {
		err = argerr.Invalid(fn, "p21", p21, "equals p12: a sample size needs discordant probabilities that differ")
		return
	}
	if (o.Alternative == test.Higher && p12 < p21) || (o.Alternative == test.Lower && p12 > p21) {
		err = argerr.NoSolution(fn, "p12 - p21 lies on the null side for the "+o.Alternative.String()+" alternative: the power never exceeds alpha")
		return
	}
	if pw <= alpha {
		err = argerr.Invalid(fn, "Power", pw, "does not exceed Alpha = "+argerr.Format(alpha)+"; a test reaches that without data")
	}
	return
}

// PairedNormalN returns the asymptotic number of pairs for McNemar's test
// to have the target power when the discordant cell probabilities are p12
// (success on the first measurement only) and p21 (second only), by
// Connor's formula (Connor RJ 1987, Sample size for testing differences in
// proportions for the paired-sample design, Biometrics 43:207-211):
//
//	n = [ z_a sqrt(psi) + z_b sqrt(psi - delta^2) ]^2 / delta^2,
//	psi = p12 + p21, delta = p12 - p21.
//
// Domain: probabilities in [0, 1] with p12 + p21 <= 1 and p12 != p21.
func PairedNormalN(p12, p21 float64, o PairedOptions) (NormalSize, error) {
	const fn = "power.PairedNormalN"
	alpha, pw, err := o.check(fn, p12, p21, true)
	if err != nil {
		return NormalSize{}, err
	}
	psi, delta := p12+p21, p12-p21
	za, zb := zAlpha(alpha, o.Alternative), zq(pw)
	num := za*math.Sqrt(psi) + zb*math.Sqrt(math.Max(0, psi-delta*delta))
	if num <= 0 {
		return NormalSize{}, argerr.NoSolution(fn, "the formula gives no positive n (target power below one half with degenerate probabilities)")
	}
	real := num * num / (delta * delta)
	if err := checkRealN(fn, real); err != nil {
		return NormalSize{}, err
	}
	r := NormalSize{Method: "McNemar asymptotic (Connor 1987)", Real: real, Uncorrected: real, N: ceilN(real)}
	r.Power = pairedNormalPower(float64(r.N), p12, p21, alpha, o.Alternative)
	if float64(r.N)*psi < 20 {
		r.Warnings = append(r.Warnings, "fewer than 20 discordant pairs expected: check with the exact conditional power")
	}
	return r, nil
}

// PairedNormalPower returns the asymptotic power of McNemar's test with n
// pairs (Connor 1987), upper side shown, a two-sided test adds the mirror:
//
//	Phi( (sqrt(n) delta - z_a sqrt(psi)) / sqrt(psi - delta^2) ).
//
// p12 may equal p21 (power near alpha).
func PairedNormalPower(n int64, p12, p21 float64, o PairedOptions) (float64, error) {
	const fn = "power.PairedNormalPower"
	if n < 1 {
		return 0, argerr.Invalid(fn, "n", n, "must be at least 1")
	}
	alpha, _, err := o.check(fn, p12, p21, false)
	if err != nil {
		return 0, err
	}
	return pairedNormalPower(float64(n), p12, p21, alpha, o.Alternative), nil
}

func pairedNormalPower(n, p12, p21, alpha float64, alt test.Alternative) float64 {
	psi := p12 + p21
	if psi == 0 {
		return 0
	}
	s1 := math.Sqrt(math.Max(0, psi-(p12-p21)*(p12-p21)))
	return sidedPower(n, p12-p21, math.Sqrt(psi), s1, zAlpha(alpha, alt), alt)
}

// checkMethod validates the McNemar test the options plan for.
func (o PairedOptions) checkMethod(fn string) error {
	switch o.Method {
	case test.McNemarExact, test.McNemarAsymptotic:
		return nil
	case test.McNemarAsymptoticCC:
		return argerr.Invalid(fn, "Method", o.Method.String(), "is not planned; use McNemarExact or McNemarAsymptotic")
	}
	return argerr.Invalid(fn, "Method", int(o.Method), "is not a test.McNemarMethod")
}

// testName names the planned test as test.McNemar names it, with the
// alternative.
func (o PairedOptions) testName() string {
	name := o.Method.String()
	if o.MidP && o.Method == test.McNemarExact {
		name = "McNemar mid-p"
	}
	return name + ", " + o.Alternative.String()
}

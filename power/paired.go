package power

import (
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
)

// PairedOptions configures the paired (McNemar) functions. The zero value
// means: exact conditional test, two-sided, alpha 0.05, power 0.80,
// search limit DefaultMaxN.
type PairedOptions struct {
	// Alpha is the significance level in (0, 1); 0 means 0.05.
	Alpha float64
	// Power is the target power in (0, 1); 0 means 0.80.
	Power float64
	// Alternative is the direction for p10 - p01; the zero value is TwoSided.
	Alternative Alternative
	// Method selects the McNemar test; the zero value is McNemarExact.
	Method PairedMethod
	// Enumerate, with McNemarAsymptotic, replaces Connor's formula by the
	// exact power of the chi-square test, enumerated like the others.
	Enumerate bool
	// MaxN bounds the number of pairs in exact searches; 0 means DefaultMaxN.
	MaxN int64
}

// pairedCheck validates the discordant probabilities and the options.
func (o PairedOptions) check(fn string, p10, p01 float64, needEffect bool) (alpha, pw float64, err error) {
	if err = argerr.Prob(fn, "p10", p10); err != nil {
		return
	}
	if err = argerr.Prob(fn, "p01", p01); err != nil {
		return
	}
	if !(p10+p01 <= 1) {
		err = argerr.Invalid(fn, "p01", p01, "plus p10 = "+argerr.Format(p10)+" exceeds 1")
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
	if p10 == p01 {
		err = argerr.Invalid(fn, "p01", p01, "equals p10: a sample size needs discordant probabilities that differ")
		return
	}
	if (o.Alternative == Greater && p10 < p01) || (o.Alternative == Less && p10 > p01) {
		err = argerr.NoSolution(fn, "p10 - p01 lies on the null side for the "+o.Alternative.String()+" alternative: the power never exceeds alpha")
		return
	}
	if pw <= alpha {
		err = argerr.Invalid(fn, "Power", pw, "does not exceed Alpha = "+argerr.Format(alpha)+"; a test reaches that without data")
	}
	return
}

// PairedNormalN returns the asymptotic number of pairs for McNemar's test
// to have the target power when the discordant cell probabilities are p10
// (success on the first measurement only) and p01 (second only), by
// Connor's formula (Connor RJ 1987, Sample size for testing differences in
// proportions for the paired-sample design, Biometrics 43:207-211):
//
//	n = [ z_a sqrt(psi) + z_b sqrt(psi - delta^2) ]^2 / delta^2,
//	psi = p10 + p01, delta = p10 - p01.
//
// Domain: probabilities in [0, 1] with p10 + p01 <= 1 and p10 != p01.
func PairedNormalN(p10, p01 float64, o PairedOptions) (NormalSize, error) {
	const fn = "power.PairedNormalN"
	alpha, pw, err := o.check(fn, p10, p01, true)
	if err != nil {
		return NormalSize{}, err
	}
	psi, delta := p10+p01, p10-p01
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
	r.Power = pairedNormalPower(float64(r.N), p10, p01, alpha, o.Alternative)
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
// p10 may equal p01 (power near alpha).
func PairedNormalPower(n int64, p10, p01 float64, o PairedOptions) (float64, error) {
	const fn = "power.PairedNormalPower"
	if n < 1 {
		return 0, argerr.Invalid(fn, "n", n, "must be at least 1")
	}
	alpha, _, err := o.check(fn, p10, p01, false)
	if err != nil {
		return 0, err
	}
	return pairedNormalPower(float64(n), p10, p01, alpha, o.Alternative), nil
}

func pairedNormalPower(n, p10, p01, alpha float64, alt Alternative) float64 {
	psi := p10 + p01
	if psi == 0 {
		return 0
	}
	s1 := math.Sqrt(math.Max(0, psi-(p10-p01)*(p10-p01)))
	return sidedPower(n, p10-p01, math.Sqrt(psi), s1, zAlpha(alpha, alt), alt)
}

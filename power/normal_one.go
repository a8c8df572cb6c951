package power

import (
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/test"
)

// OneSampleNormalN returns the normal-approximation number of trials for
// the test of H0: p = p0 to have power o.Power at the true proportion p1:
//
//	n = [ z_a sqrt(p0 (1-p0)) + z_b sqrt(p1 (1-p1)) ]^2 / (p1 - p0)^2,
//
// z_a = z_{1-alpha/2} (two-sided) or z_{1-alpha}, z_b = z_{power}
// (Fleiss, Levin, Paik 2003, Statistical Methods for Rates and
// Proportions, 3rd ed., section 2.5.1). It ignores the far rejection tail
// of a two-sided test, as the textbook formula does; the reported Power
// includes it. The exact test's power has a sawtooth in n: compare
// OneSampleN, which searches the exact power.
//
// Domain: 0 < p0 < 1, 0 <= p1 <= 1, p1 != p0, and for a one-sided
// alternative p1 on its side of p0 (otherwise ErrNoSolution: power cannot
// exceed alpha). o.Alpha and o.Power in (0, 1) (zero means 0.05, 0.80).
func OneSampleNormalN(p0, p1 float64, o OneSampleOptions) (NormalSize, error) {
	const fn = "power.OneSampleNormalN"
	alpha, pw, err := o.levels(fn, p0, p1)
	if err != nil {
		return NormalSize{}, err
	}
	za, zb := zAlpha(alpha, o.Alternative), zq(pw)
	d := math.Abs(p1 - p0)
	s := za*math.Sqrt(p0*(1-p0)) + zb*math.Sqrt(p1*(1-p1))
	if s <= 0 {
		return NormalSize{}, argerr.NoSolution(fn, "target power below one half with a degenerate p1: the formula gives no positive n")
	}
	real := s * s / (d * d)
	if err := checkRealN(fn, real); err != nil {
		return NormalSize{}, err
	}
	r := NormalSize{Method: "normal approximation (score variance under H0)", Real: real, Uncorrected: real, N: ceilN(real)}
	r.Power = oneSampleNormalPower(float64(r.N), p0, p1, alpha, o.Alternative)
	if r.N < 30 {
		r.Warnings = append(r.Warnings, smallSampleWarning)
	}
	return r, nil
}

// OneSampleNormalPower returns the normal-approximation power of the test
// of H0: p = p0 with n trials at the true proportion p1:
//
//	upper side: Phi( (sqrt(n) (p1 - p0) - z_a sqrt(p0 q0)) / sqrt(p1 q1) )
//
// and the mirror for the lower side; a two-sided test adds both sides.
// Domain as OneSampleNormalN, n >= 1; p1 may equal p0 (power = alpha
// approximately). For p1 in {0, 1} the power is 0 or 1 by the sign of the
// numerator.
func OneSampleNormalPower(n int64, p0, p1 float64, o OneSampleOptions) (float64, error) {
	const fn = "power.OneSampleNormalPower"
	if n < 1 {
		return 0, argerr.Invalid(fn, "n", n, "must be at least 1")
	}
	if err := argerr.OpenProb(fn, "p0", p0); err != nil {
		return 0, err
	}
	if err := argerr.Prob(fn, "p1", p1); err != nil {
		return 0, err
	}
	if err := checkAlternative(fn, o.Alternative); err != nil {
		return 0, err
	}
	alpha := orDefault(o.Alpha, DefaultAlpha)
	if err := checkLevel(fn, "Alpha", alpha); err != nil {
		return 0, err
	}
	return oneSampleNormalPower(float64(n), p0, p1, alpha, o.Alternative), nil
}

func oneSampleNormalPower(n, p0, p1, alpha float64, alt test.Alternative) float64 {
	return sidedPower(n, p1-p0, math.Sqrt(p0*(1-p0)), math.Sqrt(p1*(1-p1)), zAlpha(alpha, alt), alt)
}

// sidedPower returns the normal-approximation power of a z test with
// signed effect d per unit (positive: the test.Higher direction), null and
// alternative standard deviations s0 and s1 per unit, critical value za
// and n units:
//
//	side(e) = Phi( (sqrt(n) e - za s0) / s1 ),
//
// side(d) for test.Higher, side(-d) for test.Lower, their sum (at most 1) for
// two-sided. s1 = 0 gives 0 or 1 by the sign of the numerator.
func sidedPower(n, d, s0, s1, za float64, alt test.Alternative) float64 {
	side := func(e float64) float64 {
		num := math.Sqrt(n)*e - za*s0
		if s1 == 0 {
			if num > 0 {
				return 1
			}
			return 0
		}
		return phi(num / s1)
	}
	switch alt {
	case test.Higher:
		return side(d)
	case test.Lower:
		return side(-d)
	}
	return math.Min(1, side(d)+side(-d))
}

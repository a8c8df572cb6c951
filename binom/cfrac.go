package binom

import "math"

// betaFrac evaluates the continued fraction of the regularized incomplete
// beta function,
//
//	I_x(a, b) = x^a (1-x)^b / (a B(a, b)) * betaFrac(a, b, x),
//	betaFrac  = 1/(1 + d_1/(1 + d_2/(1 + ...))),
//	d_{2m+1}  = -(a+m)(a+b+m) x / ((a+2m)(a+2m+1)),
//	d_{2m}    = m (b-m) x / ((a+2m-1)(a+2m)),
//
// (Abramowitz and Stegun 1964, 26.5.8, recalled; DiDonato and Morris 1992,
// ACM TOMS 18:360-373) by the forward three-term recurrence of its
// convergents,
// renormalised after every pair of steps. The coefficient divisions are off
// the recurrence's critical path, so a step costs a few nanoseconds. It
// converges for x < (a+1)/(a+b+2); the number of steps grows like
// sqrt(a b/(a+b)) next to that boundary, where the callers use the uniform
// expansion instead (temme.go), and falls to a handful a few standard
// deviations away. Its rounding error grows like its value, about
// 1/(1 - rho) for the ratio rho of successive PMF terms (the leading
// denominators cancel near the mean: at N = 1e12 within a few standard
// deviations that costs 1e-11), so the callers use it only where rho is
// well below 1 and x <= 1/2; there it is good to a few ulps.
func betaFrac(a, b, x float64) float64 {
	const eps = 3e-16 // just above the rounding noise of the convergents
	apb := a + b
	// Convergents A_j/B_j with A_0 = 0, B_0 = 1, A_1 = B_1 = 1 and the
	// first step d_1 folded in: f_2 = 1/(1 + d_1).
	aPrev, bPrev := 1.0, 1.0
	d1 := -apb * x / (a + 1)
	aCur, bCur := 1.0, 1+d1
	f := aCur / bCur
	for m := 1.0; m < 1e8; m++ {
		m2 := 2 * m
		nEven := m * (b - m) * x
		nOdd := -(a + m) * (apb + m) * x
		qEven := (a + m2 - 1) * (a + m2)
		qOdd := (a + m2) * (a + m2 + 1)
		inv := 1 / (qEven * qOdd)
		dEven := nEven * qOdd * inv
		dOdd := nOdd * qEven * inv
		// Two steps of X_j = X_{j-1} + d X_{j-2}.
		a1 := aCur + dEven*aPrev
		b1 := bCur + dEven*bPrev
		a2 := a1 + dOdd*aCur
		b2 := b1 + dOdd*bCur
		s := 1 / b2
		aPrev, bPrev = a1*s, b1*s
		aCur, bCur = a2*s, 1
		fNew := aCur
		if math.Abs(fNew-f) <= eps*math.Abs(fNew) {
			return fNew
		}
		f = fNew
	}
	return f
}

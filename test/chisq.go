package test

import "math"

// logChiSquareSurvival returns ln P(X >= x) for X chi-square with df > 0
// degrees of freedom, finite where the probability underflows. It is the
// regularized upper incomplete gamma Q(df/2, x/2): below z = a + 1 by the
// power series of P and ln(1 - P); above by the continued fraction of Q
// (modified Lentz), each to about 1e-15 relative; the prefactor
// a ln z - z - ln Gamma(a) costs about 1e-16 relative to its largest term,
// so the log-value is accurate to about 1e-13 relative for df below 1000.
// Source: Press WH et al. (2007), Numerical Recipes, 3rd ed., section 6.2.
func logChiSquareSurvival(x float64, df int) float64 {
	if x <= 0 {
		return 0
	}
	if math.IsInf(x, 1) {
		return math.Inf(-1)
	}
	a, z := float64(df)/2, x/2
	lga, _ := math.Lgamma(a)
	pre := a*math.Log(z) - z - lga
	if z < a+1 {
		// P(a, z) = exp(pre) / a * sum z^n / ((a+1)...(a+n)).
		sum, term := 1.0, 1.0
		for n := 1; n < 100000; n++ {
			term *= z / (a + float64(n))
			sum += term
			if term < sum*1e-17 {
				break
			}
		}
		p := math.Exp(pre) * sum / a
		return math.Log1p(-p)
	}
	// Q(a, z) = exp(pre) / (z + 1 - a - 1 (1-a)/(z + 3 - a - 2 (2-a)/(z + 5 - a - ...))).
	const tiny = 1e-300
	b := z + 1 - a
	c := 1 / tiny
	d := 1 / b
	h := d
	for i := 1; i < 100000; i++ {
		an := -float64(i) * (float64(i) - a)
		b += 2
		d = an*d + b
		if math.Abs(d) < tiny {
			d = tiny
		}
		c = b + an/c
		if math.Abs(c) < tiny {
			c = tiny
		}
		d = 1 / d
		del := d * c
		h *= del
		if math.Abs(del-1) < 1e-16 {
			break
		}
	}
	return pre + math.Log(h)
}

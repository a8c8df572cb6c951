package interval

import "math"

// arcsine returns the variance-stabilized interval
//
//	sin^2(arcsin(sqrt(p~)) -+ z / (2 sqrt(n))),  p~ = (k + 3/8)/(n + 3/4)
//
// (Anscombe's 3/8 adjustment, as in Brown, Cai and DasGupta 2001), with the
// angle clipped to [0, pi/2] (flagged) and the end conventions L = 0 at
// k = 0, U = 1 at k = n.
func arcsine(k, n int64, z float64) (lo, hi float64, fl flags) {
	fk, fn := float64(k), float64(n)
	a := math.Asin(math.Sqrt((fk + 0.375) / (fn + 0.75)))
	h := z / (2 * math.Sqrt(fn))
	switch {
	case k == 0:
		lo = 0
	case a-h <= 0:
		lo, fl = 0, fl|clipLow
	default:
		s := math.Sin(a - h)
		lo = s * s
	}
	switch {
	case k == n:
		hi = 1
	case a+h >= math.Pi/2:
		hi, fl = 1, fl|clipHigh
	default:
		s := math.Sin(a + h)
		hi = s * s
	}
	return lo, hi, fl
}

// logit returns the Wald interval on the log-odds scale,
//
//	expit(ln(k/(n-k)) -+ z sqrt(n/(k(n-k)))),
//
// computed as expit(x) = 1/(1 + e^-x), which stays within (0, 1). At k = 0
// (k = n) the log-odds are infinite: the limits are 0 and the
// Clopper-Pearson upper limit 1 - a^(1/n) (a^(1/n) and 1), flagged.
func logit(k, n int64, lv level) (lo, hi float64, fl flags) {
	if k == 0 || k == n {
		lo, hi = exactLower(ClopperPearson, k, n, lv), exactUpper(ClopperPearson, k, n, lv)
		return lo, hi, exactEnd
	}
	fk, fnk := float64(k), float64(n-k)
	c := math.Log(fk / fnk)
	h := lv.z * math.Sqrt(1/fk+1/fnk)
	return expit(c - h), expit(c + h), 0
}

// expit returns 1/(1 + e^-x), the inverse of the log-odds.
func expit(x float64) float64 { return 1 / (1 + math.Exp(-x)) }

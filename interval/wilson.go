package interval

import "math"

// wilsonLower returns the lower limit of the Wilson (1927) score interval,
//
//	L = (2k + z^2 - z sqrt(z^2 + 4k(n-k)/n)) / (2(n + z^2)),
//
// rationalized to L = 2k(k + z^2 k/n) / ((n + z^2)(2k + z^2 + z sqrt(...)))
// so that no digits cancel when k is small and n large. L = 0 at k = 0.
func wilsonLower(k, n int64, z float64) float64 {
	if k == 0 {
		return 0
	}
	fk, fn := float64(k), float64(n)
	z2 := z * z
	r := z * math.Sqrt(z2+4*fk*((fn-fk)/fn))
	return 2 * fk * (fk + z2*fk/fn) / ((fn + z2) * (2*fk + z2 + r))
}

// wilsonUpper returns the upper Wilson limit
// U = (2k + z^2 + z sqrt(z^2 + 4k(n-k)/n)) / (2(n + z^2)), a sum of
// positive terms; U = 1 at k = n.
func wilsonUpper(k, n int64, z float64) float64 {
	if k == n {
		return 1
	}
	fk, fn := float64(k), float64(n)
	z2 := z * z
	r := z * math.Sqrt(z2+4*fk*((fn-fk)/fn))
	return math.Min(1, (2*fk+z2+r)/(2*(fn+z2)))
}

// wilsonCCLower returns the lower limit of the Wilson score interval with
// continuity correction (Newcombe 1998, single proportion, method 4):
//
//	L = (2k + z^2 - 1 - z sqrt(z^2 - 2 - 1/n + 4k(n-k+1)/n)) / (2(n + z^2)),
//
// rationalized (the numerator's conjugate product is (2k-1)^2 (1 + z^2/n))
// to L = (2k-1)^2 / (2n(2k + z^2 - 1 + z sqrt(...))). L = 0 at k = 0. For
// k >= 1 the square root's argument is at least z^2 + 2 - 1/n > 0.
func wilsonCCLower(k, n int64, z float64) float64 {
	if k == 0 {
		return 0
	}
	fk, fn := float64(k), float64(n)
	z2 := z * z
	r := z * math.Sqrt(z2-2-1/fn+4*fk*((fn-fk+1)/fn))
	return (2*fk - 1) * (2*fk - 1) / (2 * fn * (2*fk + z2 - 1 + r))
}

// wilsonCCUpper returns the upper limit with continuity correction in
// Newcombe's direct form, a sum of positive terms that keeps full accuracy
// for the small upper limits of small k (it equals 1 - wilsonCCLower(n-k):
// the interval is symmetric under k -> n-k). U = 1 at k = n.
func wilsonCCUpper(k, n int64, z float64) float64 {
	if k == n {
		return 1
	}
	fk, fn := float64(k), float64(n)
	z2 := z * z
	// U = (2k + z^2 + 1 + z sqrt(z^2 + 2 - 1/n + 4k(n-k-1)/n)) / (2(n + z^2));
	// the square root's argument is at least z^2 + 2 - 1/n - 0 for k <= n-1.
	r := z * math.Sqrt(z2+2-1/fn+4*fk*((fn-fk-1)/fn))
	return math.Min(1, (2*fk+z2+1+r)/(2*(fn+z2)))
}

// Package xmath holds elementary functions that the standard library gets
// wrong in corners kofn reaches.
package xmath

import "math"

// Log returns the natural logarithm of x, correct also for subnormal x.
//
// On amd64 the standard library's math.Log is an assembly routine that
// returns about -709.09 for every subnormal input (5e-324 included) instead
// of values down to -744.44. Log scales a subnormal argument by 2^64 first,
// which is exact, and subtracts 64 ln 2; elsewhere it is math.Log.
// Accuracy: within 2 ulp everywhere (the extra subtraction adds one
// rounding for subnormal x).
func Log(x float64) float64 {
	if x > 0 && x < 0x1p-1022 {
		return math.Log(x*0x1p64) - 64*math.Ln2
	}
	return math.Log(x)
}

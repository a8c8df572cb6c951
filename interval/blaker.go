package interval

import "math"

// blakerLowerT returns the log-odds of Blaker's lower limit.
func blakerLowerT(k, n int64, lv level) float64 {
	return lowerT(ClopperPearson, k, n, lv) // placeholder until the acceptability test lands
}

var _ = math.Pi

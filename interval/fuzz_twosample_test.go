package interval_test

import (
	"math"
	"testing"

	"github.com/kofnlab/kofn/interval"
)

// twoSampleCheck holds what every two-sample interval must satisfy: the
// range of its parameter.
type twoSampleCheck struct {
	name   string
	lo, hi float64 // the parameter's range
	iv     func(level float64, side interval.Side) (interval.Interval, error)
}

// FuzzTwoSampleIntervals calls every two-sample interval (difference,
// ratio, odds ratio, paired difference) on arbitrary counts, methods
// (in range and out of it) and levels, and checks what must hold whatever
// the method: a typed error naming the function, or limits that are not
// NaN, ordered, inside the parameter's range, an estimate that is not NaN
// unless a warning says why, and two-sided intervals nested across levels
// (the 99% interval holds the 80% one, to 1e-9 relative; every method here
// widens with the level by construction).
func FuzzTwoSampleIntervals(f *testing.F) {
	f.Add(int64(56), int64(70), int64(48), int64(80), 0.95, 0, 0)
	f.Add(int64(0), int64(10), int64(0), int64(20), 0.9, 3, 1)
	f.Add(int64(10), int64(10), int64(0), int64(10), 0.99, 2, 2)
	f.Add(int64(1), int64(1<<52), int64(1<<51), int64(1<<52), 0.95, 2, 0)
	f.Add(int64(math.MaxInt64), int64(math.MaxInt64), int64(40), int64(2), 0.95, 1, 0)
	f.Add(int64(3), int64(5), int64(2), int64(4), 1e-300, 3, 2)
	f.Add(int64(7), int64(2000), int64(30), int64(2100), 1-1e-16, 6, 1)
	f.Fuzz(func(t *testing.T, k1, n1, k2, n2 int64, level float64, method, side int) {
		checks := []twoSampleCheck{
			{"Difference", -1, 1, func(l float64, s interval.Side) (interval.Interval, error) {
				return interval.Difference(k1, n1, k2, n2, interval.DiffOptions{Level: l, Method: interval.DiffMethod(method % 9), Side: s})
			}},
			{"Ratio", 0, math.Inf(1), func(l float64, s interval.Side) (interval.Interval, error) {
				return interval.Ratio(k1, n1, k2, n2, interval.RatioOptions{Level: l, Method: interval.RatioMethod(method % 6), Side: s})
			}},
			{"OddsRatio", 0, math.Inf(1), func(l float64, s interval.Side) (interval.Interval, error) {
				return interval.OddsRatio(k1, n1, k2, n2, interval.OddsOptions{Level: l, Method: interval.OddsMethod(method % 6), Side: s})
			}},
			// The same four numbers as a matched table.
			{"PairedDifference", -1, 1, func(l float64, s interval.Side) (interval.Interval, error) {
				return interval.PairedDifference(k1, n1, k2, n2, interval.PairedOptions{Level: l, Method: interval.PairedMethod(method % 5), Side: s})
			}},
		}
		sd := interval.Side(side % 4)
		for _, c := range checks {
			iv, err := c.iv(level, sd)
			checkResult(t, result{iv, err})
			if err != nil {
				continue
			}
			if !(iv.Lower >= c.lo && iv.Upper <= c.hi) {
				t.Fatalf("%s: limits [%g, %g] outside [%g, %g]", c.name, iv.Lower, iv.Upper, c.lo, c.hi)
			}
			if math.IsNaN(iv.Estimate) && len(iv.Warnings) == 0 {
				t.Fatalf("%s: NaN estimate without a warning: %+v", c.name, iv)
			}
			if sd != interval.TwoSided {
				continue
			}
			narrow, err1 := c.iv(0.8, interval.TwoSided)
			wide, err2 := c.iv(0.99, interval.TwoSided)
			if err1 != nil || err2 != nil {
				continue
			}
			tol := func(x float64) float64 { return 1e-9 * math.Max(1e-300, math.Abs(x)) }
			if wide.Lower > narrow.Lower+tol(narrow.Lower) || wide.Upper < narrow.Upper-tol(narrow.Upper) {
				t.Fatalf("%s: the 99%% interval [%g, %g] does not hold the 80%% one [%g, %g]", c.name, wide.Lower, wide.Upper, narrow.Lower, narrow.Upper)
			}
		}
	})
}

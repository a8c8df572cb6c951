package test

import (
	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
)

// checkTwo validates the counts of two independent samples for function
// fn: 0 <= k1 <= n1, 0 <= k2 <= n2, n1 + n2 <= 2^53.
func checkTwo(fn string, k1, n1, k2, n2 int64) error {
	if err := argerr.KN(fn, "k1", "n1", k1, n1); err != nil {
		return err
	}
	if err := argerr.KN(fn, "k2", "n2", k2, n2); err != nil {
		return err
	}
	if n1 > binom.MaxN-n2 {
		return argerr.TooLarge(fn, "n1", n1, "plus n2 exceeds 2^53, the largest count held exactly in float64")
	}
	return nil
}

// diffEstimate returns p1 - p2 (NaN for an empty sample).
func diffEstimate(k1, n1, k2, n2 int64) float64 {
	return float64(k1)/float64(n1) - float64(k2)/float64(n2)
}

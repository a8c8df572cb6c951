package test

import (
	"math"
	"testing"

	"github.com/kofnlab/kofn/interval"
)

// TestIntervalPackageAgrees: the intervals attached to the one-sample
// tests (found here by inverting the tests) agree with package interval,
// which computes them on its own (closed forms, incomplete beta roots,
// its own Blaker search), two-sided and one-sided.
func TestIntervalPackageAgrees(t *testing.T) {
	t.Parallel()
	pairs := []struct {
		m  BinomialOptions
		im interval.Method
	}{
		{optCentral, interval.ClopperPearson},
		{optCentralMidP, interval.MidP},
		{optBlaker, interval.Blaker},
		{optScore, interval.Wilson},
		{optScoreCC, interval.WilsonCC},
		{optLR, interval.LikelihoodRatio},
	}
	sides := []struct {
		a Alternative
		s interval.Side
	}{{TwoSided, interval.TwoSided}, {Lower, interval.UpperBound}, {Higher, interval.LowerBound}}
	for _, p := range pairs {
		for _, sd := range sides {
			if p.m == optBlaker && sd.a != TwoSided {
				continue // one-sided Blaker is the one-sided exact test
			}
			for _, n := range []int64{1, 3, 10, 27, 100, 263, 1000} {
				for k := int64(0); k <= n; k += 1 + n/7 {
					r, err := Binomial(k, n, 0.5, with(p.m, sd.a))
					if err != nil {
						t.Fatal(err)
					}
					iv, err := interval.Proportion(k, n, interval.Options{Method: p.im, Side: sd.s})
					if err != nil {
						t.Fatal(err)
					}
					if math.Abs(r.Interval.Lower-iv.Lower) > 1e-9 || math.Abs(r.Interval.Upper-iv.Upper) > 1e-9 {
						t.Errorf("%v %v %d/%d: test [%v, %v], interval [%v, %v]", p.m, sd.a, k, n, r.Interval.Lower, r.Interval.Upper, iv.Lower, iv.Upper)
					}
				}
			}
		}
	}
}

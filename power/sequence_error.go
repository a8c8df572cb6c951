package power

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

// MaxDifferenceHorizon bounds the horizon of DifferenceSequenceErrorProb.
const MaxDifferenceHorizon = 5000

// DifferenceSequenceErrorProb returns the exact probability that the
// two-sample confidence sequence s ever excludes the true difference p1 -
// p2 within horizon observations per group, when both groups are
// observed one item at a time in parallel (a look after every pair):
//
//	P(exists n <= horizon : p1 - p2 not in s.Limits(k1, n, k2, n)).
//
// For ProductSequence it is at most s.Alpha for every horizon (the
// method is exact); for NormalMixtureSequence it shows how far the
// asymptotic guarantee is from holding at these proportions and sizes.
//
// Method: dynamic programming over (k1, k2); after n pairs the recursion
// keeps the states within 10 standard deviations plus 10 of each group's
// binomial mean, which holds all but a probability below 1e-20 per step
// (the mass outside is dropped and cannot make the answer larger by more
// than horizon x 1e-20). Cost O(horizon^2 p1 q1^(1/2) p2 q2^(1/2)) states
// plus, for the product method, two one-proportion limits per count and
// step: horizon 300 at p1 = p2 = 1/2 takes about 2 s (product) and 0.5 s
// (normal). horizon is limited to MaxDifferenceHorizon; ctx is checked
// every step.
//
// Domain: s from test.NewDifferenceSequence, p1 and p2 in (0, 1), horizon
// >= 1.
func DifferenceSequenceErrorProb(ctx context.Context, s test.DifferenceSequence, p1, p2 float64, horizon int64) (float64, error) {
	const fn = "power.DifferenceSequenceErrorProb"
	if !(s.Alpha > 0 && s.Alpha < 1) {
		return 0, argerr.Invalid(fn, "s", "DifferenceSequence{}", "is not built; use test.NewDifferenceSequence")
	}
	if err := argerr.OpenProb(fn, "p1", p1); err != nil {
		return 0, err
	}
	if err := argerr.OpenProb(fn, "p2", p2); err != nil {
		return 0, err
	}
	if horizon < 1 {
		return 0, argerr.Invalid(fn, "horizon", horizon, "must be at least 1")
	}
	if horizon > MaxDifferenceHorizon {
		return 0, argerr.TooLarge(fn, "horizon", horizon, "exceeds MaxDifferenceHorizon = 5000")
	}
	delta := p1 - p2
	box := func(n int64, p float64) (int64, int64) {
		sd := math.Sqrt(float64(n) * p * (1 - p))
		lo := int64(math.Floor(float64(n)*p - 10*sd - 10))
		hi := int64(math.Ceil(float64(n)*p + 10*sd + 10))
		return max(lo, 0), min(hi, n)
	}
	// cur[i*w2 + j]: mass at k1 = lo1 + i, k2 = lo2 + j among paths never out
	lo1, hi1, lo2, hi2 := int64(0), int64(0), int64(0), int64(0)
	cur := []float64{1}
	miss := 0.0
	var l1, u1, l2, u2 []float64 // per-group limits of the product method
	for n := int64(1); n <= horizon; n++ {
		if err := argerr.Canceled(fn, ctx); err != nil {
			return 0, err
		}
		nlo1, nhi1 := box(n, p1)
		nlo2, nhi2 := box(n, p2)
		w1, w2 := nhi1-nlo1+1, nhi2-nlo2+1
		ow2 := hi2 - lo2 + 1
		nxt := make([]float64, w1*w2)
		for i := lo1; i <= hi1; i++ {
			for j := lo2; j <= hi2; j++ {
				v := cur[(i-lo1)*ow2+(j-lo2)]
				if v == 0 {
					continue
				}
				for _, d1 := range [2]int64{0, 1} {
					q1 := 1 - p1
					if d1 == 1 {
						q1 = p1
					}
					a := i + d1
					if a < nlo1 || a > nhi1 {
						continue
					}
					for _, d2 := range [2]int64{0, 1} {
						q2 := 1 - p2
						if d2 == 1 {
							q2 = p2
						}
						b := j + d2
						if b < nlo2 || b > nhi2 {
							continue
						}
						nxt[(a-nlo1)*w2+(b-nlo2)] += v * q1 * q2
					}
				}
			}
		}
		if s.Method == test.ProductSequence {
			l1, u1 = groupLimits(l1[:0], u1[:0], nlo1, nhi1, n, s)
			l2, u2 = groupLimits(l2[:0], u2[:0], nlo2, nhi2, n, s)
		}
		for a := nlo1; a <= nhi1; a++ {
			for b := nlo2; b <= nhi2; b++ {
				idx := (a-nlo1)*w2 + (b - nlo2)
				v := nxt[idx]
				if v == 0 {
					continue
				}
				var lo, hi float64
				if s.Method == test.ProductSequence {
					lo, hi = l1[a-nlo1]-u2[b-nlo2], u1[a-nlo1]-l2[b-nlo2]
				} else {
					lo, hi = s.Limits(a, n, b, n)
				}
				if !(delta >= lo && delta <= hi) {
					miss += v
					nxt[idx] = 0
				}
			}
		}
		cur = nxt
		lo1, hi1, lo2, hi2 = nlo1, nhi1, nlo2, nhi2
	}
	return miss, nil
}

// groupLimits appends the one-group limits of the product method for k in
// [lo, hi] at n.
func groupLimits(l, u []float64, lo, hi, n int64, s test.DifferenceSequence) ([]float64, []float64) {
	for k := lo; k <= hi; k++ {
		iv := interval.SequenceInterval(k, n, 1-s.Alpha/2, s.Mix)
		l, u = append(l, iv.Lower), append(u, iv.Upper)
	}
	return l, u
}

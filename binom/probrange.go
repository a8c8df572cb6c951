package binom

import (
	"math"

	"github.com/kofnlab/kofn/internal/xmath"
)

// rangeSumMax is the most PMF terms LogProbRange sums directly; wider
// ranges are differences of tails (see LogProbRange).
const rangeSumMax = 1 << 16

// rangeCancel is the largest ratio of the subtracted tails to the result
// that LogProbRange accepts from a difference of tails: it costs at most a
// factor 8 on their 1e-15 relative error.
const rangeCancel = 8

// LogProbRange returns ln P(lo <= X <= hi); -Inf when the range is empty
// (lo > hi) or outside the support, 0 when it covers 0..N.
//
// Of the three exact forms
//
//	P(X <= hi) - P(X <= lo-1),  P(X > lo-1) - P(X > hi),
//	1 - P(X <= lo-1) - P(X > hi),
//
// it takes the one whose subtracted terms are smallest against the result;
// if even that one would cancel more than a factor 8 (a narrow range in the
// bulk, where every form subtracts nearly equal tails), it sums the PMF
// terms of the range instead, from the one nearest the mode outward by the
// ratio b(j+1)/b(j) = (N-j) P / ((j+1)(1-P)), re-anchored at an exact
// LogProb every 128 terms so that the rounding of the ratio cannot build
// up, and stopped where the terms no longer count.
//
// Accuracy: within 1e-14 relative to max(1, |ln P|) wherever the range has
// at most 65536 terms or cancels less than a factor 8 (which covers every
// range for N up to 1e12; beyond, the error of a range a little wider than
// 65536 terms in the bulk grows like 1e-16 sqrt(N P (1-P)) / 65536).
// Cost: two tail evaluations, plus up to 65536 terms (a few nanoseconds
// each) for narrow ranges in the bulk of a wide distribution.
func (d Dist) LogProbRange(lo, hi int64) float64 {
	if !d.valid() {
		return math.NaN()
	}
	lo = max(lo, 0)
	hi = min(hi, d.N)
	switch {
	case lo > hi:
		return math.Inf(-1)
	case lo == 0 && hi == d.N:
		return 0
	case lo == 0:
		return d.LogCDF(hi)
	case hi == d.N:
		return d.LogSurvival(lo - 1)
	case lo == hi:
		return d.LogProb(lo)
	case d.P == 0 || d.P == 1:
		return d.LogProb(lo) // the mass sits at 0 or N, neither inside
	}
	// Both ends inside: lower and upper tails at lo-1 and at hi.
	tl, sl := d.bothTails(lo - 1) // P(X <= lo-1), P(X > lo-1)
	th, sh := d.bothTails(hi)     // P(X <= hi), P(X > hi)
	// Candidate results, each with the log of what it subtracts from.
	best, bestCancel := math.Inf(-1), math.Inf(1)
	try := func(r, from float64) {
		if c := from - r; r > math.Inf(-1) && c < bestCancel {
			best, bestCancel = r, c
		}
	}
	try(xmath.LogDiffExp(th, tl), th)
	try(xmath.LogDiffExp(sl, sh), sl)
	try(xmath.Log1mExp(math.Min(xmath.LogAddExp(tl, sh), 0)), 0)
	if bestCancel <= math.Log(rangeCancel) || hi-lo+1 > rangeSumMax {
		return best
	}
	return d.logSumTerms(lo, hi)
}

// bothTails returns ln P(X <= k) and ln P(X > k) for 0 <= k < N and
// 0 < P < 1, the smaller computed directly and the larger as its
// complement.
func (d Dist) bothTails(k int64) (lower, upper float64) {
	t := d.smallTail(k)
	return t.logLower(), t.logUpper()
}

// logSumTerms returns ln sum_{j=lo..hi} b(j) for 0 <= lo < hi <= N and
// 0 < P < 1 by the ratio recurrence from the term nearest the mode.
func (d Dist) logSumTerms(lo, hi int64) float64 {
	start := min(max(d.Mode(), lo), hi)
	l0 := d.LogProb(start)
	n := float64(d.N)
	c := d.P / (1 - d.P)
	ic := (1 - d.P) / d.P
	const block = 128
	sum := 1.0 // in units of b(start)
	// Upward: b(j+1) = b(j) (N-j) c / (j+1).
	t := 1.0
	for j := start; j < hi; j++ {
		if (j+1-start)%block == 0 {
			t = math.Exp(d.LogProb(j+1) - l0)
		} else {
			fj := float64(j)
			t *= (n - fj) * c / (fj + 1)
		}
		s1 := sum + t
		if s1 == sum {
			break
		}
		sum = s1
	}
	// Downward: b(j-1) = b(j) j ic / (N-j+1).
	t = 1.0
	for j := start; j > lo; j-- {
		if (start-j+1)%block == 0 {
			t = math.Exp(d.LogProb(j-1) - l0)
		} else {
			fj := float64(j)
			t *= fj * ic / (n - fj + 1)
		}
		s1 := sum + t
		if s1 == sum {
			break
		}
		sum = s1
	}
	return l0 + math.Log(sum)
}

// ProbRange returns P(lo <= X <= hi) = exp(LogProbRange(lo, hi)), with the
// accuracy and cost of LogProbRange.
func (d Dist) ProbRange(lo, hi int64) float64 { return math.Exp(d.LogProbRange(lo, hi)) }

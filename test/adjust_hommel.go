package test

import (
	"context"
	"math"
	"slices"

	"github.com/kofnlab/kofn/internal/argerr"
)

// sortOrder returns the permutation that sorts p (values in [0, 1]) in
// ascending order, ties in input order. Non-negative float64 values order
// as their bit patterns, so a least-significant-digit radix sort on the
// 64-bit keys (16-bit digits, digits shared by every key skipped) sorts in
// O(m); short inputs use a comparison sort.
func sortOrder(ctx context.Context, fn string, p []float64) ([]int32, error) {
	m := len(p)
	if m > math.MaxInt32 {
		return nil, argerr.TooLarge(fn, "len(p)", m, "exceeds 2^31 - 1 p-values")
	}
	order := make([]int32, m)
	for i := range order {
		order[i] = int32(i)
	}
	if m < 1<<12 {
		slices.SortStableFunc(order, func(a, b int32) int {
			switch {
			case p[a] < p[b]:
				return -1
			case p[a] > p[b]:
				return 1
			}
			return 0
		})
		return order, nil
	}
	keys := make([]uint64, m)
	var and, or uint64 = math.MaxUint64, 0
	for i, v := range p {
		k := math.Float64bits(v + 0) // +0 turns -0 into +0
		keys[i] = k
		and &= k
		or |= k
	}
	tmpO := make([]int32, m)
	tmpK := make([]uint64, m)
	var count [1 << 16]int
	for shift := uint(0); shift < 64; shift += 16 {
		if (and>>shift)&0xffff == (or>>shift)&0xffff {
			continue // every key has this digit
		}
		clear(count[:])
		for _, k := range keys {
			count[(k>>shift)&0xffff]++
		}
		sum := 0
		for d, c := range count {
			count[d] = sum
			sum += c
		}
		for j, k := range keys {
			if j%checkEvery == 0 {
				if err := argerr.Canceled(fn, ctx); err != nil {
					return nil, err
				}
			}
			d := (k >> shift) & 0xffff
			tmpK[count[d]] = k
			tmpO[count[d]] = order[j]
			count[d]++
		}
		keys, tmpK = tmpK, keys
		order, tmpO = tmpO, order
	}
	return order, nil
}

// hommelSorted writes into a the Hommel adjusted p-values of the ascending
// p-values s.
//
// Hommel's procedure is the closed test of Simes's local tests, so the
// adjusted p-value of the hypothesis with the i-th smallest p-value
// (1-based) is the largest Simes p-value of a subset containing it. Simes's
// p-value increases with each member, so for subsets of size r the largest
// is that of the r largest p-values J_r when i is among them (r >= m-i+1),
// and that of {i} with the r-1 largest otherwise. With q_t = p(m-t) the
// p-values from the largest down (t = 0..m-1),
//
//	S_r = min_{t <= r-1} q_t r/(r-t)   (Simes's p-value of J_r)
//	A_r = min_{t <= r-2} q_t r/(r-t)   (A_1 = +Inf)
//	adjusted p(i) = max( max_{r >= m-i+1} S_r, max_{r <= m-i} min(r p(i), A_r) ).
//
// The minima over t are minima of q_t/(1 - t u) at u = 1/r, that is the
// reciprocal of the upper envelope of the lines (1 - t u)/q_t, built as t
// grows (slopes decreasing) and queried by bisection: O(m log m) for all r.
// In the second maximum, r contributes A_r to the i with r p(i) >= A_r and
// r p(i) to the others: a range maximum swept with a heap and a suffix
// maximum. The chosen minimum is re-evaluated from q_t directly, so the
// envelope's arithmetic only selects and does not round the result.
func hommelSorted(ctx context.Context, fn string, s, a []float64) error {
	m := len(s)
	q := func(t int) float64 { return s[m-1-t] }
	S := make([]float64, m+1) // 1-based by r
	A := make([]float64, m+1)
	env := envelope{q: q}
	for r := 1; r <= m; r++ {
		if r%checkEvery == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return err
			}
		}
		if r == 1 {
			A[r] = math.Inf(1)
		} else {
			A[r] = env.min(r)
		}
		env.add(r - 1)
		S[r] = env.min(r)
	}
	// sufS[r] = max_{r' >= r} S_r'.
	sufS := make([]float64, m+2)
	for r := m; r >= 1; r-- {
		sufS[r] = math.Max(sufS[r+1], S[r])
	}
	// For r >= 2: istar[r] is the first 1-based i with r p(i) >= A_r (m+1 if none).
	// best[c] = max r with min(m-r, istar[r]-1) = c. The saturated ranges
	// [istar[r], m-r] are grouped by their start (a counting sort).
	best := make([]int32, m+1)
	istar := make([]int32, m+1)
	first := make([]int32, m+2) // first[i]..first[i+1]-1 index byStart for ranges starting at i
	for r := 1; r <= m; r++ {
		is := m + 1
		if r >= 2 {
			// The first j with r s[j] >= A_r, by bisection (s ascends).
			lo, hi, fr := 0, m, float64(r)
			for lo < hi {
				mid := int(uint(lo+hi) >> 1)
				if fr*s[mid] >= A[r] {
					hi = mid
				} else {
					lo = mid + 1
				}
			}
			is = lo + 1
		}
		istar[r] = int32(is)
		if c := min(m-r, is-1); c >= 1 {
			best[c] = max(best[c], int32(r))
		}
		if is <= m-r {
			first[is+1]++
		}
	}
	for i := 1; i <= m+1; i++ {
		first[i] += first[i-1]
	}
	byStart := make([]int32, first[m+1])
	fill := slices.Clone(first)
	for r := 2; r <= m; r++ {
		if is := int(istar[r]); is <= m-r {
			byStart[fill[is]] = int32(r)
			fill[is]++
		}
	}
	var bestR int32
	sufBest := make([]int32, m+2)
	for c := m; c >= 1; c-- {
		bestR = max(bestR, best[c])
		sufBest[c] = bestR
	}
	var ranges rangeHeap
	for i := 1; i <= m; i++ {
		if i%checkEvery == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return err
			}
		}
		for _, r := range byStart[first[i]:first[i+1]] {
			ranges.push(rangeItem{v: A[r], end: m - int(r)})
		}
		for len(ranges) > 0 && ranges[0].end < i {
			ranges.pop()
		}
		v := sufS[m-i+1]
		if len(ranges) > 0 {
			v = math.Max(v, ranges[0].v)
		}
		if r := sufBest[i]; r > 0 {
			v = math.Max(v, float64(r)*s[i-1])
		}
		a[i-1] = math.Min(1, v)
	}
	return nil
}

// envelope is the upper envelope of the lines L_t(u) = (1 - t u)/q_t for
// the t added so far with q_t > 0; min(r) returns min_t q_t r/(r-t).
type envelope struct {
	q     func(int) float64
	lines []int     // t of the lines on the hull, oldest first
	cross []float64 // cross[j] = u where lines[j-1] and lines[j] meet (cross[0] unused)
	zero  bool      // some added q_t is 0, so the minimum is 0
	at    int       // the hull index of the last query's optimum
}

// meet returns the u at which the lines of t1 < t2 are equal:
// (1 - t1 u)/q1 = (1 - t2 u)/q2, so u = (q1 - q2)/(q1 t2 - q2 t1).
func (e *envelope) meet(t1, t2 int) float64 {
	q1, q2 := e.q(t1), e.q(t2)
	return (q1 - q2) / (q1*float64(t2) - q2*float64(t1))
}

func (e *envelope) add(t int) {
	if e.q(t) == 0 {
		e.zero = true
		return
	}
	for len(e.lines) >= 2 {
		n := len(e.lines)
		if e.meet(e.lines[n-1], t) >= e.cross[n-1] {
			e.lines, e.cross = e.lines[:n-1], e.cross[:n-1]
			continue
		}
		break
	}
	x := 0.0
	if n := len(e.lines); n > 0 {
		x = e.meet(e.lines[n-1], t)
	}
	e.lines = append(e.lines, t)
	e.cross = append(e.cross, x)
}

func (e *envelope) min(r int) float64 {
	if e.zero {
		return 0
	}
	n := len(e.lines)
	if n == 0 {
		return math.Inf(1)
	}
	u := 1 / float64(r)
	// The optimal line is lines[J] with J the number of crossings above u
	// (cross decreases along the hull). The queries' u decrease, so J
	// moves forward, except after lines were dropped from the end.
	J := min(e.at, n-1)
	for J > 0 && e.cross[J] <= u {
		J--
	}
	for J+1 < n && e.cross[J+1] > u {
		J++
	}
	e.at = J
	best := math.Inf(1)
	for j := max(0, J-1); j <= min(n-1, J+1); j++ {
		t := e.lines[j]
		best = math.Min(best, e.q(t)*float64(r)/float64(r-t))
	}
	return best
}

type rangeItem struct {
	v   float64
	end int
}

// rangeHeap is a max-heap of values with the last index they apply to.
type rangeHeap []rangeItem

func (h *rangeHeap) push(x rangeItem) {
	*h = append(*h, x)
	a := *h
	for i := len(a) - 1; i > 0; {
		p := (i - 1) / 2
		if a[p].v >= a[i].v {
			break
		}
		a[p], a[i] = a[i], a[p]
		i = p
	}
}

func (h *rangeHeap) pop() {
	a := *h
	n := len(a) - 1
	a[0] = a[n]
	a = a[:n]
	for i := 0; ; {
		l, r, big := 2*i+1, 2*i+2, i
		if l < n && a[l].v > a[big].v {
			big = l
		}
		if r < n && a[r].v > a[big].v {
			big = r
		}
		if big == i {
			break
		}
		a[i], a[big] = a[big], a[i]
		i = big
	}
	*h = a
}

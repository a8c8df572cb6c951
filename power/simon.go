package power

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/internal/stagewise"
	"github.com/kofnlab/kofn/interval"
)

// Look is one planned analysis of a multi-stage one-proportion study; it
// is interval.Look (see there), shared with test.StageWise.
type Look = interval.Look

// TwoStage is a Simon two-stage design for a single-arm study: treat N1
// subjects and stop (not rejecting H0) when at most R1 respond; otherwise
// treat N - N1 more and reject H0 when more than R respond among all N.
type TwoStage struct {
	R1 int64 `json:"r1"` // stage-one stopping count: stop when responses <= R1
	N1 int64 `json:"n1"` // stage-one size
	R  int64 `json:"r"`  // final count: reject H0 when total responses > R
	N  int64 `json:"n"`  // total size of both stages
}

func (d TwoStage) check(fn string) error {
	if d.N1 < 1 {
		return argerr.Invalid(fn, "N1", d.N1, "must be at least 1")
	}
	if d.N <= d.N1 {
		return argerr.Invalid(fn, "N", d.N, "must exceed N1 = "+argerr.Format(d.N1))
	}
	if d.N > stagewise.MaxN {
		return argerr.TooLarge(fn, "N", d.N, "exceeds the limit of "+argerr.Format(stagewise.MaxN))
	}
	if d.R1 < 0 || d.R1 >= d.N1 {
		return argerr.Invalid(fn, "R1", d.R1, "must lie in [0, N1-1]")
	}
	if d.R < d.R1 || d.R >= d.N {
		return argerr.Invalid(fn, "R", d.R, "must lie in [R1, N-1]")
	}
	return nil
}

// Looks returns the design as two looks: futility stop at look 1 for
// counts <= R1, no efficacy stop there; at look 2 reject for counts > R.
func (d TwoStage) Looks() []Look {
	return []Look{{N: d.N1, Futility: d.R1, Efficacy: d.N1 + 1}, {N: d.N, Futility: d.R, Efficacy: d.R + 1}}
}

// TwoStageEval is the operating characteristic of a two-stage design at
// one response probability.
type TwoStageEval struct {
	P float64 `json:"p"` // response probability evaluated
	// EarlyStop is the probability of early termination after stage one,
	// P(X1 <= R1).
	EarlyStop float64 `json:"early_stop"`
	// ExpectedN is the expected number of subjects, N1 + (1 - EarlyStop)(N - N1).
	ExpectedN float64 `json:"expected_n"`
	// Reject is the probability of rejecting H0 (declaring the treatment
	// worth further study): P(X1 > R1, X1 + X2 > R).
	Reject float64 `json:"reject"`
}

// MarshalJSON encodes the evaluation with non-finite floats as strings.
func (e TwoStageEval) MarshalJSON() ([]byte, error) {
	type plain TwoStageEval
	return jsonfloat.Marshal(plain(e))
}

// UnmarshalJSON decodes what MarshalJSON encodes.
func (e *TwoStageEval) UnmarshalJSON(b []byte) error {
	type plain TwoStageEval
	return jsonfloat.Unmarshal(b, (*plain)(e))
}

// EvaluateTwoStage returns the early-stopping probability, the expected
// size and the rejection probability of design d at response
// probability p:
//
//	PET = P(X1 <= r1),  EN = n1 + (1 - PET)(n - n1),
//	P(reject) = sum_{x1 = r1+1}^{n1} b(x1; n1, p) P(X2 > r - x1),  X2 ~ Binomial(n - n1, p)
//
// (Simon R (1989), Optimal two-stage designs for phase II clinical trials,
// Controlled Clinical Trials 10:1-10). Exact sums of binom's log-space
// densities, within about 1e-13 relative; cost O(n1 (n - n1)).
func EvaluateTwoStage(d TwoStage, p float64) (TwoStageEval, error) {
	const fn = "power.EvaluateTwoStage"
	if err := d.check(fn); err != nil {
		return TwoStageEval{}, err
	}
	if err := argerr.Prob(fn, "p", p); err != nil {
		return TwoStageEval{}, err
	}
	dist, err := stagewise.New(context.Background(), d.Looks(), p)
	if err != nil {
		return TwoStageEval{}, err
	}
	return TwoStageEval{P: p, EarlyStop: dist.Low[0], ExpectedN: dist.ExpectedN(), Reject: dist.Reject()}, nil
}

// SimonDesign is one two-stage design found by Simon, with its operating
// characteristics under H0 and H1.
type SimonDesign struct {
	TwoStage `json:"design"`
	// Alpha is the attained size: the rejection probability at p0.
	Alpha float64 `json:"alpha"`
	// Power is the attained power: the rejection probability at p1.
	Power float64 `json:"power"`
	// EarlyStop0 and ExpectedN0 are the probability of early termination
	// and the expected size under p0; EarlyStop1 and ExpectedN1 under p1.
	EarlyStop0 float64 `json:"early_stop0"`
	ExpectedN0 float64 `json:"expected_n0"`
	EarlyStop1 float64 `json:"early_stop1"`
	ExpectedN1 float64 `json:"expected_n1"`
	// WeightLow and WeightHigh bound the weights q in [0, 1] for which the
	// design minimizes the expected loss q N + (1 - q) ExpectedN0 among
	// all designs (Jung, Lee, Kim and George 2004); the minimax design
	// has WeightHigh = 1 and the optimal design WeightLow = 0.
	WeightLow  float64 `json:"weight_low"`
	WeightHigh float64 `json:"weight_high"`
}

// MarshalJSON encodes the design with non-finite floats as strings.
func (d SimonDesign) MarshalJSON() ([]byte, error) {
	type plain SimonDesign
	return jsonfloat.Marshal(plain(d))
}

// UnmarshalJSON decodes what MarshalJSON encodes.
func (d *SimonDesign) UnmarshalJSON(b []byte) error {
	type plain SimonDesign
	return jsonfloat.Unmarshal(b, (*plain)(d))
}

// SimonResult holds the designs Simon found.
type SimonResult struct {
	P0    float64 `json:"p0"`    // response probability under H0
	P1    float64 `json:"p1"`    // response probability under H1
	Alpha float64 `json:"alpha"` // requested size
	Beta  float64 `json:"beta"`  // requested type II error (power 1 - Beta)
	// Optimal minimizes ExpectedN0; Minimax minimizes N (ties by
	// ExpectedN0).
	Optimal SimonDesign `json:"optimal"`
	Minimax SimonDesign `json:"minimax"`
	// Admissible lists the admissible designs from the minimax (first) to
	// the optimal (last): those minimizing q N + (1 - q) ExpectedN0 for
	// some q in [0, 1].
	Admissible []SimonDesign `json:"admissible"`
	// SearchedN is the largest total size the search examined; every
	// design with N <= SearchedN was considered (or excluded by a proven
	// bound).
	SearchedN int64 `json:"searched_n"`
	// Warnings lists caveats that do not stop the answer.
	Warnings []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the result with non-finite floats as strings.
func (r SimonResult) MarshalJSON() ([]byte, error) {
	type plain SimonResult
	return jsonfloat.Marshal(plain(r))
}

// UnmarshalJSON decodes what MarshalJSON encodes.
func (r *SimonResult) UnmarshalJSON(b []byte) error {
	type plain SimonResult
	return jsonfloat.Unmarshal(b, (*plain)(r))
}

// SimonOptions holds the knobs of Simon; the zero value means defaults.
type SimonOptions struct {
	// MaxN bounds the total size searched; 0 means DefaultSimonMaxN, and
	// at most MaxSimonN is accepted.
	MaxN int64
}

// DefaultSimonMaxN is the default bound on the total size that Simon
// searches, and MaxSimonN the largest bound accepted (memory grows as
// 32 MaxN^2 bytes: 8 MB at 500, 32 MB at 1000).
const (
	DefaultSimonMaxN int64 = 500
	MaxSimonN        int64 = 1000
)

// simonTol is the relative tolerance of the size and power constraints in
// the search (the tables carry about n ulps of rounding); the reported
// Alpha and Power are recomputed exactly.
const simonTol = 1e-12

// Simon finds Simon's optimal and minimax two-stage designs, and the
// admissible designs between them, for testing H0: p <= p0 against H1:
// p >= p1 with size at most alpha and power at least 1 - beta (Simon R
// (1989), Optimal two-stage designs for phase II clinical trials,
// Controlled Clinical Trials 10:1-10; Jung SH, Lee T, Kim K, George SL
// (2004), Admissible two-stage designs for phase II cancer clinical
// trials, Statistics in Medicine 23:561-569). A design (r1/n1, r/n)
// stops after n1 subjects when at most r1 respond and rejects H0 when more
// than r of all n respond.
//
// The search is exact and exhaustive over 1 <= n1 < n <= MaxN, 0 <= r1 <
// n1, r1 <= r < n, with pruning that never drops a candidate:
//   - n starts at the smallest size whose most powerful (randomized)
//     single-stage test reaches the power, since no two-stage design with
//     that maximum size can beat it (Neyman-Pearson lemma);
//   - r1 is at most the largest count with P_p1(X1 > r1) >= 1 - beta,
//     since the power cannot exceed the probability of going on;
//   - for each (n, n1, r1) the expected size under p0 does not depend on
//     r, and candidates whose expected size is not below the best already
//     found at a smaller n are dominated and skipped;
//   - r is the smallest count meeting the size (the size and power both
//     fall as r grows), found by a short walk up from the count of the
//     same (n1, r1) at the previous n (the size at a fixed r only grows
//     with n) or by bisection;
//   - the search ends at the n beyond which n1 + q(n1)(n - n1) exceeds
//     the best expected size for every n1, where q(n1) is the smallest
//     continuation probability under p0 that the power allows.
//
// Constraints are checked on tables of binomial probabilities built by
// the Pascal recurrence with a relative tolerance of 1e-12; the reported
// Alpha, Power, early-stopping probabilities and expected sizes are then
// recomputed from binom's densities. Cost: growing roughly as n^3 in the
// final size n (BenchmarkSimon; the figures are in the README's speed
// table); memory 32 MaxN^2 bytes; ctx is
// checked for every n. Errors: p0, p1 not in (0, 1) with p0 < p1; alpha, beta not in (0,
// 1) with alpha + beta < 1; MaxN above MaxSimonN (ErrTooLarge); no design
// with n <= MaxN (ErrNoSolution). When the bound on n that proves
// optimality exceeds MaxN, a warning says the optimal design is the best
// with n <= MaxN.
func Simon(ctx context.Context, p0, p1, alpha, beta float64, opt SimonOptions) (SimonResult, error) {
	const fn = "power.Simon"
	if err := argerr.OpenProb(fn, "p0", p0); err != nil {
		return SimonResult{}, err
	}
	if err := argerr.OpenProb(fn, "p1", p1); err != nil {
		return SimonResult{}, err
	}
	if p1 <= p0 {
		return SimonResult{}, argerr.Invalid(fn, "p1", p1, "must exceed p0 = "+argerr.Format(p0))
	}
	if err := argerr.OpenProb(fn, "alpha", alpha); err != nil {
		return SimonResult{}, err
	}
	if err := argerr.OpenProb(fn, "beta", beta); err != nil {
		return SimonResult{}, err
	}
	if alpha+beta >= 1 {
		return SimonResult{}, argerr.Invalid(fn, "beta", beta, "plus alpha must be below 1 (otherwise no data are needed)")
	}
	maxN := opt.MaxN
	if maxN == 0 {
		maxN = DefaultSimonMaxN
	}
	if maxN < 2 {
		return SimonResult{}, argerr.Invalid(fn, "MaxN", maxN, "must be at least 2")
	}
	if maxN > MaxSimonN {
		return SimonResult{}, argerr.TooLarge(fn, "MaxN", maxN, "exceeds MaxSimonN = "+argerr.Format(MaxSimonN))
	}
	res := SimonResult{P0: p0, P1: p1, Alpha: alpha, Beta: beta}
	s := newSimonSearch(p0, p1, alpha, beta)
	nLo := s.firstN(maxN)
	if nLo > maxN {
		return SimonResult{}, argerr.NoSolution(fn, "no design with n <= "+argerr.Format(maxN)+" has the power: even a single-stage test needs more")
	}
	s.grow(nLo)
	var found []simonCand // best design at each n that beats all smaller n
	bestEN := math.Inf(1)
	nHi := maxN
	n := nLo
	for ; n <= nHi; n++ {
		if err := argerr.Canceled(fn, ctx); err != nil {
			return SimonResult{}, err
		}
		s.grow(n)
		c, ok := s.bestAt(ctx, n, bestEN)
		if err := argerr.Canceled(fn, ctx); err != nil {
			return SimonResult{}, err
		}
		if ok {
			if len(found) == 0 || c.en < bestEN {
				found = append(found, c)
				bestEN = c.en
				nHi = min(maxN, s.nBound(bestEN))
			}
		}
	}
	res.SearchedN = n - 1
	if len(found) == 0 {
		return SimonResult{}, argerr.NoSolution(fn, "no two-stage design with n <= "+argerr.Format(maxN)+" meets the size and power")
	}
	if s.nBound(bestEN) > maxN {
		res.Warnings = append(res.Warnings, "the optimal design is the best with n <= "+argerr.Format(maxN)+
			"; a larger n could give a smaller expected size (raise MaxN)")
	}
	hull := lowerHull(found)
	for i, c := range hull {
		d, err := simonDesign(c.TwoStage, p0, p1)
		if err != nil {
			return SimonResult{}, err
		}
		d.WeightLow, d.WeightHigh = 0, 1
		if i > 0 {
			d.WeightHigh = tradeWeight(hull[i-1], c)
		}
		if i < len(hull)-1 {
			d.WeightLow = tradeWeight(c, hull[i+1])
		}
		res.Admissible = append(res.Admissible, d)
	}
	res.Minimax = res.Admissible[0]
	res.Optimal = res.Admissible[len(res.Admissible)-1]
	return res, nil
}

// simonDesign evaluates a design exactly under p0 and p1.
func simonDesign(d TwoStage, p0, p1 float64) (SimonDesign, error) {
	e0, err := EvaluateTwoStage(d, p0)
	if err != nil {
		return SimonDesign{}, err
	}
	e1, err := EvaluateTwoStage(d, p1)
	if err != nil {
		return SimonDesign{}, err
	}
	return SimonDesign{TwoStage: d, Alpha: e0.Reject, Power: e1.Reject, EarlyStop0: e0.EarlyStop,
		ExpectedN0: e0.ExpectedN, EarlyStop1: e1.EarlyStop, ExpectedN1: e1.ExpectedN}, nil
}

// tradeWeight returns the q at which designs a (smaller n) and b have the
// same loss q n + (1-q) EN0: q = s / (1 + s), s = (EN_a - EN_b)/(n_b - n_a).
func tradeWeight(a, b simonCand) float64 {
	s := (a.en - b.en) / float64(b.N-a.N)
	return s / (1 + s)
}

// lowerHull returns the points of the lower convex hull of (n, EN0), in
// increasing n, of candidates given in increasing n and decreasing EN0.
func lowerHull(c []simonCand) []simonCand {
	var h []simonCand
	for _, p := range c {
		for len(h) >= 2 {
			a, b := h[len(h)-2], h[len(h)-1]
			// b lies on or above the segment a-p: drop it.
			if (b.en-a.en)*float64(p.N-a.N) >= (p.en-a.en)*float64(b.N-a.N) {
				h = h[:len(h)-1]
				continue
			}
			break
		}
		h = append(h, p)
	}
	return h
}

type simonCand struct {
	TwoStage
	en float64 // expected size under p0 from the tables
}

// simonSearch holds the binomial tables of the search: pmf rows and upper
// tails P(X > x) for every size m up to the grown limit, at p0 and p1.
type simonSearch struct {
	p0, p1, alpha, power float64
	pmf0, pmf1           [][]float64 // pmf[m][x], x = 0..m
	sf0, sf1             [][]float64 // sf[m][x] = P(X > x), x = 0..m
	r1max                []int64     // largest r1 with P1(X1 > r1) >= power, -1 if none
	// rLast[n1][r1] is the smallest final count meeting the size found for
	// (n1, r1) at a smaller n (-1: none yet). The size at a fixed r grows
	// with n (one more second-stage trial can only add rejections), so it
	// bounds the count at larger n from below.
	rLast [][]int32
}

func newSimonSearch(p0, p1, alpha, beta float64) *simonSearch {
	s := &simonSearch{p0: p0, p1: p1, alpha: alpha, power: 1 - beta}
	s.pmf0 = [][]float64{{1}}
	s.pmf1 = [][]float64{{1}}
	s.sf0 = [][]float64{{0}}
	s.sf1 = [][]float64{{0}}
	s.r1max = []int64{-1}
	s.rLast = [][]int32{nil}
	return s
}

// grow extends the tables to sizes up to n by the Pascal recurrence
// b_m(x) = p b_{m-1}(x-1) + (1-p) b_{m-1}(x), a convex combination of
// non-negative numbers (rounding grows by at most one ulp per row).
func (s *simonSearch) grow(n int64) {
	next := func(prev []float64, p float64) []float64 {
		row := make([]float64, len(prev)+1)
		q := 1 - p
		for x, v := range prev {
			row[x] += q * v
			row[x+1] += p * v
		}
		return row
	}
	sf := func(row []float64) []float64 {
		t := make([]float64, len(row))
		var acc float64
		for x := len(row) - 1; x >= 0; x-- {
			t[x] = acc // P(X > x)
			acc += row[x]
		}
		return t
	}
	for m := int64(len(s.pmf0)); m <= n; m++ {
		s.pmf0 = append(s.pmf0, next(s.pmf0[m-1], s.p0))
		s.pmf1 = append(s.pmf1, next(s.pmf1[m-1], s.p1))
		s.sf0 = append(s.sf0, sf(s.pmf0[m]))
		s.sf1 = append(s.sf1, sf(s.pmf1[m]))
		r := int64(-1)
		for x := int64(0); x < m; x++ {
			if s.sf1[m][x] >= s.power*(1-simonTol) {
				r = x
			} else {
				break
			}
		}
		s.r1max = append(s.r1max, r)
		last := make([]int32, r+1)
		for i := range last {
			last[i] = -1
		}
		s.rLast = append(s.rLast, last)
	}
}

// firstN returns the smallest n <= maxN at which the most powerful
// randomized level-alpha test of n trials has power 1 - beta, or maxN+1.
func (s *simonSearch) firstN(maxN int64) int64 {
	for n := int64(1); n <= maxN; n++ {
		s.grow(n)
		sf0, sf1, f0, f1 := s.sf0[n], s.sf1[n], s.pmf0[n], s.pmf1[n]
		// smallest c with P0(X > c) <= alpha, then randomize at c.
		c := int64(0)
		for c < n && sf0[c] > s.alpha {
			c++
		}
		pw := sf1[c]
		if f0[c] > 0 && sf0[c] < s.alpha {
			pw += (s.alpha - sf0[c]) / f0[c] * f1[c]
		}
		if pw >= s.power*(1-simonTol) {
			return n
		}
	}
	return maxN + 1
}

// nBound returns the largest n at which a design could have expected
// size below en: n < n1 + (en - n1)/q(n1) for some n1 < en, where q(n1) =
// P0(X1 > r1max(n1)) is the smallest continuation probability the power
// allows.
func (s *simonSearch) nBound(en float64) int64 {
	hi := int64(0)
	for n1 := int64(1); float64(n1) < en; n1++ {
		s.grow(n1)
		r := s.r1max[n1]
		if r < 0 {
			continue
		}
		q := s.sf0[n1][r]
		if q <= 0 {
			return math.MaxInt64
		}
		b := float64(n1) + (en-float64(n1))/q
		if b > 1e15 {
			return math.MaxInt64
		}
		hi = max(hi, int64(math.Ceil(b)))
	}
	return hi
}

// stageTail returns sum_{x1 = r1+1}^{n1} f[x1] g(r - x1) where g(m) = P(X2 > m)
// for X2 of size n2 (1 below 0, 0 from n2 on).
func stageTail(f []float64, sf []float64, r1, r int64) float64 {
	n2 := int64(len(sf)) - 1
	var acc float64
	n1 := int64(len(f)) - 1
	for x1 := n1; x1 > r1; x1-- {
		m := r - x1
		switch {
		case m < 0:
			acc += f[x1]
		case m < n2:
			acc += f[x1] * sf[m]
		}
	}
	return acc
}

// bestAt returns the design of total size n with the smallest expected
// size under p0 below bound, if any.
func (s *simonSearch) bestAt(ctx context.Context, n int64, bound float64) (simonCand, bool) {
	best := simonCand{en: bound}
	found := false
	for n1 := int64(1); n1 < n; n1++ {
		if float64(n1) >= best.en {
			break
		}
		if n1&15 == 0 && ctx != nil && ctx.Err() != nil {
			return best, false // the caller reports the cancellation
		}
		n2 := n - n1
		f0, f1 := s.pmf0[n1], s.pmf1[n1]
		sf0n2, sf1n2 := s.sf0[n2], s.sf1[n2]
		rHi := n // r*(r1) does not increase with r1
		for r1 := int64(0); r1 <= s.r1max[n1]; r1++ {
			en := float64(n1) + s.sf0[n1][r1]*float64(n2)
			if en >= best.en {
				continue
			}
			// smallest r in [r1, rHi] with size <= alpha: a short walk up
			// from the count found at a smaller n, else bisection.
			lo, hi := r1, max(rHi, r1)
			ok := func(r int64) bool { return stageTail(f0, sf0n2, r1, r) <= s.alpha*(1+simonTol) }
			if c := int64(s.rLast[n1][r1]); c >= 0 {
				lo = min(max(lo, c), hi)
				for steps := 0; lo < hi && steps < 4 && !ok(lo); steps++ {
					lo++
				}
				if lo < hi && !ok(lo) {
					lo++
				} else {
					hi = lo
				}
			} else if !ok(hi) {
				continue
			}
			for lo < hi {
				mid := lo + (hi-lo)/2
				if ok(mid) {
					hi = mid
				} else {
					lo = mid + 1
				}
			}
			s.rLast[n1][r1] = int32(hi)
			rHi = hi
			if stageTail(f1, sf1n2, r1, hi) >= s.power*(1-simonTol) {
				best = simonCand{TwoStage: TwoStage{R1: r1, N1: n1, R: hi, N: n}, en: en}
				found = true
			}
		}
	}
	return best, found
}

// StageEval is the operating characteristic of one look of a multi-stage
// design at one success probability.
type StageEval struct {
	Look `json:"look"`
	// Reach is the probability that the study reaches this look; Futile
	// and Reject the probabilities that it stops here for futility and
	// rejecting H0 (at the last look Futile is the acceptance of H0).
	Reach  float64 `json:"reach"`
	Futile float64 `json:"futile"`
	Reject float64 `json:"reject"`
}

// MarshalJSON encodes the look with non-finite floats as strings.
func (e StageEval) MarshalJSON() ([]byte, error) {
	type plain StageEval
	return jsonfloat.Marshal(plain(e))
}

// UnmarshalJSON decodes what MarshalJSON encodes.
func (e *StageEval) UnmarshalJSON(b []byte) error {
	type plain StageEval
	return jsonfloat.Unmarshal(b, (*plain)(e))
}

// StagesEval is the operating characteristic of a multi-stage design at
// one success probability.
type StagesEval struct {
	P     float64     `json:"p"`
	Looks []StageEval `json:"looks"`
	// Reject is the probability of rejecting H0 over all looks, and
	// ExpectedN the expected number of trials, sum_k N_k P(stop at k).
	Reject    float64 `json:"reject"`
	ExpectedN float64 `json:"expected_n"`
}

// MarshalJSON encodes the evaluation with non-finite floats as strings.
func (e StagesEval) MarshalJSON() ([]byte, error) {
	type plain StagesEval
	return jsonfloat.Marshal(plain(e))
}

// UnmarshalJSON decodes what MarshalJSON encodes.
func (e *StagesEval) UnmarshalJSON(b []byte) error {
	type plain StagesEval
	return jsonfloat.Unmarshal(b, (*plain)(e))
}

// EvaluateStages returns the operating characteristic of any multi-stage
// one-proportion design given by its looks (a Simon design's Looks, a
// group-sequential design's StageLooks, or counts of one's own) at success
// probability p: for each look the probability of reaching it and of
// stopping there for futility or rejecting H0, and overall the rejection
// probability (the size at p0, the power at p1) and the expected number
// of trials. Exact, by dynamic programming over the count of successes
// (the density of the count on the paths still running, convolved with the
// binomial of each look's new trials; Jennison C, Turnbull BW (2000),
// Group Sequential Methods with Applications to Clinical Trials, section
// 12.1); sums of positive terms from binom's densities, within about 1e-13
// relative. Errors: invalid looks (see Look), p outside [0, 1], a final N
// above interval.MaxStageWiseN (ErrTooLarge). Cost O(N^2) at worst, ctx checked
// inside.
func EvaluateStages(ctx context.Context, looks []Look, p float64) (StagesEval, error) {
	const fn = "power.EvaluateStages"
	if err := stagewise.Validate(fn, looks); err != nil {
		return StagesEval{}, err
	}
	if err := argerr.Prob(fn, "p", p); err != nil {
		return StagesEval{}, err
	}
	d, err := stagewise.New(ctx, looks, p)
	if err != nil {
		return StagesEval{}, argerr.Canceled(fn, ctx)
	}
	// Sums of probabilities can round a hair above 1; a probability is
	// reported in [0, 1].
	prob := func(x float64) float64 { return math.Min(1, math.Max(0, x)) }
	out := StagesEval{P: p, Reject: prob(d.Reject()), ExpectedN: d.ExpectedN()}
	for k, l := range looks {
		out.Looks = append(out.Looks, StageEval{Look: l, Reach: prob(d.Reach(k)), Futile: prob(d.Low[k]), Reject: prob(d.High[k])})
	}
	return out, nil
}

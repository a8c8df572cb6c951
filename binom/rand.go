package binom

import (
	"math"
	"math/rand/v2"
)

// btrsMin is the smallest N min(P, 1-P) for which Rand uses transformed
// rejection; below it inversion needs fewer than about 10 steps on average.
const btrsMin = 10

// Rand returns a binomial random variate drawn with r. The cost does not
// grow with N: for N min(P, 1-P) < 10 it inverts the CDF by sequential
// search from 0 (about N min(P, 1-P) + 1 steps); otherwise it uses the
// transformed rejection with squeeze of Hörmann W (1993), "The generation
// of binomial random variates", J. Statist. Comput. Simul. 46:101-110
// (algorithm BTRS), whose expected number of trials is below 1.2 at every
// N. The acceptance test compares with the PMF ratio b(k)/b(mode) from
// LogProb (Loader's saddle-point form) rather than from differences of
// lgamma, so that it stays exact to rounding at N = 1e9 and beyond, where
// lgamma differences lose six digits. P > 1/2 is sampled as N minus a
// variate with 1-P.
//
// Special cases: N = 0 or P = 0 gives 0, P = 1 gives N; an invalid Dist
// gives -1. A nil r draws from math/rand/v2's top-level generator (randomly
// seeded, safe for concurrent use); pass a seeded *rand.Rand for
// reproducible draws. Rand never panics.
func (d Dist) Rand(r *rand.Rand) int64 {
	if !d.valid() {
		return -1
	}
	r = orDefault(r)
	switch {
	case d.N == 0 || d.P == 0:
		return 0
	case d.P == 1:
		return d.N
	case d.P > 0.5:
		return d.N - Dist{N: d.N, P: 1 - d.P}.Rand(r)
	}
	if float64(d.N)*d.P < btrsMin {
		return d.randInversion(r)
	}
	return d.randBTRS(r)
}

// globalSource is a rand.Source drawing from math/rand/v2's top-level
// generator, which is randomly seeded and safe for concurrent use.
type globalSource struct{}

func (globalSource) Uint64() uint64 { return rand.Uint64() }

// orDefault returns r, or a generator over globalSource when r is nil.
func orDefault(r *rand.Rand) *rand.Rand {
	if r == nil {
		return rand.New(globalSource{})
	}
	return r
}

// randInversion returns a variate by sequential search of the CDF from 0,
// for P <= 1/2 and N P < btrsMin (so P(X = 0) = (1-P)^N >= e^-14: no
// underflow). Cost O(N P + 1).
func (d Dist) randInversion(r *rand.Rand) int64 {
	n, p := d.N, d.P
	odds := p / (1 - p)
	for {
		u := r.Float64()
		t := math.Exp(float64(n) * math.Log1p(-p)) // P(X = 0)
		for k := int64(0); k < n; k++ {
			if u < t {
				return k
			}
			u -= t
			t *= float64(n-k) / float64(k+1) * odds
			if t == 0 {
				break // rounding left u beyond the CDF: draw again
			}
		}
		if u < t {
			return n
		}
	}
}

// randBTRS is Hörmann's (1993) BTRS for P <= 1/2 and N P >= 10.
func (d Dist) randBTRS(r *rand.Rand) int64 {
	n, p := float64(d.N), d.P
	spq := math.Sqrt(n * p * (1 - p))
	b := 1.15 + 2.53*spq
	a := -0.0873 + 0.0248*b + 0.01*p
	c := n*p + 0.5
	vr := 0.92 - 4.2/b
	alpha := (2.83 + 5.1/b) * spq
	m := d.Mode()
	lm := d.LogProb(m)
	for {
		u := r.Float64() - 0.5
		v := r.Float64()
		us := 0.5 - math.Abs(u)
		kf := math.Floor((2*a/us+b)*u + c)
		if kf < 0 || kf > n {
			continue
		}
		k := int64(kf)
		if us >= 0.07 && v <= vr {
			return k // squeeze: inside the region where the hat is below b(k)
		}
		v = math.Log(v * alpha / (a/(us*us) + b))
		if v <= d.LogProb(k)-lm {
			return k
		}
	}
}

// Rand returns a hypergeometric random variate drawn with r, by inversion
// of the CDF searched outward from the mode (alternately below and above
// it, a chop-down search; Kachitvichyanukul V, Schmeiser BW (1985),
// "Computer generation of hypergeometric random variates", J. Statist.
// Comput. Simul. 22:127-145, describe inversion from the mode as HIN's
// refinement). Cost: O(standard deviation) steps, about 0.8 sd on average;
// at totals of 1e6 that is at most a few hundred steps. A single-point
// support gives that point; an invalid Hyper gives -1. A nil r draws from
// math/rand/v2's top-level generator, as Dist.Rand.
func (h Hyper) Rand(r *rand.Rand) int64 {
	if !h.valid() {
		return -1
	}
	r = orDefault(r)
	lo, hi := h.Support()
	if lo == hi {
		return lo
	}
	m := h.Mode()
	pm := math.Exp(h.logProb(m))
	for {
		u := r.Float64()
		if u < pm {
			return m
		}
		u -= pm
		a, b := m-1, m+1
		var pa, pb float64
		if a >= lo {
			pa = pm * h.ratioDown(m)
		}
		if b <= hi {
			pb = pm * h.ratioUp(m)
		}
		for pa > 0 || pb > 0 {
			if pa > 0 {
				if u < pa {
					return a
				}
				u -= pa
				if pa *= h.ratioDown(a); a == lo {
					pa = 0
				}
				a--
			}
			if pb > 0 {
				if u < pb {
					return b
				}
				u -= pb
				if pb *= h.ratioUp(b); b == hi {
					pb = 0
				}
				b++
			}
		}
		// Rounding left u beyond the total: draw again.
	}
}

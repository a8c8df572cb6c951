package onesample

import (
	"math/big"
)

// ratOracle computes the p-values of the package comment in exact rational
// arithmetic for p0 = num/den: the PMF, both tails and every ordering with
// exact ties, independently of the log-space code. It is the reference of
// the tests for small n.
type ratOracle struct {
	n   int64
	pmf []*big.Rat
}

func newRatOracle(n, num, den int64) ratOracle {
	p := big.NewRat(num, den)
	q := new(big.Rat).Sub(big.NewRat(1, 1), p)
	o := ratOracle{n: n, pmf: make([]*big.Rat, n+1)}
	for k := int64(0); k <= n; k++ {
		c := new(big.Int).Binomial(n, k)
		v := new(big.Rat).SetInt(c)
		v.Mul(v, pow(p, k))
		v.Mul(v, pow(q, n-k))
		o.pmf[k] = v
	}
	return o
}

func pow(x *big.Rat, e int64) *big.Rat {
	r := big.NewRat(1, 1)
	for i := int64(0); i < e; i++ {
		r.Mul(r, x)
	}
	return r
}

func (o ratOracle) sum(lo, hi int64) *big.Rat {
	s := new(big.Rat)
	for j := max(lo, 0); j <= min(hi, o.n); j++ {
		s.Add(s, o.pmf[j])
	}
	return s
}

// ordered returns P(e(X) < e(k)) + w P(e(X) = e(k)) for w = 1 or 1/2.
func (o ratOracle) ordered(k int64, e func(int64) *big.Rat, mid bool) *big.Rat {
	ek := e(k)
	s := new(big.Rat)
	for j := int64(0); j <= o.n; j++ {
		switch e(j).Cmp(ek) {
		case -1:
			s.Add(s, o.pmf[j])
		case 0:
			if mid {
				s.Add(s, new(big.Rat).Mul(o.pmf[j], big.NewRat(1, 2)))
			} else {
				s.Add(s, o.pmf[j])
			}
		}
	}
	return s
}

func (o ratOracle) lower(k int64, mid bool) *big.Rat {
	s := o.sum(0, k)
	if mid {
		s.Sub(s, new(big.Rat).Mul(o.pmf[k], big.NewRat(1, 2)))
	}
	return s
}

func (o ratOracle) upper(k int64, mid bool) *big.Rat {
	s := o.sum(k, o.n)
	if mid {
		s.Sub(s, new(big.Rat).Mul(o.pmf[k], big.NewRat(1, 2)))
	}
	return s
}

func minRat(a, b *big.Rat) *big.Rat {
	if a.Cmp(b) < 0 {
		return a
	}
	return b
}

// p returns the exact p-value of test t (P0 ignored: the oracle's p0).
func (o ratOracle) p(k int64, t Test) *big.Rat {
	switch t.Alternative {
	case Lower:
		return o.lower(k, t.MidP)
	case Higher:
		return o.upper(k, t.MidP)
	}
	switch t.Rule {
	case Central:
		v := new(big.Rat).Mul(big.NewRat(2, 1), minRat(o.lower(k, t.MidP), o.upper(k, t.MidP)))
		return minRat(v, big.NewRat(1, 1))
	case Blaker:
		return o.ordered(k, func(j int64) *big.Rat { return minRat(o.sum(0, j), o.sum(j, o.n)) }, t.MidP)
	}
	return o.ordered(k, func(j int64) *big.Rat { return o.pmf[j] }, t.MidP)
}

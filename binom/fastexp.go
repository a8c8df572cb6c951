package binom

import (
	"math"
	"math/big"
)

// expTab[j] is 2^(j/64) for 0 <= j < 64, correctly rounded: each is the
// sixth square root of 2^j taken in math/big at 128 bits, then rounded
// once to the nearest double.
var expTab = func() (t [64]float64) {
	for j := range t {
		y := new(big.Float).SetPrec(128).SetMantExp(big.NewFloat(1), j) // 2^j
		for range 6 {
			y = new(big.Float).SetPrec(128).Sqrt(y) // a fresh result for each root
		}
		t[j], _ = y.Float64()
	}
	return
}()

// fastExp returns e^x, for the PMF's final exponential, where math.Exp's
// series of nine terms and four squarings is a long chain of dependent
// steps. It is the table-driven method of Tang (1989), "Table-driven
// implementation of the exponential function in IEEE floating-point
// arithmetic", ACM TOMS 15:144-157:
//
//	x = (64 m + j) ln2/64 + r,  |r| <= ln2/128,
//	e^x = 2^m 2^(j/64) e^r,
//
// with ln2/64 split into a high part of 32 significant bits (so that
// (64 m + j) times it is exact) and a low part, the table expTab, and e^r - 1
// by its Taylor polynomial of degree 6 (the remainder r^7/7! is below
// 3e-20). The rounding of the table entry, of the reduced argument and of
// the polynomial add up to about 1.5 units in the last place. Outside
// (-700, 700), and for NaN, it is math.Exp.
func fastExp(x float64) float64 {
	if !(x > -700 && x < 700) {
		return math.Exp(x)
	}
	const (
		invL  = 64 / math.Ln2
		lHi   = 6.93147180369123816490e-01 / 64 // ln 2 to 32 significant bits, over 64
		lLo   = 1.90821492927058770002e-10 / 64 // the rest of ln 2, over 64
		shift = 0x1.8p52                        // adding it rounds to an integer
	)
	kd := x*invL + shift
	n := int64(math.Float64bits(kd) - math.Float64bits(shift)) // round(x 64/ln 2)
	kd -= shift
	r := (x - kd*lHi) - kd*lLo
	r2 := r * r
	p := r + r2*(1.0/2+r*(1.0/6)) + r2*r2*(1.0/24+r*(1.0/120)+r2*(1.0/720))
	t := expTab[n&63]
	scale := math.Float64frombits(uint64(n>>6+1023) << 52) // 2^m, normal for m >= -1022
	return (t + t*p) * scale
}

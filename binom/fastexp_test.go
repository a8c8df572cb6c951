package binom

import (
	"math"
	"math/big"
	"math/rand/v2"
	"testing"
)

// TestFastExp compares fastExp with the Go standard library's math.Exp
// (a general-purpose reference, itself within about an ulp) over the
// range the PMF uses and beyond: within 4 units in the last place, and
// exactly math.Exp's value outside (-700, 700).
func TestFastExp(t *testing.T) {
	t.Parallel()
	r := rand.New(rand.NewPCG(13, 1))
	xs := []float64{0, math.Copysign(0, -1), 1e-300, -1e-300, 1e-17, -1e-17, math.Ln2 / 128, -math.Ln2 / 128,
		math.Ln2, -math.Ln2, 1, -1, -699.999, 699.999, -700, 700, -745, 709.7, -800, 800,
		math.Inf(1), math.Inf(-1), math.NaN()}
	for range 200000 {
		xs = append(xs, (r.Float64()*2-1)*700, -r.ExpFloat64()*20, (r.Float64()*2-1)*0.02)
	}
	for _, x := range xs {
		got, want := fastExp(x), math.Exp(x)
		switch {
		case math.IsNaN(want):
			if !math.IsNaN(got) {
				t.Errorf("fastExp(%v) = %v, want NaN", x, got)
			}
		case !(x > -700 && x < 700):
			if got != want {
				t.Errorf("fastExp(%v) = %v, want math.Exp's %v", x, got, want)
			}
		case math.Abs(got-want) > 4*0x1p-52*want:
			t.Errorf("fastExp(%v) = %v, math.Exp %v: %.2g ulp apart", x, got, want, math.Abs(got-want)/(0x1p-52*want))
		}
	}
}

// TestExpTab checks that each expTab[j] is 2^(j/64) correctly rounded,
// exactly in math/big: 2^j lies between (v - u/2)^64 and (v + u/2)^64 for
// v = expTab[j] and u its unit in the last place.
func TestExpTab(t *testing.T) {
	t.Parallel()
	pow64 := func(x *big.Float) *big.Float {
		y := new(big.Float).SetPrec(4096).Set(x)
		for range 6 {
			y.Mul(y, y)
		}
		return y
	}
	for j, v := range expTab {
		u := math.Nextafter(v, 2) - v
		lo := pow64(new(big.Float).SetPrec(4096).Sub(big.NewFloat(v), big.NewFloat(u/2)))
		hi := pow64(new(big.Float).SetPrec(4096).Add(big.NewFloat(v), big.NewFloat(u/2)))
		p := new(big.Float).SetPrec(4096).SetMantExp(big.NewFloat(1), j)
		if lo.Cmp(p) > 0 || hi.Cmp(p) < 0 {
			t.Errorf("expTab[%d] = %v is not 2^(%d/64) rounded", j, v, j)
		}
	}
}

package test

import (
	"context"
	"math"
	"math/big"
	"testing"
)

// This file checks Barnard and Boschloo against a brute-force enumeration
// written independently of uncond.go: the rejection region is built from
// exact rational statistics (math/big), its probability is the polynomial
//
//	P(pi) = sum over s of c_s pi^s (1-pi)^(N-s),  c_s = sum of C(n1,x1) C(n2,x2) over region tables with x1+x2 = s,
//
// with integer coefficients, and the supremum is taken over a fine grid of
// pi (1001 points, then 2000 points across each coarse cell around every
// coarse local maximum within 5% of the best, then 400 points across the
// best fine cell). A grid maximum is a lower bound of the supremum and lies
// within about 1e-9 of it at these spacings, so the package's p-value must
// agree to a relative 1e-6. Exact-enumeration oracle, common practice.

// bruteRegion returns the region's coefficients c_s, s = 0..n1+n2.
func bruteRegion(n1, n2 int, in func(x1, x2 int) bool) []float64 {
	c := make([]float64, n1+n2+1)
	for x1 := 0; x1 <= n1; x1++ {
		for x2 := 0; x2 <= n2; x2++ {
			if in(x1, x2) {
				b := new(big.Int).Binomial(int64(n1), int64(x1))
				b.Mul(b, new(big.Int).Binomial(int64(n2), int64(x2)))
				f, _ := new(big.Float).SetInt(b).Float64()
				c[x1+x2] += f
			}
		}
	}
	return c
}

func brutePoly(c []float64, pi float64) float64 {
	n := len(c) - 1
	v := 0.0
	for s, cs := range c {
		if cs != 0 {
			v += cs * math.Pow(pi, float64(s)) * math.Pow(1-pi, float64(n-s))
		}
	}
	return v
}

// bruteSup maximizes the polynomial over [0, 1] on the nested grids above.
func bruteSup(c []float64) float64 {
	const g = 1000
	vs := make([]float64, g+1)
	best := 0.0
	for i := range vs {
		vs[i] = brutePoly(c, float64(i)/g)
		best = math.Max(best, vs[i])
	}
	fine := func(a, b float64, m int) (float64, float64) {
		bv, bx := 0.0, a
		for j := 0; j <= m; j++ {
			x := a + (b-a)*float64(j)/float64(m)
			if v := brutePoly(c, x); v > bv {
				bv, bx = v, x
			}
		}
		return bv, bx
	}
	top := best
	for i := range vs {
		// Local maxima (the first point of a flat run) within 5% of the
		// best; a value of 1 is the supremum already.
		if best >= 1 || vs[i] < 0.95*best || i > 0 && vs[i-1] >= vs[i] || i < g && vs[i+1] > vs[i] {
			continue
		}
		a, b := float64(max(i-1, 0))/g, float64(min(i+1, g))/g
		v, x := fine(a, b, 2000)
		h := (b - a) / 2000
		v2, _ := fine(math.Max(0, x-h), math.Min(1, x+h), 400)
		top = math.Max(top, math.Max(v, v2))
	}
	return math.Min(1, top)
}

// bruteZ returns sign(Z) Z^2 (n1 n2 / N), an increasing function of the
// pooled score statistic, as an exact rational (0 when x1 n2 = x2 n1).
func bruteZ(x1, x2, n1, n2 int) *big.Rat {
	num := int64(x1*n2 - x2*n1)
	if num == 0 {
		return new(big.Rat)
	}
	s := int64(x1 + x2)
	r := big.NewRat(num*num, s*(int64(n1+n2)-s))
	if num < 0 {
		r.Neg(r)
	}
	return r
}

// bruteFisher returns Fisher's exact p-value of (x1, x2) as an exact
// rational: the lower or upper conditional tail, or the two-sided value by
// method m (point probabilities <= that of x1 times 1 + 1e-7; or twice the
// smaller tail, capped at 1).
func bruteFisher(x1, x2, n1, n2 int, alt Alternative, m TwoSidedRule) *big.Rat {
	s := x1 + x2
	total := new(big.Int).Binomial(int64(n1+n2), int64(s))
	h := func(x int) *big.Rat {
		b := new(big.Int).Binomial(int64(n1), int64(x))
		b.Mul(b, new(big.Int).Binomial(int64(n2), int64(s-x)))
		return new(big.Rat).SetFrac(b, total)
	}
	lo, hi := max(0, s-n2), min(n1, s)
	lower, upper, two := new(big.Rat), new(big.Rat), new(big.Rat)
	thr := new(big.Rat).Mul(h(x1), big.NewRat(10_000_001, 10_000_000))
	for x := lo; x <= hi; x++ {
		p := h(x)
		if x <= x1 {
			lower.Add(lower, p)
		}
		if x >= x1 {
			upper.Add(upper, p)
		}
		if p.Cmp(thr) <= 0 {
			two.Add(two, p)
		}
	}
	switch {
	case alt == Lower:
		return lower
	case alt == Higher:
		return upper
	case m == Central:
		c := lower
		if upper.Cmp(lower) < 0 {
			c = upper
		}
		c = new(big.Rat).Mul(c, big.NewRat(2, 1))
		if c.Cmp(big.NewRat(1, 1)) > 0 {
			c = big.NewRat(1, 1)
		}
		return c
	}
	return two
}

// bruteBarnard and bruteBoschloo are the oracles' p-values.
func bruteBarnard(k1, n1, k2, n2 int, alt Alternative) float64 {
	obs := bruteZ(k1, k2, n1, n2)
	absObs := new(big.Rat).Abs(obs)
	return bruteSup(bruteRegion(n1, n2, func(x1, x2 int) bool {
		z := bruteZ(x1, x2, n1, n2)
		switch alt {
		case Lower:
			return z.Cmp(obs) <= 0
		case Higher:
			return z.Cmp(obs) >= 0
		}
		return new(big.Rat).Abs(z).Cmp(absObs) >= 0
	}))
}

func bruteBoschloo(k1, n1, k2, n2 int, alt Alternative, m TwoSidedRule) float64 {
	thr := new(big.Rat).Mul(bruteFisher(k1, k2, n1, n2, alt, m), big.NewRat(10_000_001, 10_000_000))
	return bruteSup(bruteRegion(n1, n2, func(x1, x2 int) bool {
		return bruteFisher(x1, x2, n1, n2, alt, m).Cmp(thr) <= 0
	}))
}

type bruteShape struct{ n1, n2 int }

// bruteShapes: the lopsided shapes n2 = 1 (n1 up to 50; up to 12 under
// -short) and n2 = 2, their mirror images at small n1, and every small
// shape up to 6 x 6.
func bruteShapes() []bruteShape {
	out := []bruteShape{{12, 1}, {12, 2}}
	if !testing.Short() {
		out = append(out, bruteShape{25, 1}, bruteShape{49, 1}, bruteShape{50, 1}, bruteShape{25, 2})
	}
	for n1 := 1; n1 <= 6; n1++ {
		out = append(out, bruteShape{n1, 1}, bruteShape{1, n1})
		for n2 := 2; n2 <= 6; n2 += 2 {
			out = append(out, bruteShape{n1, n2})
		}
	}
	return out
}

func checkBrute(t *testing.T, name string, k1, n1, k2, n2 int, got Result, err error, want float64) {
	t.Helper()
	if err != nil {
		t.Fatalf("%s %d/%d vs %d/%d: %v", name, k1, n1, k2, n2, err)
	}
	if math.Abs(got.PValue-want) > 1e-6*want || math.IsNaN(got.PValue) {
		t.Errorf("%s %d/%d vs %d/%d: p = %.12g (at pi = %.6g), enumeration %.12g", name, k1, n1, k2, n2, got.PValue, got.Nuisance.At, want)
	}
}

// TestBarnardBrute: Barnard equals the enumeration for every table of every
// shape in bruteShapes and every alternative.
func TestBarnardBrute(t *testing.T) {
	t.Parallel()
	for _, sh := range bruteShapes() {
		for k1 := 0; k1 <= sh.n1; k1++ {
			for k2 := 0; k2 <= sh.n2; k2++ {
				for _, alt := range []Alternative{TwoSided, Lower, Higher} {
					r, err := Barnard(context.Background(), int64(k1), int64(sh.n1), int64(k2), int64(sh.n2), UnconditionalOptions{Alternative: alt})
					checkBrute(t, "Barnard "+alt.String(), k1, sh.n1, k2, sh.n2, r, err, bruteBarnard(k1, sh.n1, k2, sh.n2, alt))
				}
			}
		}
	}
}

// TestBoschlooBrute: Boschloo equals the enumeration for every table of
// every shape in bruteShapes, one-sided and both two-sided orderings (the
// two-sided default orders by Fisher's point-probability p-value, which is
// what this enumeration does independently).
func TestBoschlooBrute(t *testing.T) {
	t.Parallel()
	type variant struct {
		alt Alternative
		m   TwoSidedRule
	}
	variants := []variant{{TwoSided, PointProbability}, {TwoSided, Central}, {Lower, 0}, {Higher, 0}}
	for _, sh := range bruteShapes() {
		for k1 := 0; k1 <= sh.n1; k1++ {
			for k2 := 0; k2 <= sh.n2; k2++ {
				for _, v := range variants {
					r, err := Boschloo(context.Background(), int64(k1), int64(sh.n1), int64(k2), int64(sh.n2), UnconditionalOptions{Alternative: v.alt, Rule: v.m})
					checkBrute(t, "Boschloo "+v.alt.String()+" "+v.m.String(), k1, sh.n1, k2, sh.n2, r, err, bruteBoschloo(k1, sh.n1, k2, sh.n2, v.alt, v.m))
				}
			}
		}
	}
}

// TestUnconditionalDegenerate: shapes whose exact p-value is 1 by the
// derivation on unconditional (an empty sample; no successes or no
// failures in both samples; a one-sided test whose observed table points
// the other way), also at sizes where a search over the nuisance would be
// long, with the warning each carries and the enumeration where it is
// small.
func TestUnconditionalDegenerate(t *testing.T) {
	t.Parallel()
	const empty = "an empty sample: the data carry no information on p1 - p2"
	const none = "no successes in either sample: the data carry no information on p1 - p2, and p = 1"
	const all = "no failures in either sample: the data carry no information on p1 - p2, and p = 1"
	cases := []struct {
		k1, n1, k2, n2 int64
		alt            Alternative
		bb             float64
		warn           string
	}{
		{0, 1000000, 0, 0, TwoSided, 0, empty},
		{0, 0, 0, 1000000, Lower, 0, empty},
		{17, 1000000, 0, 0, Higher, 0, empty},
		{0, 0, 0, 0, TwoSided, 0, empty},
		{0, 5, 0, 0, TwoSided, 0.001, empty},
		{0, 500, 0, 1, TwoSided, 0, none},
		{0, 2000, 0, 1, Lower, 0, none},
		{0, 20000, 0, 1, Higher, 0, none},
		{0, 1000000, 0, 1, TwoSided, 0, none},
		{0, 2000, 0, 2000, TwoSided, 0.001, none},
		{1000000, 1000000, 1, 1, TwoSided, 0, all},
		{7, 7, 3, 3, Lower, 0.001, all},
		{999990, 1000000, 0, 1, Lower, 0, ""}, // p1 estimated above p2: Lower has p = 1
		{3, 1000000, 1, 1, Higher, 0, ""},     // p1 estimated below p2: Higher has p = 1
	}
	for _, c := range cases {
		for name, f := range map[string]func(context.Context, int64, int64, int64, int64, UnconditionalOptions) (Result, error){"Barnard": Barnard, "Boschloo": Boschloo} {
			r, err := f(context.Background(), c.k1, c.n1, c.k2, c.n2, UnconditionalOptions{Alternative: c.alt, BergerBoos: c.bb})
			if err != nil {
				t.Fatalf("%s %+v: %v", name, c, err)
			}
			if r.PValue != 1 || r.LogPValue != 0 {
				t.Errorf("%s %+v: p = %v (log %v), want exactly 1", name, c, r.PValue, r.LogPValue)
			}
			var w []string
			if c.warn != "" {
				w = []string{c.warn}
			}
			if len(r.Warnings) != len(w) || len(w) == 1 && r.Warnings[0] != w[0] {
				t.Errorf("%s %+v: warnings %q, want %q", name, c, r.Warnings, w)
			}
			if c.n1+c.n2 <= 14 && c.n1 > 0 && c.n2 > 0 && c.bb == 0 {
				want := bruteBarnard(int(c.k1), int(c.n1), int(c.k2), int(c.n2), c.alt)
				if name == "Boschloo" {
					want = bruteBoschloo(int(c.k1), int(c.n1), int(c.k2), int(c.n2), c.alt, 0)
				}
				if want < 1-1e-12 {
					t.Errorf("%s %+v: enumeration %v, want 1", name, c, want)
				}
			}
		}
	}
}

// BenchmarkBarnardLopsided and BenchmarkBoschlooLopsided run the shapes
// n2 = 1 and n2 = 0 at n1 = 2000 and 1e6, inside the size limit.
func BenchmarkBarnardLopsided(b *testing.B) { benchLopsided(b, Barnard) }

func BenchmarkBoschlooLopsided(b *testing.B) { benchLopsided(b, Boschloo) }

func benchLopsided(b *testing.B, f func(context.Context, int64, int64, int64, int64, UnconditionalOptions) (Result, error)) {
	for _, c := range []struct {
		name           string
		k1, n1, k2, n2 int64
	}{
		{"2000x1", 700, 2000, 1, 1},
		{"2000x1zero", 0, 2000, 0, 1},
		{"2000x0", 700, 2000, 0, 0},
		{"1e6x1", 3, 1000000, 1, 1},
		{"1e6x1zero", 0, 1000000, 0, 1},
		{"1e6x0", 0, 1000000, 0, 0},
	} {
		b.Run(c.name, func(b *testing.B) {
			c0, n := cpuTime(), 0
			for b.Loop() {
				if _, err := f(context.Background(), c.k1, c.n1, c.k2, c.n2, UnconditionalOptions{}); err != nil {
					b.Fatal(err)
				}
				n++
			}
			b.ReportMetric(float64(cpuTime()-c0)/float64(n), "cpu-ns/op")
		})
	}
}

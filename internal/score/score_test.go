package score

import (
	"math"
	"testing"
)

// loglik is the two-binomial log-likelihood (without constants).
func loglik(x1, n1, x2, n2 int64, p1, p2 float64) float64 {
	l := func(x, n int64, p float64) float64 {
		s := 0.0
		if x > 0 {
			s += float64(x) * math.Log(p)
		}
		if x < n {
			s += float64(n-x) * math.Log1p(-p)
		}
		return s
	}
	return l(x1, n1, p1) + l(x2, n2, p2)
}

// The restricted estimates must maximize the likelihood on the restriction:
// no point of a fine grid along it does better (a property check, common
// practice), and the restriction must hold.
func TestRestrictedMaxima(t *testing.T) {
	t.Parallel()
	data := [][4]int64{{56, 70, 48, 80}, {0, 10, 0, 20}, {7, 15, 12, 15}, {10, 10, 0, 10}, {3, 1000, 1, 50}, {1, 2, 1, 3}}
	for _, d := range data {
		x1, n1, x2, n2 := d[0], d[1], d[2], d[3]
		for _, delta := range []float64{-0.9, -0.5, -0.1, 0, 0.05, 0.3, 0.8} {
			p1, p2 := DiffMLE(x1, n1, x2, n2, delta)
			if math.Abs(p1-p2-delta) > 1e-12 {
				t.Errorf("%v delta %v: p1-p2 = %v", d, delta, p1-p2)
			}
			best := loglik(x1, n1, x2, n2, p1, p2)
			for i := 1; i < 2000; i++ {
				q1 := math.Max(0, delta) + (math.Min(1, 1+delta)-math.Max(0, delta))*float64(i)/2000
				if l := loglik(x1, n1, x2, n2, q1, q1-delta); l > best+1e-9 {
					t.Errorf("%v delta %v: (%v, %v) beats the MLE (%v, %v): %v > %v", d, delta, q1, q1-delta, p1, p2, l, best)
					break
				}
			}
		}
		for _, rho := range []float64{0.1, 0.5, 1, 1.7, 4} {
			p1, p2 := RatioMLE(x1, n1, x2, n2, rho)
			if x1+x2 > 0 && math.Abs(p1-rho*p2) > 1e-12 {
				t.Errorf("%v rho %v: p1/p2 = %v", d, rho, p1/p2)
			}
			best := loglik(x1, n1, x2, n2, p1, p2)
			for i := 1; i < 2000; i++ {
				q2 := math.Min(1, 1/rho) * float64(i) / 2000
				if l := loglik(x1, n1, x2, n2, rho*q2, q2); l > best+1e-9 {
					t.Errorf("%v rho %v: p2 = %v beats the MLE %v", d, rho, q2, p2)
					break
				}
			}
		}
		for _, psi := range []float64{0.05, 0.5, 1, 2, 30} {
			p1, p2 := OddsMLE(x1, n1, x2, n2, psi)
			m := float64(x1 + x2)
			if math.Abs(float64(n1)*p1+float64(n2)*p2-m) > 1e-9*math.Max(1, m) {
				t.Errorf("%v psi %v: margin %v, want %v", d, psi, float64(n1)*p1+float64(n2)*p2, m)
			}
			if p1 > 0 && p1 < 1 && p2 > 0 && p2 < 1 {
				if or := p1 * (1 - p2) / (p2 * (1 - p1)); math.Abs(or/psi-1) > 1e-10 {
					t.Errorf("%v psi %v: odds ratio %v", d, psi, or)
				}
			}
		}
	}
}

func TestPooledAtNull(t *testing.T) {
	t.Parallel()
	// Under p1 = p2 every restriction gives the pooled proportion (common
	// practice, exact).
	x1, n1, x2, n2 := int64(56), int64(70), int64(48), int64(80)
	pool := float64(x1+x2) / float64(n1+n2)
	for name, got := range map[string][2]float64{
		"diff":  pair(DiffMLE(x1, n1, x2, n2, 0)),
		"ratio": pair(RatioMLE(x1, n1, x2, n2, 1)),
		"odds":  pair(OddsMLE(x1, n1, x2, n2, 1)),
	} {
		if math.Abs(got[0]-pool) > 1e-15 || math.Abs(got[1]-pool) > 1e-15 {
			t.Errorf("%s: %v, want %v twice", name, got, pool)
		}
	}
	// At the null of no difference the Farrington-Manning statistic is the
	// pooled two-proportion z statistic, and the three contrasts agree.
	z := (0.8 - 0.6) / math.Sqrt(pool*(1-pool)*(1.0/70+1.0/80))
	for name, got := range map[string]float64{
		"diff":  DiffZ(x1, n1, x2, n2, 0, FarringtonManning),
		"ratio": RatioZ(x1, n1, x2, n2, 1, FarringtonManning),
	} {
		if math.Abs(got/z-1) > 1e-14 {
			t.Errorf("%s: Z = %v, want %v", name, got, z)
		}
	}
	mn := DiffZ(x1, n1, x2, n2, 0, MiettinenNurminen)
	if want := z * math.Sqrt(149.0/150); math.Abs(mn/want-1) > 1e-14 {
		t.Errorf("MN Z = %v, want %v", mn, want)
	}
}

func pair(a, b float64) [2]float64 { return [2]float64{a, b} }

func TestZConventions(t *testing.T) {
	t.Parallel()
	if z := DiffZ(0, 10, 0, 20, 0, MiettinenNurminen); z != 0 {
		t.Errorf("0/10 vs 0/20 at delta 0: Z = %v, want 0", z)
	}
	if z := DiffZ(10, 10, 0, 10, 0.999999, FarringtonManning); !(z > 0) {
		t.Errorf("10/10 vs 0/10 at delta 0.999999: Z = %v, want > 0 (observed 1 exceeds delta)", z)
	}
	for _, psi := range []float64{1e-6, 1, 1e6} {
		if z := OddsZ(3, 10, 5, 12, psi, MiettinenNurminen); math.IsNaN(z) {
			t.Errorf("OddsZ NaN at psi %v", psi)
		}
	}
}

func BenchmarkDiffZ(b *testing.B) {
	for b.Loop() {
		DiffZ(56, 70, 48, 80, 0.1, MiettinenNurminen)
	}
}

// TestStratifiedDiffZ: with one stratum the stratified statistic is DiffZ
// (the weight cancels); with several it decreases in delta and is 0 where
// the weighted differences balance.
func TestStratifiedDiffZ(t *testing.T) {
	for _, d := range []float64{-0.5, -0.1, 0, 0.05, 0.3} {
		one := StratifiedDiffZ([]int64{12}, []int64{30}, []int64{6}, []int64{28}, d, MiettinenNurminen, MantelHaenszelWeights)
		if want := DiffZ(12, 30, 6, 28, d, MiettinenNurminen); math.Abs(one-want) > 1e-12*math.Abs(want) {
			t.Errorf("delta %v: %v, DiffZ %v", d, one, want)
		}
	}
	x1, n1, x2, n2 := []int64{12, 8, 15}, []int64{30, 25, 40}, []int64{6, 5, 9}, []int64{28, 27, 38}
	prev := math.Inf(1)
	for d := -0.9; d < 0.9; d += 0.01 {
		z := StratifiedDiffZ(x1, n1, x2, n2, d, MiettinenNurminen, MantelHaenszelWeights)
		if !(z < prev) {
			t.Fatalf("not decreasing at delta %v: %v after %v", d, z, prev)
		}
		prev = z
	}
}

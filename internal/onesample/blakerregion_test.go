package onesample

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestBlakerRegionMatches checks the guided region search against the full
// search of LogAcceptability (the same ordering, so the values agree
// exactly) for guesses near, far from and outside the region.
func TestBlakerRegionMatches(t *testing.T) {
	t.Parallel()
	r := rand.New(rand.NewPCG(3, 7))
	for i := 0; i < 3000; i++ {
		n := int64(1 + r.IntN(2000))
		if i%10 == 0 {
			n = int64(1e6 + r.IntN(1e6))
		}
		k := r.Int64N(n + 1)
		p := math.Min(0.5, math.Max(1e-6, float64(k)/float64(n)+0.2*(r.Float64()-0.5)))
		want, err := LogAcceptability(k, n, p, false)
		if err != nil {
			t.Fatal(err)
		}
		ga, gb := r.Int64N(n+1), r.Int64N(n+1)
		if i%2 == 0 {
			ga, gb = max(0, 2*int64(float64(n)*p)-k-2), k-1
		}
		a, b, got := BlakerRegion(k, n, p, ga, gb)
		if got != want {
			t.Errorf("BlakerRegion(%d, %d, %v, %d, %d) = [%d, %d] %v, LogAcceptability %v", k, n, p, ga, gb, a, b, got, want)
		}
		if a <= b && LogOutside(n, p, a, b) != got {
			t.Errorf("LogOutside(%d, %v, %d, %d) = %v, want %v", n, p, a, b, LogOutside(n, p, a, b), got)
		}
	}
}

// FuzzBlakerRegion checks the guided search against LogAcceptability for
// any guess, including guesses outside 0..n.
func FuzzBlakerRegion(f *testing.F) {
	f.Add(int64(37), int64(1000), 0.03, int64(20), int64(36))
	f.Add(int64(0), int64(1), 0.5, int64(-5), int64(9))
	f.Fuzz(func(t *testing.T, k, n int64, p float64, ga, gb int64) {
		if n < 1 || n > 1e6 || k < 0 || k > n || !(p > 0 && p < 1) {
			return
		}
		want, err := LogAcceptability(k, n, p, false)
		if err != nil {
			t.Fatal(err)
		}
		if _, _, got := BlakerRegion(k, n, p, ga, gb); got != want {
			t.Errorf("BlakerRegion(%d, %d, %v, %d, %d) = %v, LogAcceptability %v", k, n, p, ga, gb, got, want)
		}
	})
}

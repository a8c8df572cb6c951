package test

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestSterneEndCertified: each end of Sterne's interval is where the
// two-sided point-probability test's acceptance ends: the p-value is at
// least alpha just inside it and below alpha just outside (1e-10 relative
// either way), for random k and n up to 2e6 at five levels (inversion
// property, common practice; the ends come from the skipping search of
// sterneEnd and its thresholds summed by recurrence).
func TestSterneEndCertified(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(1, 2))
	count := 600
	if testing.Short() {
		count = 150
	}
	for i := range count {
		n := []int64{1 + rng.Int64N(60), 1 + rng.Int64N(5000), 1 + rng.Int64N(2000000)}[i%3]
		k := rng.Int64N(n + 1)
		if i%7 == 0 {
			k = rng.Int64N(min(n+1, 5))
		}
		la := math.Log([]float64{0.05, 0.01, 0.1, 0.5, 1e-6}[i%5])
		for _, up := range []bool{false, true} {
			if up && k == n || !up && k == 0 {
				continue
			}
			e := sterneEnd(k, n, la, up)
			in, out := e*(1+1e-10), e*(1-1e-10)
			if up {
				in, out = out, in
			}
			lpIn := binomialLogP(BinomialOptions{}, k, n, in)
			lpOut := binomialLogP(BinomialOptions{}, k, n, out)
			if e != float64(k)/float64(n) && (lpIn < la || lpOut >= la) {
				t.Errorf("k=%d n=%d alpha=%v up=%v: end %v, ln p inside %v, outside %v, ln alpha %v", k, n, math.Exp(la), up, e, lpIn, lpOut, la)
			}
		}
	}
}

package power

import (
	"math"

	"github.com/kofnlab/kofn/binom"
)

// pmfWindow returns the binomial(n, p) probabilities w[i] = P(X = lo + i)
// over the window around the mode outside which every term is below
// 1e-17 of the mode's (so the omitted mass is below 1e-15 relative of the
// total for any n): the mode from binom's saddle-point PMF, the rest by
// the ratio recurrence b(k+1)/b(k) = (n-k)/(k+1) p/q. Cost O(sqrt(n pq)).
func pmfWindow(n int64, p float64, buf []float64) (lo int64, w []float64) {
	d := binom.Dist{N: n, P: p}
	if p == 0 || p == 1 || n == 0 {
		return d.Mode(), append(buf[:0], 1)
	}
	m := d.Mode()
	pm := math.Exp(d.LogProb(m))
	const cut = 1e-17
	r := p / (1 - p)
	// Downward from the mode.
	down := buf[:0]
	v := pm
	k := m
	for k > 0 {
		v *= float64(k) / (float64(n-k+1) * r)
		if v < cut*pm {
			break
		}
		down = append(down, v)
		k--
	}
	lo = m - int64(len(down))
	w = make([]float64, 0, len(down)+1+int(2*math.Sqrt(float64(n)*p*(1-p)))+16)
	for i := len(down) - 1; i >= 0; i-- {
		w = append(w, down[i])
	}
	w = append(w, pm)
	v = pm
	for k = m; k < n; k++ {
		v *= float64(n-k) / float64(k+1) * r
		if v < cut*pm {
			break
		}
		w = append(w, v)
	}
	return lo, w
}

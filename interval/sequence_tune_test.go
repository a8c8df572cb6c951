package interval_test

import (
	"math"
	"testing"

	"github.com/kofnlab/kofn/interval"
)

// TestTunedConcentrationScales: the tuned concentration per observation
// converges as n grows (the assumption behind the linear scaling above
// n = 1e9: r/n at 1e7 and at 1e9 agree to 0.5%), and at n = 2^53 it is that
// scaling, not an artefact of a scan that ends below the optimum.
func TestTunedConcentrationScales(t *testing.T) {
	t.Parallel()
	r7, err7 := interval.TunedConcentration(0.95, 1e7, 0.5)
	r9, err9 := interval.TunedConcentration(0.95, 1e9, 0.5)
	r53, err53 := interval.TunedConcentration(0.95, 1<<53, 0.5)
	if err7 != nil || err9 != nil || err53 != nil {
		t.Fatal(err7, err9, err53)
	}
	if d := math.Abs((r7/1e7)/(r9/1e9) - 1); d > 0.005 {
		t.Errorf("r/n at 1e7 %v and at 1e9 %v differ by %v", r7/1e7, r9/1e9, d)
	}
	if got := r53 / (1 << 53); math.Abs(got/(r9/1e9)-1) > 1e-12 {
		t.Errorf("r/n at 2^53 = %v, want %v", got, r9/1e9)
	}
}

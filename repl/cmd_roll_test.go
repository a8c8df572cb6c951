package repl

import (
	"context"
	"encoding/json"
	"math/rand/v2"
	"testing"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/power"
)

// TestRollRepeatsThePackage checks that roll's draws are binom's Rand
// with the documented generator and seed, so a seed reproduces them.
func TestRollRepeatsThePackage(t *testing.T) {
	t.Parallel()
	s, out, _ := testSession()
	s.Set.JSON = true
	if err := s.Run(context.Background(), "roll n=40 p=0.3 times=50 seed=7"); err != nil {
		t.Fatal(err)
	}
	var obj struct {
		Result rollResult `json:"result"`
	}
	if err := json.Unmarshal(out.Bytes(), &obj); err != nil {
		t.Fatal(err)
	}
	rng := rand.New(rand.NewPCG(7, 0x6b6f666e))
	d, _ := binom.New(40, 0.3)
	for i, got := range obj.Result.Draws {
		if want := d.Rand(rng); got != want {
			t.Fatalf("draw %d = %d, package %d", i, got, want)
		}
	}
	if len(obj.Result.Draws) != 50 || obj.Result.ExactMean != 12 {
		t.Errorf("result %+v", obj.Result)
	}
}

func TestUrnAndLotMatchPackage(t *testing.T) {
	t.Parallel()
	nh, _ := binom.NewNoncentralHyper(30, 19, 15, 2)
	if got := num(t, runJSON(t, "urn total=30 marked=19 draws=15 odds=2 k=12"), "p_at_most"); got != nh.CDF(12) {
		t.Errorf("noncentral CDF %v, package %v", got, nh.CDF(12))
	}
	if got := num(t, runJSON(t, "urn total=30 marked=19 draws=15 odds=2"), "mean"); got != nh.Mean() {
		t.Errorf("noncentral mean %v, package %v", got, nh.Mean())
	}
	pa, _ := power.AcceptProbLot(power.Plan{SampleSize: 89, AcceptNumber: 2}, 500, 5)
	if got := num(t, runJSON(t, "accept n=89 c=2 lot=500 defectives=5"), "lot_accept_prob"); got != pa {
		t.Errorf("finite-lot acceptance %v, package %v", got, pa)
	}
}

func TestCutAndEntropyMatchPackage(t *testing.T) {
	t.Parallel()
	d, _ := binom.New(100000, 0.5)
	obj := runJSON(t, "cut n=100000 p=0.5 logq=-2000")
	if got := num(t, obj, "lower_cut"); got != float64(d.LogQuantile(-2000)) {
		t.Errorf("lower cut %v, package %d", got, d.LogQuantile(-2000))
	}
	if got := num(t, obj, "upper_cut"); got != float64(d.LogUpperQuantile(-2000)) {
		t.Errorf("upper cut %v, package %d", got, d.LogUpperQuantile(-2000))
	}
	d2, _ := binom.New(40, 0.3)
	if got := num(t, runJSON(t, "spread n=40 p=0.3"), "entropy"); got != d2.Entropy() {
		t.Errorf("entropy %v, package %v", got, d2.Entropy())
	}
}

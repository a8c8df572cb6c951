package test_test

import (
	"context"
	"math"
	"testing"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

func FuzzStageWise(f *testing.F) {
	f.Add(int64(0), int64(9), int64(2), int64(17), 2, int64(4), 0.05, 0)
	f.Add(int64(3), int64(13), int64(12), int64(43), 1, int64(2), 0.2, 1)
	f.Add(int64(-1), int64(5), int64(7), int64(20), 2, int64(20), 1e-9, 2)
	f.Fuzz(func(t *testing.T, r1, n1, r, n int64, look int, k int64, p0 float64, alt int) {
		looks := []interval.Look{{N: n1 % 500, Futility: r1, Efficacy: n1%500 + 1}, {N: n % 1000, Futility: r, Efficacy: r + 1}}
		res, err := test.StageWise(context.Background(), looks, look, k, p0, test.StageWiseOptions{Alternative: test.Alternative(alt % 4)})
		if err != nil {
			return
		}
		if !(res.PValue >= 0 && res.PValue <= 1) || math.IsNaN(res.LogPValue) || res.LogPValue > 0 {
			t.Fatalf("p-value %v (log %v)", res.PValue, res.LogPValue)
		}
		iv := res.Interval
		if iv == nil || !(iv.Lower >= 0 && iv.Lower <= iv.Upper && iv.Upper <= 1) {
			t.Fatalf("interval %+v", iv)
		}
	})
}

package interval_test

import (
	"errors"
	"math"
	"testing"

	"github.com/kofnlab/kofn/interval"
)

// FuzzCredible: Credible and NewPosterior either fail with a typed error
// naming an argument (or ErrNoSolution) or return limits in [0, 1] around
// a finite estimate, never NaN.
func FuzzCredible(f *testing.F) {
	f.Add(int64(7), int64(30), 0.95, 0.5, 0.5, 1, 0)
	f.Add(int64(0), int64(0), 0.5, 0.3, 0.2, 1, 1)
	f.Add(int64(1e6), int64(1e9), 0.999999, 1e-3, 1e3, 0, 2)
	f.Fuzz(func(t *testing.T, k, n int64, level, a, b float64, kind, side int) {
		o := interval.CredibleOptions{Level: level, Kind: interval.CredibleKind(kind % 3), Side: interval.Side(side % 4), Prior: interval.BetaPrior(a, b)}
		iv, err := interval.Credible(k, n, o)
		if err != nil {
			var e *interval.Error
			if !errors.As(err, &e) || (e.Arg == "" && !errors.Is(err, interval.ErrNoSolution)) {
				t.Fatalf("untyped or unnamed error %v", err)
			}
			return
		}
		if !(iv.Lower >= 0 && iv.Upper <= 1 && iv.Lower <= iv.Upper) || math.IsNaN(iv.Estimate) || iv.Prior == nil {
			t.Fatalf("Credible(%d, %d, %+v) = %+v", k, n, o, iv)
		}
		p, err := interval.NewPosterior(k, n, o.Prior)
		if err != nil {
			t.Fatalf("NewPosterior failed after Credible succeeded: %v", err)
		}
		if math.IsNaN(p.Median) || math.IsNaN(p.StdDev) {
			t.Fatalf("posterior %+v", p)
		}
	})
}

package interval_test

import (
	"context"
	"errors"
	"testing"

	"github.com/kofnlab/kofn/interval"
)

func TestBrownCaiDasGuptaWald(t *testing.T) {
	t.Parallel()
	// Brown LD, Cai TT, DasGupta A (2001), Interval estimation for a
	// binomial proportion, Statistical Science 16:101-133 (recalled,
	// recomputed): exact coverage of the 95% Wald interval, closed
	// intervals, to the 3 printed decimals. The n = 591 -> 592 drop is the
	// "lucky n" effect.
	for _, c := range []struct {
		p    float64
		n    int64
		want float64
	}{{0.2, 30, 0.946}, {0.005, 591, 0.945}, {0.005, 592, 0.792}} {
		got, err := interval.Coverage(context.Background(), c.n, c.p, interval.Options{Method: interval.Wald})
		if err != nil {
			t.Fatal(err)
		}
		if diff := got.Coverage - c.want; diff > 0.0005 || diff < -0.0005 {
			t.Errorf("Wald coverage at p = %v, n = %d: %.5f, want %.3f", c.p, c.n, got.Coverage, c.want)
		}
	}
}

func TestExactCoverageAtLeastLevel(t *testing.T) {
	t.Parallel()
	// The defining property of the exact methods (Clopper and Pearson 1934;
	// Blaker 2000): coverage at or above the level at every p, here on a
	// grid of 999 p for several n and levels, both sides for
	// Clopper-Pearson.
	ps := make([]float64, 999)
	for i := range ps {
		ps[i] = (float64(i) + 0.5) / 999
	}
	ns := []int64{1, 2, 5, 17, 50, 200}
	if testing.Short() {
		ns = ns[:4]
	}
	for _, n := range ns {
		for _, lev := range []float64{0.9, 0.95, 0.99} {
			for _, opt := range []interval.Options{
				{Method: interval.ClopperPearson, Level: lev},
				{Method: interval.ClopperPearson, Level: lev, Side: interval.LowerBound},
				{Method: interval.ClopperPearson, Level: lev, Side: interval.UpperBound},
				{Method: interval.Blaker, Level: lev},
			} {
				_, sum, err := interval.CoverageCurve(context.Background(), n, ps, opt)
				if err != nil {
					t.Fatal(err)
				}
				if sum.MinCoverage < lev-1e-12 {
					t.Errorf("%v %v n = %d level %v: min coverage %v at p = %v", opt.Method, opt.Side, n, lev, sum.MinCoverage, sum.MinAtP)
				}
			}
		}
	}
}

func TestCoverageCurveMatchesPoints(t *testing.T) {
	t.Parallel()
	ps := []float64{0, 0.01, 0.3, 0.5, 0.97, 1}
	for _, m := range []interval.Method{interval.Wilson, interval.Jeffreys, interval.Wald, interval.MidP} {
		curve, sum, err := interval.CoverageCurve(context.Background(), 40, ps, interval.Options{Method: m})
		if err != nil {
			t.Fatal(err)
		}
		for i, p := range ps {
			pt, err := interval.Coverage(context.Background(), 40, p, interval.Options{Method: m})
			if err != nil {
				t.Fatal(err)
			}
			if relErr(curve[i].Coverage, pt.Coverage) > 1e-14 || relErr(curve[i].ExpectedWidth, pt.ExpectedWidth) > 1e-14 {
				t.Errorf("%v p = %v: curve %+v, point %+v", m, p, curve[i], pt)
			}
		}
		if sum.Points != len(ps) {
			t.Errorf("summary points = %d", sum.Points)
		}
	}
	over, sum, err := interval.CoverageOverN(context.Background(), 585, 595, 0.005, interval.Options{Method: interval.Wald})
	if err != nil {
		t.Fatal(err)
	}
	if len(over) != 11 || sum.MinAtN != 592 {
		t.Errorf("Wald over n = 585..595 at p = 0.005: min %v at n = %d, want n = 592", sum.MinCoverage, sum.MinAtN)
	}
}

func TestCoverageErrors(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	if _, err := interval.Coverage(context.Background(), 0, 0.5, interval.Options{}); err == nil || err.Error() != "interval.Coverage: n = 0 must be at least 1" {
		t.Errorf("n = 0: %v", err)
	}
	if _, err := interval.Coverage(context.Background(), 10, 1.5, interval.Options{}); err == nil || err.Error() != "interval.Coverage: p = 1.5 is not a probability in [0, 1]" {
		t.Errorf("p = 1.5: %v", err)
	}
	if _, err := interval.Coverage(context.Background(), interval.MaxCoverageN+1, 0.5, interval.Options{}); !errors.Is(err, interval.ErrTooLarge) {
		t.Errorf("n too large: %v", err)
	}
	if _, _, err := interval.CoverageCurve(ctx, 10, []float64{0.2, -1}, interval.Options{}); err == nil || err.Error() != "interval.CoverageCurve: ps[1] = -1 is not a probability in [0, 1]" {
		t.Errorf("bad grid: %v", err)
	}
	if _, _, err := interval.CoverageOverN(ctx, 10, 5, 0.5, interval.Options{}); err == nil || err.Error() != "interval.CoverageOverN: nMax = 5 is below nMin = 10" {
		t.Errorf("bad range: %v", err)
	}
	cctx, cancel := context.WithCancel(ctx)
	cancel()
	if _, _, err := interval.CoverageCurve(cctx, 10, []float64{0.5}, interval.Options{}); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: %v", err)
	}
}

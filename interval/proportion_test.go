package interval_test

import (
	"errors"
	"fmt"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/interval"
)

func limits(t *testing.T, k, n int64, opt interval.Options) [2]float64 {
	t.Helper()
	iv, err := interval.Proportion(k, n, opt)
	if err != nil {
		t.Fatalf("Proportion(%d, %d, %+v): %v", k, n, opt, err)
	}
	return [2]float64{iv.Lower, iv.Upper}
}

func TestNewcombeSingle(t *testing.T) {
	t.Parallel()
	// Newcombe RG (1998), Two-sided confidence intervals for the single
	// proportion: comparison of seven methods, Statistics in Medicine
	// 17:857-872, Table II (recalled, recomputed): 95% limits to 4 decimals.
	// Methods 1-7: Wald, Wald cc, Wilson, Wilson cc, Clopper-Pearson, mid-p,
	// likelihood ratio. The paper prints aberrant limits as they fall; the
	// library clips them (0/20 rows here have none to clip but Wald's).
	tests := []struct {
		k, n int64
		m    interval.Method
		want [2]float64
	}{
		{81, 263, interval.Wald, [2]float64{0.2522, 0.3638}},
		{81, 263, interval.WaldCC, [2]float64{0.2503, 0.3657}},
		{81, 263, interval.Wilson, [2]float64{0.2553, 0.3662}},
		{81, 263, interval.WilsonCC, [2]float64{0.2535, 0.3682}},
		{81, 263, interval.ClopperPearson, [2]float64{0.2527, 0.3676}},
		{81, 263, interval.MidP, [2]float64{0.2544, 0.3658}},
		{81, 263, interval.LikelihoodRatio, [2]float64{0.2542, 0.3655}},
		{0, 20, interval.Wilson, [2]float64{0, 0.1611}},
		{0, 20, interval.WilsonCC, [2]float64{0, 0.2005}},
		{0, 20, interval.ClopperPearson, [2]float64{0, 0.1684}},
		{0, 20, interval.MidP, [2]float64{0, 0.1391}},
		{0, 20, interval.LikelihoodRatio, [2]float64{0, 0.0916}},
	}
	for _, tc := range tests {
		got := limits(t, tc.k, tc.n, interval.Options{Method: tc.m})
		if diff := cmp.Diff(tc.want, got, cmpopts.EquateApprox(0, 0.00005)); diff != "" {
			t.Errorf("%v %d/%d (-want +got):\n%s", tc.m, tc.k, tc.n, diff)
		}
	}
}

func TestNISTClopperPearson(t *testing.T) {
	t.Parallel()
	// NIST/SEMATECH e-Handbook of Statistical Methods, section 7.2.4:
	// 4 defectives in 20, 90% two-sided (limits recalled, recomputed).
	got := limits(t, 4, 20, interval.Options{Method: interval.ClopperPearson, Level: 0.90})
	if diff := cmp.Diff([2]float64{0.0714, 0.4010}, got, cmpopts.EquateApprox(0, 0.00005)); diff != "" {
		t.Errorf("(-want +got):\n%s", diff)
	}
}

func TestZeroFailureBounds(t *testing.T) {
	t.Parallel()
	// Hanley JA, Lippman-Hand A (1983), JAMA 249:1743-1745: 0 events in n
	// gives the exact one-sided 95% upper limit 1 - 0.05^(1/n), n = 14:
	// 0.1926 (rule of three 3/n = 0.2143). REFERENCES.md also lists 30
	// units without failure at 90%: reliability >= 0.10^(1/30) = 0.9261,
	// the one-sided Clopper-Pearson lower limit for 30 successes of 30.
	up := limits(t, 0, 14, interval.Options{Method: interval.ClopperPearson, Side: interval.UpperBound})
	if want := -math.Expm1(math.Log(0.05) / 14); relErr(up[1], want) > 1e-15 || math.Abs(up[1]-0.1926) > 5e-5 {
		t.Errorf("0/14 upper bound = %.17g, want %.17g (0.1926)", up[1], want)
	}
	if up[0] != 0 {
		t.Errorf("0/14 upper bound: lower = %g, want 0", up[0])
	}
	lo := limits(t, 30, 30, interval.Options{Method: interval.ClopperPearson, Side: interval.LowerBound, Level: 0.9})
	if want := math.Pow(0.1, 1.0/30); relErr(lo[0], want) > 1e-15 || math.Abs(lo[0]-0.9261) > 5e-5 || lo[1] != 1 {
		t.Errorf("30/30 lower bound = %v, want [%.17g, 1]", lo, want)
	}
}

func TestGoldenCPWilson(t *testing.T) {
	t.Parallel()
	// testdata/interval_cp_wilson.tsv: Clopper-Pearson from mpmath at 40
	// digits where min(k, n-k) <= 1000, else from SciPy 1.10.1's Beta
	// quantiles (Boost), which the generator found off by up to 1e-10
	// relative against mpmath at n = 1e7, so those rows are held to 1e-9;
	// Wilson from mpmath at 50 digits; n up to 1e7.
	worst := map[string]float64{}
	for _, r := range readGolden(t, "interval_cp_wilson.tsv") {
		k, n, lev := atoi(t, r[0]), atoi(t, r[1]), atof(t, r[2])
		want := map[interval.Method][2]float64{
			interval.ClopperPearson: {atof(t, r[4]), atof(t, r[5])},
			interval.Wilson:         {atof(t, r[7]), atof(t, r[8])},
		}
		tol := map[interval.Method]float64{interval.ClopperPearson: 1e-12, interval.Wilson: 1e-12}
		if r[6] == "scipy" {
			tol[interval.ClopperPearson] = 1e-9
		}
		for m, w := range want {
			var got [2]float64
			if r[3] == "two" {
				got = limits(t, k, n, interval.Options{Method: m, Level: lev})
			} else {
				got[0] = limits(t, k, n, interval.Options{Method: m, Level: lev, Side: interval.LowerBound})[0]
				got[1] = limits(t, k, n, interval.Options{Method: m, Level: lev, Side: interval.UpperBound})[1]
			}
			for i := range 2 {
				e := relErr(got[i], w[i])
				if e > worst[m.String()] {
					worst[m.String()] = e
				}
				if e > tol[m] {
					t.Errorf("%v %d/%d level %v %s limit %d: got %.17g, want %.17g (rel %.2g)", m, k, n, lev, r[3], i, got[i], w[i], e)
				}
			}
		}
	}
	t.Logf("worst relative error: %v", worst)
}

// inverts checks that p is where the tail tail(p) equals target, to 1e-10
// relative, as every root-found limit must.
func inverts(t *testing.T, what string, logTail, target float64) {
	t.Helper()
	if e := math.Abs(math.Expm1(logTail - math.Log(target))); !(e <= 1e-10) {
		t.Errorf("%s: tail probability %.15g, want %.15g (rel %.2g)", what, math.Exp(logTail), target, e)
	}
}

func TestClopperPearsonInversion(t *testing.T) {
	t.Parallel()
	// At the Clopper-Pearson limits the one-sided binomial tails equal the
	// tail probability: P(X >= k; L) = a and P(X <= k; U) = a (Clopper and
	// Pearson 1934), checked with package binom, up to n = 1e12. A limit
	// above 1/2 is checked through its mirror image: U(k) = 1 - L(n-k), and
	// the inversion is checked on the smaller of p and 1-p, because a
	// float64 near 1 holds 1-p only to 1e-16 absolute.
	for _, c := range []struct{ k, n int64 }{
		{1, 1}, {1, 2}, {3, 10}, {81, 263}, {500, 1000}, {999, 1000}, {5, 1e9}, {5, 1e12},
		{1, 1e12}, {123456, 1e12}, {1e12 - 7, 1e12}, {4, 20}, {2, 1e6}, {500000, 1000000},
	} {
		for _, lev := range []float64{0.5, 0.9, 0.95, 0.999999} {
			for _, side := range []interval.Side{interval.TwoSided, interval.LowerBound, interval.UpperBound} {
				opt := interval.Options{Method: interval.ClopperPearson, Level: lev, Side: side}
				iv := limits(t, c.k, c.n, opt)
				mirror := opt
				switch side {
				case interval.LowerBound:
					mirror.Side = interval.UpperBound
				case interval.UpperBound:
					mirror.Side = interval.LowerBound
				}
				mv := limits(t, c.n-c.k, c.n, mirror)
				if math.Abs(iv[0]-(1-mv[1])) > 1e-15 || math.Abs(iv[1]-(1-mv[0])) > 1e-15 {
					t.Errorf("%d/%d %v %v: %v is not the mirror of %v", c.k, c.n, lev, side, iv, mv)
				}
				a := 1 - lev
				if side == interval.TwoSided {
					a /= 2
				}
				what := fmt.Sprintf("%d/%d level %v side %v", c.k, c.n, lev, side)
				if side != interval.UpperBound && c.k > 0 {
					if iv[0] <= 0.5 {
						d, _ := binom.New(c.n, iv[0])
						inverts(t, "lower "+what, d.LogSurvival(c.k-1), a)
					} else { // mirror: upper limit of n-k
						d, _ := binom.New(c.n, mv[1])
						inverts(t, "lower (mirrored) "+what, d.LogCDF(c.n-c.k), a)
					}
				}
				if side != interval.LowerBound && c.k < c.n {
					if iv[1] <= 0.5 {
						d, _ := binom.New(c.n, iv[1])
						inverts(t, "upper "+what, d.LogCDF(c.k), a)
					} else {
						d, _ := binom.New(c.n, mv[0])
						inverts(t, "upper (mirrored) "+what, d.LogSurvival(c.n-c.k-1), a)
					}
				}
			}
		}
	}
}

func TestProportionErrors(t *testing.T) {
	t.Parallel()
	tests := []struct {
		k, n int64
		opt  interval.Options
		want string
	}{
		{12, 10, interval.Options{}, "interval.Proportion: k = 12 exceeds n = 10"},
		{-1, 10, interval.Options{}, "interval.Proportion: k = -1 is negative; counts are 0 or more"},
		{0, 0, interval.Options{}, "interval.Proportion: n = 0 is 0; a proportion needs at least one trial"},
		{0, -2, interval.Options{}, "interval.Proportion: n = -2 is negative; counts are 0 or more"},
		{1, 10, interval.Options{Level: 1}, "interval.Proportion: Level = 1 must lie strictly between 0 and 1 (0 means 0.95)"},
		{1, 10, interval.Options{Level: math.NaN()}, "interval.Proportion: Level = NaN must lie strictly between 0 and 1 (0 means 0.95)"},
		{1, 10, interval.Options{Level: -0.5}, "interval.Proportion: Level = -0.5 must lie strictly between 0 and 1 (0 means 0.95)"},
		{1, 10, interval.Options{Level: 0.3, Side: interval.LowerBound}, "interval.Proportion: Level = 0.3 is below 0.5; a one-sided bound at such a level lies on the far side of the estimate"},
		{1, 10, interval.Options{Method: 99}, "interval.Proportion: Method = 99 is not a method; see the Method constants"},
		{1, 10, interval.Options{Side: 7}, "interval.Proportion: Side = 7 is not a side; use TwoSided, LowerBound or UpperBound"},
	}
	for _, tc := range tests {
		_, err := interval.Proportion(tc.k, tc.n, tc.opt)
		if err == nil || err.Error() != tc.want {
			t.Errorf("Proportion(%d, %d, %+v) error = %v, want %q", tc.k, tc.n, tc.opt, err, tc.want)
			continue
		}
		if !errors.Is(err, interval.ErrInvalidArgument) {
			t.Errorf("%v does not match ErrInvalidArgument", err)
		}
	}
	if _, err := interval.Proportion(1, binom.MaxN+1, interval.Options{}); !errors.Is(err, interval.ErrTooLarge) {
		t.Errorf("n > 2^53: err = %v, want ErrTooLarge", err)
	}
}

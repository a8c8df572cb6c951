package interval_test

import (
	"errors"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/score"
	"github.com/kofnlab/kofn/interval"
)

func pairOf(iv interval.Interval, err error) func(t *testing.T) [2]float64 {
	return func(t *testing.T) [2]float64 {
		t.Helper()
		if err != nil {
			t.Fatal(err)
		}
		return [2]float64{iv.Lower, iv.Upper}
	}
}

func TestNewcombeDifference(t *testing.T) {
	t.Parallel()
	// Newcombe RG (1998), Interval estimation for the difference between
	// independent proportions: comparison of eleven methods, Statistics in
	// Medicine 17:873-890, Table II (recalled, recomputed), 95%, 4 decimals.
	// Method numbers are the paper's.
	tests := []struct {
		k1, n1, k2, n2 int64
		m              interval.DiffMethod
		want           [2]float64
	}{
		{56, 70, 48, 80, interval.DiffWald, [2]float64{0.0575, 0.3425}},              // 1
		{56, 70, 48, 80, interval.DiffWaldCC, [2]float64{0.0441, 0.3559}},            // 2
		{56, 70, 48, 80, interval.DiffMee, [2]float64{0.0533, 0.3377}},               // 5
		{56, 70, 48, 80, interval.DiffMiettinenNurminen, [2]float64{0.0528, 0.3382}}, // 6
		{56, 70, 48, 80, interval.DiffNewcombe, [2]float64{0.0524, 0.3339}},          // 10
		{56, 70, 48, 80, interval.DiffNewcombeCC, [2]float64{0.0428, 0.3422}},        // 11
		{0, 10, 0, 20, interval.DiffNewcombe, [2]float64{-0.1611, 0.2775}},           // 10
		{0, 10, 0, 20, interval.DiffNewcombeCC, [2]float64{-0.2005, 0.3445}},         // 11
	}
	for _, tc := range tests {
		got := pairOf(interval.Difference(tc.k1, tc.n1, tc.k2, tc.n2, interval.DiffOptions{Method: tc.m}))(t)
		if diff := cmp.Diff(tc.want, got, cmpopts.EquateApprox(0, 0.00005)); diff != "" {
			t.Errorf("%v %d/%d - %d/%d (-want +got):\n%s", tc.m, tc.k1, tc.n1, tc.k2, tc.n2, diff)
		}
	}
}

func TestAgrestiRelativeRiskOddsRatio(t *testing.T) {
	t.Parallel()
	// Agresti A (2019), An Introduction to Categorical Data Analysis, 3rd
	// ed., section 2.2 (counts read; intervals recalled, recomputed):
	// placebo 189/11034, aspirin 104/11037 heart attacks. Difference 0.0077
	// with Wald 95% (0.005, 0.011); relative risk 1.82 with log-scale Wald
	// (1.43, 2.31); odds ratio 1.83 with (1.44, 2.33).
	d, err := interval.Difference(189, 11034, 104, 11037, interval.DiffOptions{Method: interval.DiffWald})
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff([3]float64{0.0077, 0.005, 0.011}, [3]float64{d.Estimate, d.Lower, d.Upper}, cmpopts.EquateApprox(0, 0.0005)); diff != "" {
		t.Errorf("difference (-want +got):\n%s", diff)
	}
	r, err := interval.Ratio(189, 11034, 104, 11037, interval.RatioOptions{Method: interval.RatioKatz})
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff([3]float64{1.82, 1.43, 2.31}, [3]float64{r.Estimate, r.Lower, r.Upper}, cmpopts.EquateApprox(0, 0.005)); diff != "" {
		t.Errorf("relative risk (-want +got):\n%s", diff)
	}
	o, err := interval.OddsRatio(189, 11034, 104, 11037, interval.OddsOptions{Method: interval.OddsWoolf})
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff([3]float64{1.83, 1.44, 2.33}, [3]float64{o.Estimate, o.Lower, o.Upper}, cmpopts.EquateApprox(0, 0.005)); diff != "" {
		t.Errorf("odds ratio (-want +got):\n%s", diff)
	}
}

// TestScoreInversion checks every score limit by inversion: the score
// statistic at the limit equals +-z to 1e-10 (and the normal tail beyond it
// equals the tail probability to 1e-10 relative).
func TestScoreInversion(t *testing.T) {
	t.Parallel()
	data := [][4]int64{{56, 70, 48, 80}, {0, 10, 0, 20}, {7, 15, 12, 15}, {10, 10, 0, 10}, {3, 1000, 1, 50}, {1, 2, 1, 3}, {189, 11034, 104, 11037}, {5, 1e9, 9, 1e9}, {400, 1000, 380, 1000}}
	for _, d := range data {
		for _, lev := range []float64{0.8, 0.95, 0.999} {
			for _, side := range []interval.Side{interval.TwoSided, interval.LowerBound, interval.UpperBound} {
				a := 1 - lev
				if side == interval.TwoSided {
					a /= 2
				}
				check := func(name string, zAt func(float64) float64, lo, hi, min, max float64) {
					t.Helper()
					if side != interval.UpperBound && lo > min {
						inverts(t, name+" lower "+fmtData(d), math.Log(normalUpper(zAt(lo))), a)
					}
					if side != interval.LowerBound && hi < max {
						inverts(t, name+" upper "+fmtData(d), math.Log(normalUpper(-zAt(hi))), a)
					}
				}
				for _, v := range []score.Variance{score.MiettinenNurminen, score.FarringtonManning} {
					dm, rm := interval.DiffMiettinenNurminen, interval.RatioMiettinenNurminen
					if v == score.FarringtonManning {
						dm, rm = interval.DiffMee, interval.RatioKoopman
					}
					iv, err := interval.Difference(d[0], d[1], d[2], d[3], interval.DiffOptions{Method: dm, Level: lev, Side: side})
					if err != nil {
						t.Fatal(err)
					}
					check(dm.String(), func(x float64) float64 { return score.DiffZ(d[0], d[1], d[2], d[3], x, v) }, iv.Lower, iv.Upper, -1, 1)
					iv, err = interval.Ratio(d[0], d[1], d[2], d[3], interval.RatioOptions{Method: rm, Level: lev, Side: side})
					if err != nil {
						t.Fatal(err)
					}
					check(rm.String(), func(x float64) float64 { return score.RatioZ(d[0], d[1], d[2], d[3], x, v) }, iv.Lower, iv.Upper, 0, math.Inf(1))
				}
				iv, err := interval.OddsRatio(d[0], d[1], d[2], d[3], interval.OddsOptions{Level: lev, Side: side})
				if err != nil {
					t.Fatal(err)
				}
				check("odds MN", func(x float64) float64 { return score.OddsZ(d[0], d[1], d[2], d[3], x, score.MiettinenNurminen) }, iv.Lower, iv.Upper, 0, math.Inf(1))
			}
		}
	}
}

func fmtData(d [4]int64) string {
	return itoa(d[0]) + "/" + itoa(d[1]) + " vs " + itoa(d[2]) + "/" + itoa(d[3])
}

func itoa(v int64) string { return fmtInt(v) }

// normalUpper returns P(Z > z) for a standard normal Z.
func normalUpper(z float64) float64 { return 0.5 * math.Erfc(z/math.Sqrt2) }

func TestTwoSampleEdges(t *testing.T) {
	t.Parallel()
	// Zero counts: the score intervals reach the ends of the range, the
	// estimates follow their conventions (common practice, exact).
	r, err := interval.Ratio(3, 10, 0, 10, interval.RatioOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if !math.IsInf(r.Upper, 1) || !math.IsInf(r.Estimate, 1) || !(r.Lower > 0) {
		t.Errorf("3/10 vs 0/10 ratio: %+v", r)
	}
	r, err = interval.Ratio(0, 10, 0, 10, interval.RatioOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r.Lower != 0 || !math.IsInf(r.Upper, 1) || !math.IsNaN(r.Estimate) || len(r.Warnings) == 0 {
		t.Errorf("0/10 vs 0/10 ratio: %+v", r)
	}
	o, err := interval.OddsRatio(0, 10, 5, 10, interval.OddsOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if o.Lower != 0 || o.Estimate != 0 || !(o.Upper > 0 && o.Upper < math.Inf(1)) {
		t.Errorf("0/10 vs 5/10 odds ratio: %+v", o)
	}
	w, err := interval.OddsRatio(0, 10, 5, 10, interval.OddsOptions{Method: interval.OddsWoolf})
	if err != nil {
		t.Fatal(err)
	}
	if len(w.Warnings) != 1 || !(w.Lower > 0) {
		t.Errorf("Woolf with a zero cell: %+v", w)
	}
	d, err := interval.Difference(10, 10, 0, 10, interval.DiffOptions{Method: interval.DiffWald})
	if err != nil {
		t.Fatal(err)
	}
	if d.Lower != 1 || d.Upper != 1 {
		t.Errorf("Wald 10/10 - 0/10: %+v", d)
	}
	d, err = interval.Difference(10, 10, 0, 10, interval.DiffOptions{Method: interval.DiffMiettinenNurminen})
	if err != nil {
		t.Fatal(err)
	}
	if d.Upper != 1 || !(d.Lower > 0.6 && d.Lower < 1) {
		t.Errorf("MN 10/10 - 0/10: %+v", d)
	}
}

// TestConditionalBound checks that the exact conditional odds-ratio
// computations refuse tables beyond MaxConditionalStdDev with interval.ErrTooLarge
// (counts of 2^50 to 2^52 ran for minutes before the bound) and accept the
// largest balanced table inside it.
func TestConditionalBound(t *testing.T) {
	t.Parallel()
	for _, e := range []uint{50, 51, 52} {
		n := int64(1) << e
		for _, m := range []interval.OddsMethod{interval.OddsCornfield, interval.OddsCornfieldMidP} {
			if _, err := interval.OddsRatio(n/2, n, n/4, n, interval.OddsOptions{Method: m}); !errors.Is(err, interval.ErrTooLarge) {
				t.Errorf("OddsRatio(2^%d, %v) error = %v, want ErrTooLarge", e, m, err)
			}
		}
		if _, err := interval.OddsRatioCMLE(n/2, n, n/4, n); !errors.Is(err, interval.ErrTooLarge) {
			t.Errorf("OddsRatioCMLE(2^%d) error = %v, want ErrTooLarge", e, err)
		}
		// The score interval answers at that size.
		if _, err := interval.OddsRatio(n/2, n, n/4, n, interval.OddsOptions{}); err != nil {
			t.Errorf("interval.OddsRatio(2^%d, Miettinen-Nurminen): %v", e, err)
		}
	}
	// Cells of 1.6e7 each: sigma just under 2048.
	const c = 16_700_000
	if iv, err := interval.OddsRatio(c, 2*c, c, 2*c, interval.OddsOptions{Method: interval.OddsCornfield}); err != nil || !(iv.Lower < 1 && iv.Upper > 1) {
		t.Errorf("OddsRatio at the bound = %+v, %v; want an interval around 1", iv, err)
	}
}

// TestOddsScoreZeroCell checks the Miettinen-Nurminen odds-ratio interval
// of a table with a zero cell and estimate 0 (a = 4, b = 60, c = 1, d = 0):
// the score statistic tends to 0 as the odds ratio does, never reaching a
// critical value, so the lower limit is 0 at every level. (Rounding in
// 1 - p2 near psi = 1e-12 once gave 1e-12 limits that shrank as the level
// grew.)
func TestOddsScoreZeroCell(t *testing.T) {
	t.Parallel()
	for _, lv := range []float64{0.396, 0.8, 0.95, 0.99} {
		iv, err := interval.OddsRatio(4, 64, 1, 1, interval.OddsOptions{Level: lv})
		if err != nil || iv.Lower != 0 || !(iv.Upper > 0) {
			t.Errorf("level %g: %+v, %v; want lower limit 0", lv, iv, err)
		}
	}
}

package interval_test

import (
	"context"
	"fmt"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"

	"github.com/kofnlab/kofn/interval"
)

// TestCommonOneStratum: with one stratum the Mantel-Haenszel estimators
// and their variances reduce to the single-table forms (algebra of the
// formulas, derivable by hand): the Robins-Breslow-Greenland variance to
// Woolf's 1/a + 1/b + 1/c + 1/d, the Greenland-Robins log risk-ratio
// variance to Katz's 1/a - 1/n1 + 1/c - 1/n2, and the Greenland-Robins
// risk-difference variance to the Wald p1 q1/n1 + p2 q2/n2; so the
// intervals equal interval.OddsRatio (Woolf), interval.Ratio (Katz) and
// interval.Difference (Wald) to rounding.
func TestCommonOneStratum(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	for _, s := range []interval.Stratum{{K1: 12, N1: 30, K2: 6, N2: 28}, {K1: 150, N1: 600, K2: 140, N2: 620}, {K1: 3, N1: 9, K2: 5, N2: 7}} {
		ts := []interval.Stratum{s}
		or, _ := interval.CommonOddsRatio(ctx, ts, interval.CommonOptions{})
		woolf, _ := interval.OddsRatio(s.K1, s.N1, s.K2, s.N2, interval.OddsOptions{Method: interval.OddsWoolf})
		rr, _ := interval.CommonRiskRatio(context.Background(), ts, interval.CommonOptions{})
		katz, _ := interval.Ratio(s.K1, s.N1, s.K2, s.N2, interval.RatioOptions{Method: interval.RatioKatz})
		rd, _ := interval.CommonRiskDifference(context.Background(), ts, interval.CommonOptions{Method: interval.CommonMantelHaenszelGR})
		wald, _ := interval.Difference(s.K1, s.N1, s.K2, s.N2, interval.DiffOptions{Method: interval.DiffWald})
		got := []float64{or.Estimate, or.Lower, or.Upper, rr.Estimate, rr.Lower, rr.Upper, rd.Estimate, rd.Lower, rd.Upper}
		want := []float64{woolf.Estimate, woolf.Lower, woolf.Upper, katz.Estimate, katz.Lower, katz.Upper, wald.Estimate, wald.Lower, wald.Upper}
		if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-12, 1e-15)); diff != "" {
			t.Errorf("%+v (-single table +common):\n%s", s, diff)
		}
	}
}

// TestCommonRiskDifferenceSato: Sato's variance is consistent with large
// strata, so it agrees with the Greenland-Robins large-strata variance
// when every stratum is large (within 2% of the standard error; Sato 1989,
// Biometrics 45:1323-1324, designed it to hold in both limits), and stays
// finite and positive with many sparse strata, where the Greenland-Robins
// variance is not meant to be used.
func TestCommonRiskDifferenceSato(t *testing.T) {
	t.Parallel()
	large := []interval.Stratum{{K1: 310, N1: 1000, K2: 270, N2: 1000}, {K1: 150, N1: 600, K2: 140, N2: 620}, {K1: 80, N1: 300, K2: 61, N2: 290}}
	sato, _ := interval.CommonRiskDifference(context.Background(), large, interval.CommonOptions{})
	gr, _ := interval.CommonRiskDifference(context.Background(), large, interval.CommonOptions{Method: interval.CommonMantelHaenszelGR})
	if sato.Estimate != gr.Estimate || math.Abs(sato.Width()/gr.Width()-1) > 0.02 {
		t.Errorf("large strata: Sato %+v, Greenland-Robins %+v", sato, gr)
	}
	var sparse []interval.Stratum
	for i := range 40 {
		sparse = append(sparse, interval.Stratum{K1: int64(i % 2), N1: 2, K2: int64(i % 3 / 2), N2: 2})
	}
	sp, err := interval.CommonRiskDifference(context.Background(), sparse, interval.CommonOptions{})
	if err != nil || !(sp.Width() > 0) || math.IsNaN(sp.Lower) {
		t.Errorf("sparse strata: %+v, %v", sp, err)
	}
}

// TestCommonErrorsAndEdges: methods for another effect are refused by
// name; an undefined Mantel-Haenszel odds ratio is NaN with a warning and
// the widest interval.
func TestCommonErrorsAndEdges(t *testing.T) {
	t.Parallel()
	ts := []interval.Stratum{{K1: 0, N1: 5, K2: 0, N2: 4}}
	iv, err := interval.CommonOddsRatio(context.Background(), ts, interval.CommonOptions{})
	if err != nil || !math.IsNaN(iv.Estimate) || len(iv.Warnings) == 0 || iv.Lower != 0 || !math.IsInf(iv.Upper, 1) {
		t.Errorf("no successes: %+v, %v", iv, err)
	}
	if _, err := interval.CommonRiskRatio(context.Background(), ts, interval.CommonOptions{Method: interval.CommonExactConditional}); err == nil {
		t.Error("exact conditional risk ratio: no error")
	}
	if _, err := interval.CommonOddsRatio(context.Background(), ts, interval.CommonOptions{Method: interval.CommonMantelHaenszelGR}); err == nil {
		t.Error("Greenland-Robins risk-difference variance for an odds ratio: no error")
	}
	for _, m := range interval.CommonMethodValues() {
		if got, err := interval.ParseCommonMethod(m.String()); err != nil || got != m {
			t.Errorf("%v: %v, %v", m, got, err)
		}
	}
}

// Invented scenario: a checkout change tried on three sites; the common
// odds ratio of conversion across the sites.
func ExampleCommonOddsRatio() {
	sites := []interval.Stratum{{K1: 12, N1: 30, K2: 6, N2: 28}, {K1: 8, N1: 25, K2: 5, N2: 27}, {K1: 15, N1: 40, K2: 9, N2: 38}}
	iv, _ := interval.CommonOddsRatio(context.Background(), sites, interval.CommonOptions{})
	fmt.Printf("%s: %.3f [%.3f, %.3f]\n", iv.Method, iv.Estimate, iv.Lower, iv.Upper)
	// Output: Mantel-Haenszel Robins-Breslow-Greenland: 2.118 [1.108, 4.047]
}

// TestStratifiedScore: with one stratum the stratified Miettinen-Nurminen
// interval is Difference's Miettinen-Nurminen interval (checked there
// against Newcombe 1998, Table II, method 6); with several strata the
// interval contains the Mantel-Haenszel estimate and is about as wide as
// Sato's (internal/score checks the statistic itself).
func TestStratifiedScore(t *testing.T) {
	t.Parallel()
	one := []interval.Stratum{{K1: 56, N1: 70, K2: 48, N2: 80}}
	got, err := interval.CommonRiskDifference(context.Background(), one, interval.CommonOptions{Method: interval.CommonStratifiedScore})
	if err != nil {
		t.Fatal(err)
	}
	mn, _ := interval.Difference(56, 70, 48, 80, interval.DiffOptions{Method: interval.DiffMiettinenNurminen})
	if diff := cmp.Diff([]float64{mn.Lower, mn.Upper}, []float64{got.Lower, got.Upper}, cmpopts.EquateApprox(1e-9, 0)); diff != "" {
		t.Errorf("one stratum (-Difference +stratified):\n%s", diff)
	}
	// Newcombe (1998), Table II, 56/70 - 48/80, method 6 (recalled, recomputed): 0.0528 to 0.3382.
	if diff := cmp.Diff([]float64{0.0528, 0.3382}, []float64{got.Lower, got.Upper}, cmpopts.EquateApprox(0, 5e-5)); diff != "" {
		t.Errorf("Newcombe Table II (-want +got):\n%s", diff)
	}
	sites := []interval.Stratum{{K1: 12, N1: 30, K2: 6, N2: 28}, {K1: 8, N1: 25, K2: 5, N2: 27}, {K1: 15, N1: 40, K2: 9, N2: 38}}
	iv, err := interval.CommonRiskDifference(context.Background(), sites, interval.CommonOptions{Method: interval.CommonStratifiedScore})
	if err != nil || !(iv.Lower < iv.Estimate && iv.Estimate < iv.Upper) {
		t.Fatalf("%+v, %v", iv, err)
	}
	mh, _ := interval.CommonRiskDifference(context.Background(), sites, interval.CommonOptions{})
	if math.Abs(iv.Width()/mh.Width()-1) > 0.15 {
		t.Errorf("stratified score width %v far from the Mantel-Haenszel Sato width %v", iv.Width(), mh.Width())
	}
}

// TestStratifiedScoreRatio: with one stratum the stratified
// Miettinen-Nurminen interval of the ratio is Ratio's Miettinen-Nurminen
// interval; with several strata it contains the Mantel-Haenszel estimate.
func TestStratifiedScoreRatio(t *testing.T) {
	t.Parallel()
	for _, s := range []interval.Stratum{{K1: 56, N1: 70, K2: 48, N2: 80}, {K1: 3, N1: 20, K2: 9, N2: 21}} {
		got, err := interval.CommonRiskRatio(context.Background(), []interval.Stratum{s}, interval.CommonOptions{Method: interval.CommonStratifiedScore})
		if err != nil {
			t.Fatal(err)
		}
		mn, _ := interval.Ratio(s.K1, s.N1, s.K2, s.N2, interval.RatioOptions{Method: interval.RatioMiettinenNurminen})
		if diff := cmp.Diff([]float64{mn.Lower, mn.Upper}, []float64{got.Lower, got.Upper}, cmpopts.EquateApprox(1e-9, 0)); diff != "" {
			t.Errorf("%+v (-Ratio +stratified):\n%s", s, diff)
		}
	}
	sites := []interval.Stratum{{K1: 12, N1: 30, K2: 6, N2: 28}, {K1: 8, N1: 25, K2: 5, N2: 27}, {K1: 15, N1: 40, K2: 9, N2: 38}}
	iv, err := interval.CommonRiskRatio(context.Background(), sites, interval.CommonOptions{Method: interval.CommonStratifiedScore})
	if err != nil || !(iv.Lower < iv.Estimate && iv.Estimate < iv.Upper) {
		t.Fatalf("%+v, %v", iv, err)
	}
}

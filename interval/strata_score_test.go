package interval_test

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/golden"
	"github.com/kofnlab/kofn/interval"
)

// readStrataSets returns the invented strata sets of
// testdata/strata_r.tsv by name.
func readStrataSets(t *testing.T) map[string][]interval.Stratum {
	t.Helper()
	sets := map[string][]interval.Stratum{}
	for _, r := range golden.Read(t, "../testdata/strata_r.tsv") {
		if r.Str(0) != "strata" {
			continue
		}
		var v []int64
		for _, f := range strings.Split(r.Str(2), ",") {
			n, err := strconv.ParseInt(f, 10, 64)
			if err != nil {
				t.Fatalf("%s: %v", r.Pos(), err)
			}
			v = append(v, n)
		}
		var ts []interval.Stratum
		for i := 0; i+3 < len(v); i += 4 {
			ts = append(ts, interval.Stratum{K1: v[i], N1: v[i+1], K2: v[i+2], N2: v[i+3]})
		}
		sets[r.Str(1)] = ts
	}
	return sets
}

// TestStratifiedScoreAgainstMpmath: both weightings of the stratified
// score intervals of the difference, the ratio and the odds ratio against
// testdata/strata_score.tsv and testdata/strata_score_odds.tsv, made by an independent mpmath solution of
// the same score equations at 50 digits (testdata/gen/strata_score.py:
// restricted estimates by bisection on the likelihood's derivative rather
// than the cubic and the quadratic kofn solves, limits by a 200-point scan
// and bisection). 1e-9 relative.
func TestStratifiedScoreAgainstMpmath(t *testing.T) {
	t.Parallel()
	sets := readStrataSets(t)
	// invented: four clinics of very different sizes and rates (as in the generator)
	sets["uneven"] = []interval.Stratum{{K1: 9, N1: 12, K2: 4, N2: 10}, {K1: 40, N1: 150, K2: 22, N2: 160}, {K1: 3, N1: 30, K2: 1, N2: 25}, {K1: 70, N1: 90, K2: 55, N2: 95}}
	rows := golden.Read(t, "../testdata/strata_score.tsv")
	odds := golden.Read(t, "../testdata/strata_score_odds.tsv")
	if len(rows) < 60 || len(odds) < 30 {
		t.Fatalf("%d and %d golden rows, want 60 and 30", len(rows), len(odds))
	}
	for _, r := range append(rows, odds...) {
		ts, ok := sets[r.Str(0)]
		if !ok {
			t.Fatalf("%s: unknown set %q", r.Pos(), r.Str(0))
		}
		w, err := interval.ParseScoreWeights(r.Str(2))
		if err != nil {
			t.Fatalf("%s: %v", r.Pos(), err)
		}
		side := interval.TwoSided
		if r.Str(4) == "lower bound" {
			side = interval.LowerBound
		}
		opt := interval.CommonOptions{Method: interval.CommonStratifiedScore, Weights: w, Level: r.Float(3), Side: side}
		var iv interval.Interval
		switch r.Str(1) {
		case "difference":
			iv, err = interval.CommonRiskDifference(context.Background(), ts, opt)
		case "odds":
			iv, err = interval.CommonOddsRatio(context.Background(), ts, opt)
		default:
			iv, err = interval.CommonRiskRatio(context.Background(), ts, opt)
		}
		if err != nil {
			t.Fatalf("%s: %v", r.Pos(), err)
		}
		want := []float64{r.Float(5), r.Float(6), r.Float(7)}
		got := []float64{iv.Estimate, iv.Lower, iv.Upper}
		if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-9, 0)); diff != "" {
			t.Errorf("%s %s %s %s (-mpmath +kofn):\n%s", r.Pos(), r.Str(0), r.Str(1), r.Str(2), diff)
		}
	}
}

// TestStratifiedScoreWeightsOneStratum: with one stratum every weighting
// gives the unstratified Miettinen-Nurminen interval (the weight cancels
// from the statistic), which interval.Difference, interval.Ratio and
// interval.OddsRatio check against published values (Newcombe 1998,
// Table II, method 6, for the difference; see their tests).
func TestStratifiedScoreWeightsOneStratum(t *testing.T) {
	t.Parallel()
	for _, s := range []interval.Stratum{{K1: 56, N1: 70, K2: 48, N2: 80}, {K1: 3, N1: 20, K2: 9, N2: 21}, {K1: 0, N1: 10, K2: 0, N2: 12}, {K1: 9, N1: 10, K2: 0, N2: 20}, {K1: 5, N1: 5, K2: 3, N2: 6}} {
		ts := []interval.Stratum{s}
		mnd, _ := interval.Difference(s.K1, s.N1, s.K2, s.N2, interval.DiffOptions{Method: interval.DiffMiettinenNurminen})
		mnr, _ := interval.Ratio(s.K1, s.N1, s.K2, s.N2, interval.RatioOptions{Method: interval.RatioMiettinenNurminen})
		mno, _ := interval.OddsRatio(s.K1, s.N1, s.K2, s.N2, interval.OddsOptions{Method: interval.OddsMiettinenNurminen})
		for _, w := range interval.ScoreWeightsValues() {
			opt := interval.CommonOptions{Method: interval.CommonStratifiedScore, Weights: w}
			d, err := interval.CommonRiskDifference(context.Background(), ts, opt)
			if err != nil {
				t.Fatal(err)
			}
			if diff := cmp.Diff([]float64{mnd.Lower, mnd.Upper}, []float64{d.Lower, d.Upper}, cmpopts.EquateApprox(1e-9, 1e-14)); diff != "" {
				t.Errorf("%+v %v difference (-Difference +stratified):\n%s", s, w, diff)
			}
			o, err := interval.CommonOddsRatio(context.Background(), ts, opt)
			if err != nil {
				t.Fatal(err)
			}
			if diff := cmp.Diff([]float64{mno.Estimate, mno.Lower, mno.Upper}, []float64{o.Estimate, o.Lower, o.Upper}, cmpopts.EquateApprox(1e-9, 0), cmpopts.EquateNaNs()); diff != "" {
				t.Errorf("%+v %v odds ratio (-OddsRatio +stratified):\n%s", s, w, diff)
			}
			if s.K1+s.K2 == 0 || s.K2 == 0 {
				continue // the ratio's Mantel-Haenszel estimate is 0/0 or infinite
			}
			r, err := interval.CommonRiskRatio(context.Background(), ts, opt)
			if err != nil {
				t.Fatal(err)
			}
			if diff := cmp.Diff([]float64{mnr.Lower, mnr.Upper}, []float64{r.Lower, r.Upper}, cmpopts.EquateApprox(1e-9, 0)); diff != "" {
				t.Errorf("%+v %v ratio (-Ratio +stratified):\n%s", s, w, diff)
			}
		}
	}
}

// TestStratifiedScoreWeightsErrors: weights other than the default need
// the stratified score method; enum values outside the list are refused
// by name; an all-failure stratum under inverse-variance weights is
// warned about, and its interval reaches 0 (derivable: its weight grows
// without bound at a difference of 0, where Z tends to 0).
func TestStratifiedScoreWeightsErrors(t *testing.T) {
	t.Parallel()
	ts := []interval.Stratum{{K1: 0, N1: 10, K2: 3, N2: 12}, {K1: 2, N1: 15, K2: 6, N2: 14}, {K1: 0, N1: 8, K2: 0, N2: 9}}
	if _, err := interval.CommonRiskDifference(context.Background(), ts, interval.CommonOptions{Weights: interval.WeightsInverseVariance}); err == nil || !strings.Contains(err.Error(), "Weights") {
		t.Errorf("weights without the score method: %v", err)
	}
	if _, err := interval.CommonRiskRatio(context.Background(), ts, interval.CommonOptions{Method: interval.CommonStratifiedScore, Weights: 7}); err == nil || !strings.Contains(err.Error(), "Weights") {
		t.Errorf("weights 7: %v", err)
	}
	iv, err := interval.CommonRiskDifference(context.Background(), ts, interval.CommonOptions{Method: interval.CommonStratifiedScore, Weights: interval.WeightsInverseVariance})
	if err != nil || len(iv.Warnings) == 0 || !(iv.Lower < 0 && iv.Upper >= 0) {
		t.Errorf("all-failure stratum: %+v, %v", iv, err)
	}
	mh, _ := interval.CommonRiskDifference(context.Background(), ts, interval.CommonOptions{Method: interval.CommonStratifiedScore})
	if len(mh.Warnings) != 0 || !(mh.Upper < 0) {
		t.Errorf("Mantel-Haenszel weights: %+v", mh)
	}
	big := make([]interval.Stratum, interval.MaxScoreStrata+1)
	for i := range big {
		big[i] = interval.Stratum{K1: 1, N1: 2, K2: 1, N2: 2}
	}
	if _, err := interval.CommonRiskDifference(context.Background(), big, interval.CommonOptions{Method: interval.CommonStratifiedScore}); err == nil || !strings.Contains(err.Error(), "MaxScoreStrata") {
		t.Errorf("too many strata: %v", err)
	}
	for _, w := range interval.ScoreWeightsValues() {
		if got, err := interval.ParseScoreWeights(w.String()); err != nil || got != w {
			t.Errorf("%v: %v, %v", w, got, err)
		}
	}
}

// TestStratifiedScoreCoverage: exact coverage by enumeration of every
// outcome of small invented designs, each a common difference or ratio
// across strata with different baseline rates. Figures at 95% (two-sided,
// computed by this test; no published figure for these designs), with
// Mantel-Haenszel and inverse-variance weights: design A, 2 strata of
// 10+10 and 6+8 trials, p2 = 0.2, 0.5, difference 0.2: 0.9520 and 0.9522;
// design B, 3 strata of 4+4, 5+4, 3+5, p2 = 0.1, 0.3, 0.6, difference 0.1:
// 0.9555 and 0.9765 (the all-failure and all-success strata of such tiny
// designs pull the inverse-variance interval to 0); design C, ratio 2 with
// p2 = 0.1, 0.2 in 2 strata of 12+12 and 9+10: 0.9684 and 0.9666; design
// D, odds ratio 3 with p2 = 0.2, 0.4 in 2 strata of 10+10 and 8+9: 0.9510
// and 0.9487. Score
// intervals are not exact, so the check is that the coverage lies within
// 0.93 to 0.99 (a gross error of a limit leaves that band) and that the
// outcomes' probabilities sum to 1.
func TestStratifiedScoreCoverage(t *testing.T) {
	if testing.Short() {
		t.Skip("enumeration of every outcome")
	}
	t.Parallel()
	type design struct {
		name   string
		n1, n2 []int64
		p2     []float64
		effect float64
		kind   string
	}
	designs := []design{
		{"A", []int64{10, 6}, []int64{10, 8}, []float64{0.2, 0.5}, 0.2, "difference"},
		{"B", []int64{4, 5, 3}, []int64{4, 4, 5}, []float64{0.1, 0.3, 0.6}, 0.1, "difference"},
		{"C", []int64{12, 9}, []int64{12, 10}, []float64{0.1, 0.2}, 2, "ratio"},
		{"D", []int64{10, 8}, []int64{10, 9}, []float64{0.2, 0.4}, 3, "odds"},
	}
	for _, d := range designs {
		for _, w := range interval.ScoreWeightsValues() {
			cov, total := coverage(t, d.n1, d.n2, d.p2, d.effect, d.kind, w)
			t.Logf("design %s, %v weights: coverage %.4f", d.name, w, cov)
			if math.Abs(total-1) > 1e-9 || cov < 0.93 || cov > 0.99 {
				t.Errorf("design %s, %v weights: coverage %.4f (total probability %v)", d.name, w, cov, total)
			}
		}
	}
}

// coverage enumerates every outcome of the strata and sums the
// probabilities of those whose interval holds the true effect.
func coverage(t *testing.T, n1, n2 []int64, p2 []float64, effect float64, kind string, w interval.ScoreWeights) (cov, total float64) {
	t.Helper()
	k := len(n1)
	pmf := make([][2][]float64, k)
	for i := range k {
		p1 := p2[i] + effect
		switch kind {
		case "ratio":
			p1 = p2[i] * effect
		case "odds":
			p1 = effect * p2[i] / (1 - p2[i] + effect*p2[i])
		}
		for g, pn := range [2]struct {
			n int64
			p float64
		}{{n1[i], p1}, {n2[i], p2[i]}} {
			dist, err := binom.New(pn.n, pn.p)
			if err != nil {
				t.Fatal(err)
			}
			for x := int64(0); x <= pn.n; x++ {
				pmf[i][g] = append(pmf[i][g], dist.Prob(x))
			}
		}
	}
	ts := make([]interval.Stratum, k)
	var walk func(i int, prob float64)
	walk = func(i int, prob float64) {
		if i == k {
			total += prob
			opt := interval.CommonOptions{Method: interval.CommonStratifiedScore, Weights: w}
			var iv interval.Interval
			var err error
			switch kind {
			case "ratio":
				iv, err = interval.CommonRiskRatio(context.Background(), ts, opt)
			case "odds":
				iv, err = interval.CommonOddsRatio(context.Background(), ts, opt)
			default:
				iv, err = interval.CommonRiskDifference(context.Background(), ts, opt)
			}
			if err != nil {
				t.Fatal(err)
			}
			if iv.Lower <= effect && effect <= iv.Upper {
				cov += prob
			}
			return
		}
		for x1 := range int64(len(pmf[i][0])) {
			for x2 := range int64(len(pmf[i][1])) {
				ts[i] = interval.Stratum{K1: x1, N1: n1[i], K2: x2, N2: n2[i]}
				walk(i+1, prob*pmf[i][0][x1]*pmf[i][1][x2])
			}
		}
	}
	walk(0, 1)
	return cov, total
}

// Invented scenario: a reminder message tried at four clinics of very
// different sizes; the common difference in follow-up rates with the
// two weightings of the stratified score interval.
func ExampleScoreWeights() {
	clinics := []interval.Stratum{{K1: 9, N1: 12, K2: 4, N2: 10}, {K1: 40, N1: 150, K2: 22, N2: 160}, {K1: 3, N1: 30, K2: 1, N2: 25}, {K1: 70, N1: 90, K2: 55, N2: 95}}
	for _, w := range interval.ScoreWeightsValues() {
		iv, _ := interval.CommonRiskDifference(context.Background(), clinics, interval.CommonOptions{Method: interval.CommonStratifiedScore, Weights: w})
		fmt.Printf("%s weights: %.4f [%.4f, %.4f]\n", w, iv.Estimate, iv.Lower, iv.Upper)
	}
	// Output:
	// Mantel-Haenszel weights: 0.1536 [0.0856, 0.2219]
	// inverse-variance score weights: 0.1378 [0.0703, 0.2075]
}

// FuzzStratifiedScore: every stratified score interval, with either
// weighting, gives ordered limits inside the parameter's range, no NaN
// limit, and (without a warning of a broken acceptance set) an estimate
// between its limits.
func FuzzStratifiedScore(f *testing.F) {
	f.Add(int64(12), int64(30), int64(6), int64(28), int64(3), int64(5), int64(2), int64(1), uint8(3), uint8(0))
	f.Add(int64(0), int64(10), int64(0), int64(12), int64(1), int64(1), int64(1), int64(1), uint8(2), uint8(1))
	f.Fuzz(func(t *testing.T, a, b, c, d, e, g, h, i int64, k, w uint8) {
		var ts []interval.Stratum
		for j := range int64(k%5 + 1) {
			n1, n2 := (b+j*g)%30, (d+j*i)%30
			if n1 < 0 {
				n1 = -n1
			}
			if n2 < 0 {
				n2 = -n2
			}
			k1, k2 := (a+j*e)%(n1+1), (c+j*h)%(n2+1)
			if k1 < 0 {
				k1 = -k1
			}
			if k2 < 0 {
				k2 = -k2
			}
			ts = append(ts, interval.Stratum{K1: k1, N1: n1, K2: k2, N2: n2})
		}
		opt := interval.CommonOptions{Method: interval.CommonStratifiedScore, Weights: interval.ScoreWeights(w % 2)}
		check := func(name string, iv interval.Interval, err error, lo, hi float64) {
			if err != nil {
				t.Fatalf("%s %+v: %v", name, ts, err)
			}
			if math.IsNaN(iv.Lower) || math.IsNaN(iv.Upper) || iv.Lower > iv.Upper || iv.Lower < lo || iv.Upper > hi {
				t.Fatalf("%s %+v: %+v", name, ts, iv)
			}
			if len(iv.Warnings) == 0 && !math.IsNaN(iv.Estimate) && (iv.Estimate < iv.Lower-1e-9*math.Abs(iv.Lower)-1e-12 || iv.Estimate > iv.Upper+1e-9*math.Abs(iv.Upper)+1e-12) {
				t.Fatalf("%s %+v: estimate outside: %+v", name, ts, iv)
			}
		}
		iv, err := interval.CommonRiskDifference(context.Background(), ts, opt)
		check("difference", iv, err, -1, 1)
		iv, err = interval.CommonRiskRatio(context.Background(), ts, opt)
		check("ratio", iv, err, 0, math.Inf(1))
		iv, err = interval.CommonOddsRatio(context.Background(), ts, opt)
		check("odds", iv, err, 0, math.Inf(1))
	})
}

// BenchmarkStratifiedScore: the stratified score intervals over 100
// invented strata of 10 + 12 trials, by effect and weighting.
func BenchmarkStratifiedScore(b *testing.B) {
	ts := make([]interval.Stratum, 100)
	for i := range ts {
		ts[i] = interval.Stratum{K1: int64(1 + i%7), N1: 10, K2: int64(1 + i%5), N2: 12}
	}
	for _, w := range interval.ScoreWeightsValues() {
		opt := interval.CommonOptions{Method: interval.CommonStratifiedScore, Weights: w}
		name := "mh"
		if w == interval.WeightsInverseVariance {
			name = "ivs"
		}
		b.Run("difference/"+name, func(b *testing.B) {
			for b.Loop() {
				if _, err := interval.CommonRiskDifference(context.Background(), ts, opt); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run("ratio/"+name, func(b *testing.B) {
			for b.Loop() {
				if _, err := interval.CommonRiskRatio(context.Background(), ts, opt); err != nil {
					b.Fatal(err)
				}
			}
		})
		b.Run("odds/"+name, func(b *testing.B) {
			for b.Loop() {
				if _, err := interval.CommonOddsRatio(context.Background(), ts, opt); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// TestStratifiedScoreCanceled: the three stratified score intervals stop
// with the context's error (an already cancelled context: no statistic is
// evaluated).
func TestStratifiedScoreCanceled(t *testing.T) {
	t.Parallel()
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	ts := []interval.Stratum{{K1: 3, N1: 10, K2: 5, N2: 12}, {K1: 7, N1: 20, K2: 4, N2: 18}}
	for _, w := range interval.ScoreWeightsValues() {
		o := interval.CommonOptions{Method: interval.CommonStratifiedScore, Weights: w}
		_, e1 := interval.CommonRiskDifference(ctx, ts, o)
		_, e2 := interval.CommonRiskRatio(ctx, ts, o)
		_, e3 := interval.CommonOddsRatio(ctx, ts, o)
		for i, err := range []error{e1, e2, e3} {
			if !errors.Is(err, context.Canceled) {
				t.Errorf("weights %v, call %d: error %v, want context.Canceled", w, i, err)
			}
		}
	}
}

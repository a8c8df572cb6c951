package test

import (
	"context"
	"math"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"

	"github.com/kofnlab/kofn/internal/golden"
	"github.com/kofnlab/kofn/interval"
)

// strataGolden reads testdata/strata_r.tsv: R 4.2.2 base's
// Cochran-Mantel-Haenszel computation (asymptotic, exact conditional with
// its conditional MLE and exact interval, Mantel-Haenszel estimate with the
// Robins-Breslow-Greenland interval) and its trend test, on invented
// strata; generator testdata/gen/strata_r.R.
func strataGolden(t *testing.T) (map[string][]interval.Stratum, []golden.Row) {
	t.Helper()
	rows := golden.Read(t, "../testdata/strata_r.tsv")
	sets := map[string][]interval.Stratum{}
	for _, r := range rows {
		if r.Str(0) != "strata" {
			continue
		}
		v := floatList(t, r.Str(2))
		var ts []interval.Stratum
		for i := 0; i+3 < len(v); i += 4 {
			ts = append(ts, interval.Stratum{K1: int64(v[i]), N1: int64(v[i+1]), K2: int64(v[i+2]), N2: int64(v[i+3])})
		}
		sets[r.Str(1)] = ts
	}
	return sets, rows
}

// TestCMHAgainstR: the asymptotic and exact CMH p-values, the
// Mantel-Haenszel estimate and its interval agree with R base to 1e-9
// relative; the conditional MLE and exact interval to R's root-finding
// tolerance.
func TestCMHAgainstR(t *testing.T) {
	t.Parallel()
	sets, rows := strataGolden(t)
	ctx := context.Background()
	alts := map[string]Alternative{"two-sided": TwoSided, "lower": Lower, "higher": Higher}
	for _, r := range rows {
		switch r.Str(0) {
		case "cmh":
			ts, alt, cc := sets[r.Str(1)], alts[r.Str(2)], r.Str(3) == "TRUE"
			got, err := CMH(ctx, ts, CMHOptions{Alternative: alt, Correction: cc})
			if err != nil {
				t.Fatalf("%s: %v", r.Pos(), err)
			}
			want := []float64{r.Float(4), r.Float(5), r.Float(6)}
			if cc && got.Statistic.Value == 0 {
				continue // |sum (a - E)| below 1/2: R drops the correction, kofn floors the magnitude at 0
			}
			if diff := cmp.Diff(want, []float64{got.Statistic.Value, got.PValue, got.Estimate}, cmpopts.EquateApprox(1e-9, 1e-300)); diff != "" {
				t.Errorf("%s (-R +kofn):\n%s", r.Pos(), diff)
			}
		case "exact":
			ts, alt := sets[r.Str(1)], alts[r.Str(2)]
			got, err := CMH(ctx, ts, CMHOptions{Alternative: alt, Exact: true})
			if err != nil {
				t.Fatalf("%s: %v", r.Pos(), err)
			}
			if diff := cmp.Diff(r.Float(3), got.PValue, cmpopts.EquateApprox(1e-9, 0)); diff != "" {
				t.Errorf("%s p-value (-R +kofn):\n%s", r.Pos(), diff)
			}
			// R finds the conditional MLE and the exact limits with its
			// root finder's default tolerance, the fourth root of the
			// machine epsilon (about 1.2e-4; recalled from R's
			// documentation), so they agree only to that; kofn's own are
			// checked by inversion in TestExactCommonOddsRatioInverts.
			if diff := cmp.Diff(r.Float(4), got.Estimate, cmpopts.EquateApprox(2e-4, 0)); diff != "" {
				t.Errorf("%s conditional MLE (-R +kofn):\n%s", r.Pos(), diff)
			}
			if alt != TwoSided {
				continue // R's one-sided interval sits at level 0.95 one-sided: checked below through the two-sided one
			}
			if diff := cmp.Diff([]float64{r.Float(5), r.Float(6)}, []float64{got.Interval.Lower, got.Interval.Upper}, cmpopts.EquateApprox(2e-3, 0)); diff != "" {
				t.Errorf("%s exact interval (-R +kofn):\n%s", r.Pos(), diff)
			}
		case "mhci":
			iv, err := interval.CommonOddsRatio(ctx, sets[r.Str(1)], interval.CommonOptions{Level: r.Float(2)})
			if err != nil {
				t.Fatalf("%s: %v", r.Pos(), err)
			}
			if diff := cmp.Diff([]float64{r.Float(3), r.Float(4), r.Float(5)}, []float64{iv.Estimate, iv.Lower, iv.Upper}, cmpopts.EquateApprox(1e-12, 0)); diff != "" {
				t.Errorf("%s (-R +kofn):\n%s", r.Pos(), diff)
			}
		case "trend":
			x, n, s := ints(t, r.Str(2)), ints(t, r.Str(3)), floatList(t, r.Str(4))
			got, err := CochranArmitage(ctx, x, n, TrendOptions{Scores: s})
			if err != nil {
				t.Fatalf("%s: %v", r.Pos(), err)
			}
			z := got.Statistic.Value
			if diff := cmp.Diff([]float64{r.Float(5), r.Float(6)}, []float64{z * z, got.PValue}, cmpopts.EquateApprox(1e-10, 0)); diff != "" {
				t.Errorf("%s trend (-R +kofn):\n%s", r.Pos(), diff)
			}
		}
	}
}

// TestExactCMHAgainstEnumeration: for small strata the exact conditional
// p-value equals the sum over every set of tables with the strata's
// margins (listed one by one, in exact hypergeometric products), for both
// two-sided rules and both tails.
func TestExactCMHAgainstEnumeration(t *testing.T) {
	t.Parallel()
	ts := []interval.Stratum{{K1: 2, N1: 4, K2: 1, N2: 5}, {K1: 3, N1: 3, K2: 1, N2: 4}, {K1: 0, N1: 2, K2: 2, N2: 3}}
	// enumerate the first cells of the three strata
	type st struct{ lo, hi int64 }
	var sup []st
	for _, s := range ts {
		m := s.K1 + s.K2
		sup = append(sup, st{max(0, m-s.N2), min(m, s.N1)})
	}
	dist := map[int64]float64{}
	var obs int64
	for _, s := range ts {
		obs += s.K1
	}
	for a := sup[0].lo; a <= sup[0].hi; a++ {
		for b := sup[1].lo; b <= sup[1].hi; b++ {
			for c := sup[2].lo; c <= sup[2].hi; c++ {
				p := hyperP(ts[0], a) * hyperP(ts[1], b) * hyperP(ts[2], c)
				dist[a+b+c] += p
			}
		}
	}
	var lower, upper, two float64
	for s, p := range dist {
		if s <= obs {
			lower += p
		}
		if s >= obs {
			upper += p
		}
		if p <= dist[obs]*(1+1e-7) {
			two += p
		}
	}
	for _, c := range []struct {
		alt  Alternative
		want float64
	}{{Lower, lower}, {Higher, upper}, {TwoSided, two}} {
		got, err := CMH(context.Background(), ts, CMHOptions{Alternative: c.alt, Exact: true})
		if err != nil {
			t.Fatal(err)
		}
		if diff := cmp.Diff(c.want, got.PValue, cmpopts.EquateApprox(1e-12, 0)); diff != "" {
			t.Errorf("%v (-enumeration +kofn):\n%s", c.alt, diff)
		}
	}
	got, _ := CMH(context.Background(), ts, CMHOptions{Exact: true, Rule: Central})
	if want := math.Min(1, 2*math.Min(lower, upper)); math.Abs(got.PValue-want) > 1e-12*want {
		t.Errorf("central: %v, enumeration %v", got.PValue, want)
	}
}

// hyperP is the hypergeometric probability of first cell a given the
// stratum's margins, by products of binomial coefficients.
func hyperP(s interval.Stratum, a int64) float64 {
	m := s.K1 + s.K2
	return choose(s.N1, a) * choose(s.N2, m-a) / choose(s.N1+s.N2, m)
}

func choose(n, k int64) float64 {
	if k < 0 || k > n {
		return 0
	}
	r := 1.0
	for i := int64(1); i <= k; i++ {
		r = r * float64(n-k+i) / float64(i)
	}
	return r
}

// TestBreslowDayAgainstIndependent: the Breslow-Day statistic with and
// without Tarone's correction against testdata/strata_bd.tsv, made by an
// independent mpmath implementation (testdata/gen/strata_bd.py: fitted
// cells by solving the quadratic at 50 digits); 1e-9 relative.
func TestBreslowDayAgainstIndependent(t *testing.T) {
	t.Parallel()
	sets, _ := strataGolden(t)
	for _, r := range golden.Read(t, "../testdata/strata_bd.tsv") {
		ts := sets[r.Str(0)]
		got, err := BreslowDay(ts, BreslowDayOptions{NoTarone: r.Str(1) == "plain"})
		if err != nil {
			t.Fatalf("%s: %v", r.Pos(), err)
		}
		if diff := cmp.Diff([]float64{r.Float(2), r.Float(3)}, []float64{got.Statistic.Value, got.PValue}, cmpopts.EquateApprox(1e-9, 0)); diff != "" {
			t.Errorf("%s (-mpmath +kofn):\n%s", r.Pos(), diff)
		}
	}
}

// TestCMHWarnsOnDisagreeingStrata: strata with opposite effects give a
// Breslow-Day warning on the CMH result.
func TestCMHWarnsOnDisagreeingStrata(t *testing.T) {
	t.Parallel()
	sets, _ := strataGolden(t)
	r, err := CMH(context.Background(), sets["opposite"], CMHOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(strings.Join(r.Warnings, " "), "strata disagree") {
		t.Errorf("no disagreement warning: %v", r.Warnings)
	}
}

// TestExactTrendAgainstEnumeration: the exact conditional trend p-value
// equals the sum over every table with the observed total (listed one by
// one), for both tails and the two-sided |T| rule.
func TestExactTrendAgainstEnumeration(t *testing.T) {
	t.Parallel()
	x, n, s := []int64{1, 2, 4}, []int64{5, 4, 6}, []float64{0, 1, 3}
	X := int64(7)
	var N int64 = 15
	tot := choose(N, X)
	wObs := 0.0
	for i := range x {
		wObs += s[i] * float64(x[i])
	}
	mean := 0.0
	type out struct{ w, p float64 }
	var all []out
	for a := int64(0); a <= n[0]; a++ {
		for b := int64(0); b <= n[1]; b++ {
			c := X - a - b
			if c < 0 || c > n[2] {
				continue
			}
			p := choose(n[0], a) * choose(n[1], b) * choose(n[2], c) / tot
			w := s[0]*float64(a) + s[1]*float64(b) + s[2]*float64(c)
			all = append(all, out{w, p})
			mean += w * p
		}
	}
	var lower, upper, two float64
	for _, o := range all {
		if o.w <= wObs {
			lower += o.p
		}
		if o.w >= wObs {
			upper += o.p
		}
		if math.Abs(o.w-mean) >= math.Abs(wObs-mean)*(1-1e-7) {
			two += o.p
		}
	}
	for _, c := range []struct {
		alt  Alternative
		want float64
	}{{Lower, lower}, {Higher, upper}, {TwoSided, two}} {
		got, err := CochranArmitage(context.Background(), x, n, TrendOptions{Scores: s, Alternative: c.alt, Exact: true})
		if err != nil {
			t.Fatal(err)
		}
		if diff := cmp.Diff(c.want, got.PValue, cmpopts.EquateApprox(1e-12, 0)); diff != "" {
			t.Errorf("%v (-enumeration +kofn):\n%s", c.alt, diff)
		}
	}
}

// TestStrataErrors: bad input is refused with an error naming the
// argument.
func TestStrataErrors(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	for _, c := range []struct {
		err  error
		want string
	}{
		{errOnly(CMH(ctx, nil, CMHOptions{})), "test.CMH: strata = 0 is empty"},
		{errOnly(CMH(ctx, []interval.Stratum{{K1: 5, N1: 4}}, CMHOptions{})), "test.CMH: strata[0].K1 = 5 exceeds strata[0].N1 = 4"},
		{errOnly(CMH(ctx, []interval.Stratum{{K1: 1, N1: 4, K2: 1, N2: 3}}, CMHOptions{MidP: true})), "test.CMH: MidP"},
		{errOnly(BreslowDay([]interval.Stratum{{K1: 1, N1: 4, K2: 1, N2: 3}}, BreslowDayOptions{})), "test.BreslowDay: strata = 1"},
		{errOnly(CochranArmitage(ctx, []int64{1, 2}, []int64{3}, TrendOptions{})), "test.CochranArmitage: x = 2"},
		{errOnly(CochranArmitage(ctx, []int64{1, 2}, []int64{3, 4}, TrendOptions{Scores: []float64{0, 0.5}, Exact: true})), "test.CochranArmitage: Scores[1] = 0.5"},
		{errOnly(CochranArmitage(ctx, []int64{1, 2}, []int64{3, 4}, TrendOptions{Scores: []float64{1, 1}})), "test.CochranArmitage: Scores"},
	} {
		if c.err == nil || !strings.HasPrefix(c.err.Error(), c.want) {
			t.Errorf("got %v, want prefix %q", c.err, c.want)
		}
	}
}

func errOnly(_ Result, err error) error { return err }

// BenchmarkCMH1000 is the asymptotic test with the Mantel-Haenszel
// estimate over 1,000 invented strata (goal: under 1 ms).
func BenchmarkCMH1000(b *testing.B) {
	ts := manyStrata(1000, 60)
	for b.Loop() {
		_, _ = CMH(context.Background(), ts, CMHOptions{})
	}
}

// BenchmarkExactCMH50x200 is the exact conditional test over 50 invented
// strata of 200 trials each (goal: within 100 ms).
func BenchmarkExactCMH50x200(b *testing.B) {
	ts := manyStrata(50, 100)
	for b.Loop() {
		_, _ = CMH(context.Background(), ts, CMHOptions{Exact: true})
	}
}

func manyStrata(k int, per int64) []interval.Stratum {
	ts := make([]interval.Stratum, k)
	for i := range ts {
		ts[i] = interval.Stratum{K1: per/3 + int64(i%7), N1: per, K2: per/4 + int64(i%5), N2: per}
	}
	return ts
}

// TestExactCommonOddsRatioInverts: the exact conditional limits solve
// their tail equations and the conditional MLE its mean equation, checked
// on the exact enumeration of the small strata of
// TestExactCMHAgainstEnumeration: at psi_L, P(S >= s) = 0.025; at psi_U,
// P(S <= s) = 0.025; at the MLE, E[S] = s (1e-9).
func TestExactCommonOddsRatioInverts(t *testing.T) {
	t.Parallel()
	ts := []interval.Stratum{{K1: 2, N1: 4, K2: 1, N2: 5}, {K1: 3, N1: 3, K2: 1, N2: 4}, {K1: 0, N1: 2, K2: 2, N2: 3}}
	iv, err := interval.CommonOddsRatio(context.Background(), ts, interval.CommonOptions{Method: interval.CommonExactConditional})
	if err != nil {
		t.Fatal(err)
	}
	// weights w(s) of the conditional distribution by enumeration
	w := map[int64]float64{}
	var obs int64
	for _, s := range ts {
		obs += s.K1
	}
	for a := int64(0); a <= 3; a++ {
		for b := int64(0); b <= 3; b++ {
			for c := int64(0); c <= 2; c++ {
				if p := hyperP(ts[0], a) * hyperP(ts[1], b) * hyperP(ts[2], c); p > 0 {
					w[a+b+c] += p
				}
			}
		}
	}
	at := func(psi float64) (lower, upper, mean float64) {
		var tot float64
		for s, v := range w {
			q := v * math.Pow(psi, float64(s))
			tot += q
			mean += float64(s) * q
			if s <= obs {
				lower += q
			}
			if s >= obs {
				upper += q
			}
		}
		return lower / tot, upper / tot, mean / tot
	}
	_, up, _ := at(iv.Lower)
	lo, _, _ := at(iv.Upper)
	_, _, mean := at(iv.Estimate)
	if diff := cmp.Diff([]float64{0.025, 0.025, float64(obs)}, []float64{up, lo, mean}, cmpopts.EquateApprox(1e-9, 0)); diff != "" {
		t.Errorf("limits [%v, %v], MLE %v (-want +got):\n%s", iv.Lower, iv.Upper, iv.Estimate, diff)
	}
}

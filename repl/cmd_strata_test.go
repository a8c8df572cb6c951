package repl

import (
	"context"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

// TestStrataMatchesPackage: strata and trend print the package's numbers
// (R base's, see test.TestCMHAgainstR: the three invented sites give
// chi-square 5.1688, p = 0.022996 and a Mantel-Haenszel odds ratio of
// 2.1176 with Robins-Breslow-Greenland limits 1.1080 and 4.0471).
func TestStrataMatchesPackage(t *testing.T) {
	t.Parallel()
	sites := []interval.Stratum{{K1: 12, N1: 30, K2: 6, N2: 28}, {K1: 8, N1: 25, K2: 5, N2: 27}, {K1: 15, N1: 40, K2: 9, N2: 38}}
	obj := runJSON(t, "strata 12/30:6/28 8/25:5/27 15/40:9/38")
	want, _ := test.CMH(context.Background(), sites, test.CMHOptions{})
	if got := num(t, obj, "test.p_value"); got != want.PValue || !relNear(got, 0.022996292174175339, 1e-9) {
		t.Errorf("p-value %v, package %v", got, want.PValue)
	}
	if got := num(t, obj, "common.lower"); !relNear(got, 1.108039941731497, 1e-9) {
		t.Errorf("lower limit %v", got)
	}
	ex := runJSON(t, "strata 12/30:6/28 8/25:5/27 15/40:9/38 method=exact")
	if got := num(t, ex, "test.p_value"); !relNear(got, 0.025796803656180489, 1e-9) {
		t.Errorf("exact p-value %v", got)
	}
	tr := runJSON(t, "trend 2/40 5/40 9/40 14/40 scores=0,1,2,3")
	if z := num(t, tr, "statistic.value"); !relNear(z*z, 13.128205128205128, 1e-6) {
		t.Errorf("trend chi-square %v", z*z)
	}
}

// TestStrataFile: file= reads one stratum per CSV row and by= gives one
// analysis per key, in order of first appearance; bad input names the
// file, the line and the column.
func TestStrataFile(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "sites.csv")
	data := "week,site,k1,n1,k2,n2\n1,a,12,30,6,28\n1,b,8,25,5,27\n2,a,15,40,9,38\n2,b,20,30,5,30\n"
	if err := os.WriteFile(path, []byte(data), 0o600); err != nil {
		t.Fatal(err)
	}
	s, out, _ := testSession()
	if err := s.Run(context.Background(), "strata file="+path+" by=week"); err != nil {
		t.Fatal(err)
	}
	text := out.String()
	if !strings.Contains(text, "week = 1:") || !strings.Contains(text, "week = 2:") || strings.Index(text, "week = 1:") > strings.Index(text, "week = 2:") {
		t.Errorf("groups missing or out of order:\n%s", text)
	}
	bad := filepath.Join(dir, "bad.csv")
	_ = os.WriteFile(bad, []byte("k1,n1,k2,n2\n1,5,2,x\n"), 0o600)
	if msg, err := runErr("strata file=" + bad); err == nil || !strings.Contains(msg, "line 2") || !strings.Contains(msg, "column n2") {
		t.Errorf("bad row: %q, %v", msg, err)
	}
	if msg, err := runErr("strata file=" + path + " by=month"); err == nil || !strings.Contains(msg, "month") {
		t.Errorf("missing key column: %q, %v", msg, err)
	}
	if msg, err := runErr("strata 12/30:6/28 8/25"); err == nil || !strings.Contains(msg, "K1/N1:K2/N2") {
		t.Errorf("malformed stratum: %q, %v", msg, err)
	}
}

func relNear(got, want, rel float64) bool {
	d := got - want
	if d < 0 {
		d = -d
	}
	return d <= rel*max(want, -want)
}

// TestStrataWeightsAndHomogeneity: weights= and homogeneity= print the
// package's numbers (interval.CommonRiskDifference with inverse-variance
// weights, checked against mpmath in testdata/strata_score.tsv; Zelen's
// exact test, checked against exact enumeration in
// testdata/strata_zelen.tsv), and misplaced options are refused by word.
func TestStrataWeightsAndHomogeneity(t *testing.T) {
	t.Parallel()
	clinics := []interval.Stratum{{K1: 9, N1: 12, K2: 4, N2: 10}, {K1: 40, N1: 150, K2: 22, N2: 160}, {K1: 3, N1: 30, K2: 1, N2: 25}, {K1: 70, N1: 90, K2: 55, N2: 95}}
	obj := runJSON(t, "strata 9/12:4/10 40/150:22/160 3/30:1/25 70/90:55/95 effect=difference-score weights=ivs homogeneity=zelen")
	iv, _ := interval.CommonRiskDifference(context.Background(), clinics, interval.CommonOptions{Method: interval.CommonStratifiedScore, Weights: interval.WeightsInverseVariance})
	if got := num(t, obj, "common.lower"); got != iv.Lower {
		t.Errorf("lower limit %v, package %v", got, iv.Lower)
	}
	z, _ := test.ZelenExact(context.Background(), clinics)
	if got := num(t, obj, "homogeneity.p_value"); got != z.PValue {
		t.Errorf("homogeneity p-value %v, package %v", got, z.PValue)
	}
	odds := runJSON(t, "strata 9/12:4/10 40/150:22/160 3/30:1/25 70/90:55/95 effect=odds-score")
	or, _ := interval.CommonOddsRatio(context.Background(), clinics, interval.CommonOptions{Method: interval.CommonStratifiedScore})
	if got := num(t, odds, "common.upper"); got != or.Upper {
		t.Errorf("odds-score upper limit %v, package %v", got, or.Upper)
	}
	if msg, err := runErr("strata 12/30:6/28 8/25:5/27 weights=ivs"); err == nil || !strings.Contains(msg, "weights=ivs") {
		t.Errorf("weights without a score effect: %q, %v", msg, err)
	}
	if msg, err := runErr("strata 12/30:6/28 8/25:5/27 homogeneity=exact"); err == nil || !strings.Contains(msg, "homogeneity") {
		t.Errorf("unknown homogeneity: %q, %v", msg, err)
	}
}

// TestEachStrataGroups: each FILE strata by=COLUMN writes one row per key
// with the numbers strata prints for that key's rows, in order of first
// appearance; without by= it says what is missing.
func TestEachStrataGroups(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "weeks.csv")
	// invented: two weeks of a trial at two sites
	data := "week,site,k1,n1,k2,n2\n2,a,15,40,9,38\n1,a,12,30,6,28\n2,b,20,30,5,30\n1,b,8,25,5,27\n"
	if err := os.WriteFile(path, []byte(data), 0o600); err != nil {
		t.Fatal(err)
	}
	s, out, _ := testSession()
	if err := s.Run(context.Background(), "each "+path+" strata by=week homogeneity=zelen"); err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(out.String()), "\n")
	if len(lines) != 3 || !strings.HasPrefix(lines[1], "2,2,") || !strings.HasPrefix(lines[2], "1,2,") {
		t.Fatalf("rows:\n%s", out.String())
	}
	for i, ts := range [][]interval.Stratum{{{K1: 15, N1: 40, K2: 9, N2: 38}, {K1: 20, N1: 30, K2: 5, N2: 30}}, {{K1: 12, N1: 30, K2: 6, N2: 28}, {K1: 8, N1: 25, K2: 5, N2: 27}}} {
		r, _ := test.CMH(context.Background(), ts, test.CMHOptions{})
		z, _ := test.ZelenExact(context.Background(), ts)
		f := strings.Split(lines[i+1], ",")
		if f[2] != strconv.FormatFloat(r.PValue, 'g', -1, 64) || f[7] != strconv.FormatFloat(z.PValue, 'g', -1, 64) {
			t.Errorf("row %d: %v, want p %v and homogeneity %v", i+1, f, r.PValue, z.PValue)
		}
	}
	if msg, err := runErr("each " + path + " strata"); err == nil || !strings.Contains(msg, "by=") {
		t.Errorf("no by=: %q, %v", msg, err)
	}
	if msg, err := runErr("each " + path + " strata by=week file=" + path); err == nil || !strings.Contains(msg, "file=") {
		t.Errorf("file= inside each: %q, %v", msg, err)
	}
}

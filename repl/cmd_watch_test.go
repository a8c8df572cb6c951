package repl

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestSequentialValues(t *testing.T) {
	t.Parallel()
	checkValues(t, []valueCase{
		// testdata/sequential_golden.tsv (testdata/gen/sequential_golden.py: a recursion over
		// the full range of k with NumPy 1.24.2, independent of the library): the truncated
		// SPRT of 0.05 against 0.15, alpha 0.05, beta 0.1, at most 200 observations.
		{"watch sprt p0=0.05 p1=0.15 max=200", "operating.0.reject", 0.03487358492712938, 1e-10, "sequential_golden.py"},
		{"watch sprt p0=0.05 p1=0.15 max=200", "operating.0.asn", 41.77771042914256, 1e-10, "sequential_golden.py"},
		{"watch sprt p0=0.05 p1=0.15 max=200", "operating.1.accept", 0.09585582325739651, 1e-10, "sequential_golden.py"},
		// the same file, from dense LAPACK solves of the CUSUM chain: p0 0.1, p1 0.2, unit 20,
		// threshold 40 (h = 2)
		{"alarm p0=0.1 p1=0.2 h=2 unit=20", "in_control.arl", 115.06820439747992, 1e-10, "sequential_golden.py"},
		{"alarm p0=0.1 p1=0.2 h=2 unit=20", "out_of_control.sdrl", 20.112617332277694, 1e-10, "sequential_golden.py"},
		{"alarm p0=0.1 p1=0.2 unit=20 arl0=500", "chart.threshold", 68, 0, "sequential_golden.py"},
		// and from mpmath at 40 digits: the sequence at 500/1000 with the prior tuned for 1000
		{"watch always p0=0.3 looks=500/1000", "looks.0.interval.lower", 0.45209203792177667558, 1e-11, "sequential_golden.py"},
		{"watch always p0=0.3 looks=500/1000", "looks.0.interval.upper", 0.54790796207822332442, 1e-11, "sequential_golden.py"},
		// Wald's lines by hand (Wald 1947, chapter 5): D = ln(0.06 0.98 / (0.02 0.94)) = 1.140285,
		// slope ln(0.98/0.94)/D = 0.0365458, reject intercept ln(0.9/0.05)/D = 2.534781
		{"watch sprt p0=0.02 p1=0.06", "test.lines.slope", 0.0365458, 1e-5, "Wald 1947"},
		{"watch sprt p0=0.02 p1=0.06", "test.lines.reject", 2.534781, 1e-6, "Wald 1947"},
	})
}

func TestSequentialStreams(t *testing.T) {
	t.Parallel()
	// decisions at each look, and the restart of the chart after a signal
	obj := runJSON(t, "watch sprt p0=0.02 p1=0.06 looks=1/20,3/40,5/60")
	looks := obj["looks"].([]any)
	if d := looks[2].(map[string]any)["decision"]; d != "reject H0" {
		t.Errorf("third look: %v", d)
	}
	obj = runJSON(t, "alarm p0=0.1 p1=0.2 h=2 unit=20 items=0110111011")
	var sig []int
	for i, l := range obj["looks"].([]any) {
		if l.(map[string]any)["signal"] == true {
			sig = append(sig, i+1)
		}
	}
	// by hand: +0.85 per defect, -0.15 per good item, signal at 2: items 5 and 9
	if len(sig) != 2 || sig[0] != 5 || sig[1] != 9 {
		t.Errorf("signals at %v, want [5 9]", sig)
	}
	// looks from a CSV file with a header, in any column order
	dir := t.TempDir()
	f := filepath.Join(dir, "looks.csv")
	if err := os.WriteFile(f, []byte("day,n,k\nmon,20,1\ntue,40,3\nwed,60,5\n"), 0o600); err != nil {
		t.Fatal(err)
	}
	obj = runJSON(t, "watch sprt p0=0.02 p1=0.06 from="+f)
	if n := len(obj["looks"].([]any)); n != 3 {
		t.Errorf("%d looks from the file", n)
	}
	bad := filepath.Join(dir, "bad.csv")
	if err := os.WriteFile(bad, []byte("k,n\n1,20\n3,x\n"), 0o600); err != nil {
		t.Fatal(err)
	}
	if _, err := runErr("watch sprt p0=0.02 p1=0.06 from=" + bad); err == nil || !strings.Contains(err.Error(), "line 3") {
		t.Errorf("bad row: %v", err)
	}
}

func TestSequentialErrors(t *testing.T) {
	t.Parallel()
	for _, line := range []string{
		"watch", "watch onion p0=0.1", "watch sprt p0=0.1", "watch sprt p0=0.1 p1=0.1", "watch sprt p0=0.1 p1=0.2 alpha=0.6 beta=0.5",
		"watch sprt p0=0.1 p1=0.2 looks=3/2", "watch sprt p0=0.1 p1=0.2 looks=3/10,2/12", "watch sprt p0=0.1 p1=0.2 looks=3/10,4/10",
		"watch sprt p0=0.1 p1=0.2 max=5 looks=1/6", "watch sprt p0=0.1 p1=0.2 looks=1/5 from=x.csv",
		"watch sprt p0=0.1 p1=0.2 from=/nonexistent/looks.csv", "watch pairs theta=0.5", "watch pairs theta=0.7 looks=3/4", "watch pairs theta=0.7 yn=0.1", "watch pairs theta=0.7 yn=0.8 ny=0.5", "watch sprt p0=0.1 p1=0.2 yn=0.1 ny=0.1",
		"watch always p0=0.1 guess=1", "watch always p0=0.1 looks=3/10,2/11", "watch ab looks=3/10", "watch ab delta=1",
		"watch ab method=exactish", "watch ab method=normal tau2=-1", "watch ab tau2=0.01", "watch sprt p0=0.1 p1=0.2 nonsense=3",
		"alarm p0=0.1 p1=0.2", "alarm p0=0.1 p1=0.2 h=2 arl0=100", "alarm p0=0.2 p1=0.1 h=2", "alarm p0=0.1 p1=0.2 h=2 items=012",
		"alarm p0=0.1 p1=0.2 h=2 items=01 looks=1/2", "alarm p0=0.00001 p1=0.00002 h=5", "alarm p0=0.1 p1=0.2 arl0=1",
		"alarm p0=0.1 p1=0.2 h=2 looks=3/10,2/10",
	} {
		if _, err := runErr(line); err == nil {
			t.Errorf("%s: no error", line)
		}
	}
}

package repl

import (
	"bytes"
	"context"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/kofnlab/kofn/test"
)

func TestEach(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	in := filepath.Join(dir, "in.csv")
	if err := os.WriteFile(in, []byte("id,n,k\nA,40,17\nB,50,3\nC,40,41\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	out, stderr, failed := runScript(t, "each "+in+" check p=0.3 method=score")
	if failed != 1 || !strings.Contains(stderr, "had 1 failed rows of 3") {
		t.Errorf("failed = %d, stderr %q; want one failed row reported", failed, stderr)
	}
	want, _ := test.Binomial(17, 40, 0.3, test.BinomialOptions{Method: test.Score})
	lines := strings.Split(strings.TrimSpace(out), "\n")
	if len(lines) != 4 || lines[0] != "id,n,k,estimate,p_value,error" {
		t.Fatalf("output:\n%s", out)
	}
	wantRow := fmt.Sprintf("A,40,17,%v,%v,", want.Estimate, want.PValue)
	if lines[1] != wantRow {
		t.Errorf("row A = %q, want %q", lines[1], wantRow)
	}
	if !strings.HasSuffix(lines[3], "test.Binomial: k = 41 exceeds n = 40") {
		t.Errorf("row C = %q, want the package error", lines[3])
	}

	// Standard input without a header, two groups, written to a file.
	s, sout, serr := testSession()
	s.In = strings.NewReader("7,15,12,15\n3,4,1,4\n")
	to := filepath.Join(dir, "out.csv")
	if err := s.Run(context.Background(), "each - versus side=low to="+to); err != nil {
		t.Fatalf("each -: %v %s", err, serr.String())
	}
	data, _ := os.ReadFile(to)
	got := strings.Split(strings.TrimSpace(string(data)), "\n")
	fisher, _ := test.Fisher(7, 15, 12, 15, test.FisherOptions{Alternative: test.Less})
	if len(got) != 3 || got[0] != "k1,n1,k2,n2,difference,p_value,error" || !strings.HasPrefix(got[1], fmt.Sprintf("7,15,12,15,%v,%v,", fisher.Estimate, fisher.PValue)) {
		t.Errorf("versus rows:\n%s", data)
	}
	if !strings.Contains(sout.String(), "rows") {
		t.Errorf("summary missing: %q", sout.String())
	}

	for line, token := range map[string]string{
		"each " + in + " spread n=4":     "spread",
		"each " + in:                     "each",
		"each nosuch.csv check p=0.3":    "nosuch.csv",
		"each " + in + " check 17/40":    "17/40",
		"each " + in + " check p=0.3 q=": "q=",
	} {
		_, err := runErr(line)
		if err == nil || !strings.Contains(err.Error(), `"`+token+`"`) {
			t.Errorf("%q: error %v, want it to name %q", line, err, token)
		}
	}
}

// benchRows builds a CSV of n rows of valid counts for the columns.
func benchRows(cols []string, n int) []byte {
	var b bytes.Buffer
	b.WriteString(strings.Join(cols, ",") + "\n")
	for i := 0; i < n; i++ {
		for j := 0; j < len(cols); j += 2 {
			if j > 0 {
				b.WriteByte(',')
			}
			fmt.Fprintf(&b, "%d,%d", (i+j)%97, 100+(i+j)%900)
		}
		b.WriteByte('\n')
	}
	return b.Bytes()
}

// benchmarkEach measures the batch path per row (ns/row metric).
func benchmarkEach(b *testing.B, verb string, rows int) {
	spec := tbl.byName[strings.Fields(verb)[0]].Row
	data := benchRows(spec.In, rows)
	args, err := parseArgs(tbl.byName[strings.Fields(verb)[0]], strings.Fields(verb)[1:])
	if err != nil {
		b.Fatal(err)
	}
	s, _, _ := testSession()
	fn, err := spec.prepare(&call{Ctx: context.Background(), S: s, Args: args})
	if err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		if _, failed, err := batch(context.Background(), bytes.NewReader(data), discard{}, spec, fn); err != nil || failed > 0 {
			b.Fatal(err, failed)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(rows), "ns/row")
}

type discard struct{}

func (discard) Write(p []byte) (int, error) { return len(p), nil }

func BenchmarkEachCheckScore(b *testing.B)   { benchmarkEach(b, "check p=0.3 method=score", 10000) }
func BenchmarkEachCheckCentral(b *testing.B) { benchmarkEach(b, "check p=0.3 method=central", 10000) }
func BenchmarkEachFlips(b *testing.B)        { benchmarkEach(b, "flips", 10000) }

func BenchmarkEachBoundsWilson(b *testing.B) { benchmarkEach(b, "bounds", 10000) }
func BenchmarkEachBoundsClopperPearson(b *testing.B) {
	benchmarkEach(b, "bounds method=clopper-pearson", 10000)
}
func BenchmarkEachGapNewcombe(b *testing.B) { benchmarkEach(b, "gap", 10000) }

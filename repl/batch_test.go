package repl

import (
	"bytes"
	"context"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"runtime"
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
	if len(lines) != 4 || lines[0] != "id,n,k,estimate,p_value,method,alt,error" {
		t.Fatalf("output:\n%s", out)
	}
	wantRow := fmt.Sprintf("A,40,17,%v,%v,score,two-sided,", want.Estimate, want.PValue)
	if lines[1] != wantRow {
		t.Errorf("row A = %q, want %q", lines[1], wantRow)
	}
	if !strings.HasSuffix(lines[3], ",line 4: k = 41 exceeds n = 40") {
		t.Errorf("row C = %q, want the package error", lines[3])
	}

	// Standard input without a header, two groups, written to a file.
	s, sout, serr := testSession()
	s.In = strings.NewReader("7,15,12,15\n3,4,1,4\n")
	to := filepath.Join(dir, "out.csv")
	if err := s.Run(context.Background(), "each - versus alt=lower to="+to); err != nil {
		t.Fatalf("each -: %v %s", err, serr.String())
	}
	data, _ := os.ReadFile(to)
	got := strings.Split(strings.TrimSpace(string(data)), "\n")
	fisher, _ := test.Fisher(7, 15, 12, 15, test.FisherOptions{Alternative: test.Lower})
	if len(got) != 3 || got[0] != "k1,n1,k2,n2,difference,p_value,method,alt,error" || got[1] != fmt.Sprintf("7,15,12,15,%v,%v,fisher point-probability,lower,", fisher.Estimate, fisher.PValue) {
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

// benchRows builds a CSV of n rows of valid counts for the columns: k
// cycling over 0..96 and trials from lo to lo+spread-1 (invented counts of
// realistic size).
func benchRows(cols []string, n int, lo, spread int) []byte {
	var b bytes.Buffer
	b.WriteString(strings.Join(cols, ",") + "\n")
	for i := 0; i < n; i++ {
		for j := 0; j < len(cols); j += 2 {
			if j > 0 {
				b.WriteByte(',')
			}
			trials := lo + (i*7+j*13)%spread
			fmt.Fprintf(&b, "%d,%d", (i*31+j*17)%min(97, trials+1), trials)
		}
		b.WriteByte('\n')
	}
	return b.Bytes()
}

// benchmarkEach measures each per row, on one worker and on every core
// (the speed-up of the worker pool), and reports rows/s.
func benchmarkEach(b *testing.B, verb string, rows, lo, spread int) {
	for _, workers := range []int{1, runtime.GOMAXPROCS(0)} {
		b.Run(fmt.Sprintf("workers=%d", workers), func(b *testing.B) {
			cmd := tbl.byName[strings.Fields(verb)[0]]
			data := benchRows(cmd.Row.In, rows, lo, spread)
			args, err := parseArgs(cmd, strings.Fields(verb)[1:])
			if err != nil {
				b.Fatal(err)
			}
			s, _, _ := testSession()
			fn, err := cmd.Row.prepare(&call{Ctx: context.Background(), S: s, Args: args})
			if err != nil {
				b.Fatal(err)
			}
			job := batchJob{spec: cmd.Row, fn: fn, workers: workers, errText: func(err error) string { return err.Error() }}
			c0 := cpuTime()
			for b.Loop() {
				if st, err := runBatch(context.Background(), bytes.NewReader(data), io.Discard, job); err != nil || st.failed > 0 {
					b.Fatal(err, st.failed)
				}
			}
			perRow := b.Elapsed().Seconds() / float64(b.N) / float64(rows)
			b.ReportMetric(perRow*1e9, "ns/row")
			b.ReportMetric(1/perRow, "rows/s")
			b.ReportMetric(float64(cpuTime()-c0)/1e3/float64(b.N)/float64(rows), "cpu-us/row")
		})
	}
}

// Realistic sizes: one group of 100 to 1099 trials; two groups of 100 to
// 1099 each for Fisher; Boschloo at 20 to 139 per group (its cost grows
// with the table count).
func BenchmarkEachBoundsWilson(b *testing.B) { benchmarkEach(b, "bounds", 10000, 100, 1000) }
func BenchmarkEachBoundsClopperPearson(b *testing.B) {
	benchmarkEach(b, "bounds method=clopper-pearson", 10000, 100, 1000)
}
func BenchmarkEachCheckExact(b *testing.B) { benchmarkEach(b, "check p=0.3", 10000, 100, 1000) }
func BenchmarkEachCheckScore(b *testing.B) {
	benchmarkEach(b, "check p=0.3 method=score", 10000, 100, 1000)
}
func BenchmarkEachFlips(b *testing.B)       { benchmarkEach(b, "flips", 10000, 100, 1000) }
func BenchmarkEachGapNewcombe(b *testing.B) { benchmarkEach(b, "gap", 10000, 100, 1000) }
func BenchmarkEachVersusFisher(b *testing.B) {
	benchmarkEach(b, "versus", 10000, 100, 1000)
}
func BenchmarkEachVersusBoschloo(b *testing.B) {
	benchmarkEach(b, "versus method=boschloo", 128, 20, 120)
}

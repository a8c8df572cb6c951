package repl

import (
	"context"
	"encoding/csv"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/kofnlab/kofn/test"
)

// TestEachAdjust: each ... adjust=M adds adjusted_p_value over the whole
// file, equal to test.AdjustPValues of the p_value column of the rows
// that have one (failed rows keep an empty cell and stay out of the
// family), for standard input and a file, over enough rows to cross many
// chunks and the spill buffer; the temporary file is removed.
func TestEachAdjust(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(16, 5))
	var sb strings.Builder
	sb.WriteString("site,k1,n1,k2,n2\n")
	const rows = 3000
	for i := range rows {
		if i%500 == 7 {
			fmt.Fprintf(&sb, "s%d,9,4,1,4\n", i) // k1 > n1: a failed row
			continue
		}
		n1, n2 := 20+rng.IntN(200), 20+rng.IntN(200)
		fmt.Fprintf(&sb, "s%d,%d,%d,%d,%d\n", i, rng.IntN(n1+1)/3, n1, rng.IntN(n2+1)/3, n2)
	}
	dir := t.TempDir()
	file := filepath.Join(dir, "sites.csv")
	if err := os.WriteFile(file, []byte(sb.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	before, _ := filepath.Glob(filepath.Join(os.TempDir(), "kofn-each-*.csv"))
	for _, c := range []struct{ line, method string }{
		{"each - versus adjust=hommel", "hommel"},
		{"each " + file + " versus method=z-pooled adjust=BH", "bh"},
	} {
		s, out, _ := testSession()
		s.In = strings.NewReader(sb.String())
		err := s.Run(context.Background(), c.line)
		if err == nil || !strings.Contains(err.Error(), "failed rows") {
			t.Fatalf("%s: %v (the bad rows must fail)", c.line, err)
		}
		recs, err := csv.NewReader(strings.NewReader(out.String())).ReadAll()
		if err != nil {
			t.Fatal(err)
		}
		hdr := recs[0]
		col := func(name string) int {
			for i, h := range hdr {
				if h == name {
					return i
				}
			}
			t.Fatalf("no column %s in %v", name, hdr)
			return -1
		}
		pc, ac, nc, ec := col("p_value"), col("adjusted_p_value"), col("adjustment"), col("error")
		if len(recs) != rows+1 || ac != pc+1 || nc != pc+2 {
			t.Fatalf("%s: %d rows, header %v", c.line, len(recs), hdr)
		}
		var p []float64
		for _, r := range recs[1:] {
			if len(r) != len(hdr) {
				t.Fatalf("row %v has %d fields", r, len(r))
			}
			if r[ec] != "" {
				if r[ac] != "" {
					t.Errorf("failed row %v has an adjusted value", r)
				}
				continue
			}
			v, _ := strconv.ParseFloat(r[pc], 64)
			p = append(p, v)
		}
		want, _ := test.AdjustPValues(context.Background(), p, adjustment(c.method))
		i := 0
		for _, r := range recs[1:] {
			if r[ec] != "" {
				continue
			}
			got, err := strconv.ParseFloat(r[ac], 64)
			if err != nil || got != want[i] {
				t.Fatalf("%s: row %v adjusted %q, want %v", c.line, r[0], r[ac], want[i])
			}
			if !strings.HasPrefix(r[nc], adjustment(c.method).String()+" over "+strconv.Itoa(len(p))) {
				t.Fatalf("adjustment column %q", r[nc])
			}
			i++
		}
	}
	after, _ := filepath.Glob(filepath.Join(os.TempDir(), "kofn-each-*.csv"))
	if len(after) > len(before) {
		t.Errorf("temporary files left: %v", after)
	}
	s, _, _ := testSession()
	if err := s.Run(context.Background(), "each - bounds adjust=holm"); err == nil || !strings.Contains(err.Error(), "p_value") {
		t.Errorf("bounds with adjust: %v", err)
	}
	if err := s.Run(context.Background(), "each - versus adjust=tukey"); err == nil || !strings.Contains(err.Error(), "adjust=tukey") {
		t.Errorf("unknown adjustment: %v", err)
	}
}

package repl

import (
	"bufio"
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestEachCorpus runs each over the corpus of broken CSV files in
// testdata/each and compares the output CSV and the error line with the
// expected .out files. Beside the file comparison it checks the rules that
// must hold whatever the layout: every output row has the header's
// column count, every failed row names its input line, and no input row
// is lost (rows written = records read).
func TestEachCorpus(t *testing.T) {
	t.Parallel()
	f, err := os.Open("testdata/each/cases.txt")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := strings.TrimSpace(sc.Text())
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		file, cmd, _ := strings.Cut(line, " ")
		path := filepath.Join("testdata", "each", file)
		s, out, errw := testSession()
		s.Run(context.Background(), "each "+path+" "+cmd)
		got := "$ each " + file + " " + cmd + "\n" + out.String()
		if e := errw.String(); e != "" {
			got += "stderr: " + strings.ReplaceAll(e, path, file)
		}
		golden := strings.TrimSuffix(path, ".csv") + ".out"
		if *update {
			if err := os.WriteFile(golden, []byte(got), 0o644); err != nil {
				t.Fatal(err)
			}
		} else if want, err := os.ReadFile(golden); err != nil || string(want) != got {
			t.Errorf("%s: output differs from %s (%v):\n%s", file, golden, err, firstDiff(string(want), got))
		}
		checkEachRows(t, file, out.String())
	}
}

// checkEachRows checks that every CSV row has the header's column count
// and that a non-empty error cell starts with the line it came from.
func checkEachRows(t *testing.T, name, out string) {
	t.Helper()
	if out == "" {
		return
	}
	rd := newCSVReader(strings.NewReader(out))
	hdr, err := rd.next()
	if err != nil || hdr.err != nil {
		t.Errorf("%s: output header unreadable: %v %v", name, err, hdr.err)
		return
	}
	for {
		rec, err := rd.next()
		if err != nil {
			return
		}
		if rec.err != nil || len(rec.fields) != len(hdr.fields) {
			t.Errorf("%s: output line %d has %d fields, header %d (%v)", name, rec.line, len(rec.fields), len(hdr.fields), rec.err)
			continue
		}
		if e := rec.fields[len(rec.fields)-1]; e != "" && !strings.HasPrefix(e, "line ") {
			t.Errorf("%s: error cell %q lacks the line number", name, e)
		}
	}
}

package golden

import (
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
)

func write(t *testing.T, text string) string {
	t.Helper()
	path := filepath.Join(t.TempDir(), "g.tsv")
	if err := os.WriteFile(path, []byte(text), 0o600); err != nil {
		t.Fatal(err)
	}
	return path
}

func TestRead(t *testing.T) {
	t.Parallel()
	path := write(t, "# header\n# case one\tp=0.25\tless\n\nx\t3\t-inf\t1e-300\n")
	cases, rows := ReadCases(t, path)
	if len(rows) != 1 || rows[0].Line != 4 || rows[0].Str(0) != "x" || rows[0].Int(1) != 3 || rows[0].Float(3) != 1e-300 {
		t.Fatalf("rows = %+v", rows)
	}
	if v := rows[0].Floats(2); len(v) != 2 || v[0] > -1e308 {
		t.Errorf("Floats(2) = %v", v)
	}
	c := cases["one"]
	if c.Float("p") != 0.25 || c.Str("1") != "less" || c.Line != 2 {
		t.Errorf("case = %+v", c)
	}
}

// fatalTB records the first Fatalf and stops the goroutine, as testing.T.
type fatalTB struct {
	testing.TB
	msg string
}

func (f *fatalTB) Helper() {}
func (f *fatalTB) Fatalf(format string, args ...any) {
	f.msg = fmt.Sprintf(format, args...)
	runtime.Goexit()
}

func TestBadFieldNamesPlace(t *testing.T) {
	t.Parallel()
	path := write(t, "# header\n1\t2\n1\tx\n")
	rows := Read(t, path)
	for _, tc := range []struct {
		call func(tb *fatalTB)
		want string
	}{
		{func(tb *fatalTB) { r := rows[1]; r.tb = tb; r.Int(1) }, `g.tsv:3 field 1: "x" is not an integer`},
		{func(tb *fatalTB) { r := rows[1]; r.tb = tb; r.Float(1) }, `g.tsv:3 field 1: "x" is not a number`},
		{func(tb *fatalTB) { r := rows[0]; r.tb = tb; r.Str(5) }, `g.tsv:2: field 5 missing`},
		{func(tb *fatalTB) { Read(tb, write(t, "# only a header\n")) }, "no data rows"},
	} {
		tb := &fatalTB{TB: t}
		done := make(chan struct{})
		go func() { defer close(done); tc.call(tb) }()
		<-done
		if !strings.Contains(tb.msg, tc.want) {
			t.Errorf("message %q, want it to contain %q", tb.msg, tc.want)
		}
	}
}

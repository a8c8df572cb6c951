package repl

import (
	"bufio"
	"context"
	"io"
	"strings"
	"testing"
)

// TestScriptLinesOfAnyLength: a line over the limit fails with its line
// number and the script goes on; long lines under the limit run; the
// final line needs no newline.
func TestScriptLinesOfAnyLength(t *testing.T) {
	t.Parallel()
	huge := "bounds 1/2 " + strings.Repeat("x", 3<<20)
	long := "tail 3/14 p=0.5 # " + strings.Repeat("y", 600<<10)
	script := "bounds 3/14\n" + huge + "\n" + long + "\r\ncheck 3/14 p=0.5"
	s, out, errw := testSession()
	failed := s.RunLines(context.Background(), strings.NewReader(script), true)
	if failed != 1 {
		t.Errorf("failed = %d, want 1", failed)
	}
	if !strings.HasPrefix(errw.String(), `line 2: error: "line 2" is 3145739 bytes long`) || strings.Count(errw.String(), "\n") != 1 {
		t.Errorf("stderr %.300q", errw.String())
	}
	for _, want := range []string{"Wilson interval", "exactly 3", "point-probability test"} {
		if !strings.Contains(out.String(), want) {
			t.Errorf("output lacks %q (a later line did not run)", want)
		}
	}
}

func TestReadLine(t *testing.T) {
	t.Parallel()
	r := bufio.NewReaderSize(strings.NewReader("ab\n\n"+strings.Repeat("z", 100)+"\r\nlast"), 16)
	type got struct {
		line string
		size int
		err  error
	}
	want := []got{{"ab", 2, nil}, {"", 0, nil}, {"", 100, nil}, {"last", 4, nil}, {"", 0, io.EOF}}
	for i, w := range want {
		l, n, err := readLine(r, lineLimits{keep: 50})
		if l != w.line || n != w.size || err != w.err {
			t.Errorf("line %d: (%q, %d, %v), want %v", i+1, l, n, err, w)
		}
	}
}

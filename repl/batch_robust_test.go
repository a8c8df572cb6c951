package repl

import (
	"bytes"
	"context"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"sync"
	"sync/atomic"
	"testing"
	"time"
)

// TestEachDevZero: an endless binary input stops at once with an error
// naming the NUL byte, instead of growing memory until killed.
func TestEachDevZero(t *testing.T) {
	t.Parallel()
	if _, err := os.Stat("/dev/zero"); err != nil {
		t.Skip("no /dev/zero")
	}
	done := make(chan string, 1)
	go func() { e, _ := runErr("each /dev/zero bounds"); done <- e }()
	select {
	case e := <-done:
		if !strings.Contains(e, "NUL byte") {
			t.Errorf("stderr %q", e)
		}
	case <-time.After(10 * time.Second):
		t.Fatal("each /dev/zero does not stop")
	}
}

// TestEachLongRecord: a record over 1 MiB fails alone, with its line
// number, and the next rows run.
func TestEachLongRecord(t *testing.T) {
	t.Parallel()
	path := filepath.Join(t.TempDir(), "long.csv")
	data := "id,k,n\nA,1,10\n" + strings.Repeat("z", 2<<20) + ",2,10\nC,3,10\n"
	if err := os.WriteFile(path, []byte(data), 0o600); err != nil {
		t.Fatal(err)
	}
	out, stderr, failed := runScript(t, "each "+path+" bounds")
	lines := strings.Split(strings.TrimSpace(out), "\n")
	if failed != 1 || len(lines) != 4 || !strings.Contains(lines[2], "line 3: the record is 2097157 bytes long") || !strings.HasPrefix(lines[3], "C,3,10,0.3,") {
		t.Errorf("failed %d, stderr %q, output:\n%.500s", failed, stderr, out)
	}
}

// TestEachParallelOrder: on many workers the output is the same, row for
// row and in input order, as on one.
func TestEachParallelOrder(t *testing.T) {
	t.Parallel()
	cmd := tbl.get("check")
	data := benchRows(cmd.Row.In, 2000, 10, 300)
	run := func(workers int) string {
		args, _ := parseArgs(cmd, []string{"p=0.3"})
		s, _, _ := testSession()
		fn, err := cmd.Row.prepare(&call{Ctx: context.Background(), S: s, Args: args})
		if err != nil {
			t.Fatal(err)
		}
		var out bytes.Buffer
		job := batchJob{spec: cmd.Row, fn: fn, workers: workers, errText: func(err error) string { return err.Error() }}
		st, err := runBatch(context.Background(), bytes.NewReader(data), &out, job)
		if err != nil || st.rows != 2000 || st.failed != 0 {
			t.Fatalf("workers %d: %+v %v", workers, st, err)
		}
		return out.String()
	}
	one := run(1)
	for _, w := range []int{2, 7, 4 * runtime.GOMAXPROCS(0)} {
		if got := run(w); got != one {
			t.Errorf("workers=%d: output differs from workers=1:\n%s", w, firstDiff(one, got))
		}
	}
}

// TestEachCancel: a cancelled run keeps every row computed, writes no
// "context canceled" rows, and ends with one line of done and not run.
func TestEachCancel(t *testing.T) {
	t.Parallel()
	cmd := tbl.get("bounds")
	data := benchRows(cmd.Row.In, 5000, 10, 300)
	ctx, cancel := context.WithCancel(context.Background())
	var calls atomic.Int64
	job := batchJob{spec: cmd.Row, workers: 3, source: "rows.csv", size: int64(len(data)),
		errText: func(err error) string { return err.Error() },
		fn: func(ctx context.Context, v []int64) ([]float64, error) {
			if calls.Add(1) == 1000 {
				cancel()
			}
			if ctx.Err() != nil {
				return nil, ctx.Err()
			}
			return []float64{float64(v[0]) / float64(v[1]), 0, 1}, nil
		}}
	var out bytes.Buffer
	st, err := runBatch(ctx, bytes.NewReader(data), &out, job)
	if err != nil {
		t.Fatal(err)
	}
	rows := strings.Count(out.String(), "\n") - 1
	if !st.stopped || st.rows != rows || st.rows < 900 || st.rows+st.notRun+st.unread != 5000 || strings.Contains(out.String(), "cancel") {
		t.Errorf("stats %+v, %d rows written", st, rows)
	}
	line := st.stopLine()
	if !strings.Contains(line, "rows done") || !strings.Contains(line, "not run") || strings.Contains(line, "\n") {
		t.Errorf("stop line %q", line)
	}
}

// TestEachEscapesOnTerminal: pass-through columns keep their bytes in a
// file and are escaped when the output is a terminal.
func TestEachEscapesOnTerminal(t *testing.T) {
	t.Parallel()
	cmd := tbl.get("bounds")
	args, _ := parseArgs(cmd, nil)
	s, _, _ := testSession()
	fn, _ := cmd.Row.prepare(&call{Ctx: context.Background(), S: s, Args: args})
	in := "id,k,n\n\x1b[2Jx\u202e,1,10\n"
	for _, escape := range []bool{false, true} {
		var out bytes.Buffer
		job := batchJob{spec: cmd.Row, fn: fn, workers: 1, escape: escape, errText: func(err error) string { return err.Error() }}
		if _, err := runBatch(context.Background(), strings.NewReader(in), &out, job); err != nil {
			t.Fatal(err)
		}
		raw := strings.ContainsAny(out.String(), "\x1b\u202e")
		if raw == escape {
			t.Errorf("escape=%v: output %q", escape, out.String())
		}
	}
}

// syncBuffer is a bytes.Buffer safe for the progress goroutine.
type syncBuffer struct {
	mu sync.Mutex
	b  bytes.Buffer
}

func (s *syncBuffer) Write(p []byte) (int, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.Write(p)
}

func (s *syncBuffer) String() string {
	s.mu.Lock()
	defer s.mu.Unlock()
	return s.b.String()
}

// TestEachProgress: with a terminal for progress, a run longer than a
// second writes a progress line (rows, rate, time left) and clears it at
// the end; without one it writes nothing (runEach passes a progress
// writer only when standard error is a terminal).
func TestEachProgress(t *testing.T) {
	if testing.Short() {
		t.Skip("takes over a second")
	}
	t.Parallel()
	cmd := tbl.get("bounds")
	data := benchRows(cmd.Row.In, 30, 10, 300)
	slow := func(_ context.Context, v []int64) ([]float64, error) {
		time.Sleep(50 * time.Millisecond)
		return []float64{0, 0, 1}, nil
	}
	var prog syncBuffer
	job := batchJob{spec: cmd.Row, fn: slow, workers: 1, progress: &prog, size: int64(len(data)),
		errText: func(err error) string { return err.Error() }}
	if _, err := runBatch(context.Background(), bytes.NewReader(data), io.Discard, job); err != nil {
		t.Fatal(err)
	}
	p := prog.String()
	if !strings.Contains(p, "rows read") || !strings.Contains(p, "rows/s") || !strings.HasSuffix(p, "\r\x1b[K") {
		t.Errorf("progress %q", p)
	}
	if strings.Contains(p, "\n") {
		t.Errorf("progress wrote a new line: %q", p)
	}
}

// TestEachOutputNotThroughLink: each to=FILE writes only a regular file,
// never through a symbolic link (the link's target is left untouched).
func TestEachOutputNotThroughLink(t *testing.T) {
	dir := t.TempDir()
	in := filepath.Join(dir, "in.csv")
	target := filepath.Join(dir, "target.txt")
	link := filepath.Join(dir, "out.csv")
	if err := os.WriteFile(in, []byte("k,n\n3,10\n"), 0o600); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(target, []byte("keep\n"), 0o600); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink(target, link); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	msg, err := runErr("each " + in + " bounds to=" + link)
	if err == nil || !strings.Contains(msg, "to=") {
		t.Errorf("writing through a link: %q, %v", msg, err)
	}
	if b, _ := os.ReadFile(target); string(b) != "keep\n" {
		t.Errorf("the link's target was changed to %q", b)
	}
}

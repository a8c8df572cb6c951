package report

import (
	"bytes"
	"errors"
	"testing"
)

func TestReport(t *testing.T) {
	t.Parallel()
	var b bytes.Buffer
	r := New(&b)
	r.Line("  a\t%d", 1)
	r.Line("  longer\t%d", 22)
	r.Warnings([]string{"w1"})
	if err := r.Flush(); err != nil {
		t.Fatal(err)
	}
	want := "  a       1\n  longer  22\n    warning: w1\n"
	if got := b.String(); got != want {
		t.Errorf("output %q, want %q", got, want)
	}
}

type failWriter struct{}

var errWrite = errors.New("write failed")

func (failWriter) Write([]byte) (int, error) { return 0, errWrite }

func TestReportKeepsFirstError(t *testing.T) {
	t.Parallel()
	r := New(failWriter{})
	r.Line("x")
	if err := r.Flush(); !errors.Is(err, errWrite) {
		t.Errorf("Flush() = %v, want %v", err, errWrite)
	}
}

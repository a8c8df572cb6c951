// Package report writes the aligned text that the example programs print:
// lines whose tab-separated columns line up, and the warnings of a result,
// keeping the first write error so that a program checks it once at the end.
package report

import (
	"fmt"
	"io"
	"text/tabwriter"
)

// Report buffers aligned lines for a writer and remembers the first write
// error. Columns are padded with two spaces beyond the widest cell of a
// block of consecutive lines (text/tabwriter).
type Report struct {
	tw  *tabwriter.Writer
	err error
}

// New returns a Report that writes to w once Flush is called.
func New(w io.Writer) *Report {
	return &Report{tw: tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)}
}

// Line writes one formatted line; tabs separate aligned columns. After a
// write error it does nothing.
func (r *Report) Line(format string, args ...any) {
	if r.err == nil {
		_, r.err = fmt.Fprintf(r.tw, format+"\n", args...)
	}
}

// Warnings writes each warning of a result on its own indented line.
func (r *Report) Warnings(ws []string) {
	for _, w := range ws {
		r.Line("    warning: %s", w)
	}
}

// Flush writes out what is buffered and returns the first error.
func (r *Report) Flush() error {
	if r.err != nil {
		return r.err
	}
	return r.tw.Flush()
}

package repl

import (
	"bufio"
	"context"
	"encoding/csv"
	"io"
	"os"
	"slices"
	"strconv"

	"github.com/kofnlab/kofn/test"
)

// adjustSpill adds an adjusted p-value column over the whole file to each's
// output (each ... adjust=METHOD). An adjusted p-value needs every p-value
// of the family, so the output rows are spilled to a temporary file as they
// are computed, keeping only the p-values in memory (8 bytes a row, and
// during the adjustment a few arrays of that length); when
// the input is done the p-values are adjusted and a second pass copies the
// spilled rows to the output with the adjusted column added. The input is
// read once (it may be standard input), and memory does not grow with the
// rows beyond the p-value column.
type adjustSpill struct {
	method test.Adjustment
	pcol   int // position of p_value in a spilled row
	file   *os.File
	bw     *bufio.Writer
	w      *csv.Writer
	p      []float64 // p-values of the rows that have one, in output order
}

// newAdjustSpill returns a spill for the adjustment named word, or an
// error naming it when the verb writes no p-value.
func newAdjustSpill(word string, verb *command) (*adjustSpill, error) {
	if !slices.Contains(verb.Row.Out, "p_value") {
		return nil, inputErr("adjust="+word, "needs a verb that writes a p_value column (a test, like check, versus or flips)")
	}
	if !slices.Contains(adjustWords, word) {
		return nil, inputErr("adjust="+word, "is not an adjustment"+unknownHint(word, adjustWords))
	}
	return &adjustSpill{method: adjustment(word)}, nil
}

// start opens the temporary file; width is the input columns of a row.
func (a *adjustSpill) start(width int, spec *rowSpec) error {
	a.pcol = width + slices.Index(spec.Out, "p_value")
	f, err := os.CreateTemp("", "kofn-each-*.csv")
	if err != nil {
		return err
	}
	a.file = f
	a.bw = bufio.NewWriterSize(f, 64<<10)
	a.w = csv.NewWriter(a.bw)
	return nil
}

// close removes the temporary file.
func (a *adjustSpill) close() {
	if a.file != nil {
		a.file.Close()
		os.Remove(a.file.Name())
	}
}

// header returns the output header with the adjusted columns after the
// result columns.
func (a *adjustSpill) header(hdr []string) []string {
	return slices.Insert(slices.Clone(hdr), a.pcol+1, "adjusted_p_value", "adjustment")
}

// rowP returns the p-value of a spilled row, if it has one (no error).
func (a *adjustSpill) rowP(row []string) (float64, bool) {
	if row[len(row)-1] != "" || a.pcol >= len(row) {
		return 0, false
	}
	p, err := strconv.ParseFloat(row[a.pcol], 64)
	return p, err == nil && p >= 0 && p <= 1
}

// write spills one output row and keeps its p-value.
func (a *adjustSpill) write(row []string) error {
	if p, ok := a.rowP(row); ok {
		a.p = append(a.p, p)
	}
	return a.w.Write(row)
}

// finish adjusts the p-values and copies the spilled rows to out with the
// adjusted columns. When the run stopped early the family is incomplete
// and the adjusted cells are left empty, saying why.
func (a *adjustSpill) finish(ctx context.Context, out *csv.Writer, stopped bool) error {
	a.w.Flush()
	if err := a.w.Error(); err != nil {
		return err
	}
	if err := a.bw.Flush(); err != nil {
		return err
	}
	note := a.method.String() + " over " + strconv.Itoa(len(a.p)) + " p-values"
	var adj []float64
	if stopped {
		note = "not computed: the run stopped before the family was complete"
	} else {
		var err error
		if adj, err = test.AdjustPValues(context.WithoutCancel(ctx), a.p, a.method); err != nil {
			return err
		}
	}
	if _, err := a.file.Seek(0, io.SeekStart); err != nil {
		return err
	}
	rd := csv.NewReader(bufio.NewReaderSize(a.file, 64<<10))
	rd.FieldsPerRecord = -1
	rd.ReuseRecord = true
	next := 0
	for {
		row, err := rd.Read()
		if err == io.EOF {
			return nil
		}
		if err != nil {
			return err
		}
		cell := ""
		if _, ok := a.rowP(row); ok && adj != nil {
			cell = strconv.FormatFloat(adj[next], 'g', -1, 64)
			next++
		}
		if err := out.Write(slices.Insert(row, a.pcol+1, cell, note)); err != nil {
			return err
		}
	}
}

// summary says what adjust= did, for the last line of each.
func (a *adjustSpill) summary() string {
	return "adjusted_p_value by " + a.method.String() + " over the " + strconv.Itoa(len(a.p)) +
		" rows with a p-value (rows spilled to a temporary file, then copied with the column in a second pass)"
}

// put writes an output row, through the spill when adjust= is on.
func (job batchJob) put(w *csv.Writer, row []string) error {
	if job.adjust != nil {
		return job.adjust.write(row)
	}
	return w.Write(row)
}

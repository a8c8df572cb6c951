package repl

import (
	"bufio"
	"context"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"
)

// rowSpec describes how the batch command applies a verb to one CSV row:
// the count columns it reads, the result columns it writes, and prepare,
// which reads the verb's options once and returns the function applied to
// every row.
type rowSpec struct {
	In      []string // input count columns, e.g. k, n
	Out     []string // result columns
	prepare func(c *call) (rowFunc, error)
}

// rowFunc computes the result columns of one row from its counts.
type rowFunc func(ctx context.Context, counts []int64) ([]float64, error)

func eachCommand() *command {
	return &command{
		Name:    "each",
		Group:   "data",
		Summary: "apply an interval or test to every row of a CSV file of counts, writing CSV",
		Usage:   "each FILE|- VERB [verb options] [to=FILE]",
		Options: []opt{{Name: "to", Doc: "write the CSV to this file instead of the screen"}},
		Help: helpText{
			Computes: "Reads a CSV file (or standard input for -) with one set of counts per row, applies VERB " +
				"with the given options to each row, and streams CSV out: the input columns, then the result " +
				"columns, then an error column that is empty when the row worked. The first row is a header if " +
				"it is not all numbers; the count columns are then found by name (k,n for one group; k1,n1,k2,n2 " +
				"for two; a,b,c,d for pairs), and other columns pass through; without a header the counts are " +
				"the first columns. A row that fails does not stop the run, but the command reports failure. " +
				"The output is CSV whatever the json setting; numbers are written in full precision. " +
				"From a shell: kofn -c 'each visits.csv check p=0.3' > results.csv, or with the data on standard " +
				"input: kofn -c 'each - check p=0.3' < visits.csv.",
			Methods:     "", // filled by newTable with the row verbs
			Assumptions: "Each row is a separate analysis: no correction for testing many rows is applied.",
			Examples:    []string{"each - check p=0.3", "each - flips method=exact"},
			Sources:     "RFC 4180 (CSV).",
		},
		Run: runEach,
		raw: true,
	}
}

func runEach(c *call) error {
	words := c.Args.pos
	if len(words) < 2 {
		return &InputError{Token: "each", Reason: "needs a file (or -) and a verb; usage: " + c.Args.cmd.Usage}
	}
	file, verbWord := words[0], strings.ToLower(words[1])
	verb := c.S.cmds.get(verbWord)
	if verb == nil || verb.Row == nil {
		return inputErr(words[1], "cannot run on rows"+unknownHint(verbWord, c.S.cmds.rowVerbs()))
	}
	var rest []string
	to := ""
	for _, w := range words[2:] {
		if v, ok := strings.CutPrefix(w, "to="); ok {
			to = v
			continue
		}
		rest = append(rest, w)
	}
	args, err := parseArgs(verb, rest)
	if err != nil {
		return err
	}
	if len(args.pos) > 0 {
		return inputErr(args.pos[0], "is not an option; the counts come from the file's rows")
	}
	vc := &call{Ctx: c.Ctx, S: c.S, Args: args}
	fn, err := verb.Row.prepare(vc)
	if err != nil {
		return err
	}
	if err := args.Check(); err != nil {
		return err
	}
	var in io.Reader
	if file == "-" {
		if c.S.interactive {
			return inputErr(file, "is the terminal here; give a file name, or pipe the CSV in: kofn -c 'each - ...' < file.csv")
		}
		if c.S.In == nil {
			return inputErr(file, "cannot be read: standard input holds the commands; give a file name, or use kofn -c 'each - ...' < file.csv")
		}
		in = c.S.In
	} else {
		f, err := os.Open(file)
		if err != nil {
			return inputErr(file, "cannot be read: "+errors.Unwrap(err).Error())
		}
		defer f.Close()
		in = f
	}
	out := c.S.Out
	if to != "" {
		f, err := os.Create(to)
		if err != nil {
			return inputErr("to="+to, "cannot be written: "+errors.Unwrap(err).Error())
		}
		defer f.Close()
		out = f
	}
	rows, failed, err := batch(c.Ctx, in, out, verb.Row, fn)
	if err != nil {
		return err
	}
	if to != "" {
		b := c.Block("each: " + verbWord + " on " + file)
		b.Row("rows", strconv.Itoa(rows))
		b.Row("failed", strconv.Itoa(failed))
		b.Row("written to", to)
	}
	if failed > 0 {
		return &InputError{Token: file, Reason: fmt.Sprintf("had %d failed rows of %d; see the error column", failed, rows)}
	}
	return nil
}

// batch streams the CSV from in to out, applying fn to each row's counts.
// It returns the number of data rows and of failed rows; err reports a
// CSV syntax error, a write error or cancellation.
func batch(ctx context.Context, in io.Reader, out io.Writer, spec *rowSpec, fn rowFunc) (rows, failed int, err error) {
	r := csv.NewReader(bufio.NewReaderSize(in, 1<<16))
	r.ReuseRecord = true
	r.FieldsPerRecord = -1
	bw := bufio.NewWriterSize(out, 1<<16)
	defer bw.Flush()
	w := csv.NewWriter(bw)
	idx := make([]int, len(spec.In))
	for i := range idx {
		idx[i] = i
	}
	counts := make([]int64, len(spec.In))
	var outRec []string
	var buf []byte
	line := 0
	for {
		rec, rerr := r.Read()
		if rerr == io.EOF {
			break
		}
		line++
		if rerr != nil {
			return rows, failed, inputErr("line "+strconv.Itoa(line), "is not valid CSV: "+rerr.Error())
		}
		if line == 1 {
			if header, ok := headerIndex(rec, spec.In); ok {
				idx = header
				outRec = append(append(outRec[:0], rec...), spec.Out...)
				w.Write(append(outRec, "error"))
				continue
			}
			// No header: write one of our own.
			hdr := append([]string(nil), spec.In...)
			for i := len(spec.In); i < len(rec); i++ {
				hdr = append(hdr, "col"+strconv.Itoa(i+1))
			}
			w.Write(append(append(hdr, spec.Out...), "error"))
		}
		if rows%4096 == 0 && ctx.Err() != nil {
			return rows, failed, ctx.Err()
		}
		rows++
		outRec = append(outRec[:0], rec...)
		rowErr := rowCounts(rec, idx, counts)
		if rowErr == nil {
			var res []float64
			res, rowErr = fn(ctx, counts)
			if rowErr == nil {
				for _, v := range res {
					buf = strconv.AppendFloat(buf[:0], v, 'g', -1, 64)
					outRec = append(outRec, string(buf))
				}
				outRec = append(outRec, "")
			}
		}
		if rowErr != nil {
			failed++
			for range spec.Out {
				outRec = append(outRec, "")
			}
			outRec = append(outRec, strings.ReplaceAll(rowErr.Error(), "\n", " "))
		}
		if err := w.Write(outRec); err != nil {
			return rows, failed, err
		}
	}
	w.Flush()
	if err := w.Error(); err != nil {
		return rows, failed, err
	}
	return rows, failed, bw.Flush()
}

// headerIndex reports whether rec is a header (some field is not a whole
// number) and, if so, the positions of the wanted columns; a header that
// lacks one of them is treated as a header with the counts first.
func headerIndex(rec []string, want []string) ([]int, bool) {
	numeric := true
	for _, f := range rec {
		if _, err := strconv.ParseInt(strings.TrimSpace(f), 10, 64); err != nil {
			numeric = false
		}
	}
	if numeric {
		return nil, false
	}
	idx := make([]int, len(want))
	for i, name := range want {
		idx[i] = -1
		for j, f := range rec {
			if strings.EqualFold(strings.TrimSpace(f), name) {
				idx[i] = j
			}
		}
		if idx[i] < 0 {
			idx[i] = i
		}
	}
	return idx, true
}

// rowCounts reads the count columns of one row.
func rowCounts(rec []string, idx []int, counts []int64) error {
	for i, j := range idx {
		if j >= len(rec) {
			return errors.New("missing column " + strconv.Itoa(j+1))
		}
		v, err := parseCount(strings.TrimSpace(rec[j]))
		if err != nil {
			return err
		}
		counts[i] = v
	}
	return nil
}

// rowVerbList describes the row verbs of t and their count columns.
func rowVerbList(t *table) string {
	var parts []string
	for _, n := range t.rowVerbs() {
		parts = append(parts, n+" ("+strings.Join(t.get(n).Row.In, ",")+")")
	}
	return strings.Join(parts, ", ")
}

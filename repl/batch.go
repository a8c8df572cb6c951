package repl

import (
	"bufio"
	"context"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"os"
	"runtime"
	"slices"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"time"
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
		Usage:   "each FILE|- VERB [verb options] [to=FILE] [adjust=A]",
		Options: []opt{{Name: "to", Doc: "write the CSV to this file instead of the screen"},
			{Name: "adjust", Doc: "add an adjusted_p_value column over the whole file: " + adjustHelp, Values: adjustWords}},
		Help: helpText{
			Computes: "Reads a CSV file (or standard input for -) with one set of counts per row, applies VERB " +
				"with the given options to each row, and streams CSV out: the input columns, the result columns " +
				"in full precision, the method, level and side the row was computed with, and an error column. " +
				"The first row is the header when it names every count column the verb reads (k,n for one group; " +
				"k1,n1,k2,n2 for two; n11,n12,n21,n22 for pairs; found by name, other columns pass through), or when none " +
				"of its fields is a number (then missing count columns are reported once, before any row). " +
				"Otherwise the first row is data and the counts are the first columns. Every input row gives one " +
				"output row with the header's column count; a row that cannot be used (too few or too many " +
				"fields, a bad count, a bare quote, a record over 1 MiB) has its input line number and the reason " +
				"in the error column and counts as failed, and the run goes on. Rows run on all cores, written in " +
				"input order. On a terminal, progress (rows, rate, time left) goes to standard error once a second; " +
				"Ctrl-C stops the run, keeps the rows done and says how many were not run. " +
				"A last line on standard error gives the rows done and failed and which header rule applied; the " +
				"command fails if any row did. Undefined estimates (an empty group) are written NaN. " +
				"From a shell: kofn -c 'each visits.csv check p=0.3' > results.csv, or with the data on standard " +
				"input: kofn -c 'each - check p=0.3' < visits.csv. " +
				"Grouped: each FILE strata by=COLUMN reads one stratum a row (k1,n1,k2,n2) and writes one row per " +
				"value of the key column, in order of first appearance: the key, the number of strata, the test's " +
				"p-value and statistic, the common effect with its limits, the homogeneity p-value, what was computed " +
				"and the warnings; a group with an unusable row is not analysed and carries that row's line and reason " +
				"in the error column; a row whose key cannot be read stops the run before anything is computed (any group " +
				"could lack a stratum). The file needs a header naming the columns and the key; it is held in memory " +
				"(up to 1,000,000 rows). Invented example: a file sites.csv with columns site,k1,n1,k2,n2, one row per " +
				"site and week: each sites.csv strata by=site effect=difference-score.",
			Methods: "", // filled by newTable with the row verbs
			Assumptions: "Each row is a separate analysis: no correction for testing many rows is applied, unless " +
				"adjust= asks for one. With adjust= (verbs writing a p_value), the rows with a p-value form one " +
				"family: the output rows are spilled to a temporary file while the p-values (8 bytes a row; the " +
				"adjustment briefly needs some ten arrays of that length: 80 MB more at 500,000 rows with hommel) stay " +
				"in memory, and once the input ends a second pass writes the rows with adjusted_p_value and " +
				"adjustment columns after the results; the input is read once, so standard input works.",
			Examples: []string{"each - check p=0.3", "each - flips method=exact", "each - strata by=site"},
			Sources:  "RFC 4180 (CSV).",
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
	if verb != nil && verb.Row == nil && verb.Grouped != nil {
		return runEachGroups(c, verb, file, words[2:])
	}
	if verb == nil || verb.Row == nil {
		return inputErr(words[1], "cannot run on rows"+unknownHint(verbWord, c.S.cmds.rowVerbs()))
	}
	to, adjustWord, rest := splitEachOptions(words[2:])
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
	job := batchJob{spec: verb.Row, fn: fn, workers: runtime.GOMAXPROCS(0), source: file}
	if adjustWord != "" {
		if job.adjust, err = newAdjustSpill(adjustWord, verb); err != nil {
			return err
		}
	}
	job.metaNames, job.meta, err = rowMeta(vc, verb)
	if err != nil {
		return err
	}
	job.errText = func(err error) string { return shellError(c.S.cmds, verbWord, err) }
	in, closeIn, err := openEachInput(c, file)
	if err != nil {
		return err
	}
	defer closeIn()
	if f, ok := in.(*os.File); ok && f != c.S.In {
		if fi, err := f.Stat(); err == nil && fi.Mode().IsRegular() {
			job.size = fi.Size()
		}
	}
	out := c.S.Out
	if to != "" {
		// Never through a link, and only as a regular file, as the history.
		f, err := openRegular(to, os.O_WRONLY|os.O_CREATE|os.O_TRUNC)
		if err != nil {
			reason := err.Error()
			if u := errors.Unwrap(err); u != nil {
				reason = u.Error()
			}
			return inputErr("to="+to, "cannot be written: "+reason)
		}
		defer f.Close()
		out = f
	}
	job.escape = isTerminal(out)
	if isTerminal(c.S.Err) {
		job.progress = c.S.Err
	}
	st, err := runBatch(c.Ctx, in, out, job)
	if err != nil {
		return err
	}
	if to != "" {
		b := c.Block("each: " + verbWord + " on " + file)
		b.Row("rows", strconv.Itoa(st.rows))
		b.Row("failed", strconv.Itoa(st.failed))
		b.Row("header", st.header)
		if job.adjust != nil {
			b.Row("adjusted", job.adjust.summary())
		}
		b.Row("written to", to)
	}
	switch {
	case st.stopped:
		return &InputError{Token: file, Reason: st.stopLine()}
	case st.failed > 0:
		return &InputError{Token: file, Reason: fmt.Sprintf("had %d failed rows of %d (see the error column); %s", st.failed, st.rows, st.header)}
	}
	if to == "" {
		fmt.Fprintf(c.S.Err, "each: %d rows done, none failed; %s\n", st.rows, safeText(st.header, false))
		if job.adjust != nil {
			fmt.Fprintf(c.S.Err, "each: %s\n", job.adjust.summary())
		}
	}
	return nil
}

// openEachInput opens each's input: the file, or standard input for -
// when it is not the terminal or the command stream. The returned
// function closes it.
func openEachInput(c *call, file string) (io.Reader, func(), error) {
	if file == "-" {
		if c.S.interactive {
			return nil, nil, inputErr(file, "is the terminal here; give a file name, or pipe the CSV in: kofn -c 'each - ...' < file.csv")
		}
		if c.S.In == nil {
			return nil, nil, inputErr(file, "cannot be read: standard input holds the commands; give a file name, or use kofn -c 'each - ...' < file.csv")
		}
		return c.S.In, func() {}, nil
	}
	f, err := os.Open(file)
	if err != nil {
		return nil, nil, inputErr(file, "cannot be read: "+errors.Unwrap(err).Error())
	}
	if fi, err := f.Stat(); err == nil && fi.IsDir() {
		f.Close()
		return nil, nil, inputErr(file, "is a directory; give a CSV file")
	}
	return f, func() { f.Close() }, nil
}

// rowMeta returns the columns that say what each row computed: the
// method, the level and the side (or bound), for the verbs that have them,
// as the session would run them.
func rowMeta(c *call, verb *command) (names, values []string, err error) {
	if len(verb.Methods) > 0 {
		m, err := c.Method()
		if err != nil {
			return nil, nil, err
		}
		if m == "exact" || m == "fisher" { // the exact family: its rule and mid-p
			if o := verb.option("rule"); o != nil {
				m += " " + strings.ToLower(c.Args.Str("rule", o.Values[0]))
			}
			if verb.option("midp") != nil && strings.EqualFold(c.Args.Str("midp", "off"), "on") {
				m += " mid-p"
			}
		}
		names, values = append(names, "method"), append(values, m)
	}
	if verb.option("level") != nil && slices.Contains(verb.outColumns(), "lower") {
		l, err := c.Level()
		if err != nil {
			return nil, nil, err
		}
		names, values = append(names, "level"), append(values, strconv.FormatFloat(l, 'g', -1, 64))
	}
	for _, side := range []string{"alt", "side", "bound"} {
		if o := verb.option(side); o != nil && len(o.Values) > 0 {
			v := strings.ToLower(c.Args.Str(side, o.Values[0]))
			names, values = append(names, side), append(values, v)
			break
		}
	}
	return names, values, nil
}

// batchJob is one run of each: the verb's row form and how to run it.
type batchJob struct {
	spec      *rowSpec
	fn        rowFunc
	metaNames []string // method, level, side columns
	meta      []string
	errText   func(error) string // an error as the shell words it
	workers   int
	escape    bool      // escape control characters (the output is a terminal)
	progress  io.Writer // a terminal for progress lines, or nil
	size      int64     // input bytes when known, for the time left
	source    string
	adjust    *adjustSpill // adjust=: the whole file's adjusted p-values (batch_adjust.go)
}

// batchStats says what a run did.
type batchStats struct {
	rows, failed int // data rows written, and those with an error
	notRun       int // rows read but not computed because the run stopped
	unread       int // rows after the stop that were counted but not read (-1: unknown)
	stopped      bool
	header       string // which rule decided the first row, in words
}

func (st batchStats) stopLine() string {
	rest := strconv.Itoa(st.notRun+max(st.unread, 0)) + " not run"
	if st.unread < 0 {
		rest = strconv.Itoa(st.notRun) + " not run and the rest of the input not read"
	}
	return fmt.Sprintf("stopped (interrupted): %d rows done (%d of them failed), %s; the rows done are written", st.rows, st.failed, rest)
}

// rowChunk is a run of consecutive records computed by one worker.
type rowChunk struct {
	recs []record
	out  [][]string // output rows; nil for a row not run
	done chan struct{}
}

// maxChunkRows bounds the records per chunk. A chunk holds enough rows to
// take about chunkTime to compute, judged from the rows done so far, so
// the hand-over between goroutines stays cheap beside rows of a
// microsecond while slow rows (an unconditional test) are spread one by
// one over the workers.
const (
	maxChunkRows = 64
	chunkTime    = 50 * time.Microsecond
)

// chunkSize returns the rows for the next chunk from the rows computed so
// far and the time they took.
func chunkSize(rows, nanos int64) int {
	if rows == 0 || nanos <= 0 {
		return 1
	}
	perRow := nanos / rows
	if perRow <= 0 {
		return maxChunkRows
	}
	return int(max(1, min(maxChunkRows, int64(chunkTime)/perRow)))
}

// runBatch streams the CSV from in to out, applying the job's function to
// every data row on a pool of workers, with the output in input order and
// a bounded number of rows in flight.
//
// The first row is the header when it names every count column the verb
// reads (columns are then found by name, others pass through), or when
// none of its fields is a number (then the missing count columns are an
// error before any row is computed). Otherwise it is data, the counts are
// the first columns, and a header of the kofn column names is written.
// No row is dropped: every record gives one output row with the header's
// column count, and a record that cannot be used carries its line number
// and the reason in the error column.
func runBatch(ctx context.Context, in io.Reader, out io.Writer, job batchJob) (st batchStats, err error) {
	rd := newCSVReader(in)
	first, rerr := rd.next()
	if rerr == io.EOF {
		return st, &InputError{Token: job.source, Reason: "is empty: no header and no rows"}
	}
	if rerr != nil {
		return st, readError(job.source, rd, rerr)
	}
	idx, header, isHeader, herr := decideHeader(first, job.spec.In)
	if herr != nil {
		return st, inputErr(job.source, herr.Error())
	}
	width := len(header)
	if isHeader {
		st.header = "first row taken as the header: it names " + strings.Join(job.spec.In, ", ")
	} else {
		st.header = "no header: the first row is data, and the counts are the first " + strconv.Itoa(len(job.spec.In)) + " columns"
	}

	bw := bufio.NewWriterSize(out, 64<<10)
	w := csv.NewWriter(bw)
	hdr := append(append(append(escapeCells(header, job.escape), job.spec.Out...), job.metaNames...), "error")
	if job.adjust != nil {
		if err := job.adjust.start(width, job.spec); err != nil {
			return st, err
		}
		defer job.adjust.close()
		hdr = job.adjust.header(hdr)
	}
	if err := w.Write(hdr); err != nil {
		return st, err
	}

	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	workers := max(1, job.workers)
	jobs := make(chan *rowChunk, 2*workers)
	order := make(chan *rowChunk, 2*workers)
	var wg sync.WaitGroup
	var doneRows, doneNanos atomic.Int64
	for range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			counts := make([]int64, len(job.spec.In))
			for ch := range jobs {
				start := time.Now()
				for i, rec := range ch.recs {
					ch.out[i] = job.row(ctx, rec, idx, width, counts)
				}
				doneNanos.Add(int64(time.Since(start)))
				doneRows.Add(int64(len(ch.recs)))
				close(ch.done)
			}
		}()
	}
	var readErr error
	leftover := 0 // rows read but never handed to a worker (set by the reader)
	var readRows atomic.Int64
	go func() {
		defer close(order)
		defer close(jobs)
		size := 1
		pending := []record{}
		if !isHeader {
			pending = append(pending, first)
		}
		flush := func() {
			ch := &rowChunk{recs: pending, out: make([][]string, len(pending)), done: make(chan struct{})}
			order <- ch
			jobs <- ch
			pending = make([]record, 0, size)
		}
		for ctx.Err() == nil {
			if len(pending) >= size {
				flush()
				size = chunkSize(doneRows.Load(), doneNanos.Load())
			}
			rec, err := rd.next()
			if err != nil {
				if err != io.EOF {
					readErr = err
				}
				break
			}
			readRows.Add(1)
			pending = append(pending, rec)
		}
		if len(pending) > 0 && ctx.Err() == nil {
			flush()
		} else {
			leftover = len(pending)
		}
	}()

	stopProgress := job.startProgress(&st, rd, &readRows)
	var werr error
	for ch := range order {
		<-ch.done
		for _, row := range ch.out {
			if row == nil {
				st.notRun++
				continue
			}
			if werr != nil {
				continue
			}
			st.rows++
			if row[len(row)-1] != "" {
				st.failed++
			}
			if werr = job.put(w, row); werr != nil {
				cancel()
			}
		}
	}
	wg.Wait()
	stopProgress()
	st.notRun += leftover
	if werr == nil && job.adjust != nil {
		werr = job.adjust.finish(ctx, w, st.notRun > 0 || ctx.Err() != nil)
	}
	w.Flush()
	if werr == nil {
		werr = w.Error()
	}
	if ferr := bw.Flush(); werr == nil {
		werr = ferr
	}
	if werr != nil {
		return st, werr
	}
	if readErr != nil {
		return st, readError(job.source, rd, readErr)
	}
	if st.notRun > 0 || ctx.Err() != nil {
		st.stopped = true
		st.unread = -1
		if job.size > 0 {
			st.unread = countRest(rd)
		}
	}
	return st, nil
}

// readError reports why the input could not be read on; the rows before
// are written.
func readError(source string, rd *csvReader, err error) error {
	where := "line " + strconv.Itoa(rd.lineNo+1)
	switch err {
	case errNUL:
		return inputErr(source, "holds "+err.Error()+" (on "+where+"); reading stopped there, the rows before are written")
	case errHugeLine:
		return inputErr(source, "has "+err.Error()+" (on "+where+", over 64 MiB); reading stopped there, the rows before are written")
	}
	return inputErr(source, "could not be read after line "+strconv.Itoa(rd.lineNo)+": "+err.Error())
}

// countRest counts the records left in a regular file after a stop,
// without computing them.
func countRest(rd *csvReader) int {
	n := 0
	for {
		if _, err := rd.next(); err != nil {
			return n
		}
		n++
	}
}

// decideHeader applies the header rule of runBatch to the first record.
// It returns the positions of the count columns, the output's input
// header, and whether the first record is a header.
func decideHeader(first record, want []string) (idx []int, header []string, isHeader bool, err error) {
	idx = make([]int, len(want))
	if first.err == nil {
		found := 0
		for i, name := range want {
			idx[i] = -1
			for j, f := range first.fields {
				if strings.EqualFold(strings.TrimSpace(f), name) {
					idx[i] = j
					found++
					break
				}
			}
		}
		if found == len(want) {
			return idx, first.fields, true, nil
		}
		numbers := 0
		for _, f := range first.fields {
			if decimalRE.MatchString(strings.TrimSpace(f)) {
				numbers++
			}
		}
		if numbers == 0 {
			var missing []string
			for i, name := range want {
				if idx[i] < 0 {
					missing = append(missing, name)
				}
			}
			return nil, nil, false, errors.New("has the header " + shortToken(strings.Join(first.fields, ",")) +
				", which lacks the column" + plural(len(missing)) + " " + strings.Join(missing, ", ") +
				" (the verb reads " + strings.Join(want, ", ") + "); name the columns so, or drop the header to read the first columns")
		}
	}
	for i := range idx {
		idx[i] = i
	}
	header = append([]string(nil), want...)
	n := len(want)
	if first.err == nil {
		n = max(n, len(first.fields))
	}
	for i := len(want); i < n; i++ {
		header = append(header, "col"+strconv.Itoa(i+1))
	}
	return idx, header, false, nil
}

func plural(n int) string {
	if n == 1 {
		return ""
	}
	return "s"
}

// row computes the output row of one record: the input's columns (as
// many as the header has), the results, the meta columns and the error.
// It returns nil when the run was stopped before the row was computed.
func (job batchJob) row(ctx context.Context, rec record, idx []int, width int, counts []int64) []string {
	out := make([]string, width, width+len(job.spec.Out)+len(job.meta)+1)
	copy(out, escapeCells(rec.fields[:min(len(rec.fields), width)], job.escape))
	var res []float64
	var problem string
	switch {
	case rec.err != nil:
		problem = reasonLine(rec.err)
	case len(rec.fields) != width:
		problem = "has " + strconv.Itoa(len(rec.fields)) + " fields, the header " + strconv.Itoa(width)
	default:
		for i, j := range idx {
			v, err := parseCount(strings.TrimSpace(rec.fields[j]))
			if err != nil {
				problem = "column " + job.spec.In[i] + ": " + reasonLine(err)
				break
			}
			counts[i] = v
		}
		if problem == "" {
			if ctx.Err() != nil {
				return nil
			}
			var err error
			res, err = job.fn(ctx, counts)
			if err != nil {
				if ctx.Err() != nil {
					return nil
				}
				problem = job.errText(err)
			}
		}
	}
	for i := range job.spec.Out {
		if i < len(res) {
			out = append(out, strconv.FormatFloat(res[i], 'g', -1, 64))
		} else {
			out = append(out, "")
		}
	}
	out = append(out, job.meta...)
	if problem != "" {
		problem = "line " + strconv.Itoa(rec.line) + ": " + safeText(shortenWords(problem), false)
	}
	return append(out, problem)
}

// reasonLine is an input error as "token reason" on one line.
func reasonLine(err error) string {
	if ie, ok := err.(*InputError); ok {
		return strconv.Quote(shortToken(ie.Token)) + " " + ie.Reason
	}
	return err.Error()
}

// shortenWords shortens every over-long word of msg.
func shortenWords(msg string) string {
	words := strings.Fields(msg)
	for i, w := range words {
		words[i] = shortToken(w)
	}
	return strings.Join(words, " ")
}

// escapeCells escapes control characters in pass-through cells when the
// output goes to a terminal (a file or pipe gets the cells unchanged).
func escapeCells(cells []string, escape bool) []string {
	if !escape {
		return cells
	}
	out := make([]string, len(cells))
	for i, c := range cells {
		out[i] = safeText(c, false)
	}
	return out
}

// startProgress writes a progress line to the job's terminal once a
// second (rows done, rate, time left when the input size is known) and
// returns the function that stops it and clears the line.
func (job batchJob) startProgress(st *batchStats, rd *csvReader, readRows *atomic.Int64) func() {
	if job.progress == nil {
		return func() {}
	}
	stop := make(chan struct{})
	done := make(chan struct{})
	start := time.Now()
	go func() {
		defer close(done)
		t := time.NewTicker(time.Second)
		defer t.Stop()
		shown := false
		for {
			select {
			case <-stop:
				if shown {
					io.WriteString(job.progress, "\r\x1b[K")
				}
				return
			case <-t.C:
				n := readRows.Load()
				el := time.Since(start).Seconds()
				line := fmt.Sprintf("\reach: %d rows read, %.0f rows/s", n, float64(n)/el)
				if b := rd.read.Load(); job.size > 0 && b > 0 && b < job.size {
					left := el * float64(job.size-b) / float64(b)
					line += ", about " + time.Duration(left*float64(time.Second)).Round(time.Second).String() + " left"
				}
				io.WriteString(job.progress, line+"\x1b[K")
				shown = true
			}
		}
	}()
	return func() { close(stop); <-done }
}

// rowVerbList describes the row verbs of t and their count columns.
func rowVerbList(t *table) string {
	var parts []string
	for _, n := range t.rowVerbs() {
		if g := t.get(n).Grouped; g != nil {
			parts = append(parts, n+" (one stratum a row in "+strings.Join(g.In, ",")+", grouped by by=COLUMN: one output row per group)")
			continue
		}
		parts = append(parts, n+" ("+strings.Join(t.get(n).Row.In, ",")+")")
	}
	return strings.Join(parts, ", ")
}

// outColumns returns the result columns of the verb's row or grouped form.
func (c *command) outColumns() []string {
	switch {
	case c.Row != nil:
		return c.Row.Out
	case c.Grouped != nil:
		return c.Grouped.Out
	}
	return nil
}

// splitEachOptions takes each's own options out of the words after its
// verb: to=FILE and adjust=METHOD (lower-cased); the rest are the verb's.
func splitEachOptions(words []string) (to, adjustWord string, rest []string) {
	for _, w := range words {
		if v, ok := strings.CutPrefix(w, "to="); ok {
			to = v
			continue
		}
		if v, ok := strings.CutPrefix(w, "adjust="); ok {
			adjustWord = strings.ToLower(v)
			continue
		}
		rest = append(rest, w)
	}
	return to, adjustWord, rest
}

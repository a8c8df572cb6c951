package repl

import (
	"bufio"
	"context"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"os"
	"slices"
	"strconv"
	"strings"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

// groupSpec is the grouped form of a verb for each: the file holds one
// stratum per row, by= names the key column, and one output row is
// written per key (see runEachGroups).
type groupSpec struct {
	In  []string // count columns of a stratum
	Out []string // result columns after the key
}

// strataGroups is the grouped form of strata.
var strataGroups = &groupSpec{
	In: []string{"k1", "n1", "k2", "n2"},
	Out: []string{"strata", "p_value", "statistic", "estimate", "lower", "upper", "homogeneity_p_value",
		"effect", "weights", "homogeneity", "warnings"},
}

// maxGroupRows bounds the rows each ... strata holds in memory (32 bytes
// of counts a row, and the keys): 1e6 rows, the limit of strata per call.
const maxGroupRows = 1_000_000

// strataGroup is one key's strata and the first unusable row among them.
type strataGroup struct {
	key  string
	ts   []interval.Stratum
	rows int
	bad  string // "line N: reason" of the first unusable row, or ""
}

// runEachGroups is each FILE strata by=COLUMN: it reads every row (a
// stratum) into groups by the key column, in order of first appearance,
// runs the strata analysis on each group and writes one CSV row per
// group. A group with an unusable row is not analysed: its row carries
// that line and the reason in the error column. A row whose key cannot be
// read (a broken record, or too few fields to reach the key) stops the
// run before anything is computed, since any group could lack a stratum.
func runEachGroups(c *call, verb *command, file string, words []string) error {
	to, adjustWord, rest := splitEachOptions(words)
	args, err := parseArgs(verb, rest)
	if err != nil {
		return err
	}
	if len(args.pos) > 0 {
		return inputErr(args.pos[0], "is not an option; the strata come from the file's rows")
	}
	if args.Has("file") {
		return inputErr("file="+args.Str("file", ""), "does not go with each; the strata come from "+file)
	}
	by := strings.TrimSpace(args.Str("by", ""))
	if by == "" {
		return &InputError{Token: "strata", Reason: "in each needs by=COLUMN, the key column that groups the rows into strata sets (one output row per key)"}
	}
	if adjustWord != "" && !slices.Contains(adjustWords, adjustWord) {
		return inputErr("adjust="+adjustWord, "is not an adjustment"+unknownHint(adjustWord, adjustWords))
	}
	vc := &call{Ctx: c.Ctx, S: c.S, Args: args}
	st, err := readStrataSettings(vc)
	if err != nil {
		return err
	}
	if err := args.Check(); err != nil {
		return err
	}
	metaNames, meta, err := rowMeta(vc, verb)
	if err != nil {
		return err
	}
	in, closeIn, err := openEachInput(c, file)
	if err != nil {
		return err
	}
	defer closeIn()
	groups, rows, err := readGroups(c.Ctx, in, file, by, strataGroups.In)
	if err != nil {
		return err
	}
	out := c.S.Out
	if to != "" {
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
	escape := isTerminal(out)
	weights := "mh"
	if st.weights == interval.WeightsInverseVariance {
		weights = "ivs"
	}
	var table [][]string
	var pvals []float64
	var prow []int
	failed, done := 0, 0
	for _, g := range groups {
		if c.Ctx.Err() != nil {
			break
		}
		row := make([]string, 0, 1+len(strataGroups.Out)+len(meta)+1)
		row = append(row, safeCell(g.key, escape), strconv.Itoa(g.rows))
		problem := g.bad
		var res strataResult
		if problem == "" {
			res, err = st.analyse(c.Ctx, g.key, g.ts)
			if err != nil {
				if c.Ctx.Err() != nil {
					break
				}
				problem = by + " " + strconv.Quote(shortToken(g.key)) + ": " + safeText(shortenWords(shellError(c.S.cmds, "strata", err)), false)
			}
		}
		if problem == "" {
			hp := ""
			var warn []string
			warn = append(append(warn, res.Test.Warnings...), res.Common.Warnings...)
			if h := res.Homogeneity; h != nil {
				hp = fmtFull(h.PValue)
				warn = append(warn, h.Warnings...)
			}
			row = append(row, fmtFull(res.Test.PValue), fmtFull(res.Test.Statistic.Value), fmtFull(res.Common.Estimate),
				fmtFull(res.Common.Lower), fmtFull(res.Common.Upper), hp)
			row = append(row, st.effect, weights, st.homogeneity, strings.Join(warn, "; "))
			pvals, prow = append(pvals, res.Test.PValue), append(prow, len(table))
		} else {
			failed++
			row = append(row, "", "", "", "", "", "", st.effect, weights, st.homogeneity, "")
		}
		row = append(append(row, meta...), problem)
		table = append(table, row)
		done++
	}
	stopped := done < len(groups)
	hdr := append(append(append([]string{safeCell(by, escape)}, strataGroups.Out...), metaNames...), "error")
	note := ""
	if adjustWord != "" {
		// The adjusted p-values go right after p_value, as in the row form.
		var adj []float64
		note = test.Adjustment(adjustment(adjustWord)).String() + " over " + strconv.Itoa(len(pvals)) + " p-values"
		if stopped {
			note = "not computed: the run stopped before the family was complete"
		} else if adj, err = test.AdjustPValues(context.WithoutCancel(c.Ctx), pvals, adjustment(adjustWord)); err != nil {
			return err
		}
		cells := make([]string, len(table))
		for i, j := range prow {
			if adj != nil {
				cells[j] = fmtFull(adj[i])
			}
		}
		pcol := 1 + slices.Index(strataGroups.Out, "p_value")
		hdr = slices.Insert(hdr, pcol+1, "adjusted_p_value", "adjustment")
		for j := range table {
			table[j] = slices.Insert(table[j], pcol+1, cells[j], note)
		}
	}
	bw := bufio.NewWriterSize(out, 64<<10)
	w := csv.NewWriter(bw)
	if err := w.Write(hdr); err != nil {
		return err
	}
	if err := w.WriteAll(table); err != nil {
		return err
	}
	if err := bw.Flush(); err != nil {
		return err
	}
	summary := fmt.Sprintf("%d groups by %s from %d rows", len(groups), by, rows)
	if to != "" {
		b := c.Block("each: strata on " + file)
		b.Row("groups", strconv.Itoa(done), "by "+by+", from "+strconv.Itoa(rows)+" rows")
		b.Row("failed", strconv.Itoa(failed))
		if note != "" {
			b.Row("adjusted", "adjusted_p_value by "+note)
		}
		b.Row("written to", to)
	}
	switch {
	case stopped:
		return &InputError{Token: file, Reason: fmt.Sprintf("stopped (interrupted): %d of %d groups done (%d of them failed); the groups done are written", done, len(groups), failed)}
	case failed > 0:
		return &InputError{Token: file, Reason: fmt.Sprintf("had %d failed groups of %d (see the error column); %s", failed, len(groups), summary)}
	}
	if to == "" {
		fmt.Fprintf(c.S.Err, "each: %s done, none failed\n", safeText(summary, false))
	}
	return nil
}

// fmtFull writes a number in full precision, as the row form does.
func fmtFull(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

// safeCell escapes control characters of a cell bound for a terminal.
func safeCell(s string, escape bool) string {
	if escape {
		return safeText(s, false)
	}
	return s
}

// readGroups reads the strata of in by the key column by, in order of
// first appearance. The first row must be a header naming the count
// columns and the key.
func readGroups(ctx context.Context, in io.Reader, source, by string, want []string) ([]*strataGroup, int, error) {
	rd := newCSVReader(in)
	first, err := rd.next()
	if err == io.EOF {
		return nil, 0, &InputError{Token: source, Reason: "is empty: no header and no rows"}
	}
	if err != nil {
		return nil, 0, readError(source, rd, err)
	}
	if first.err != nil {
		return nil, 0, inputErr(source, "has an unreadable first row ("+reasonLine(first.err)+"); each ... strata needs a header naming "+strings.Join(want, ", ")+" and the by= column")
	}
	col := map[string]int{}
	for i, f := range first.fields {
		name := strings.ToLower(strings.TrimSpace(f))
		if _, dup := col[name]; !dup {
			col[name] = i
		}
	}
	var missing []string
	for _, c := range append(slices.Clone(want), strings.ToLower(by)) {
		if _, ok := col[c]; !ok {
			missing = append(missing, c)
		}
	}
	if len(missing) > 0 {
		return nil, 0, inputErr(source, "has the header "+shortToken(strings.Join(first.fields, ","))+", which lacks the column"+plural(len(missing))+" "+
			strings.Join(missing, ", ")+" (each ... strata reads "+strings.Join(want, ", ")+" and the key named by by=)")
	}
	keyCol := col[strings.ToLower(by)]
	byKey := map[string]*strataGroup{}
	var groups []*strataGroup
	rows := 0
	for {
		rec, err := rd.next()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, 0, readError(source, rd, err)
		}
		rows++
		if rows > maxGroupRows {
			return nil, 0, inputErr(source, "has more than 1000000 rows, the limit of strata a grouped run holds; split the file")
		}
		if rows&4095 == 0 && ctx.Err() != nil {
			return nil, 0, &InputError{Token: source, Reason: "stopped (interrupted) while reading; nothing was computed"}
		}
		// A row whose key cannot be read could belong to any group, and
		// every group's analysis could then miss a stratum: the run stops.
		if rec.err != nil {
			return nil, 0, inputErr(source, "line "+strconv.Itoa(rec.line)+": "+safeText(shortenWords(reasonLine(rec.err)), false)+
				"; its "+by+" key cannot be read, so the group it belongs to is unknown: fix the row (nothing was computed)")
		}
		if keyCol >= len(rec.fields) {
			return nil, 0, inputErr(source, "line "+strconv.Itoa(rec.line)+": has "+strconv.Itoa(len(rec.fields))+" fields and no "+by+
				" key, so the group it belongs to is unknown: fix the row (nothing was computed)")
		}
		key := strings.TrimSpace(rec.fields[keyCol])
		g := byKey[key]
		if g == nil {
			g = &strataGroup{key: key}
			byKey[key] = g
			groups = append(groups, g)
		}
		g.rows++
		if g.bad != "" {
			continue
		}
		problem := ""
		var v [4]int64
		switch {
		case len(rec.fields) != len(first.fields):
			problem = "has " + strconv.Itoa(len(rec.fields)) + " fields, the header " + strconv.Itoa(len(first.fields))
		default:
			for i, c := range want {
				n, err := parseCount(strings.TrimSpace(rec.fields[col[c]]))
				if err != nil {
					problem = "column " + c + ": " + reasonLine(err)
					break
				}
				v[i] = n
			}
		}
		if problem != "" {
			g.bad = "line " + strconv.Itoa(rec.line) + ": " + safeText(shortenWords(problem), false)
			continue
		}
		g.ts = append(g.ts, interval.Stratum{K1: v[0], N1: v[1], K2: v[2], N2: v[3]})
	}
	if len(groups) == 0 {
		return nil, 0, inputErr(source, "has a header and no rows")
	}
	return groups, rows, nil
}

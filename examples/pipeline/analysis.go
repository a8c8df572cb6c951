package main

import (
	"context"
	"errors"
	"fmt"
	"strconv"
	"strings"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

// Config says what every row gets: the analysis, its method and level,
// the alternative, and how the p-values are adjusted for multiplicity. It
// is built once from the flags (Parse) and shipped to the workers as part
// of each DoFn, so every field is exported and serialisable.
type Config struct {
	Analysis string   // "bounds" (interval.Proportion), "check" (test.Binomial) or "versus" (test.Fisher)
	Columns  []string // the input columns in order; the counts are named k, n (k1, n1, k2, n2 for versus)
	By       string   // the column whose values form the adjustment's families; "" adjusts over the whole input
	Method   string   // interval method for bounds (interval.ParseMethod); unused otherwise
	Level    float64  // confidence level of bounds
	Side     string   // interval side of bounds (interval.ParseSide)
	P0       float64  // null proportion of check
	Alt      string   // alternative of check and versus (test.ParseAlternative)
	Adjust   string   // multiplicity adjustment (test.ParseAdjustment), or "none"
}

// Validate checks the configuration with the library's own parsers, so a
// bad flag fails before the pipeline starts, in the library's words.
func (c Config) Validate() error {
	switch c.Analysis {
	case "bounds", "check", "versus":
	default:
		return fmt.Errorf("--analysis %q: use bounds, check or versus", c.Analysis)
	}
	need := []string{"k", "n"}
	if c.Analysis == "versus" {
		need = []string{"k1", "n1", "k2", "n2"}
	}
	for _, n := range need {
		if c.col(n) < 0 {
			return fmt.Errorf("--columns %q lacks the column %s that --analysis %s needs", strings.Join(c.Columns, ","), n, c.Analysis)
		}
	}
	if c.By != "" && c.col(c.By) < 0 {
		return fmt.Errorf("--by %q is not one of --columns %q", c.By, strings.Join(c.Columns, ","))
	}
	if c.Analysis == "bounds" {
		if _, err := interval.ParseMethod(c.Method); err != nil {
			return err
		}
		if _, err := interval.ParseSide(c.Side); err != nil {
			return err
		}
		if c.Adjust != "none" {
			return errors.New("--adjust applies to p-values; bounds computes intervals (use --adjust none)")
		}
	} else if _, err := test.ParseAlternative(c.Alt); err != nil {
		return err
	}
	if c.Adjust != "none" {
		if _, err := test.ParseAdjustment(c.Adjust); err != nil {
			return err
		}
	}
	return nil
}

// col returns the index of column name, or -1.
func (c Config) col(name string) int {
	for i, n := range c.Columns {
		if n == name {
			return i
		}
	}
	return -1
}

// Result is one output row: the input row as read, what was computed and
// from which method, level and side, or the reason the row failed.
type Result struct {
	Line     string  // the input line
	Group    string  // the adjustment family (the --by column's value)
	Estimate float64 // k/n, or p1 - p2 for versus
	Lower    float64 // interval limits (bounds)
	Upper    float64
	PValue   float64 // the p-value (check, versus)
	Adjusted float64 // the adjusted p-value, filled by the adjustment step
	Method   string  // the published name of the method the library used
	Level    float64 // the confidence level (bounds)
	Side     string  // the side or alternative
	Err      string  // why the row failed; empty for a good row
}

// Analyze computes one row with the library; the pipeline calls it on
// every row, and the tests call it directly to check the pipeline.
func Analyze(c Config, line string) Result {
	fields := strings.Split(line, ",")
	r := Result{Line: line}
	if i := c.col(c.By); c.By != "" && i < len(fields) {
		r.Group = strings.TrimSpace(fields[i])
	}
	if len(fields) != len(c.Columns) {
		r.Err = fmt.Sprintf("has %d fields, --columns names %d", len(fields), len(c.Columns))
		return r
	}
	count := func(name string) int64 {
		v, err := strconv.ParseInt(strings.TrimSpace(fields[c.col(name)]), 10, 64)
		if err != nil && r.Err == "" {
			r.Err = "column " + name + ": " + strconv.Quote(fields[c.col(name)]) + " is not a whole number"
		}
		return v
	}
	switch c.Analysis {
	case "bounds":
		k, n := count("k"), count("n")
		if r.Err != "" {
			return r
		}
		m, _ := interval.ParseMethod(c.Method)
		side, _ := interval.ParseSide(c.Side)
		iv, err := interval.Proportion(k, n, interval.Options{Method: m, Level: c.Level, Side: side})
		if err != nil {
			r.Err = err.Error()
			return r
		}
		r.Estimate, r.Lower, r.Upper, r.Method, r.Level, r.Side = iv.Estimate, iv.Lower, iv.Upper, iv.Method, iv.Level, iv.Side.String()
	case "check":
		k, n := count("k"), count("n")
		if r.Err != "" {
			return r
		}
		alt, _ := test.ParseAlternative(c.Alt)
		res, err := test.Binomial(k, n, c.P0, test.BinomialOptions{Alternative: alt, SkipInterval: true})
		if err != nil {
			r.Err = err.Error()
			return r
		}
		r.Estimate, r.PValue, r.Method, r.Side = res.Estimate, res.PValue, res.Method, res.Alternative.String()
	case "versus":
		k1, n1, k2, n2 := count("k1"), count("n1"), count("k2"), count("n2")
		if r.Err != "" {
			return r
		}
		alt, _ := test.ParseAlternative(c.Alt)
		res, err := test.Fisher(k1, n1, k2, n2, test.FisherOptions{Alternative: alt})
		if err != nil {
			r.Err = err.Error()
			return r
		}
		r.Estimate, r.PValue, r.Method, r.Side = res.Estimate, res.PValue, res.Method, res.Alternative.String()
	}
	return r
}

// AdjustFamily fills the adjusted p-values of one family's rows (rows
// that failed are left out of the family), with the library's adjustment.
func AdjustFamily(c Config, rows []Result) ([]Result, error) {
	if c.Adjust == "none" || c.Analysis == "bounds" {
		return rows, nil
	}
	m, err := test.ParseAdjustment(c.Adjust)
	if err != nil {
		return nil, err
	}
	var p []float64
	var idx []int
	for i, r := range rows {
		if r.Err == "" {
			p, idx = append(p, r.PValue), append(idx, i)
		}
	}
	adj, err := test.AdjustPValues(context.Background(), p, m)
	if err != nil {
		return nil, err
	}
	for j, i := range idx {
		rows[i].Adjusted = adj[j]
	}
	return rows, nil
}

// Header is the output's first line for configuration c.
func Header(c Config) string {
	h := strings.Join(c.Columns, ",") + ",estimate"
	switch {
	case c.Analysis == "bounds":
		h += ",lower,upper"
	case c.Adjust != "none":
		h += ",p_value,adjusted_p_value,adjustment"
	default:
		h += ",p_value"
	}
	return h + ",method,level_or_alternative,error"
}

// Format writes a result as a CSV line under Header(c).
func Format(c Config, r Result) string {
	g := strconv.FormatFloat
	f := func(x float64) string { return g(x, 'g', -1, 64) }
	var b strings.Builder
	b.WriteString(r.Line)
	if r.Err != "" {
		// every computed column empty, then the reason, CSV-quoted
		cols := strings.Count(Header(c), ",") + 1 - len(c.Columns)
		b.WriteString(strings.Repeat(",", cols))
		b.WriteString(`"` + strings.ReplaceAll(r.Err, `"`, `""`) + `"`)
		return b.String()
	}
	b.WriteString("," + f(r.Estimate))
	switch {
	case c.Analysis == "bounds":
		b.WriteString("," + f(r.Lower) + "," + f(r.Upper) + "," + r.Method + "," + f(r.Level) + " " + r.Side + ",")
		return b.String()
	case c.Adjust != "none":
		b.WriteString("," + f(r.PValue) + "," + f(r.Adjusted) + "," + c.Adjust)
	default:
		b.WriteString("," + f(r.PValue))
	}
	b.WriteString("," + r.Method + "," + r.Side + ",")
	return b.String()
}

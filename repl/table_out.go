package repl

import (
	"encoding/csv"
	"strconv"
	"strings"
	"unicode/utf8"
)

// optShow chooses how a curve prints: as a plot (default), as an aligned
// table, as CSV, or as the plot followed by the table.
var optShow = opt{Name: "show", Doc: "plot (default): the curve as a terminal plot; table: an aligned table of every point; csv: the same values as CSV; both: the plot, then the table", Values: []string{"plot", "table", "csv", "both"}}

// valueTable is a curve's values: named columns and one row per point.
type valueTable struct {
	cols []string
	rows [][]float64
}

// add appends one row.
func (t *valueTable) add(vals ...float64) { t.rows = append(t.rows, vals) }

// text renders the table aligned, numbers right-aligned with the
// session's digits (whole numbers plainly).
func (t valueTable) text(s *Session) string {
	cells := make([][]string, len(t.rows)+1)
	cells[0] = t.cols
	for i, r := range t.rows {
		row := make([]string, len(r))
		for j, v := range r {
			row[j] = s.stat(v)
		}
		cells[i+1] = row
	}
	width := make([]int, len(t.cols))
	for _, r := range cells {
		for j, c := range r {
			width[j] = max(width[j], utf8.RuneCountInString(c))
		}
	}
	var sb strings.Builder
	for _, r := range cells {
		sb.WriteString(" ")
		for j, c := range r {
			sb.WriteString(" " + strings.Repeat(" ", width[j]-utf8.RuneCountInString(c)) + c)
		}
		sb.WriteByte('\n')
	}
	return sb.String()
}

// csv renders the table as CSV with full-precision numbers.
func (t valueTable) csv() string {
	var sb strings.Builder
	w := csv.NewWriter(&sb)
	w.Write(t.cols)
	for _, r := range t.rows {
		rec := make([]string, len(r))
		for j, v := range r {
			rec[j] = strconv.FormatFloat(v, 'g', -1, 64)
		}
		w.Write(rec)
	}
	w.Flush()
	return sb.String()
}

// showCurve prints a curve as the show= option asks: the plot (made only
// when needed), the table, its CSV, or both plot and table.
func (c *call) showCurve(t valueTable, plot func() string) error {
	how, err := c.Args.Choice("show", "plot", optShow.Values...)
	if err != nil {
		return err
	}
	switch how {
	case "table":
		c.Plot(t.text(c.S))
	case "csv":
		c.Plot(t.csv())
	case "both":
		c.Plot(plot())
		c.Plot(t.text(c.S))
	default:
		c.Plot(plot())
	}
	return nil
}

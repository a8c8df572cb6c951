// Package golden reads the tab-separated golden files of testdata/ for the
// tests of several packages: data rows split on tabs, with typed accessors
// that fail the test naming the file, line and field of a bad value.
//
// A golden file starts with '#' header lines (what it holds, the generator
// command, the tool and version, the date); blank lines and other '#' lines
// are skipped too. Header lines of the form
//
//	# case NAME<TAB>key=value<TAB>value...
//
// describe a named case (ReadCases); a value without "=" is keyed by its
// position among the fields after NAME (key=value fields counted too),
// "0", "1", ...
package golden

import (
	"bufio"
	"fmt"
	"os"
	"strconv"
	"strings"
	"testing"
)

// Row is one data line of a golden file.
type Row struct {
	Fields []string // the line split on tabs
	File   string   // the path given to Read
	Line   int      // 1-based line number in File
	tb     testing.TB
}

// Case is one "# case" header line of a golden file.
type Case struct {
	Name   string            // the first field after "# case"
	Values map[string]string // key=value fields, or position -> value
	File   string
	Line   int
	tb     testing.TB
}

// Read returns the data rows of the golden file at path. It fails the test
// when the file cannot be read or holds no data row.
func Read(tb testing.TB, path string) []Row {
	tb.Helper()
	_, rows := ReadCases(tb, path)
	return rows
}

// ReadCases returns the "# case" header lines of the golden file at path by
// name, and its data rows, as Read.
func ReadCases(tb testing.TB, path string) (map[string]Case, []Row) {
	tb.Helper()
	f, err := os.Open(path)
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	cases := map[string]Case{}
	var rows []Row
	sc := bufio.NewScanner(f)
	sc.Buffer(nil, 1<<20)
	for n := 1; sc.Scan(); n++ {
		line := sc.Text()
		if c, ok := strings.CutPrefix(line, "# case "); ok {
			fs := strings.Split(c, "\t")
			m := map[string]string{}
			for i, kv := range fs[1:] {
				k, v, found := strings.Cut(kv, "=")
				if !found {
					k, v = strconv.Itoa(i), kv
				}
				m[k] = v
			}
			cases[fs[0]] = Case{Name: fs[0], Values: m, File: path, Line: n, tb: tb}
			continue
		}
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		rows = append(rows, Row{Fields: strings.Split(line, "\t"), File: path, Line: n, tb: tb})
	}
	if err := sc.Err(); err != nil {
		tb.Fatalf("%s: %v", path, err)
	}
	if len(rows) == 0 {
		tb.Fatalf("%s: no data rows", path)
	}
	return cases, rows
}

// Pos returns "file:line" of the row, for messages.
func (r Row) Pos() string { return fmt.Sprintf("%s:%d", r.File, r.Line) }

// Len returns the number of fields.
func (r Row) Len() int { return len(r.Fields) }

// Str returns field i; it fails the test when the row has no field i.
func (r Row) Str(i int) string {
	r.tb.Helper()
	if i < 0 || i >= len(r.Fields) {
		r.tb.Fatalf("%s: field %d missing (the row has %d)", r.Pos(), i, len(r.Fields))
	}
	return r.Fields[i]
}

// Int returns field i parsed as a base-10 int64, failing the test with the
// file, line and field when it is not one.
func (r Row) Int(i int) int64 {
	r.tb.Helper()
	return parseInt(r.tb, r.Str(i), fmt.Sprintf("%s field %d", r.Pos(), i))
}

// Float returns field i parsed as a float64 ("inf", "-inf" and "nan" as
// strconv.ParseFloat reads them), failing the test with the file, line and
// field when it is not one.
func (r Row) Float(i int) float64 {
	r.tb.Helper()
	return parseFloat(r.tb, r.Str(i), fmt.Sprintf("%s field %d", r.Pos(), i))
}

// Floats returns fields i, i+1, ... to the end parsed as Float does.
func (r Row) Floats(i int) []float64 {
	r.tb.Helper()
	v := make([]float64, 0, len(r.Fields))
	for j := i; j < len(r.Fields); j++ {
		v = append(v, r.Float(j))
	}
	return v
}

// Pos returns "file:line" of the case line, for messages.
func (c Case) Pos() string { return fmt.Sprintf("%s:%d", c.File, c.Line) }

// Str returns the value of key; it fails the test when the case has none.
func (c Case) Str(key string) string {
	c.tb.Helper()
	v, ok := c.Values[key]
	if !ok {
		c.tb.Fatalf("%s: case %q has no %q", c.Pos(), c.Name, key)
	}
	return v
}

// Int returns the value of key parsed as a base-10 int64.
func (c Case) Int(key string) int64 {
	c.tb.Helper()
	return parseInt(c.tb, c.Str(key), fmt.Sprintf("%s case %q %s", c.Pos(), c.Name, key))
}

// Float returns the value of key parsed as a float64.
func (c Case) Float(key string) float64 {
	c.tb.Helper()
	return parseFloat(c.tb, c.Str(key), fmt.Sprintf("%s case %q %s", c.Pos(), c.Name, key))
}

// Int parses s as a base-10 int64, failing the test with s when it is not
// one; for callers that hold bare fields.
func Int(tb testing.TB, s string) int64 {
	tb.Helper()
	return parseInt(tb, s, "golden field")
}

// Float parses s as a float64, failing the test with s when it is not one.
func Float(tb testing.TB, s string) float64 {
	tb.Helper()
	return parseFloat(tb, s, "golden field")
}

func parseInt(tb testing.TB, s, where string) int64 {
	tb.Helper()
	v, err := strconv.ParseInt(s, 10, 64)
	if err != nil {
		tb.Fatalf("%s: %q is not an integer", where, s)
	}
	return v
}

func parseFloat(tb testing.TB, s, where string) float64 {
	tb.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		tb.Fatalf("%s: %q is not a number", where, s)
	}
	return v
}

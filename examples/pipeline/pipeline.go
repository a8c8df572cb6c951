package main

import (
	"fmt"
	"reflect"
	"strings"

	"github.com/apache/beam/sdks/v2/go/pkg/beam"
	"github.com/apache/beam/sdks/v2/go/pkg/beam/io/textio"
)

func init() {
	beam.RegisterType(reflect.TypeOf((*Result)(nil)).Elem())
	beam.RegisterType(reflect.TypeOf((*analyzeFn)(nil)).Elem())
	beam.RegisterType(reflect.TypeOf((*adjustFn)(nil)).Elem())
	beam.RegisterType(reflect.TypeOf((*formatFn)(nil)).Elem())
}

// analyzeFn runs the library on one input line (Analyze) and keys the
// result by its adjustment family. Header lines (whose first field is the
// first column's name) and blank lines are dropped.
type analyzeFn struct {
	Cfg Config
}

func (f *analyzeFn) ProcessElement(line string, emit func(string, Result)) {
	line = strings.TrimRight(line, "\r")
	if strings.TrimSpace(line) == "" {
		return
	}
	if first, _, _ := strings.Cut(line, ","); strings.TrimSpace(first) == f.Cfg.Columns[0] {
		return
	}
	r := Analyze(f.Cfg, line)
	emit(r.Group, r)
}

// adjustFn adjusts one family's p-values (AdjustFamily) once all its rows
// are grouped together.
type adjustFn struct {
	Cfg Config
}

func (f *adjustFn) ProcessElement(group string, rows func(*Result) bool, emit func(Result)) error {
	var all []Result
	var r Result
	for rows(&r) {
		all = append(all, r)
	}
	out, err := AdjustFamily(f.Cfg, all)
	if err != nil {
		return fmt.Errorf("family %q: %w", group, err)
	}
	for _, r := range out {
		emit(r)
	}
	return nil
}

// formatFn writes one result as a CSV line.
type formatFn struct {
	Cfg Config
}

func (f *formatFn) ProcessElement(r Result) string { return Format(f.Cfg, r) }

// Build adds the pipeline to scope s: read the lines of input, analyse
// each row, adjust each family's p-values, format, and return the output
// lines (without the header, which Write adds).
func Build(s beam.Scope, cfg Config, lines beam.PCollection) beam.PCollection {
	keyed := beam.ParDo(s.Scope("analyze"), &analyzeFn{Cfg: cfg}, lines)
	grouped := beam.GroupByKey(s.Scope("family"), keyed)
	adjusted := beam.ParDo(s.Scope("adjust"), &adjustFn{Cfg: cfg}, grouped)
	return beam.ParDo(s.Scope("format"), &formatFn{Cfg: cfg}, adjusted)
}

// Write writes the header and the output lines to one text file (a
// single shard: the output's order is the runner's; sort it when the
// order matters).
func Write(s beam.Scope, cfg Config, out beam.PCollection, path string) {
	header := beam.Create(s, Header(cfg))
	textio.Write(s, path, beam.Flatten(s, header, out))
}

// textioRead reads the lines of a text file.
func textioRead(s beam.Scope, path string) beam.PCollection { return textio.Read(s, path) }

package interval_test

import (
	"strconv"
	"testing"

	"github.com/kofnlab/kofn/internal/golden"
)

// readGolden returns the tab-separated fields of the data lines of a
// golden file in ../testdata (internal/golden, which fails the test on an
// unreadable or empty file).
func readGolden(t *testing.T, name string) [][]string {
	t.Helper()
	var rows [][]string
	for _, r := range golden.Read(t, "../testdata/"+name) {
		rows = append(rows, r.Fields)
	}
	return rows
}

func atoi(t *testing.T, s string) int64 {
	t.Helper()
	return golden.Int(t, s)
}

func atof(t *testing.T, s string) float64 {
	t.Helper()
	return golden.Float(t, s)
}

// relErr returns |got - want| / |want| (|got - want| when want = 0).
func relErr(got, want float64) float64 {
	d := got - want
	if d < 0 {
		d = -d
	}
	if want == 0 {
		return d
	}
	if want < 0 {
		want = -want
	}
	return d / want
}

func fmtInt(v int64) string { return strconv.FormatInt(v, 10) }

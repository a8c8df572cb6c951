package test

import (
	"bufio"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"
)

// readGolden returns the data rows of a golden file, split on tabs.
func readGolden(t *testing.T, path string) [][]string {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var rows [][]string
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := sc.Text()
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		rows = append(rows, strings.Split(line, "\t"))
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	return rows
}

func atoi(t *testing.T, s string) int64 {
	t.Helper()
	v, err := strconv.ParseInt(s, 10, 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

func atof(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

func alt(t *testing.T, s string) Alternative {
	t.Helper()
	a, err := ParseAlternative(s)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

// relClose reports |got - want| <= rel |want| (margin 0), or both zero.
func relClose(got, want, rel float64) bool {
	return got == want || math.Abs(got-want) <= rel*math.Abs(want)
}

// checkInterval compares an attached interval with a reference one, to
// abs (the references print interval ends at about 1e-15 absolute).
func checkInterval(t *testing.T, what string, iv *Interval, lo, hi, abs float64) {
	t.Helper()
	if iv == nil || math.Abs(iv.Lower-lo) > abs || math.Abs(iv.Upper-hi) > abs {
		t.Errorf("%s: interval %+v, want [%v, %v]", what, iv, lo, hi)
	}
}

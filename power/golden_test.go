package power

import (
	"bufio"
	"os"
	"strconv"
	"strings"
	"testing"
)

// goldenRows reads a tab-separated golden file from testdata: the "# case"
// lines as key=value maps by case name (first field after "# case"), and
// the data lines as fields.
func goldenRows(t *testing.T, name string) (cases map[string]map[string]string, rows [][]string) {
	t.Helper()
	f, err := os.Open("../testdata/" + name)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	cases = map[string]map[string]string{}
	sc := bufio.NewScanner(f)
	for sc.Scan() {
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
			cases[fs[0]] = m
			continue
		}
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		rows = append(rows, strings.Split(line, "\t"))
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	return cases, rows
}

func atof(t *testing.T, s string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

func atoi(t *testing.T, s string) int64 {
	t.Helper()
	v, err := strconv.ParseInt(s, 10, 64)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

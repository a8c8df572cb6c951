package repl

import (
	"bytes"
	"context"
	"encoding/json"
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

// testSession returns a session with fixed settings (width 72, Unicode
// plots) writing to buffers.
func testSession() (*Session, *bytes.Buffer, *bytes.Buffer) {
	var out, errw bytes.Buffer
	s := NewSession(&out, &errw)
	s.In = strings.NewReader("")
	return s, &out, &errw
}

// runScript runs the lines as a script and returns stdout, stderr and the
// number of failed lines.
func runScript(t *testing.T, lines ...string) (string, string, int) {
	t.Helper()
	s, out, errw := testSession()
	failed := s.RunLines(context.Background(), strings.NewReader(strings.Join(lines, "\n")), true)
	return out.String(), errw.String(), failed
}

// runJSON runs one command with json=on and decodes its result object.
func runJSON(t *testing.T, line string) map[string]any {
	t.Helper()
	s, out, errw := testSession()
	s.Set.JSON = true
	if err := s.Run(context.Background(), line); err != nil {
		t.Fatalf("%s: %v (stderr %q)", line, err, errw.String())
	}
	var obj struct {
		Command string         `json:"command"`
		Input   string         `json:"input"`
		Result  map[string]any `json:"result"`
	}
	if err := json.Unmarshal(out.Bytes(), &obj); err != nil {
		t.Fatalf("%s: output is not one JSON object: %v\n%s", line, err, out.String())
	}
	if strings.Count(strings.TrimSpace(out.String()), "\n") != 0 {
		t.Fatalf("%s: JSON output spans several lines:\n%s", line, out.String())
	}
	return obj.Result
}

// num reads a JSON number (or a non-finite string) from a decoded object
// by a dotted path.
func num(t *testing.T, obj map[string]any, path string) float64 {
	t.Helper()
	var v any = obj
	for _, key := range strings.Split(path, ".") {
		if l, ok := v.([]any); ok { // a list index
			i, err := strconv.Atoi(key)
			if err != nil || i >= len(l) {
				t.Fatalf("path %s: %q is not an index of a list of %d", path, key, len(l))
			}
			v = l[i]
			continue
		}
		m, ok := v.(map[string]any)
		if !ok {
			t.Fatalf("path %s: %v is not an object", path, v)
		}
		v = m[key]
	}
	f, ok := v.(float64)
	if !ok {
		t.Fatalf("path %s: %v (%T) is not a number", path, v, v)
	}
	return f
}

// runErr runs one line and returns its error output and error.
func runErr(line string) (string, error) {
	s, _, errw := testSession()
	err := s.Run(context.Background(), line)
	return errw.String(), err
}

// valueCase is one published or package value that a command's JSON must
// reproduce: the number at path in the result of line, within relative
// tolerance rel, with its source.
type valueCase struct {
	line, path string
	want, rel  float64
	src        string
}

// checkValues runs each case and compares the value.
func checkValues(t *testing.T, tests []valueCase) {
	t.Helper()
	for _, tc := range tests {
		got := num(t, runJSON(t, tc.line), tc.path)
		if diff := cmp.Diff(tc.want, got, cmpopts.EquateApprox(tc.rel, 0)); diff != "" {
			t.Errorf("%s %s (%s) (-want +got):\n%s", tc.line, tc.path, tc.src, diff)
		}
	}
}

package repl

import (
	"context"
	"encoding/json"
	"strings"
	"testing"
	"unicode/utf8"
)

// TestJSONEveryExample runs every help example with json=on: each must
// print exactly one JSON object on one line, naming its command.
func TestJSONEveryExample(t *testing.T) {
	t.Parallel()
	for _, name := range tbl.names {
		for _, ex := range tbl.byName[name].Help.Examples {
			if name == "tour" || name == "each" || name == "help" && ex == "help" {
				continue // several objects, CSV, or a listing
			}
			s, out, errw := testSession()
			s.Set.JSON = true
			if err := s.Run(context.Background(), ex); err != nil {
				t.Errorf("%s: %v %s", ex, err, errw.String())
				continue
			}
			text := strings.TrimSuffix(out.String(), "\n")
			if strings.Contains(text, "\n") {
				t.Errorf("%s: JSON spans several lines", ex)
				continue
			}
			var obj map[string]any
			if err := json.Unmarshal([]byte(text), &obj); err != nil {
				t.Errorf("%s: not one JSON object: %v\n%s", ex, err, text)
				continue
			}
			if obj["command"] != name || obj["input"] != ex || obj["result"] == nil {
				t.Errorf("%s: envelope %v", ex, obj)
			}
		}
	}
	// Errors in JSON mode are objects too, on the result stream.
	s, out, _ := testSession()
	s.Set.JSON = true
	s.Run(context.Background(), "tail 41/40 p=0.3")
	var obj map[string]any
	if err := json.Unmarshal(out.Bytes(), &obj); err != nil || !strings.Contains(obj["error"].(string), "41/40") {
		t.Errorf("JSON error object: %v %s", err, out.String())
	}
}

// TestPlotsFitAndFallBack draws every plotting example at two widths and
// both character sets: no line may exceed the width, and the ASCII
// form must be pure ASCII.
func TestPlotsFitAndFallBack(t *testing.T) {
	t.Parallel()
	lines := []string{"spread n=40 p=0.3", "spread n=100000 p=0.5", "detect n=10..300 p=0.3 truth=0.5",
		"size p=0.3 truth=0.5", "accept n=89 c=2", "urn total=500 marked=25 draws=50"}
	if tbl.byName["cover"] != nil {
		lines = append(lines, "cover n=30 method=wald,wilson")
	}
	for _, width := range []int{40, 72, 120} {
		for _, ascii := range []bool{false, true} {
			for _, line := range lines {
				s, out, errw := testSession()
				s.Set.Width, s.Set.ASCII = width, ascii
				if err := s.Run(context.Background(), line); err != nil {
					t.Fatalf("%s: %v %s", line, err, errw.String())
				}
				inPlot := false
				for _, l := range strings.Split(out.String(), "\n") {
					if strings.Contains(l, "│") || strings.Contains(l, "|") {
						inPlot = true
					}
					if inPlot && (strings.HasPrefix(strings.TrimSpace(l), "└") || strings.HasPrefix(strings.TrimSpace(l), "+")) {
						if n := utf8.RuneCountInString(l); n > width {
							t.Errorf("%s at width %d: axis line has %d columns", line, width, n)
						}
					}
					if ascii {
						for _, r := range l {
							if r > 126 {
								t.Errorf("%s ascii: non-ASCII %q in %q", line, r, l)
								break
							}
						}
					}
				}
				if !inPlot {
					t.Errorf("%s: no plot drawn", line)
				}
			}
		}
	}
}

func TestChartSeveralSeries(t *testing.T) {
	t.Parallel()
	ch := chart{xs: []float64{0, 0.5, 1}, series: []series{{"a", []float64{0.9, 0.95, 1}}, {"b", []float64{1, 0.9, 0.95}}},
		yLo: 0.9, yHi: 1, ref: 0.95, height: 3, digits: 2, xLabel: "p"}
	got := ch.render()
	want := " 1.0 │○ ●\n0.95 │┈●○\n0.90 │●○\n     └───\n      0 1  p\n      ● a   ○ b\n"
	if got != want {
		t.Errorf("render:\n%s\nwant:\n%s", got, want)
	}
}

// TestJSONFlagOnOneCommand: "--json" on a line prints that command's
// result as JSON, the same object as with json=on, and leaves the setting
// off for the next command. The Wilson limits are those of Newcombe (1998),
// single proportion, Table II for 81/263 (0.2553, 0.3662).
func TestJSONFlagOnOneCommand(t *testing.T) {
	t.Parallel()
	for _, spelling := range []string{"--json", "-json", "--JSON"} {
		testJSONFlag(t, "bounds 81/263 "+spelling)
		testJSONFlag(t, "bounds "+spelling+" 81/263")
	}
}

func testJSONFlag(t *testing.T, line string) {
	t.Helper()
	s, out, errw := testSession()
	if err := s.Run(context.Background(), line); err != nil {
		t.Fatalf("%s: %v %s", line, err, errw.String())
	}
	var got struct {
		Command string
		Result  struct{ Lower, Upper float64 }
	}
	if err := json.Unmarshal(out.Bytes(), &got); err != nil {
		t.Fatalf("not one JSON object: %v\n%s", err, out.String())
	}
	if got.Command != "bounds" || got.Result.Lower < 0.25525 || got.Result.Lower > 0.25535 || got.Result.Upper < 0.36615 || got.Result.Upper > 0.36625 {
		t.Errorf("got %+v", got)
	}
	if s.Set.JSON {
		t.Error("--json changed the session setting")
	}
	out.Reset()
	if err := s.Run(context.Background(), "bounds 81/263"); err != nil || strings.HasPrefix(out.String(), "{") {
		t.Errorf("the next command printed JSON: %q %v", out.String(), err)
	}
}

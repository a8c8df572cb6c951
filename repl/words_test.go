package repl

import (
	"encoding/json"
	"fmt"
	"math"
	"regexp"
	"strings"
	"testing"
)

// goNameRE finds what must not reach a shell user: a package-qualified
// function name or a Go-style mixed-case identifier.
var goNameRE = regexp.MustCompile(`\b(binom|interval|test|power)\.[A-Z]|\b[A-Z][a-z]+[A-Z][A-Za-z]*\b|\b[a-z]+[A-Z][A-Za-z]*\b`)

// TestErrorsInShellWords runs lines whose errors come from the packages:
// each error line must name the shell's options (the examples:
// upto=, c=, n=) and carry no Go identifier or float noise.
func TestErrorsInShellWords(t *testing.T) {
	t.Parallel()
	tests := []struct{ line, want string }{
		{"accept n=10 c=11", "c=11 is not below n=10"},
		{"size p=0.3 truth=0.31 upto=500", "raise upto="},
		{"size p=0.3 truth=0.31 upto=500", "upto=500"},
		{"bounds 0/0", "n = 0: a proportion needs at least one trial"},
		{"margin d=0.001 by=chance upto=100", "upto=100"},
		{"size p1=0.3 p2=0.31 method=fisher upto=3000000", "upto=3000000 exceeds the limit"},
	}
	for _, tc := range tests {
		stderr, err := runErr(tc.line)
		if err == nil {
			t.Errorf("%q: no error", tc.line)
			continue
		}
		if !strings.Contains(stderr, tc.want) {
			t.Errorf("%q: %q lacks %q", tc.line, stderr, tc.want)
		}
		if m := goNameRE.FindString(stderr); m != "" {
			t.Errorf("%q: %q shows the Go name %q", tc.line, stderr, m)
		}
		if noisyRE.MatchString(stderr) {
			t.Errorf("%q: %q shows float noise", tc.line, stderr)
		}
	}
}

func TestDenoise(t *testing.T) {
	t.Parallel()
	for in, want := range map[string]string{
		"r = 0.9999989999999999 is":   "r = 0.999999 is",
		"d = -0.011999999999999997":   "d = -0.012",
		"level 0.95 and 1e-6 stay":    "level 0.95 and 1e-6 stay",
		"x = 0.12345678901234567e-05": "x = 1.23456789012e-06",
	} {
		if got := denoise(in); got != want {
			t.Errorf("denoise(%q) = %q, want %q", in, got, want)
		}
	}
}

// TestTerminalSafety: control characters from input are escaped in error
// lines and output blocks, and a 200 KB token is shortened in the error.
func TestTerminalSafety(t *testing.T) {
	t.Parallel()
	for _, line := range []string{"bounds 1/\x1b[2J10", "bounds 1/10 method=\x1b]0;x\x07", "tail \x9b31m/4 p=0.3",
		"spread n=4 p=0.3 k=1..\u202e3", "nosuch\x1b[2J", "bounds 1/1\xff0"} {
		stderr, _ := runErr(line)
		for _, raw := range []string{"\x1b", "\x07", "\x9b", "\u202e", "\xff", "\u009b"} {
			if strings.Contains(stderr, raw) {
				t.Errorf("%q: raw %q in %q", line, raw, stderr)
			}
		}
		if !strings.Contains(stderr, `\x1b`) && !strings.Contains(stderr, `\x9b`) && !strings.Contains(stderr, `\u009b`) && !strings.Contains(stderr, `\u202e`) && !strings.Contains(stderr, `\xff`) {
			t.Errorf("%q: no escape in %q", line, stderr)
		}
	}
	long := "bounds 1/" + strings.Repeat("7", 200_000) + "x"
	stderr, _ := runErr(long)
	if len(stderr) > 400 || !strings.Contains(stderr, "more characters") {
		t.Errorf("long token: %d bytes of error: %.200q", len(stderr), stderr)
	}
	if got := safeText("a\tb\nc\x00", true); got != "a\\tb\nc\\x00" {
		t.Errorf("safeText = %q", got)
	}
}

// TestTailPartition: tail's three-way split at k adds up to 1 and the
// cumulative tails are its partial sums; k= n= is the same as K/N.
func TestTailPartition(t *testing.T) {
	t.Parallel()
	for _, line := range []string{"tail 17/40 p=0.3", "tail 0/299 p=0.01", "tail 52/52 p=0.9", "tail k=67 n=52300 p=0.001"} {
		r := runJSON(t, line)
		below, exactly, above := num(t, r, "below"), num(t, r, "exactly"), num(t, r, "above")
		if sum := below + exactly + above; math.Abs(sum-1) > 1e-14 {
			t.Errorf("%s: below + exactly + above = %v", line, sum)
		}
		if d := num(t, r, "at_most") - (below + exactly); math.Abs(d) > 1e-14 {
			t.Errorf("%s: at_most differs from below + exactly by %v", line, d)
		}
		if d := num(t, r, "at_least") - (above + exactly); math.Abs(d) > 1e-14 {
			t.Errorf("%s: at_least differs from above + exactly by %v", line, d)
		}
	}
	a, b := runJSON(t, "tail k=67 n=52300 p=0.001"), runJSON(t, "tail 67/52300 p=0.001")
	if num(t, a, "at_most") != num(t, b, "at_most") {
		t.Error("tail k= n= differs from tail K/N")
	}
}

// TestCurveTables: show=csv gives, row for row, the values of the JSON
// curve; accept marks the AQL and RQL on its OC plot.
func TestCurveTables(t *testing.T) {
	t.Parallel()
	obj := runJSON(t, "detect n=30..45 p=0.2 truth=0.4 alt=higher")
	curve := obj["curve"].([]any)
	out, stderr, failed := runScript(t, "detect n=30..45 p=0.2 truth=0.4 alt=higher show=csv")
	if failed != 0 {
		t.Fatal(stderr)
	}
	csvPart := out[strings.Index(out, "n,power\n"):]
	rows := strings.Split(strings.TrimSpace(csvPart), "\n")[1:]
	if len(rows) != len(curve) || len(rows) != 16 {
		t.Fatalf("%d CSV rows for %d curve points", len(rows), len(curve))
	}
	for i, r := range rows {
		pt := curve[i].(map[string]any)
		if want := fmt.Sprintf("%v,%v", pt["n"], pt["power"]); r != want {
			t.Errorf("row %d = %q, JSON %q", i, r, want)
		}
	}
	plot, _, _ := runScript(t, "accept aql=0.01 rql=0.05")
	if !strings.Contains(plot, "AQL 0.01 and RQL 0.05") || strings.Count(plot, "▲") != 3 {
		t.Errorf("OC plot lacks the AQL and RQL marks:\n%s", plot)
	}
	a := runJSON(t, "accept n=89 c=2 at=0.01,0.02,0.05")
	// Montgomery, Introduction to Statistical Quality Control, single sampling n = 89, c = 2:
	// Pa(0.01) = 0.9397 (recalled, recomputed with scipy.stats.binom.cdf(2, 89, 0.01) = 0.93969).
	if at := a["at"].([]any); len(at) != 3 || math.Abs(at[0].(map[string]any)["y"].(float64)-0.93969) > 1e-5 {
		t.Errorf("at list: %v", a["at"])
	}
}

// TestJSONSafe: DEL, C1 and bidirectional overrides leave JSON escaped,
// and the value reads back unchanged (found by FuzzLine: "\x7f -json").
func TestJSONSafe(t *testing.T) {
	t.Parallel()
	in := "a\x7fb\u0085c\u202ed\x1b"
	b, _ := json.Marshal(in)
	safe := jsonSafe(b)
	var back string
	if err := json.Unmarshal(safe, &back); err != nil || back != in || needsEscape(string(safe), true) {
		t.Errorf("jsonSafe(%q) = %q, back %q, %v", b, safe, back, err)
	}
}

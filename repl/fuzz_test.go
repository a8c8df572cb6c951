package repl

import (
	"context"
	"encoding/json"
	"errors"
	"regexp"
	"strings"
	"testing"
	"time"
)

// FuzzLine feeds arbitrary lines to the shell's line runner. It must never
// panic or hang; every failing line gives exactly one error line, naming a
// token of the line (an *InputError's token is a word of the line, or the
// verb) or a package error in the shell's words; nothing derived from the
// line reaches the output with a control character unescaped; and the same
// line in JSON mode prints JSON objects with lower_snake keys only.
// Its seed corpus is testdata/fuzz/FuzzLine beside the seeds below.
func FuzzLine(f *testing.F) {
	for _, seed := range []string{
		"spread n=40 p=0.3", "tail 17/40 p=0.3", "tail 10..20/40 p=30%", "cut n=200 p=0.02 q=0.01",
		"urn total=500 marked=25 draws=50 k=0", "set level=90% digits=3", "help spread", "tail 17/ p=0.3",
		"tail 41/40 p=0.3", "spread n=1e6 p=1e-9", "tail 0/0 p=0", "spread n=9007199254740992 p=0.5",
		"spred n=4", "set json=on", "# comment", "spread n=40 p=0.3 k=0..40", "bounds 1/\x1b[2J10",
		"tail k=67 n=52300 p=0.001", "check 3/14 p=0.5 -json", "noninf 12/400 10/400 margin=0.02 alt=lower",
		"equiv 170/200 178/200 lo=-0.05 hi=0.1", "check 17/40 p=0.3 side=high", "flips 412 31 14 43 midp=on",
		"versus 12/15 7/15 rule=blaker midp=on", "accept n=10 c=11", "bounds 1/1\xff0 method=\u202ewilson",
	} {
		f.Add(seed)
	}
	for _, name := range tbl.names {
		for _, ex := range tbl.byName[name].Help.Examples {
			f.Add(ex)
		}
	}
	f.Fuzz(func(t *testing.T, line string) {
		if strings.ContainsAny(line, "\n\r") {
			return
		}
		words := splitLine(line)
		if len(words) > 0 && (strings.EqualFold(words[0], "each") || strings.EqualFold(words[0], "tour")) {
			return // file access and the long walk-through are tested elsewhere
		}
		s, out, errw := testSession()
		ctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
		defer cancel()
		err := s.Run(ctx, line)
		if needsEscape(out.String(), true) || needsEscape(errw.String(), true) {
			t.Fatalf("%q: a control character reached the output: %q %q", line, out.String(), errw.String())
		}
		checkJSONLine(t, line)
		if err == nil || errors.Is(err, errQuit) || errors.Is(err, context.DeadlineExceeded) {
			return
		}
		if n := strings.Count(errw.String(), "\n"); n != 1 {
			t.Fatalf("%q: %d error lines: %q", line, n, errw.String())
		}
		if m := goPrefixRE.FindString(errw.String()); m != "" {
			t.Fatalf("%q: the error shows the Go name %q: %q", line, m, errw.String())
		}
		var ie *InputError
		if errors.As(err, &ie) {
			found := false
			for _, w := range words {
				if w == ie.Token || strings.EqualFold(w, ie.Token) {
					found = true
				}
			}
			if !found {
				t.Fatalf("%q: error names %q, which is not a word of the line: %v", line, ie.Token, err)
			}
		}
	})
}

// goPrefixRE matches a package-qualified Go function name at the start
// of an error message ("interval.Proportion: ...").
var goPrefixRE = regexp.MustCompile(`^error: (binom|interval|test|power)\.[A-Z]\w*:`)

// checkJSONLine runs line with --json: every output line must be one JSON
// object whose keys are lower_snake (help pages quote user text as values,
// never as keys).
func checkJSONLine(t *testing.T, line string) {
	t.Helper()
	s, out, _ := testSession()
	ctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
	defer cancel()
	// Before any comment: "... # note --json" would comment the flag out.
	if err := s.Run(ctx, strings.Join(splitLine(line), " ")+" --json"); errors.Is(err, context.DeadlineExceeded) {
		return
	}
	for _, l := range strings.Split(strings.TrimSuffix(out.String(), "\n"), "\n") {
		if l == "" {
			continue
		}
		var obj map[string]any
		if err := json.Unmarshal([]byte(l), &obj); err != nil {
			t.Fatalf("%q --json: not a JSON object: %v: %.200q", line, err, l)
		}
		for _, key := range jsonKeys(obj) {
			if !lowerSnake(key) {
				t.Fatalf("%q --json: key %q is not lower_snake", line, key)
			}
		}
	}
}

// jsonKeys lists every object key in v, at any depth, except inside the
// settings' per-command methods map (whose keys are command names).
func jsonKeys(v any) []string {
	var keys []string
	switch x := v.(type) {
	case map[string]any:
		for k, e := range x {
			keys = append(keys, k)
			if k != "methods" {
				keys = append(keys, jsonKeys(e)...)
			}
		}
	case []any:
		for _, e := range x {
			keys = append(keys, jsonKeys(e)...)
		}
	}
	return keys
}

func lowerSnake(k string) bool {
	if k == "" {
		return false
	}
	for _, r := range k {
		if !(r >= 'a' && r <= 'z' || r >= '0' && r <= '9' || r == '_') {
			return false
		}
	}
	return true
}

// FuzzScript feeds arbitrary bytes to the script runner: the failures it
// counts are the numbered error lines it prints, one per failed line.
func FuzzScript(f *testing.F) {
	f.Add("bounds 17/40\ntail 41/40 p=0.3\n\nspred n=4")
	f.Add("check 3/14 p=0.5\r\n# note\r\nset json=on\nbounds 1/\x1b[2J10\n")
	f.Add("quit\nbounds 1/2")
	f.Fuzz(func(t *testing.T, script string) {
		for _, l := range strings.Split(script, "\n") {
			if w := splitLine(l); len(w) > 0 && (strings.EqualFold(w[0], "each") || strings.EqualFold(w[0], "tour")) {
				return
			}
		}
		s, out, errw := testSession()
		ctx, cancel := context.WithTimeout(context.Background(), 10*time.Second)
		defer cancel()
		failed := s.RunLines(ctx, strings.NewReader(script), true)
		if ctx.Err() != nil {
			return
		}
		if needsEscape(out.String(), true) || needsEscape(errw.String(), true) {
			t.Fatalf("%q: a control character reached the output", script)
		}
		if n := strings.Count(errw.String(), ": error: "); n != failed {
			t.Fatalf("%q: %d failed, %d error lines: %q", script, failed, n, errw.String())
		}
	})
}

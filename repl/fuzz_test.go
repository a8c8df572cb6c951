package repl

import (
	"context"
	"errors"
	"strings"
	"testing"
	"time"
)

// FuzzLine feeds arbitrary lines to the dispatcher: it must never panic,
// and every failing line must give exactly one error line that names a
// token of the line (an *InputError's token is a word of the line, or the
// verb), or a package error.
func FuzzLine(f *testing.F) {
	for _, seed := range []string{
		"spread n=40 p=0.3", "tail 17/40 p=0.3", "tail 10..20/40 p=30%", "cut n=200 p=0.02 q=0.01",
		"urn total=500 marked=25 draws=50 k=0", "set level=90% digits=3", "help spread", "tail 17/ p=0.3",
		"tail 41/40 p=0.3", "spread n=1e6 p=1e-9", "tail 0/0 p=0", "spread n=9007199254740992 p=0.5",
		"spred n=4", "set json=on", "# comment", "spread n=40 p=0.3 k=0..40",
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
		s, _, errw := testSession()
		ctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
		defer cancel()
		err := s.Run(ctx, line)
		if err == nil || errors.Is(err, errQuit) {
			return
		}
		if n := strings.Count(errw.String(), "\n"); n != 1 {
			t.Fatalf("%q: %d error lines: %q", line, n, errw.String())
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

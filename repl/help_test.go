package repl

import (
	"context"
	"strings"
	"testing"
)

// TestHelpPages checks that every command has a complete help page and
// that every example on it runs without error.
func TestHelpPages(t *testing.T) {
	t.Parallel()
	for _, name := range tbl.names {
		cmd := tbl.byName[name]
		if cmd.Summary == "" || cmd.Usage == "" || cmd.Help.Computes == "" || cmd.Group == "" {
			t.Errorf("%s: summary, usage, group or description missing", name)
		}
		if !strings.HasPrefix(cmd.Usage, name) {
			t.Errorf("%s: usage %q does not start with the verb", name, cmd.Usage)
		}
		if cmd.Group != "session" && (len(cmd.Help.Examples) == 0 || cmd.Help.Sources == "" || cmd.Help.Assumptions == "") {
			t.Errorf("%s: examples, sources or assumptions missing", name)
		}
		for _, ex := range cmd.Help.Examples {
			if !strings.HasPrefix(ex, name) {
				t.Errorf("%s: example %q is not a %s command", name, ex, name)
			}
			s, _, errw := testSession()
			s.In = strings.NewReader("n11,n12,n21,n22,k,n,k1,n1,k2,n2,site\n1,1,7,12,17,40,17,40,9,38,a\n")
			if err := s.Run(context.Background(), ex); err != nil {
				t.Errorf("help %s example %q fails: %v %s", name, ex, err, errw.String())
			}
		}
		out, stderr, failed := runScript(t, "help "+name)
		if failed != 0 || stderr != "" {
			t.Errorf("help %s: %s", name, stderr)
		}
		if cmd.Group != "session" && !strings.Contains(strings.Join(strings.Fields(out), " "), "consult a qualified statistician") {
			t.Errorf("help %s lacks the caution", name)
		}
	}
	out, _, failed := runScript(t, "help")
	if failed != 0 {
		t.Fatal("help failed")
	}
	for _, name := range tbl.names {
		if !strings.Contains(out, "  "+name+" ") {
			t.Errorf("help listing lacks %s", name)
		}
	}
}

func TestCompletion(t *testing.T) {
	t.Parallel()
	tests := []struct {
		head string
		want string // one expected candidate
		word string
	}{
		{"spr", "spread ", "spr"},
		{"", "tail ", ""},
		{"spread ", "level=", ""},
		{"spread n=40 le", "level=", "le"},
		{"set plot=a", "ascii ", "a"},
		{"help ur", "urn", "ur"},
		{"bounds 17/40 method=cl", "clopper-pearson ", "cl"},
		{"cover n=30 method=wald,wi", "wald,wilson ", "wald,wi"},
		{"each data.csv bo", "bounds ", "bo"},
		{"each data.csv bounds me", "method=", "me"},
		// Values read from the packages' lists (test.AlternativeValues, test.TwoSidedRuleValues,
		// test.BinomialMethodValues, test.McNemarMethodValues).
		{"check 17/40 p=0.3 alt=", "higher ", ""},
		{"versus 1/2 3/4 rule=bl", "blaker ", "bl"},
		{"check 17/40 p=0.3 method=", "likelihood-ratio ", ""},
		{"flips 1 2 3 4 method=a", "asymptotic-cc ", "a"},
		{"detect n=10..20 p=0.3 truth=0.5 show=", "table ", ""},
		{"set check=", "score ", ""},
	}
	for _, tc := range tests {
		cands, word := completions(tbl, tc.head)
		if word != tc.word {
			t.Errorf("completions(%q) word = %q, want %q", tc.head, word, tc.word)
		}
		found := false
		for _, c := range cands {
			found = found || c == tc.want
		}
		if !found {
			t.Errorf("completions(%q) = %q, want %q among them", tc.head, cands, tc.want)
		}
	}
	got, n := completer{tbl}.Do([]rune("spre"), 4)
	if n != 4 || len(got) != 1 || string(got[0]) != "ad " {
		t.Errorf("Do(spre) = %q, %d", got, n)
	}
}

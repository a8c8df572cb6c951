package repl

import (
	"strings"
)

// completer completes command names, option names and option values
// (methods and fixed choices) for readline, from a session's table.
type completer struct{ t *table }

// Do implements readline.AutoCompleter: it returns the suffixes that
// extend the word before the cursor, and that word's length.
func (c completer) Do(line []rune, pos int) ([][]rune, int) {
	cands, word := completions(c.t, string(line[:pos]))
	var out [][]rune
	for _, c := range cands {
		if strings.HasPrefix(c, word) {
			out = append(out, []rune(c[len(word):]))
		}
	}
	return out, len([]rune(word))
}

// completions returns the candidates for the last word of head and that
// word.
func completions(t *table, head string) ([]string, string) {
	words := strings.Fields(head)
	if len(words) == 0 || !strings.HasSuffix(head, " ") && len(words) == 1 {
		word := ""
		if len(words) == 1 {
			word = words[0]
		}
		var cands []string
		for _, n := range t.names {
			cands = append(cands, n+" ")
		}
		return cands, strings.ToLower(word)
	}
	cmd := t.get(strings.ToLower(words[0]))
	if cmd == nil {
		return nil, ""
	}
	word := ""
	if !strings.HasSuffix(head, " ") {
		word = words[len(words)-1]
	}
	if cmd.Name == "help" {
		return t.names, word
	}
	done := len(words) // words before the one being completed
	if word != "" {
		done--
	}
	if cmd.Name == "each" {
		switch {
		case done == 1: // the file: nothing to offer
			return nil, ""
		case done == 2:
			var cands []string
			for _, v := range t.rowVerbs() {
				cands = append(cands, v+" ")
			}
			return cands, word
		}
		if cmd = t.get(strings.ToLower(words[2])); cmd == nil {
			return nil, ""
		}
	}
	if name, val, ok := strings.Cut(word, "="); ok {
		o := cmd.option(strings.ToLower(name))
		if o == nil {
			return nil, ""
		}
		vals := o.Values
		if o.Name == "method" && len(cmd.Methods) > 0 {
			vals = cmd.Methods
		}
		prefix := ""
		if cmd.Name == "cover" { // a comma-separated list of methods
			if i := strings.LastIndex(val, ","); i >= 0 {
				prefix, val = val[:i+1], val[i+1:]
			}
		}
		var cands []string
		for _, v := range vals {
			cands = append(cands, prefix+v+" ")
		}
		return cands, prefix + val
	}
	var cands []string
	for _, o := range cmd.Options {
		cands = append(cands, o.Name+"=")
	}
	return cands, word
}

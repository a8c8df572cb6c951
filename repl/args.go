package repl

import (
	"strings"
)

// splitLine cuts a line into blank-separated words, dropping a comment
// that starts with # at the beginning of a word.
func splitLine(line string) []string {
	var words []string
	for _, w := range strings.Fields(line) {
		if strings.HasPrefix(w, "#") {
			break
		}
		words = append(words, w)
	}
	return words
}

// option is one name=value word of a command line.
type option struct {
	name, value, word string
	used              bool
}

// argSet holds the words of one command line after the verb: positional
// words in order and name=value options. Getters read and check values,
// returning an *InputError that names the token; Check reports options the
// command never read.
type argSet struct {
	cmd  *command
	pos  []string
	opts []*option
}

// parseArgs sorts the words after the verb into positional words and
// options, rejecting options the command does not know (with the nearest
// known name) and options given twice.
func parseArgs(cmd *command, words []string) (*argSet, error) {
	a := &argSet{cmd: cmd}
	if cmd.raw {
		a.pos = words
		return a, nil
	}
	for _, w := range words {
		name, value, ok := strings.Cut(w, "=")
		if !ok {
			a.pos = append(a.pos, w)
			continue
		}
		name = strings.ToLower(name)
		if name == "" {
			return nil, inputErr(w, "has no option name before =; write name=value")
		}
		if value == "" {
			return nil, inputErr(w, "has no value after =; write "+name+"=value")
		}
		if cmd.option(name) == nil {
			if now, ok := renamedOptions[name]; ok && cmd.option(strings.SplitN(now, "=", 2)[0]) != nil {
				return nil, inputErr(w, "is not an option of "+cmd.Name+"; write "+now)
			}
			return nil, inputErr(w, "is not an option of "+cmd.Name+unknownHint(name, cmd.optionNames()))
		}
		for _, o := range a.opts {
			if o.name == name {
				return nil, inputErr(w, "repeats option "+name+" (already "+o.word+")")
			}
		}
		a.opts = append(a.opts, &option{name: name, value: value, word: w})
	}
	return a, nil
}

// unknownHint returns "; did you mean X?" for the known name nearest to
// word, or a pointer to help when none is close.
func unknownHint(word string, known []string) string {
	if s := nearest(word, known); s != "" {
		return "; did you mean " + s + "?"
	}
	if len(known) == 0 {
		return "; it takes no options"
	}
	return "; choose from " + strings.Join(known, ", ")
}

// Len returns the number of positional words.
func (a *argSet) Len() int { return len(a.pos) }

// Pos returns positional word i ("" when absent).
func (a *argSet) Pos(i int) string {
	if i < len(a.pos) {
		return a.pos[i]
	}
	return ""
}

// lookup returns the option named name and marks it used.
func (a *argSet) lookup(name string) *option {
	for _, o := range a.opts {
		if o.name == name {
			o.used = true
			return o
		}
	}
	return nil
}

// Has reports whether option name was given.
func (a *argSet) Has(name string) bool { return a.lookup(name) != nil }

// Str returns the raw value of option name, or def.
func (a *argSet) Str(name, def string) string {
	if o := a.lookup(name); o != nil {
		return o.value
	}
	return def
}

// wrap re-labels an error about a value so it names the whole word.
func wrap(o *option, err error) error {
	if err == nil {
		return nil
	}
	return inputErr(o.word, reasonOf(err))
}

// Float returns option name as a finite decimal, or def.
func (a *argSet) Float(name string, def float64) (float64, error) {
	o := a.lookup(name)
	if o == nil {
		return def, nil
	}
	v, err := parseFloat(o.value)
	return v, wrap(o, err)
}

// Prob returns option name as a probability in [0, 1], or def.
func (a *argSet) Prob(name string, def float64) (float64, error) {
	o := a.lookup(name)
	if o == nil {
		return def, nil
	}
	v, err := parseProb(o.value)
	return v, wrap(o, err)
}

// OpenProb returns option name as a probability strictly inside (0, 1), or def.
func (a *argSet) OpenProb(name string, def float64) (float64, error) {
	o := a.lookup(name)
	if o == nil {
		return def, nil
	}
	v, err := parseOpenProb(o.value)
	return v, wrap(o, err)
}

// Count returns option name as a whole number >= 0, or def.
func (a *argSet) Count(name string, def int64) (int64, error) {
	o := a.lookup(name)
	if o == nil {
		return def, nil
	}
	v, err := parseCount(o.value)
	return v, wrap(o, err)
}

// Range returns option name as lo..hi (or a single count), or def, def.
func (a *argSet) Range(name string, def int64) (lo, hi int64, err error) {
	o := a.lookup(name)
	if o == nil {
		return def, def, nil
	}
	lo, hi, err = parseRange(o.value)
	return lo, hi, wrap(o, err)
}

// Choice returns option name as one of the allowed words (case-insensitive),
// or def.
func (a *argSet) Choice(name, def string, allowed ...string) (string, error) {
	o := a.lookup(name)
	if o == nil {
		return def, nil
	}
	v := strings.ToLower(o.value)
	for _, w := range allowed {
		if v == w {
			return w, nil
		}
	}
	return "", inputErr(o.word, "is not a choice for "+name+unknownHint(v, allowed))
}

// KN returns positional word i as a count pair k/n.
func (a *argSet) KN(i int, what string) (k, n int64, err error) {
	if i >= len(a.pos) {
		return 0, 0, &InputError{Token: a.cmd.Name, Reason: "needs " + what + "; usage: " + a.cmd.Usage}
	}
	return parseKN(a.pos[i])
}

// Want checks the number of positional words against [min, max].
func (a *argSet) Want(min, max int) error {
	if len(a.pos) < min {
		return &InputError{Token: a.cmd.Name, Reason: "needs more arguments; usage: " + a.cmd.Usage}
	}
	if len(a.pos) > max {
		return inputErr(a.pos[max], "is one argument too many; usage: "+a.cmd.Usage)
	}
	return nil
}

// Check reports an option the command accepted but did not use in this
// form of the call (for example a two-sample method on a one-sample call).
func (a *argSet) Check() error {
	for _, o := range a.opts {
		if !o.used {
			return inputErr(o.word, "does not apply to this use of "+a.cmd.Name+"; see help "+a.cmd.Name)
		}
	}
	return nil
}

// Need checks that every named option was given.
func (a *argSet) Need(names ...string) error {
	for _, name := range names {
		if a.lookup(name) == nil {
			return &InputError{Token: a.cmd.Name, Reason: "needs " + name + "=; usage: " + a.cmd.Usage}
		}
	}
	return nil
}

// Counts reads the named options, all required, as whole numbers >= 0.
func (a *argSet) Counts(names ...string) ([]int64, error) {
	if err := a.Need(names...); err != nil {
		return nil, err
	}
	out := make([]int64, len(names))
	for i, name := range names {
		v, err := a.Count(name, 0)
		if err != nil {
			return nil, err
		}
		out[i] = v
	}
	return out, nil
}

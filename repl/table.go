package repl

import "sort"

// commandTable lists the shell's verbs: one constructor per command, each
// returning a fresh *Command. NewSession builds the session's table from
// it, so no command depends on package initialisation order and two
// sessions never share a Command value. To add a command, write its
// constructor in a file cmd_NAME.go and add one line here.
var commandTable = []func() *command{
	// distribution
	spreadCommand,
	tailCommand,
	cutCommand,
	urnCommand,
	rollCommand,
	// intervals
	boundsCommand,
	gapCommand,
	ratioCommand,
	oddsCommand,
	pairsCommand,
	coverCommand,
	sharesCommand,
	posteriorCommand,
	// tests
	checkCommand,
	flipsCommand,
	versusCommand,
	noninfCommand,
	equivCommand,
	armsCommand,
	splitCommand,
	familyCommand,
	strataCommand,
	trendCommand,
	watchCommand,
	beatsCommand,
	// planning
	detectCommand,
	sizeCommand,
	marginCommand,
	proveCommand,
	acceptCommand,
	simonCommand,
	interimCommand,
	alarmCommand,
	predictCommand,
	monitorCommand,
	// data
	eachCommand,
	// session
	setCommand,
	recordCommand,
	helpCommand,
	tourCommand,
	quitCommand,
}

// table is one session's set of commands, by name.
type table struct {
	byName map[string]*command
	names  []string // sorted
}

// newTable builds a table from constructors and then completes what
// depends on the whole set: the per-command method settings of set and
// the row verbs listed by each's help. A duplicate name is a programming
// error caught by the tests (the later one wins).
func newTable(ctors []func() *command) *table {
	t := &table{byName: map[string]*command{}}
	for _, ctor := range ctors {
		c := ctor()
		if _, dup := t.byName[c.Name]; !dup {
			t.names = append(t.names, c.Name)
		}
		t.byName[c.Name] = c
	}
	sort.Strings(t.names)
	if set := t.byName["set"]; set != nil {
		set.Options = settingOptions(t)
	}
	if each := t.byName["each"]; each != nil {
		each.Help.Methods = "Verbs that run on rows, with the columns they read: " + rowVerbList(t) + ". Any method of the verb."
	}
	return t
}

// get returns the command called name, or nil.
func (t *table) get(name string) *command { return t.byName[name] }

// rowVerbs lists the verbs that have a row form, sorted.
func (t *table) rowVerbs() []string {
	var out []string
	for _, n := range t.names {
		if t.byName[n].Row != nil || t.byName[n].Grouped != nil {
			out = append(out, n)
		}
	}
	return out
}

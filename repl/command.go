package repl

import (
	"context"
	"sort"
)

// Command is one verb of the shell.
type Command struct {
	Name    string   // the verb
	Group   string   // heading in the help listing
	Summary string   // one line for the listing
	Usage   string   // the call shape, e.g. "bounds K/N [method=M] [level=L]"
	Options []Opt    // options the verb accepts
	Methods []string // names accepted by method= (first is the default); nil when none
	Help    Help     // the help page
	Run     func(c *Call) error
	// Row, when set, lets the batch command apply the verb to one CSV row
	// (see batch.go).
	Row *rowSpec
	// raw passes every word after the verb to Run as positional, for
	// commands that hand options on to another verb (each).
	raw bool
}

// Opt documents one name=value option.
type Opt struct {
	Name   string
	Doc    string
	Values []string // fixed choices, for completion; nil for free values
}

// Help is the per-command help page.
type Help struct {
	Computes    string   // what the command computes
	Methods     string   // the methods offered, by published name
	Assumptions string   // what the data must satisfy
	Examples    []string // invented examples, each one command line that runs
	Sources     string   // published sources
	Caution     bool     // add the caution for clinical and safety-critical use
}

// Call is one running command: its context, session, arguments, and the
// output it builds (text blocks and plots for the screen, one value for
// JSON).
type Call struct {
	Ctx  context.Context
	S    *Session
	Args *Args
	Line string

	parts []part
	data  any
}

type part struct {
	block *Block
	plot  string
}

// Block starts a new output block with the given title.
func (c *Call) Block(title string) *Block {
	b := &Block{Title: title}
	c.parts = append(c.parts, part{block: b})
	return b
}

// Plot adds a rendered plot to the text output (omitted in JSON mode).
func (c *Call) Plot(text string) { c.parts = append(c.parts, part{plot: text}) }

// Data sets the value printed as the command's JSON result.
func (c *Call) Data(v any) { c.data = v }

// Method returns the method word for this call: the method= option, else
// the session default for the command, else the command's first method.
func (c *Call) Method() (string, error) {
	cmd := c.Args.cmd
	def := c.S.Set.Methods[cmd.Name]
	if def == "" && len(cmd.Methods) > 0 {
		def = cmd.Methods[0]
	}
	return c.Args.Choice("method", def, cmd.Methods...)
}

// Level returns the level= option or the session's confidence level.
func (c *Call) Level() (float64, error) { return c.Args.OpenProb("level", c.S.Set.Level) }

// option returns the documented option called name, or nil.
func (cmd *Command) option(name string) *Opt {
	for i := range cmd.Options {
		if cmd.Options[i].Name == name {
			return &cmd.Options[i]
		}
	}
	return nil
}

// optionNames lists the command's option names.
func (cmd *Command) optionNames() []string {
	names := make([]string, len(cmd.Options))
	for i, o := range cmd.Options {
		names[i] = o.Name
	}
	return names
}

// registry holds every command, by name.
var registry = map[string]*Command{}

// register adds commands to the registry; a duplicate name is a programming
// error caught by the tests (the later one wins).
func register(cmds ...*Command) {
	for _, c := range cmds {
		registry[c.Name] = c
	}
}

// commandNames returns the registered verbs in sorted order.
func commandNames() []string {
	names := make([]string, 0, len(registry))
	for n := range registry {
		names = append(names, n)
	}
	sort.Strings(names)
	return names
}

// Shared option documentation.
var (
	optLevel  = Opt{Name: "level", Doc: "confidence level, like 0.95 or 95% (default: the session level)"}
	optMethod = func(doc string, methods []string) Opt { return Opt{Name: "method", Doc: doc, Values: methods} }
)

package repl

import (
	"context"
)

// command is one verb of the shell.
type command struct {
	Name    string   // the verb
	Group   string   // heading in the help listing
	Summary string   // one line for the listing
	Usage   string   // the call shape, e.g. "bounds K/N [method=M] [level=L]"
	Options []opt    // options the verb accepts
	Methods []string // names accepted by method= (first is the default); nil when none
	Help    helpText // the help page
	Run     func(c *call) error
	// Row, when set, lets the batch command apply the verb to one CSV row
	// (see batch.go).
	Row *rowSpec
	// Grouped, when set, lets each run the verb on groups of rows, one
	// stratum a row (see batch_strata.go).
	Grouped *groupSpec
	// raw passes every word after the verb to Run as positional, for
	// commands that hand options on to another verb (each).
	raw bool
}

// opt documents one name=value option.
type opt struct {
	Name   string   `json:"name"`
	Doc    string   `json:"doc"`
	Values []string `json:"values,omitempty"` // fixed choices, for completion; nil for free values
}

// helpText is the per-command help page.
type helpText struct {
	Computes    string   // what the command computes
	Methods     string   // the methods offered, by published name
	Assumptions string   // what the data must satisfy
	Examples    []string // invented examples, each one command line that runs
	Sources     string   // published sources
	Caution     bool     // add the caution for clinical and safety-critical use
}

// call is one running command: its context, session, arguments, and the
// output it builds (text blocks and plots for the screen, one value for
// JSON).
type call struct {
	Ctx  context.Context
	S    *Session
	Args *argSet
	Line string

	parts []part
	data  any
}

type part struct {
	block *block
	plot  string
}

// Block starts a new output block with the given title.
func (c *call) Block(title string) *block {
	b := &block{Title: title}
	c.parts = append(c.parts, part{block: b})
	return b
}

// Plot adds a rendered plot to the text output (omitted in JSON mode).
func (c *call) Plot(text string) { c.parts = append(c.parts, part{plot: text}) }

// Data sets the value printed as the command's JSON result.
func (c *call) Data(v any) { c.data = v }

// Method returns the method word for this call: the method= option, else
// the session default for the command, else the command's first method.
func (c *call) Method() (string, error) {
	cmd := c.Args.cmd
	def := c.S.Set.Methods[cmd.Name]
	if def == "" && len(cmd.Methods) > 0 {
		def = cmd.Methods[0]
	}
	return c.Args.Choice("method", def, cmd.Methods...)
}

// Level returns the level= option or the session's confidence level.
func (c *call) Level() (float64, error) { return c.Args.OpenProb("level", c.S.Set.Level) }

// option returns the documented option called name, or nil.
func (cmd *command) option(name string) *opt {
	for i := range cmd.Options {
		if cmd.Options[i].Name == name {
			return &cmd.Options[i]
		}
	}
	return nil
}

// optionNames lists the command's option names.
func (cmd *command) optionNames() []string {
	names := make([]string, len(cmd.Options))
	for i, o := range cmd.Options {
		names[i] = o.Name
	}
	return names
}

// Shared option documentation.
var (
	optLevel  = opt{Name: "level", Doc: "confidence level, like 0.95 or 95% (default: the session level)"}
	optMethod = func(doc string, methods []string) opt { return opt{Name: "method", Doc: doc, Values: methods} }
)

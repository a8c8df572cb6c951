package repl

import (
	"strings"
)

// caution is printed on every help page of a command that computes.
const caution = "These numbers can steer decisions that hurt people when they are wrong. For clinical " +
	"and safety-critical use consult a qualified statistician, the applicable regulations and standards, and local practice."

func helpCommand() *command {
	return &command{
		Name:    "help",
		Group:   "session",
		Summary: "list the commands, or explain one: help NAME",
		Usage:   "help [COMMAND]",
		Help: helpText{
			Computes: "Lists the commands by group, or shows one command's page: what it computes, the methods, " +
				"its options, assumptions, invented examples and sources.",
			Examples: []string{"help", "help spread"},
		},
		Run: runHelp,
	}
}

// groupOrder is the order of groups in the listing.
var groupOrder = []string{"distribution", "intervals", "tests", "planning", "data", "session"}

type helpPage struct {
	Name        string   `json:"name"`
	Usage       string   `json:"usage"`
	Summary     string   `json:"summary"`
	Computes    string   `json:"computes"`
	Methods     []string `json:"methods,omitempty"`
	Options     []opt    `json:"options,omitempty"`
	Assumptions string   `json:"assumptions,omitempty"`
	Examples    []string `json:"examples,omitempty"`
	Sources     string   `json:"sources,omitempty"`
	Caution     string   `json:"caution,omitempty"`
}

func runHelp(c *call) error {
	a := c.Args
	if err := a.Want(0, 1); err != nil {
		return err
	}
	if a.Len() == 0 {
		return helpListing(c)
	}
	name := strings.ToLower(a.Pos(0))
	cmd := c.S.cmds.get(name)
	if cmd == nil {
		return inputErr(a.Pos(0), "is not a command"+unknownHint(name, c.S.cmds.names))
	}
	pg := helpPage{Name: cmd.Name, Usage: cmd.Usage, Summary: cmd.Summary, Computes: cmd.Help.Computes,
		Methods: cmd.Methods, Options: cmd.Options, Assumptions: cmd.Help.Assumptions,
		Examples: cmd.Help.Examples, Sources: cmd.Help.Sources}
	if cmd.Group != "session" {
		pg.Caution = caution
	}
	c.Data(pg)
	w := max(50, c.S.Set.Width)
	var sb strings.Builder
	sb.WriteString(cmd.Usage + "\n  " + cmd.Summary + "\n")
	section := func(title, text string) {
		if text == "" {
			return
		}
		sb.WriteString("\n" + title + "\n")
		sb.WriteString(wrapText(text, w, "  "))
	}
	section("What it computes", cmd.Help.Computes)
	section("Methods", cmd.Help.Methods)
	if len(cmd.Options) > 0 {
		sb.WriteString("\nOptions\n")
		nw := 0
		for _, o := range cmd.Options {
			nw = max(nw, len(o.Name))
		}
		for _, o := range cmd.Options {
			doc := o.Doc
			if len(o.Values) > 0 && o.Name == "method" {
				doc += ": " + strings.Join(o.Values, ", ")
			} else if len(o.Values) > 0 && !mentionsAll(doc, o.Values) {
				doc += " (" + strings.Join(o.Values, ", ") + ")"
			}
			sb.WriteString(hangText(pad(o.Name, nw)+"  ", doc, w, "  "))
		}
	}
	section("Assumptions", cmd.Help.Assumptions)
	if len(cmd.Help.Examples) > 0 {
		sb.WriteString("\nExamples (counts invented, unless a source below gives them)\n")
		for _, e := range cmd.Help.Examples {
			sb.WriteString("  " + e + "\n")
		}
	}
	section("Sources", cmd.Help.Sources)
	section("Caution", pg.Caution)
	c.Plot(sb.String())
	return nil
}

func helpListing(c *call) error {
	type entry struct {
		Name    string `json:"name"`
		Group   string `json:"group"`
		Summary string `json:"summary"`
	}
	var list []entry
	var sb strings.Builder
	sb.WriteString("kofn: binomial inference from k successes in n trials. One command per line; counts as k/n,\n" +
		"options as name=value. help NAME explains a command; tour walks through an invented example.\n")
	nw := 0
	for _, n := range c.S.cmds.names {
		nw = max(nw, len(n))
	}
	for _, g := range groupOrder {
		first := true
		for _, n := range c.S.cmds.names {
			cmd := c.S.cmds.get(n)
			if cmd.Group != g {
				continue
			}
			if first {
				sb.WriteString("\n" + g + "\n")
				first = false
			}
			list = append(list, entry{n, g, cmd.Summary})
			sb.WriteString("  " + pad(n, nw) + "  " + cmd.Summary + "\n")
		}
	}
	sb.WriteString("\n" + wrapText(caution, max(50, c.S.Set.Width), ""))
	c.Data(list)
	c.Plot(sb.String())
	return nil
}

// wrapText fills text into lines of at most width runes, each starting
// with indent.
func wrapText(text string, width int, indent string) string {
	var sb strings.Builder
	line := indent
	for _, w := range strings.Fields(text) {
		if len(line) > len(indent) && len(line)+1+len(w) > width {
			sb.WriteString(line + "\n")
			line = indent
		}
		if len(line) > len(indent) {
			line += " "
		}
		line += w
	}
	if len(line) > len(indent) {
		sb.WriteString(line + "\n")
	}
	return sb.String()
}

// hangText writes label then text filled to width, continuation lines
// indented to line up after the label.
func hangText(label, text string, width int, indent string) string {
	body := wrapText(text, width-len(indent)-len(label), "")
	lines := strings.Split(strings.TrimSuffix(body, "\n"), "\n")
	var sb strings.Builder
	for i, l := range lines {
		if i == 0 {
			sb.WriteString(indent + label + l + "\n")
		} else {
			sb.WriteString(indent + strings.Repeat(" ", len(label)) + l + "\n")
		}
	}
	return sb.String()
}

// mentionsAll reports whether doc names every value (so the help need not
// list them again).
func mentionsAll(doc string, values []string) bool {
	for _, v := range values {
		if !strings.Contains(doc, v) {
			return false
		}
	}
	return true
}

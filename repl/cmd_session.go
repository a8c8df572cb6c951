package repl

import (
	"sort"
	"strconv"
)

func setCommand() *command {
	return &command{
		Name:    "set",
		Group:   "session",
		Summary: "show or change session settings (level, digits, json, plot, width, default methods)",
		Usage:   "set [name=value ...]",
		Options: nil, // filled by newTable with settingOptions
		Help: helpText{
			Computes: "Shows the session settings, or changes them for the rest of the session. " +
				"level is the confidence level used when a command gets no level= (0.95 or 95%); " +
				"digits the significant digits printed (1 to 15); json=on prints one JSON object per command; " +
				"plot=ascii draws plots with plain characters; width the plot width in columns. " +
				"A command name as setting (for example bounds=jeffreys) sets that command's default method.",
			Examples: []string{"set", "set level=90% digits=3", "set level=0.95 digits=4"},
		},
		Run: runSet,
	}
}

func quitCommand() *command {
	return &command{
		Name:    "quit",
		Group:   "session",
		Summary: "leave the shell (Ctrl-D does the same)",
		Usage:   "quit",
		Help:    helpText{Computes: "Ends the session."},
		Run: func(c *call) error {
			if err := c.Args.Want(0, 0); err != nil {
				return err
			}
			return errQuit
		},
	}
}

// settingOptions lists the options of set: the fixed settings and one per
// command of t that has methods.
func settingOptions(t *table) []opt {
	opts := []opt{
		{Name: "level", Doc: "confidence level, in (0, 1) or as a percentage"},
		{Name: "digits", Doc: "significant digits printed, 1 to 15"},
		{Name: "json", Doc: "on: one JSON object per command; off: text blocks", Values: []string{"on", "off"}},
		{Name: "plot", Doc: "blocks (Unicode) or ascii", Values: []string{"blocks", "ascii"}},
		{Name: "width", Doc: "plot width in columns, 20 to 400"},
	}
	for _, name := range t.names {
		if m := t.get(name).Methods; len(m) > 0 {
			opts = append(opts, opt{Name: name, Doc: "default method of " + name, Values: m})
		}
	}
	return opts
}

// settingsView is the JSON form of the settings.
type settingsView struct {
	Level   float64           `json:"level"`
	Digits  int               `json:"digits"`
	JSON    bool              `json:"json"`
	Plot    string            `json:"plot"`
	Width   int               `json:"width"`
	Methods map[string]string `json:"methods"`
}

func runSet(c *call) error {
	if err := c.Args.Want(0, 0); err != nil {
		return err
	}
	next := c.S.Set
	next.Methods = map[string]string{}
	for k, v := range c.S.Set.Methods {
		next.Methods[k] = v
	}
	a := c.Args
	var err error
	if next.Level, err = a.OpenProb("level", next.Level); err != nil {
		return err
	}
	if d, err := a.Count("digits", int64(next.Digits)); err != nil {
		return err
	} else if d < 1 || d > 15 {
		return inputErr("digits="+a.Str("digits", ""), "is outside 1 to 15")
	} else {
		next.Digits = int(d)
	}
	if j, err := a.Choice("json", onOff(next.JSON), "on", "off"); err != nil {
		return err
	} else {
		next.JSON = j == "on"
	}
	if p, err := a.Choice("plot", plotStyle(next.ASCII), "blocks", "ascii"); err != nil {
		return err
	} else {
		next.ASCII = p == "ascii"
	}
	if w, err := a.Count("width", int64(next.Width)); err != nil {
		return err
	} else if w < 20 || w > 400 {
		return inputErr("width="+a.Str("width", ""), "is outside 20 to 400 columns")
	} else {
		next.Width = int(w)
	}
	for _, name := range c.S.cmds.names {
		cmd := c.S.cmds.get(name)
		if len(cmd.Methods) == 0 {
			continue
		}
		if m, err := a.Choice(name, "", cmd.Methods...); err != nil {
			return err
		} else if m != "" {
			next.Methods[name] = m
		}
	}
	c.S.Set = next
	c.Data(settingsView{next.Level, next.Digits, next.JSON, plotStyle(next.ASCII), next.Width, next.effectiveMethods(c.S.cmds)})
	title := "session settings"
	if len(a.opts) > 0 {
		title = "changed settings"
	}
	b := c.Block(title)
	show := func(name string) bool { return len(a.opts) == 0 || a.Has(name) }
	rows := []struct{ name, value, doc string }{
		{"level", pct(next.Level), "confidence level when a command gets no level="},
		{"digits", strconv.Itoa(next.Digits), "significant digits printed"},
		{"json", onOff(next.JSON), "one JSON object per command"},
		{"plot", plotStyle(next.ASCII), "plot characters"},
		{"width", strconv.Itoa(next.Width), "plot width in columns"},
	}
	for _, r := range rows {
		if show(r.name) {
			b.Row(r.name, r.value, r.doc)
		}
	}
	ms := next.effectiveMethods(c.S.cmds)
	names := make([]string, 0, len(ms))
	for n := range ms {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range names {
		if show(n) {
			b.Row(n, ms[n], "default method of "+n)
		}
	}
	return nil
}

// effectiveMethods returns the default method of every command of t with
// methods: the session's choice or the command's own default.
func (st Settings) effectiveMethods(t *table) map[string]string {
	out := map[string]string{}
	for _, name := range t.names {
		cmd := t.get(name)
		if len(cmd.Methods) == 0 {
			continue
		}
		m := st.Methods[name]
		if m == "" {
			m = cmd.Methods[0]
		}
		out[name] = m
	}
	return out
}

func onOff(b bool) string {
	if b {
		return "on"
	}
	return "off"
}

func plotStyle(ascii bool) string {
	if ascii {
		return "ascii"
	}
	return "blocks"
}

package repl

import (
	"context"
	"strings"
	"testing"
)

// tbl is a command table for tests that inspect the commands themselves.
var tbl = newTable(commandTable)

// TestCommandTable checks the table: one entry per name, every command
// complete enough to dispatch, derived parts filled in, and sessions that
// do not share Command values (a change to one session's table cannot
// reach another).
func TestCommandTable(t *testing.T) {
	t.Parallel()
	seen := map[string]bool{}
	for _, ctor := range commandTable {
		c := ctor()
		if seen[c.Name] {
			t.Errorf("command %q appears twice in commandTable", c.Name)
		}
		seen[c.Name] = true
		if c.Run == nil {
			t.Errorf("command %q has no Run", c.Name)
		}
		if c.Name != strings.ToLower(c.Name) || strings.ContainsAny(c.Name, " =/") {
			t.Errorf("command %q is not a plain lowercase word", c.Name)
		}
	}
	if len(tbl.names) != len(commandTable) {
		t.Errorf("table has %d names for %d constructors", len(tbl.names), len(commandTable))
	}
	if tbl.get("set").option("bounds") == nil {
		t.Error("set has no per-command method setting for bounds")
	}
	if !strings.Contains(tbl.get("each").Help.Methods, "bounds (k,n)") {
		t.Errorf("each help does not list the row verbs: %q", tbl.get("each").Help.Methods)
	}
	a, b := NewSession(nil, nil), NewSession(nil, nil)
	if a.cmds.get("bounds") == b.cmds.get("bounds") {
		t.Error("two sessions share a Command value")
	}
	// A session still runs after another session's table was changed.
	b.cmds.get("bounds").Run = nil
	s, out, errw := testSession()
	if err := s.Run(context.Background(), "bounds 17/40"); err != nil || !strings.Contains(out.String(), "Wilson") {
		t.Errorf("bounds after another session's change: %v %s %s", err, out.String(), errw.String())
	}
}

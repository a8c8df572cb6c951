package repl

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func TestMainExitStatus(t *testing.T) {
	t.Parallel()
	tests := []struct {
		args   []string
		stdin  string
		status int
		out    string // expected in stdout
		errs   string // expected in stderr
	}{
		{[]string{"-c", "tail 17/40 p=0.3"}, "", ExitOK, "exactly 17", ""},
		{[]string{"-c", "tail 41/40 p=0.3"}, "", ExitFailed, "", `"41/40"`},
		{[]string{"-c", "tail 17/40 p=0.3\nspred"}, "", ExitFailed, "exactly 17", "did you mean spread"},
		{nil, "tail 17/40 p=0.3\n# comment\n\nspread n=40 p=0.3\n", ExitOK, "central 95%", ""},
		{nil, "tail 17/40 p=0.3\nbogus\nspread n=40 p=0.3\n", ExitFailed, "central 95%", "line 2: error:"},
		{nil, "quit\nbogus\n", ExitOK, "", ""},
		{[]string{"-json", "-c", "tail 2/89 p=0.01"}, "", ExitOK, `"at_most":0.9396899183135595`, ""},
		{[]string{"-width", "5"}, "", ExitUsage, "", "outside 20 to 400"},
		{[]string{"-c", "each - bounds"}, "k,n\n17,40\n", ExitOK, "17,40,0.425,", ""},
		{nil, "each - bounds\n17,40\n", ExitFailed, "", "standard input holds the commands"},
		{[]string{"stray"}, "", ExitUsage, "", "unexpected argument"},
		{[]string{"-nosuchflag"}, "", ExitUsage, "", "flag provided but not defined"},
	}
	for _, tc := range tests {
		var out, errw bytes.Buffer
		got := Main(tc.args, strings.NewReader(tc.stdin), &out, &errw)
		if got != tc.status || !strings.Contains(out.String(), tc.out) || !strings.Contains(errw.String(), tc.errs) {
			t.Errorf("Main(%q) with stdin %q = %d\nstdout: %s\nstderr: %s\nwant status %d, %q, %q",
				tc.args, tc.stdin, got, out.String(), errw.String(), tc.status, tc.out, tc.errs)
		}
	}
}

func TestHistoryFileMode(t *testing.T) {
	dir := t.TempDir()
	t.Setenv("XDG_STATE_HOME", dir)
	path := historyPath()
	if want := filepath.Join(dir, "kofn", "history"); path != want {
		t.Fatalf("historyPath() = %q, want %q", path, want)
	}
	// An existing file with a wider mode is narrowed.
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		t.Fatal(err)
	}
	var old strings.Builder
	for i := 0; i < historyKeep+10; i++ {
		old.WriteString("tail 17/40 p=0.3\n")
	}
	if err := os.WriteFile(path, []byte(old.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	h, err := openHistory(path)
	if err != nil {
		t.Fatal(err)
	}
	h.add("spread n=40 p=0.3")
	h.close()
	fi, err := os.Stat(path)
	if err != nil {
		t.Fatal(err)
	}
	if fi.Mode().Perm() != 0o600 {
		t.Errorf("history mode %v, want 0600", fi.Mode().Perm())
	}
	data, _ := os.ReadFile(path)
	lines := strings.Split(strings.TrimSpace(string(data)), "\n")
	if len(lines) != historyKeep+1 || lines[len(lines)-1] != "spread n=40 p=0.3" {
		t.Errorf("history has %d lines ending %q, want %d ending with the new line", len(lines), lines[len(lines)-1], historyKeep+1)
	}
	// A fresh file in a fresh directory.
	t.Setenv("XDG_STATE_HOME", filepath.Join(dir, "fresh"))
	h, err = openHistory(historyPath())
	if err != nil {
		t.Fatal(err)
	}
	h.close()
	for p, want := range map[string]os.FileMode{historyPath(): 0o600, filepath.Dir(historyPath()): 0o700} {
		fi, err := os.Stat(p)
		if err != nil || fi.Mode().Perm() != want {
			t.Errorf("%s: mode %v, %v; want %v", p, fi.Mode().Perm(), err, want)
		}
	}
	// A relative XDG_STATE_HOME is ignored, as the XDG specification asks.
	t.Setenv("XDG_STATE_HOME", "relative/dir")
	t.Setenv("HOME", dir)
	if got, want := historyPath(), filepath.Join(dir, ".local", "state", "kofn", "history"); got != want {
		t.Errorf("historyPath() = %q, want %q", got, want)
	}
}

func TestHistoryCanBeTurnedOff(t *testing.T) {
	t.Setenv("KOFN_NO_HISTORY", "")
	if !historyOn(false) || historyOn(true) {
		t.Errorf("flag: historyOn(false) = %v, historyOn(true) = %v", historyOn(false), historyOn(true))
	}
	for v, want := range map[string]bool{"1": false, "yes": false, "0": true} {
		t.Setenv("KOFN_NO_HISTORY", v)
		if got := historyOn(false); got != want {
			t.Errorf("KOFN_NO_HISTORY=%q: history on = %v, want %v", v, got, want)
		}
	}
}

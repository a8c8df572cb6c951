package repl

import (
	"context"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestSessionRecord: a record holds every command with its text and JSON
// results; run again as a script it gives the same output and the same
// failures; it is written with mode 0600 and never through a link.
func TestSessionRecord(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	path := filepath.Join(dir, "session.kofn")
	lines := []string{"bounds 17/40", "check 3/14 p=0.5 alt=lower", "tail 41/40 p=0.3", "set digits=3", "bounds 3/14 --json"}
	s, out, errw := testSession()
	script := "record " + path + "\n" + strings.Join(lines, "\n") + "\nrecord off\n"
	if failed := s.RunLines(context.Background(), strings.NewReader(script), true); failed != 1 {
		t.Fatalf("failed = %d: %s", failed, errw.String())
	}
	data, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	rec := string(data)
	for _, l := range lines {
		if !strings.Contains(rec, "\n"+l+"\n") {
			t.Errorf("record lacks the command %q", l)
		}
	}
	for _, want := range []string{"# Wilson interval for p, 95% two-sided", `#> {"command":"bounds","input":"bounds 17/40"`,
		`# error: "41/40" has more successes than trials`, `#> {"command":"check"`} {
		if !strings.Contains(rec, want) {
			t.Errorf("record lacks %q:\n%s", want, rec)
		}
	}
	if strings.Contains(rec, "record off") || strings.Contains(rec, "\nrecord ") {
		t.Error("the record command itself was recorded")
	}
	if fi, _ := os.Stat(path); fi.Mode().Perm() != 0o600 {
		t.Errorf("record mode %v, want 0600", fi.Mode().Perm())
	}
	// Re-run the record as a script: same output for the recorded commands.
	orig := out.String()
	orig = orig[strings.Index(orig, "Wilson"):strings.LastIndex(orig, "session record ended")]
	s2, out2, errw2 := testSession()
	f, _ := os.Open(path)
	defer f.Close()
	if failed := s2.RunLines(context.Background(), f, true); failed != 1 {
		t.Errorf("re-run: failed = %d: %s", failed, errw2.String())
	}
	if got := out2.String(); !strings.Contains(got, orig) {
		t.Errorf("re-run output differs:\n%s", firstDiff(orig, got))
	}
	// A link is refused, its target untouched.
	target := filepath.Join(dir, "target")
	os.WriteFile(target, []byte("keep\n"), 0o644)
	link := filepath.Join(dir, "link")
	if err := os.Symlink(target, link); err == nil {
		if _, err := runErr("record " + link); err == nil || !strings.Contains(err.Error(), "symbolic link") {
			t.Errorf("record through a link: %v", err)
		}
		if b, _ := os.ReadFile(target); string(b) != "keep\n" {
			t.Errorf("link target changed: %q", b)
		}
	}
}

//go:build unix

package repl

import (
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"
)

// TestHistoryRefusesNonRegular covers the unsafe history paths: a
// symbolic link (to a file, which must stay untouched, and dangling), a
// FIFO (which must not hang start-up), a directory. Each is refused with
// a reason naming what was found, and nothing is written through it.
func TestHistoryRefusesNonRegular(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	target := filepath.Join(dir, "target")
	if err := os.WriteFile(target, []byte("precious\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		name, want string
		make       func(path string) error
	}{
		{"symlink", "symbolic link", func(p string) error { return os.Symlink(target, p) }},
		{"dangling", "symbolic link", func(p string) error { return os.Symlink(filepath.Join(dir, "nowhere"), p) }},
		{"fifo", "named pipe", func(p string) error { return syscall.Mkfifo(p, 0o600) }},
		{"directory", "directory", func(p string) error { return os.Mkdir(p, 0o700) }},
	}
	for _, tc := range cases {
		path := filepath.Join(dir, tc.name, "history")
		if err := os.MkdirAll(filepath.Dir(path), 0o700); err != nil {
			t.Fatal(err)
		}
		if err := tc.make(path); err != nil {
			t.Fatal(err)
		}
		done := make(chan error, 1)
		go func() {
			h, err := openHistory(path)
			if h != nil {
				h.add("bounds 1/2")
				h.close()
			}
			done <- err
		}()
		select {
		case err := <-done:
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("%s: openHistory error %v, want one naming %q", tc.name, err, tc.want)
			}
		case <-time.After(5 * time.Second):
			t.Fatalf("%s: openHistory hangs", tc.name)
		}
	}
	data, err := os.ReadFile(target)
	fi, _ := os.Stat(target)
	if err != nil || string(data) != "precious\n" || fi.Mode().Perm() != 0o644 {
		t.Errorf("the link's target changed: %q, mode %v", data, fi.Mode().Perm())
	}
	if _, err := os.Lstat(filepath.Join(dir, "nowhere")); err == nil {
		t.Error("a dangling link's target was created")
	}
}

// TestHistoryLongLines: a history file holding a huge line is read with
// bounded memory; the huge line is dropped, the others kept.
func TestHistoryLongLines(t *testing.T) {
	t.Parallel()
	path := filepath.Join(t.TempDir(), "history")
	body := "bounds 1/2\n" + strings.Repeat("x", 3<<20) + "\ncheck 3/14 p=0.5"
	if err := os.WriteFile(path, []byte(body), 0o600); err != nil {
		t.Fatal(err)
	}
	h, err := openHistory(path)
	if err != nil {
		t.Fatal(err)
	}
	defer h.close()
	if len(h.lines) != 2 || h.lines[0] != "bounds 1/2" || h.lines[1] != "check 3/14 p=0.5" {
		t.Errorf("lines %.80q", h.lines)
	}
}

// TestInteractiveHistoryFallback runs the interactive loop with a FIFO,
// a symbolic link and a directory where the history file belongs: each
// time the shell says in one line why history is off, runs the commands,
// and does not hang.
func TestInteractiveHistoryFallback(t *testing.T) {
	dir := t.TempDir()
	target := filepath.Join(dir, "target")
	os.WriteFile(target, []byte("x\n"), 0o644)
	for name, mk := range map[string]func(string) error{
		"fifo":      func(p string) error { return syscall.Mkfifo(p, 0o600) },
		"symlink":   func(p string) error { return os.Symlink(target, p) },
		"directory": func(p string) error { return os.Mkdir(p, 0o700) },
	} {
		state := filepath.Join(dir, name)
		path := filepath.Join(state, "kofn", "history")
		if err := os.MkdirAll(filepath.Dir(path), 0o700); err != nil {
			t.Fatal(err)
		}
		if err := mk(path); err != nil {
			t.Fatal(err)
		}
		t.Setenv("XDG_STATE_HOME", state)
		var out, errw syncBuffer
		s := NewSession(&out, &errw)
		done := make(chan int, 1)
		go func() { done <- interactive(s, strings.NewReader("bounds 17/40\n"), true) }()
		select {
		case <-done:
		case <-time.After(10 * time.Second):
			t.Fatalf("%s: the interactive shell hangs", name)
		}
		e := errw.String()
		if !strings.HasPrefix(e, "kofn: no history this session: ") || strings.Count(e, "\n") != 1 || !strings.Contains(e, "not a regular file") {
			t.Errorf("%s: stderr %q, want one line saying why history is off", name, e)
		}
		if !strings.Contains(out.String(), "Wilson interval") {
			t.Errorf("%s: the command did not run: %q", name, out.String())
		}
	}
	if b, _ := os.ReadFile(target); string(b) != "x\n" {
		t.Errorf("the link's target changed: %q", b)
	}
}

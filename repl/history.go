package repl

import (
	"bufio"
	"os"
	"path/filepath"
	"strings"
)

// historyKeep is the number of lines kept in the history file.
const historyKeep = 1000

// historyPath returns $XDG_STATE_HOME/kofn/history, or
// ~/.local/state/kofn/history when XDG_STATE_HOME is unset or relative
// (as the XDG base directory specification asks); "" when no home
// directory is known.
func historyPath() string {
	if d := os.Getenv("XDG_STATE_HOME"); filepath.IsAbs(d) {
		return filepath.Join(d, "kofn", "history")
	}
	home, err := os.UserHomeDir()
	if err != nil || home == "" {
		return ""
	}
	return filepath.Join(home, ".local", "state", "kofn", "history")
}

// history is the command history file, kept with mode 0600 because
// command lines may hold confidential counts.
type history struct {
	f     *os.File
	lines []string
}

// openHistory opens (creating) the history file at path with mode 0600 in
// a directory of mode 0700, reads its last historyKeep lines and trims the
// file to them.
func openHistory(path string) (*history, error) {
	if path == "" {
		return nil, os.ErrNotExist
	}
	if err := os.MkdirAll(filepath.Dir(path), 0o700); err != nil {
		return nil, err
	}
	f, err := os.OpenFile(path, os.O_CREATE|os.O_RDWR|os.O_APPEND, 0o600)
	if err != nil {
		return nil, err
	}
	if err := f.Chmod(0o600); err != nil { // an older file may be wider
		f.Close()
		return nil, err
	}
	h := &history{f: f}
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		if l := strings.TrimSpace(sc.Text()); l != "" {
			h.lines = append(h.lines, l)
		}
	}
	if len(h.lines) > historyKeep {
		h.lines = h.lines[len(h.lines)-historyKeep:]
		if err := h.rewrite(path); err != nil {
			f.Close()
			return nil, err
		}
	}
	return h, nil
}

// rewrite replaces the file by the kept lines, through a temporary file
// created with mode 0600.
func (h *history) rewrite(path string) error {
	tmp, err := os.CreateTemp(filepath.Dir(path), ".history-*")
	if err != nil {
		return err
	}
	w := bufio.NewWriter(tmp)
	for _, l := range h.lines {
		w.WriteString(l + "\n")
	}
	if err := w.Flush(); err != nil {
		tmp.Close()
		os.Remove(tmp.Name())
		return err
	}
	tmp.Close()
	if err := os.Rename(tmp.Name(), path); err != nil {
		os.Remove(tmp.Name())
		return err
	}
	h.f.Close()
	h.f, err = os.OpenFile(path, os.O_RDWR|os.O_APPEND, 0o600)
	return err
}

// add appends one line to the file.
func (h *history) add(line string) {
	h.f.WriteString(strings.TrimSpace(line) + "\n")
}

func (h *history) close() { h.f.Close() }

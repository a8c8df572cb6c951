package repl

import (
	"bufio"
	"errors"
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
// file to them. It never follows a symbolic link at path, never blocks on
// a FIFO or device there, and accepts only a regular file owned by the
// user; otherwise it returns an error saying what it found, and the shell
// carries on without history.
func openHistory(path string) (*history, error) {
	if path == "" {
		return nil, errors.New("no home directory or XDG_STATE_HOME to keep it in")
	}
	if err := os.MkdirAll(filepath.Dir(path), 0o700); err != nil {
		return nil, err
	}
	f, err := openRegular(path, os.O_CREATE|os.O_RDWR|os.O_APPEND)
	if err != nil {
		return nil, err
	}
	if err := f.Chmod(0o600); err != nil { // an older file may be wider
		f.Close()
		return nil, err
	}
	h := &history{f: f}
	r := bufio.NewReader(f)
	for {
		l, _, err := readLine(r, lineLimits{keep: maxHistoryLine, stop: 16 << 20, nul: true})
		if l = strings.TrimSpace(l); l != "" {
			h.lines = append(h.lines, l)
			if len(h.lines) > 2*historyKeep {
				h.lines = append(h.lines[:0], h.lines[historyKeep:]...)
			}
		}
		if err != nil {
			break
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

// maxHistoryLine is the longest history line kept; longer lines (a pasted
// data set, say) are dropped from the file's history.
const maxHistoryLine = 64 << 10

// openRegular opens path without following a final symbolic link and
// without blocking on a FIFO, and returns the file only if it is a
// regular file; the error names what was found instead.
func openRegular(path string, flag int) (*os.File, error) {
	f, err := os.OpenFile(path, flag|noFollow|nonBlock, 0o600)
	if err != nil {
		if fi, lerr := os.Lstat(path); lerr == nil {
			if kind := fileKind(fi.Mode()); kind != "" {
				return nil, errors.New(path + " is " + kind + ", not a regular file")
			}
		}
		return nil, err
	}
	fi, err := f.Stat()
	if err != nil {
		f.Close()
		return nil, err
	}
	if kind := fileKind(fi.Mode()); kind != "" {
		f.Close()
		return nil, errors.New(path + " is " + kind + ", not a regular file")
	}
	if lfi, err := os.Lstat(path); err != nil || !os.SameFile(fi, lfi) {
		f.Close()
		return nil, errors.New(path + " changed while it was opened")
	}
	return f, nil
}

// fileKind describes a file mode that is not a regular file ("" for a
// regular file).
func fileKind(m os.FileMode) string {
	switch {
	case m.IsRegular():
		return ""
	case m&os.ModeSymlink != 0:
		return "a symbolic link"
	case m.IsDir():
		return "a directory"
	case m&os.ModeNamedPipe != 0:
		return "a named pipe (FIFO)"
	case m&os.ModeSocket != 0:
		return "a socket"
	case m&os.ModeDevice != 0:
		return "a device"
	}
	return "not a regular file"
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
	h.f, err = openRegular(path, os.O_RDWR|os.O_APPEND)
	return err
}

// add appends one line to the file.
func (h *history) add(line string) {
	h.f.WriteString(strings.TrimSpace(line) + "\n")
}

func (h *history) close() { h.f.Close() }

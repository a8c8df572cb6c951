package repl

import (
	"bufio"
	"bytes"
	"os"
	"strings"
	"time"
)

// recorder writes the session record: every command line as typed, then
// its text output and its JSON result as comment lines, so the file is
// both a record and a script (kofn < FILE runs the commands again; the
// comments are skipped).
type recorder struct {
	f    *os.File
	w    *bufio.Writer
	path string
}

// recordPrefixes mark the comment lines of a record: text output and the
// JSON result.
const (
	recText = "# "
	recJSON = "#> "
)

func recordCommand() *command {
	return &command{
		Name:    "record",
		Group:   "session",
		Summary: "write the session's commands and results (text and JSON) to a file that runs again as a script",
		Usage:   "record FILE   or   record off",
		Help: helpText{
			Computes: "Starts a session record: from here on every command line is written to FILE as typed, " +
				"followed by its text output on lines starting with \"# \" and its JSON result on one line " +
				"starting with \"#> \" (errors as \"# error: ...\"). The file is appended to, created with mode " +
				"0600 (it may hold confidential counts), and never written through a symbolic link. Because the " +
				"results are comments, the record is also a script: kofn < FILE runs the same commands again, " +
				"so a later version's results can be compared with the record. record off ends it; record " +
				"alone says where it goes. CSV that each writes to the screen is not copied into the record.",
			Examples: []string{"record"},
		},
		Run: runRecord,
	}
}

type recordView struct {
	File      string `json:"file,omitempty"`
	Recording bool   `json:"recording"`
}

func runRecord(c *call) error {
	a := c.Args
	if err := a.Want(0, 1); err != nil {
		return err
	}
	s := c.S
	if a.Len() == 0 {
		b := c.Block("session record")
		if s.rec == nil {
			b.Row("recording", "off")
			c.Data(recordView{})
		} else {
			b.Row("recording to", s.rec.path)
			c.Data(recordView{s.rec.path, true})
		}
		return nil
	}
	arg := a.Pos(0)
	if strings.EqualFold(arg, "off") {
		if s.rec == nil {
			return inputErr(arg, "ends nothing: no record is being written")
		}
		path := s.rec.path
		if err := s.rec.close(); err != nil {
			s.rec = nil
			return inputErr(path, "could not be written in full: "+err.Error())
		}
		s.rec = nil
		c.Block("session record ended").Row("written to", path)
		c.Data(recordView{path, false})
		return nil
	}
	if s.rec != nil {
		return inputErr(arg, "cannot start a record: one is already going to "+s.rec.path+"; record off first")
	}
	f, err := openRegular(arg, os.O_CREATE|os.O_WRONLY|os.O_APPEND)
	if err != nil {
		return inputErr(arg, "cannot be written: "+err.Error())
	}
	s.rec = &recorder{f: f, w: bufio.NewWriter(f), path: arg}
	s.rec.w.WriteString("# kofn session record, started " + time.Now().UTC().Format("2006-01-02 15:04 UTC") +
		". Each command, then its output as # lines and its JSON as a #> line; run it again with kofn < " + arg + "\n")
	c.Block("session record started").Row("writing to", arg, "commands with their text and JSON results")
	c.Data(recordView{arg, true})
	return nil
}

// recordCall writes one finished top-level command to the record.
func (s *Session) recordCall(line, verb string, c *call, err error) {
	if s.rec == nil || s.depth != 1 || strings.EqualFold(verb, "record") {
		return
	}
	w := s.rec.w
	defer w.Flush()
	w.WriteString(safeText(strings.TrimSpace(line), false) + "\n")
	if err != nil {
		w.WriteString(recText + "error: " + shellMessage(s.cmds, verb, err) + "\n")
		return
	}
	var text bytes.Buffer
	renderText(&text, c)
	for _, l := range strings.Split(strings.TrimRight(text.String(), "\n"), "\n") {
		if l != "" {
			w.WriteString(recText + l + "\n")
		}
	}
	if c.data != nil {
		if b, err := jsonEnvelope(verb, c); err == nil {
			w.WriteString(recJSON + string(b) + "\n")
		}
	}
}

func (r *recorder) close() error {
	err := r.w.Flush()
	if cerr := r.f.Close(); err == nil {
		err = cerr
	}
	return err
}

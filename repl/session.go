package repl

import (
	"bufio"
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"strconv"
	"strings"

	"github.com/kofnlab/kofn/internal/jsonfloat"
)

// Settings are the session-wide defaults that commands read. The set
// command changes them; an embedder may set them directly between calls.
type Settings struct {
	Level   float64           // confidence level for intervals and tests (default 0.95)
	Digits  int               // significant digits printed (default 4)
	JSON    bool              // print one JSON object per command instead of text blocks
	ASCII   bool              // draw plots with plain ASCII instead of Unicode blocks
	Width   int               // plot width in columns (default: the terminal's, else 72)
	Methods map[string]string // default method per command name
}

// DefaultSettings returns the settings a new session starts with.
func DefaultSettings() Settings {
	return Settings{Level: 0.95, Digits: 4, Width: 72, Methods: map[string]string{}}
}

// Session runs command lines against one set of settings and one command
// table, writing results to Out and error lines to Err. Make one with
// NewSession. A Session is not safe for concurrent use; separate sessions
// share nothing and may run in parallel.
type Session struct {
	Out io.Writer // results
	Err io.Writer // one line per failed command
	In  io.Reader // data for "each -" (standard input by default)
	Set Settings

	cmds        *table // the command table, built by NewSession
	script      bool   // prefix errors with the line number
	interactive bool   // at a terminal prompt
	lineNo      int
	jsonOnce    bool      // --json on the line being run
	depth       int       // nesting of Run (tour runs its steps through Run)
	rec         *recorder // the session record, when one is being written
}

// jsonOut reports whether results print as JSON: the json setting, or
// --json on the line being run.
func (s *Session) jsonOut() bool { return s.Set.JSON || s.jsonOnce }

// NewSession returns a session with default settings writing results to
// out and error lines to errw, with standard input as the data of
// "each -". It builds the session's command table from commandTable.
func NewSession(out, errw io.Writer) *Session {
	return &Session{Out: out, Err: errw, In: os.Stdin, Set: DefaultSettings(), cmds: newTable(commandTable)}
}

// Run executes one command line and prints its result, or one error line.
// Blank lines and comments do nothing. It returns the command's error (nil
// on success); the session stays usable whatever happened.
func (s *Session) Run(ctx context.Context, line string) error {
	s.lineNo++
	words := splitLine(line)
	words, once := takeJSONFlag(words)
	if len(words) == 0 {
		return nil
	}
	if once && !s.jsonOnce {
		// --json anywhere on the line: this command's result as JSON,
		// without touching the json setting.
		s.jsonOnce = true
		defer func() { s.jsonOnce = false }()
	}
	s.depth++
	defer func() { s.depth-- }()
	c, err := s.exec(ctx, line, words)
	if err != nil {
		if errors.Is(err, errQuit) {
			return err
		}
		s.report(words[0], err)
		s.recordCall(line, words[0], nil, err)
		return err
	}
	s.print(words[0], c)
	s.recordCall(line, words[0], c, nil)
	return nil
}

// takeJSONFlag removes every "--json" or "-json" word from a command line
// (the two spellings the kofn program's own -json flag accepts) and
// reports whether there was one.
func takeJSONFlag(words []string) ([]string, bool) {
	out, found := words[:0:0], false
	for _, w := range words {
		if strings.EqualFold(w, "--json") || strings.EqualFold(w, "-json") {
			found = true
			continue
		}
		out = append(out, w)
	}
	return out, found
}

// exec parses and runs one command, returning the finished call.
func (s *Session) exec(ctx context.Context, line string, words []string) (*call, error) {
	verb := strings.ToLower(words[0])
	cmd := s.cmds.get(verb)
	if cmd == nil {
		return nil, inputErr(words[0], "is not a command"+unknownHint(verb, s.cmds.names))
	}
	args, err := parseArgs(cmd, words[1:])
	if err != nil {
		return nil, err
	}
	c := &call{Ctx: ctx, S: s, Args: args, Line: strings.TrimSpace(line)}
	if err := cmd.Run(c); err != nil {
		return nil, err
	}
	if err := args.Check(); err != nil {
		return nil, err
	}
	return c, nil
}

// report prints one error line for a failed command.
func (s *Session) report(verb string, err error) {
	msg := shellMessage(s.cmds, verb, err)
	if errors.Is(err, context.Canceled) && s.interactive {
		msg = "\n" + msg // after the ^C the terminal echoed
	}
	if s.jsonOut() {
		b, _ := jsonfloat.Marshal(struct {
			Command string `json:"command"`
			Error   string `json:"error"`
		}{verb, msg})
		fmt.Fprintf(s.Out, "%s\n", jsonSafe(b))
	}
	prefix := "error: "
	if strings.HasPrefix(msg, "\n") {
		prefix, msg = "\nerror: ", msg[1:]
	}
	if s.script {
		prefix = fmt.Sprintf("line %d: error: ", s.lineNo)
	}
	fmt.Fprintf(s.Err, "%s%s\n", prefix, msg)
}

// print writes the call's output as text blocks and plots, or as one JSON
// object {"command": verb, "input": line, "result": data}.
func (s *Session) print(verb string, c *call) {
	if s.jsonOut() {
		if c.data == nil {
			return
		}
		b, err := jsonEnvelope(verb, c)
		if err != nil {
			fmt.Fprintf(s.Err, "error: cannot encode the result as JSON: %v\n", err)
			return
		}
		fmt.Fprintf(s.Out, "%s\n", b)
		return
	}
	renderText(s.Out, c)
}

// jsonEnvelope is the JSON form of a finished call, safe to show on a
// terminal (see jsonSafe).
func jsonEnvelope(verb string, c *call) ([]byte, error) {
	b, err := jsonfloat.Marshal(struct {
		Command string `json:"command"`
		Input   string `json:"input"`
		Result  any    `json:"result"`
	}{strings.ToLower(verb), c.Line, c.data})
	return jsonSafe(b), err
}

// renderText writes the call's text blocks and plots.
func renderText(w io.Writer, c *call) {
	for i, p := range c.parts {
		if i > 0 {
			io.WriteString(w, "\n")
		}
		if p.block != nil {
			p.block.render(w)
		} else {
			io.WriteString(w, safeText(p.plot, true))
		}
	}
}

// maxScriptLine is the longest command line run (1 MiB); a longer line
// is reported with its number and skipped, and the script goes on.
const maxScriptLine = 1 << 20

// RunLines runs every line of r as a command, without prompts, and
// returns the number of lines that failed. With numbered set, errors name
// the line number (script mode). Lines of any length are read with
// bounded memory: one longer than 1 MiB fails with its number and the
// next line runs. It stops early at "quit" or when ctx is cancelled
// (which counts as a failure).
func (s *Session) RunLines(ctx context.Context, r io.Reader, numbered bool) (failed int) {
	s.script = numbered
	s.lineNo = 0
	defer func() { s.script = false }()
	br := bufio.NewReaderSize(r, 64<<10)
	for {
		line, size, err := readLine(br, lineLimits{keep: maxScriptLine})
		if err != nil {
			if err != io.EOF {
				fmt.Fprintf(s.Err, "error: reading commands after line %d: %v\n", s.lineNo, err)
				failed++
			}
			return failed
		}
		if ctx.Err() != nil {
			return failed + 1
		}
		if size > maxScriptLine {
			s.lineNo++
			s.report("", &InputError{Token: "line " + strconv.Itoa(s.lineNo),
				Reason: "is " + strconv.Itoa(size) + " bytes long, beyond the 1 MiB a command line may have; it was skipped"})
			failed++
			continue
		}
		if err := s.Run(ctx, line); err != nil {
			if errors.Is(err, errQuit) {
				return failed
			}
			failed++
		}
	}
}

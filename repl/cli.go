package repl

import (
	"context"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"strings"
)

// Exit statuses of Main.
const (
	ExitOK     = 0 // every command succeeded
	ExitFailed = 1 // at least one command failed
	ExitUsage  = 2 // the command line of kofn itself was wrong
)

// Main runs the kofn program with the given arguments (without the program
// name) and streams, and returns the exit status. With -c it runs the
// given commands; else, when stdin is a terminal, it starts the interactive
// shell; else it runs stdin as a script.
func Main(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("kofn", flag.ContinueOnError)
	fs.SetOutput(stderr)
	cmd := fs.String("c", "", "run `commands` (one per line) and exit")
	asJSON := fs.Bool("json", false, "print one JSON object per command")
	ascii := fs.Bool("ascii", false, "draw plots with plain ASCII characters")
	noHist := fs.Bool("no-history", false, "do not read or write the history file (also: KOFN_NO_HISTORY=1)")
	width := fs.Int("width", 0, "plot width in columns (default: the terminal's, else 72)")
	fs.Usage = func() {
		fmt.Fprintf(stderr, "usage: kofn [-c 'commands'] [-json] [-ascii] [-width N] [-no-history]\n"+
			"  starts the kofn shell on a terminal, runs standard input as a script otherwise.\n")
		fs.PrintDefaults()
	}
	if err := fs.Parse(args); err != nil {
		if err == flag.ErrHelp {
			return ExitOK
		}
		return ExitUsage
	}
	if fs.NArg() > 0 {
		fmt.Fprintf(stderr, "kofn: unexpected argument %q; put commands after -c or on standard input\n", fs.Arg(0))
		return ExitUsage
	}
	s := NewSession(stdout, stderr)
	s.In = stdin
	term := isTerminal(stdin)
	s.Set.ASCII = *ascii || !unicodeLocale()
	s.Set.JSON = *asJSON
	switch {
	case *width != 0:
		if *width < 20 || *width > 400 {
			fmt.Fprintf(stderr, "kofn: -width %d is outside 20 to 400 columns\n", *width)
			return ExitUsage
		}
		s.Set.Width = *width
	case isTerminal(stdout):
		s.Set.Width = terminalWidth()
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	if *cmd != "" {
		return status(s.RunLines(ctx, strings.NewReader(*cmd), false))
	}
	if term {
		stop() // the interactive loop handles Ctrl-C itself
		return interactive(s, stdin, historyOn(*noHist))
	}
	s.In = nil // standard input holds the commands, not data
	return status(s.RunLines(ctx, stdin, true))
}

// historyOn reports whether the interactive shell keeps a history file:
// not with -no-history, nor when KOFN_NO_HISTORY is set to anything but
// "" or "0".
func historyOn(noHistoryFlag bool) bool {
	if noHistoryFlag {
		return false
	}
	v := os.Getenv("KOFN_NO_HISTORY")
	return v == "" || v == "0"
}

func status(failed int) int {
	if failed > 0 {
		return ExitFailed
	}
	return ExitOK
}

// unicodeLocale reports whether plots may use Unicode blocks: not on a
// dumb terminal, nor when the locale is set and names no UTF-8 encoding.
func unicodeLocale() bool {
	if os.Getenv("TERM") == "dumb" {
		return false
	}
	for _, v := range []string{"LC_ALL", "LC_CTYPE", "LANG"} {
		if loc := os.Getenv(v); loc != "" {
			l := strings.ToLower(loc)
			return strings.Contains(l, "utf-8") || strings.Contains(l, "utf8")
		}
	}
	return true
}

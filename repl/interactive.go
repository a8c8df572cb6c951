package repl

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"sync"

	"github.com/chzyer/readline"
)

// greeting is the first line on a terminal; hint the second.
const (
	greeting = "kofn: binomial inference from k successes in n trials."
	hint     = "Type tour for a walk-through, help for the commands; Ctrl-D leaves."
)

// isTerminal reports whether f is an *os.File on a terminal.
func isTerminal(f any) bool {
	file, ok := f.(*os.File)
	return ok && readline.IsTerminal(int(file.Fd()))
}

// terminalWidth returns the terminal's width in columns, 72 when unknown.
func terminalWidth() int {
	if w := readline.GetScreenWidth(); w >= 20 {
		return min(w, 400)
	}
	return 72
}

// interactive runs the prompt loop on a terminal until Ctrl-D or quit. A
// Ctrl-C while a command runs cancels its context; at the prompt it clears
// the line. It returns ExitOK: at a terminal, failures were seen.
func interactive(s *Session, stdin io.Reader, useHistory bool) int {
	s.interactive = true
	fmt.Fprintln(s.Out, greeting)
	fmt.Fprintln(s.Out, hint)
	cfg := &readline.Config{
		Prompt:                 "kofn> ",
		AutoComplete:           completer{s.cmds},
		InterruptPrompt:        "^C",
		EOFPrompt:              "",
		DisableAutoSaveHistory: true,
		HistoryLimit:           historyKeep,
		Stdin:                  io.NopCloser(stdin),
	}
	rl, err := readline.NewEx(cfg)
	if err != nil {
		fmt.Fprintf(s.Err, "kofn: cannot start line editing: %v; reading commands as a script\n", err)
		return status(s.RunLines(context.Background(), stdin, true))
	}
	defer rl.Close()
	var hist *history
	if useHistory {
		if hist, err = openHistory(historyPath()); err != nil {
			fmt.Fprintf(s.Err, "kofn: no history this session: %s\n", safeText(err.Error(), false))
		} else {
			defer hist.close()
			for _, l := range hist.lines {
				rl.SaveHistory(l)
			}
		}
	}

	// One signal handler for the whole session: it cancels the running
	// command, if any; at the prompt readline sees Ctrl-C as a key.
	var mu sync.Mutex
	var cancel context.CancelFunc
	sig := make(chan os.Signal, 1)
	signal.Notify(sig, os.Interrupt)
	defer signal.Stop(sig)
	go func() {
		for range sig {
			mu.Lock()
			if cancel != nil {
				cancel()
			}
			mu.Unlock()
		}
	}()

	for {
		line, err := rl.Readline()
		if errors.Is(err, readline.ErrInterrupt) {
			if line == "" {
				fmt.Fprintln(s.Out, "(Ctrl-D or quit leaves)")
			}
			continue
		}
		if err != nil { // io.EOF: Ctrl-D
			return ExitOK
		}
		if len(splitLine(line)) > 0 {
			rl.SaveHistory(line)
			if hist != nil {
				hist.add(line)
			}
		}
		ctx, c := context.WithCancel(context.Background())
		mu.Lock()
		cancel = c
		mu.Unlock()
		err = s.Run(ctx, line)
		mu.Lock()
		cancel = nil
		mu.Unlock()
		c()
		if errors.Is(err, errQuit) {
			return ExitOK
		}
	}
}

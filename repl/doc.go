// Package repl is the kofn shell: a small line-oriented language for
// binomial inference, its parser, command table, output blocks, terminal
// plots, help pages, interactive loop, script mode and CSV batch runner.
//
// The shell is a thin layer. Every number it prints comes from the kofn
// packages (binom, interval, test, power); the shell only parses, checks
// input, dispatches and formats.
//
// # Grammar
//
// One command per line: a verb, then positional arguments, then options
// written name=value, separated by blanks. A # starts a comment. Counts are
// written k/n ("17/40": 17 successes in 40 trials). Numbers are plain
// decimals (0.3, 1e-6, 2.5); probabilities and levels may also be written
// as percentages (95%). The shell rejects nan, inf, hexadecimal floats and
// digit separators (1_000, 1,000) and names the offending token.
//
//	spread n=40 p=0.3
//	bounds 17/40 level=90%
//	help bounds
//
// Session settings (confidence level, digits, default methods, JSON output,
// plot style and width) are changed with "set name=value" and shown with
// "set" alone; they last for the session. "record FILE" writes the
// session's commands with their text and JSON results to FILE, as comment
// lines under each command, so the record runs again as a script.
//
// # Output
//
// Each command prints a compact block: a title naming the method by its
// published name, the level and the side, then aligned label/value rows
// and any warnings; some add a terminal plot (Unicode blocks, or ASCII
// with -ascii, set plot=ascii or a non-UTF-8 locale). With kofn -json,
// "set json=on", or --json (also spelt -json) anywhere on one line, each
// such command prints instead one JSON object on one line,
//
//	{"command": "bounds", "input": "bounds 17/40", "result": {...}}
//
// where result is the package's result value (non-finite numbers as the
// strings "+Inf", "-Inf", "NaN"); a failed command prints
// {"command": ..., "error": ...}. The batch command (each) always writes
// CSV: the input columns, the result columns in full precision, and an
// error column.
//
// # Modes
//
// On a terminal the shell reads lines with github.com/chzyer/readline,
// with history in the user's state directory (mode 0600, can be turned
// off) and completion of commands, methods and option names. Ctrl-C stops
// a running computation and returns to the prompt; Ctrl-D leaves. When
// standard input is not a terminal, lines are read as a script (no prompt,
// no history) and the exit status is non-zero if any line failed.
//
// # Embedding
//
// The exported surface is what the kofn program and an embedder need:
// Main is the whole program (repl/cmd/kofn calls only it); NewSession
// makes a Session with default Settings and its own command table, built
// from the explicit list in table.go when the session starts (no package
// state is shared between sessions); Session.Run executes one line and
// Session.RunLines a script; a rejected token comes back as an
// *InputError. A Session is used by one goroutine at a time; separate
// sessions may run concurrently.
//
//	s := repl.NewSession(os.Stdout, os.Stderr)
//	s.Set.Digits = 3
//	if err := s.Run(ctx, "bounds 17/40"); err != nil { ... }
//
// Results steer decisions. For clinical studies and safety-critical
// acceptance, consult a qualified statistician, the applicable regulations
// and standards, and local practice.
package repl

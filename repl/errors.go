package repl

import (
	"errors"
	"strconv"
)

// InputError reports a bad token on a command line: the token as typed and
// what is wrong with it. Its message reads, for example,
//
//	"41/40" has more successes than trials (41 > 40)
type InputError struct {
	Token  string // the offending token, exactly as typed
	Reason string // what is wrong and, where it helps, how to fix it
}

// Error formats the message described on the type.
func (e *InputError) Error() string { return strconv.Quote(e.Token) + " " + e.Reason }

func inputErr(tok, reason string) error { return &InputError{Token: tok, Reason: reason} }

// errQuit is returned by the quit command to end a session.
var errQuit = errors.New("quit")

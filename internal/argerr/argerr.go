// Package argerr holds the error values that every kofn package returns.
//
// Each public package re-exports the sentinels and the Error type under its
// own name (binom.ErrInvalidArgument, interval.Error, ...), so callers never
// import this package; because the values are shared, errors.Is works across
// packages: an interval error caused by a bad binomial parameter still
// matches binom.ErrInvalidArgument.
package argerr

import (
	"context"
	"errors"
	"fmt"
	"math"
	"strconv"
)

// Sentinels. Every *Error unwraps to exactly one of them (or to a context
// error for a cancelled computation).
var (
	// ErrInvalidArgument: an argument is outside the function's domain
	// (negative count, k > n, probability outside [0, 1], NaN, ...).
	ErrInvalidArgument = errors.New("invalid argument")
	// ErrTooLarge: the problem exceeds a documented size limit that keeps
	// the computation to seconds.
	ErrTooLarge = errors.New("problem too large")
	// ErrNoSolution: the request is valid but no answer exists (a target
	// power that no n up to the search limit reaches, a sampling plan that
	// cannot meet both risks).
	ErrNoSolution = errors.New("no solution")
)

// Error describes why a call failed: the function, the argument, its value
// and the reason, in the shape of strconv.NumError. Its message reads, for
// example, "interval.Proportion: k = 12 exceeds n = 10".
type Error struct {
	Func   string // qualified function name, e.g. "binom.New"
	Arg    string // argument name as in the signature; empty when the failure is not one argument's
	Value  string // the offending value as the caller wrote it, formatted
	Reason string // what is wrong and, where it helps, how to fix the call
	Err    error  // the sentinel or context error this error wraps
}

// Error formats the message described on the type.
func (e *Error) Error() string {
	if e.Arg == "" {
		return e.Func + ": " + e.Reason
	}
	return e.Func + ": " + e.Arg + " = " + e.Value + " " + e.Reason
}

// Unwrap returns the sentinel (or context error) so errors.Is works.
func (e *Error) Unwrap() error { return e.Err }

// Format renders an argument value the way a user would write it:
// integers plainly, floats in the shortest form that round-trips.
func Format(v any) string {
	switch x := v.(type) {
	case float64:
		if math.IsNaN(x) {
			return "NaN"
		}
		return strconv.FormatFloat(x, 'g', -1, 64)
	case int64:
		return strconv.FormatInt(x, 10)
	case int:
		return strconv.Itoa(x)
	case string:
		return strconv.Quote(x)
	default:
		return fmt.Sprint(v)
	}
}

// Invalid returns an ErrInvalidArgument error for argument arg of fn.
func Invalid(fn, arg string, value any, reason string) *Error {
	return &Error{Func: fn, Arg: arg, Value: Format(value), Reason: reason, Err: ErrInvalidArgument}
}

// TooLarge returns an ErrTooLarge error for argument arg of fn.
func TooLarge(fn, arg string, value any, reason string) *Error {
	return &Error{Func: fn, Arg: arg, Value: Format(value), Reason: reason, Err: ErrTooLarge}
}

// NoSolution returns an ErrNoSolution error for fn with the given reason.
func NoSolution(fn, reason string) *Error {
	return &Error{Func: fn, Reason: reason, Err: ErrNoSolution}
}

// Canceled wraps the context's error for fn; it returns nil while ctx is live.
func Canceled(fn string, ctx context.Context) error {
	err := ctx.Err()
	if err == nil {
		return nil
	}
	return &Error{Func: fn, Reason: "stopped: " + err.Error(), Err: err}
}

// Prob checks that p is a probability in [0, 1] (NaN rejected).
func Prob(fn, arg string, p float64) error {
	if !(p >= 0 && p <= 1) {
		return Invalid(fn, arg, p, "is not a probability in [0, 1]")
	}
	return nil
}

// OpenProb checks that p lies strictly inside (0, 1) (NaN rejected).
func OpenProb(fn, arg string, p float64) error {
	if !(p > 0 && p < 1) {
		return Invalid(fn, arg, p, "must lie strictly between 0 and 1")
	}
	return nil
}

// Count checks that a count is non-negative.
func Count(fn, arg string, v int64) error {
	if v < 0 {
		return Invalid(fn, arg, v, "is negative; counts are 0 or more")
	}
	return nil
}

// KN checks 0 <= k <= n, naming k (or n) in the error; kArg and nArg are the
// argument names as the caller's signature spells them.
func KN(fn, kArg, nArg string, k, n int64) error {
	if n < 0 {
		return Invalid(fn, nArg, n, "is negative; counts are 0 or more")
	}
	if k < 0 {
		return Invalid(fn, kArg, k, "is negative; counts are 0 or more")
	}
	if k > n {
		return Invalid(fn, kArg, k, "exceeds "+nArg+" = "+strconv.FormatInt(n, 10))
	}
	return nil
}

package interval

import "github.com/kofnlab/kofn/internal/argerr"

// Error is the typed error every kofn function returns: it names the
// function, the argument, the value and the reason, and unwraps to one of
// the sentinels below (use errors.Is and errors.As).
type Error = argerr.Error

// Sentinels shared by all kofn packages; errors.Is(err, interval.ErrInvalidArgument)
// holds for an invalid argument reported by any of them.
var (
	// ErrInvalidArgument marks an argument outside the function's domain.
	ErrInvalidArgument = argerr.ErrInvalidArgument
	// ErrTooLarge marks a problem over a documented size limit.
	ErrTooLarge = argerr.ErrTooLarge
	// ErrNoSolution marks a valid request that has no answer.
	ErrNoSolution = argerr.ErrNoSolution
)

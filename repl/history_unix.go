//go:build unix

package repl

import "syscall"

// Flags of openRegular: do not follow a final symbolic link, do not wait
// for a writer on a FIFO.
const (
	noFollow = syscall.O_NOFOLLOW
	nonBlock = syscall.O_NONBLOCK
)

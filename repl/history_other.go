//go:build !unix

package repl

// Without O_NOFOLLOW and O_NONBLOCK, openRegular relies on its checks
// after opening (the file's kind, and the same file as the link-free
// Lstat of the path).
const (
	noFollow = 0
	nonBlock = 0
)

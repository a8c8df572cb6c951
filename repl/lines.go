package repl

import (
	"bufio"
	"bytes"
	"errors"
	"io"
	"strings"
)

// Errors of readLine that end the reading of a stream.
var (
	errHugeLine = errors.New("a line longer than the reading limit, with no end in sight")
	errNUL      = errors.New("a NUL byte: this is not text")
)

// lineLimits bound readLine: keep is the most bytes kept in memory (a
// longer line is read to its end and dropped), stop the most bytes read
// in one line before giving up on the stream, and nul whether a NUL byte
// ends the reading (binary data such as /dev/zero).
type lineLimits struct {
	keep, stop int
	nul        bool
}

// readLine reads one line from r (without its \n or \r\n) within the
// limits. A line longer than lim.keep is read to its end and dropped:
// line is then "" and size its full length, so the caller can report it
// and go on. err is io.EOF after the last line (which may lack a final
// newline), errHugeLine or errNUL when the stream cannot be read on, or a
// read error.
func readLine(r *bufio.Reader, lim lineLimits) (line string, size int, err error) {
	var sb strings.Builder
	for {
		chunk, isPrefix, rerr := r.ReadLine()
		if lim.nul && bytes.IndexByte(chunk, 0) >= 0 {
			return "", size, errNUL
		}
		size += len(chunk)
		if size <= lim.keep {
			sb.Write(chunk)
		} else if sb.Len() > 0 {
			sb.Reset()
		}
		if rerr != nil {
			if rerr == io.EOF && size > 0 {
				return finish(&sb, size, lim.keep), size, nil
			}
			return finish(&sb, size, lim.keep), size, rerr
		}
		if !isPrefix {
			return finish(&sb, size, lim.keep), size, nil
		}
		if lim.stop > 0 && size > lim.stop {
			return "", size, errHugeLine
		}
	}
}

func finish(sb *strings.Builder, size, max int) string {
	if size > max {
		return ""
	}
	return sb.String()
}

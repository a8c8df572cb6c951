package repl

import (
	"bufio"
	"io"
	"strings"
)

// readLine reads one line from r (without its \n or \r\n), keeping at
// most max bytes in memory. A longer line is read to its end and
// dropped: line is then "" and size its full length, so the caller can
// report it and go on with the next line. err is io.EOF after the last
// line (which may lack a final newline) or a read error.
func readLine(r *bufio.Reader, max int) (line string, size int, err error) {
	var sb strings.Builder
	for {
		chunk, isPrefix, rerr := r.ReadLine()
		size += len(chunk)
		if size <= max {
			sb.Write(chunk)
		} else if sb.Len() > 0 {
			sb.Reset()
		}
		if rerr != nil {
			if rerr == io.EOF && size > 0 {
				// ReadLine returned the last line before; EOF now.
				return finish(&sb, size, max), size, nil
			}
			return finish(&sb, size, max), size, rerr
		}
		if !isPrefix {
			return finish(&sb, size, max), size, nil
		}
	}
}

func finish(sb *strings.Builder, size, max int) string {
	if size > max {
		return ""
	}
	return sb.String()
}

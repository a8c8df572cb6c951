package repl

import (
	"bufio"
	"errors"
	"io"
	"strconv"
	"strings"
	"sync/atomic"
)

// maxRecord is the most bytes one CSV record may hold; a longer record
// is reported and skipped.
const maxRecord = 1 << 20

// maxLine is the most bytes read in one physical line before the input
// is given up as not CSV.
const maxLine = 64 << 20

// maxRecordLines is the most physical lines one quoted field may span.
const maxRecordLines = 64

// record is one CSV record: its first physical line number, its fields,
// and what was wrong with it (nil when it parsed).
type record struct {
	line   int
	fields []string
	err    error
}

// physLine is one physical line of the input and its number.
type physLine struct {
	text string
	no   int
	size int
}

// csvReader reads RFC 4180 records with bounded memory and recovers from
// bad records: a bare quote, an unterminated quote or an over-long record
// fails that record only, and reading goes on at the next line.
type csvReader struct {
	br      *bufio.Reader
	lineNo  int
	pending []physLine   // lines read ahead while looking for a closing quote
	read    atomic.Int64 // bytes consumed, for progress
}

func newCSVReader(r io.Reader) *csvReader {
	return &csvReader{br: bufio.NewReaderSize(r, 64<<10)}
}

// physical returns the next physical line, or io.EOF.
func (r *csvReader) physical() (physLine, error) {
	if len(r.pending) > 0 {
		l := r.pending[0]
		r.pending = r.pending[1:]
		return l, nil
	}
	text, size, err := readLine(r.br, lineLimits{keep: maxRecord, stop: maxLine, nul: true})
	if err != nil {
		return physLine{}, err
	}
	r.lineNo++
	r.read.Add(int64(size) + 1)
	return physLine{text, r.lineNo, size}, nil
}

// next returns the next record, or io.EOF after the last one; other
// errors are read errors of the input. Blank lines are skipped.
func (r *csvReader) next() (record, error) {
	for {
		first, err := r.physical()
		if err != nil {
			return record{}, err
		}
		if first.size > maxRecord {
			return record{line: first.no, err: errors.New("the record is " + strconv.Itoa(first.size) + " bytes long, beyond the 1 MiB a record may have")}, nil
		}
		if strings.TrimSpace(first.text) == "" {
			continue
		}
		text := first.text
		var more []physLine
		for {
			fields, open, perr := parseCSVLine(text)
			if perr != nil {
				r.pending = append(more, r.pending...)
				return record{line: first.no, err: perr}, nil
			}
			if !open {
				return record{line: first.no, fields: fields}, nil
			}
			l, err := r.physical()
			if err != nil || len(more)+1 >= maxRecordLines || len(text)+1+l.size > maxRecord {
				// The quote is never closed within bounds: fail this line
				// alone and read on from the line after it.
				if err == nil {
					more = append(more, l)
				}
				r.pending = append(more, r.pending...)
				return record{line: first.no, err: errOpenQuote}, nil
			}
			more = append(more, l)
			text += "\n" + l.text
		}
	}
}

var (
	errOpenQuote = errors.New("a quote opens a field that is not closed within 64 lines and 1 MiB; write a quote inside a field as \"\"")
)

// parseCSVLine splits text into fields. open reports a quoted field still
// open at the end of text (the record continues on the next line); err
// reports a bare quote in an unquoted field or text after a closing
// quote.
func parseCSVLine(text string) (fields []string, open bool, err error) {
	i := 0
	for {
		if i < len(text) && text[i] == '"' {
			var sb strings.Builder
			j := i + 1
			for {
				q := strings.IndexByte(text[j:], '"')
				if q < 0 {
					return nil, true, nil
				}
				sb.WriteString(text[j : j+q])
				j += q + 1
				if j < len(text) && text[j] == '"' {
					sb.WriteByte('"')
					j++
					continue
				}
				break
			}
			fields = append(fields, sb.String())
			switch {
			case j == len(text):
				return fields, false, nil
			case text[j] == ',':
				i = j + 1
				continue
			}
			return nil, false, errors.New("the quote that closes field " + strconv.Itoa(len(fields)) + " is followed by text before the next comma")
		}
		end := strings.IndexByte(text[i:], ',')
		field := text[i:]
		if end >= 0 {
			field = text[i : i+end]
		}
		if strings.IndexByte(field, '"') >= 0 {
			return nil, false, errors.New("bare quote in field " + strconv.Itoa(len(fields)+1) + "; quote the whole field and double the quote inside (\"a\"\"b\")")
		}
		fields = append(fields, field)
		if end < 0 {
			return fields, false, nil
		}
		i += end + 1
	}
}

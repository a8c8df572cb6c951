package repl

import (
	"errors"
	"io"
	"os"
	"strconv"
	"strings"
)

// maxLooks bounds the looks one watch or alarm command reads.
const maxLooks = 1_000_000

// lookSource reads the looks of a sequential command: looks= written on
// the line (looks separated by commas, each look's counts by sep, like
// 3/40 or 3/40:5/41), or from= a CSV file (or - for standard input) with
// one look per row and the count columns named in cols (found by the
// header when its first row names them, else the first columns). It
// returns the counts of each look and the label of each (the input line
// for a file, the look number otherwise).
func lookSource(c *call, cols []string, parse func(word string) ([]int64, error)) ([][]int64, []string, error) {
	a := c.Args
	lo, from := a.lookup("looks"), a.lookup("from")
	if lo != nil && from != nil {
		return nil, nil, inputErr(from.word, "cannot be combined with looks=; give the looks one way")
	}
	if lo != nil {
		var out [][]int64
		var labels []string
		for i, w := range strings.Split(lo.value, ",") {
			v, err := parse(strings.TrimSpace(w))
			if err != nil {
				return nil, nil, inputErr(lo.word, "has look "+strconv.Itoa(i+1)+" "+strconv.Quote(w)+", which "+reasonOf(err))
			}
			out = append(out, v)
			labels = append(labels, strconv.Itoa(i+1))
		}
		return out, labels, nil
	}
	if from == nil {
		return nil, nil, nil
	}
	var in io.Reader
	if from.value == "-" {
		if c.S.interactive {
			return nil, nil, inputErr(from.word, "is the terminal here; give a file name, or pipe the CSV in: kofn -c 'watch ... from=-' < looks.csv")
		}
		if c.S.In == nil {
			return nil, nil, inputErr(from.word, "cannot be read: standard input holds the commands; give a file name, or use kofn -c '... from=-' < looks.csv")
		}
		in = c.S.In
	} else {
		f, err := os.Open(from.value)
		if err != nil {
			return nil, nil, inputErr(from.word, "cannot be read: "+errors.Unwrap(err).Error())
		}
		defer f.Close()
		if fi, err := f.Stat(); err == nil && fi.IsDir() {
			return nil, nil, inputErr(from.word, "is a directory; give a CSV file")
		}
		in = f
	}
	r := newCSVReader(in)
	var out [][]int64
	var labels []string
	idx := []int(nil)
	first := true
	for {
		rec, err := r.next()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, nil, inputErr(from.word, "cannot be read: "+err.Error())
		}
		where := "line " + strconv.Itoa(rec.line)
		if rec.err != nil {
			return nil, nil, inputErr(from.word, where+": "+rec.err.Error())
		}
		if first {
			first = false
			if h := headerIndex(rec.fields, cols); h != nil {
				idx = h
				continue
			}
			if !anyNumber(rec.fields) {
				return nil, nil, inputErr(from.word, where+": the header does not name the columns "+strings.Join(cols, ", "))
			}
		}
		if idx == nil {
			idx = make([]int, len(cols))
			for i := range idx {
				idx[i] = i
			}
		}
		v := make([]int64, len(cols))
		for i, j := range idx {
			if j >= len(rec.fields) {
				return nil, nil, inputErr(from.word, where+": has "+strconv.Itoa(len(rec.fields))+" fields; the look needs "+strings.Join(cols, ", "))
			}
			x, err := parseCount(strings.TrimSpace(rec.fields[j]))
			if err != nil {
				return nil, nil, inputErr(from.word, where+": "+cols[i]+" "+strconv.Quote(rec.fields[j])+" "+reasonOf(err))
			}
			v[i] = x
		}
		out = append(out, v)
		labels = append(labels, strconv.Itoa(rec.line))
		if len(out) > maxLooks {
			return nil, nil, inputErr(from.word, "holds more than 1000000 looks")
		}
	}
	if len(out) == 0 {
		return nil, nil, inputErr(from.word, "holds no looks")
	}
	return out, labels, nil
}

// headerIndex returns the positions of cols in a header row, or nil when
// the row does not name them all.
func headerIndex(fields, cols []string) []int {
	idx := make([]int, len(cols))
	for i, c := range cols {
		idx[i] = -1
		for j, f := range fields {
			if strings.EqualFold(strings.TrimSpace(f), c) {
				idx[i] = j
			}
		}
		if idx[i] < 0 {
			return nil
		}
	}
	return idx
}

func anyNumber(fields []string) bool {
	for _, f := range fields {
		if _, err := parseFloat(strings.TrimSpace(f)); err == nil {
			return true
		}
	}
	return false
}

// oneLook parses "k/n".
func oneLook(w string) ([]int64, error) {
	k, n, err := parseKN(w)
	if err != nil {
		return nil, err
	}
	return []int64{k, n}, nil
}

// twoLook parses "k1/n1:k2/n2".
func twoLook(w string) ([]int64, error) {
	a, b, ok := strings.Cut(w, ":")
	if !ok {
		return nil, errors.New("needs both groups as k1/n1:k2/n2")
	}
	x, err := oneLook(a)
	if err != nil {
		return nil, err
	}
	y, err := oneLook(b)
	if err != nil {
		return nil, err
	}
	return append(x, y...), nil
}

// pairLook parses "n12:n21".
func pairLook(w string) ([]int64, error) {
	a, b, ok := strings.Cut(w, ":")
	if !ok {
		return nil, errors.New("needs the discordant counts as n12:n21")
	}
	x, err := parseCount(a)
	if err != nil {
		return nil, err
	}
	y, err := parseCount(b)
	if err != nil {
		return nil, err
	}
	return []int64{x, y}, nil
}

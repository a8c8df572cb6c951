package repl

import (
	"io"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// block is one compact output block: a title line, aligned label/value
// rows, and warnings.
type block struct {
	Title    string
	rows     [][3]string
	warnings []string
}

// Row adds a labelled value with an optional note printed after it.
func (b *block) Row(label, value string, note ...string) *block {
	b.rows = append(b.rows, [3]string{label, value, strings.Join(note, " ")})
	return b
}

// Warn adds warnings, printed after the rows.
func (b *block) Warn(ws ...string) *block {
	b.warnings = append(b.warnings, ws...)
	return b
}

// render writes the block: the title, then rows indented by two spaces
// with labels and values padded to common widths.
func (b *block) render(w io.Writer) {
	var sb strings.Builder
	if b.Title != "" {
		sb.WriteString(b.Title)
		sb.WriteByte('\n')
	}
	lw, vw := 0, 0
	for _, r := range b.rows {
		lw = max(lw, utf8.RuneCountInString(r[0]))
		if r[2] != "" {
			vw = max(vw, utf8.RuneCountInString(r[1]))
		}
	}
	for _, r := range b.rows {
		sb.WriteString("  ")
		sb.WriteString(pad(r[0], lw))
		sb.WriteString("  ")
		if r[2] == "" {
			sb.WriteString(r[1])
		} else {
			sb.WriteString(pad(r[1], vw))
			sb.WriteString("  ")
			sb.WriteString(r[2])
		}
		sb.WriteByte('\n')
	}
	for _, wn := range b.warnings {
		sb.WriteString("  warning: ")
		sb.WriteString(wn)
		sb.WriteByte('\n')
	}
	io.WriteString(w, safeText(sb.String(), true))
}

// pad right-pads s with blanks to width runes.
func pad(s string, width int) string {
	if n := utf8.RuneCountInString(s); n < width {
		return s + strings.Repeat(" ", width-n)
	}
	return s
}

// num formats x with the session's significant digits: fixed notation
// between 1e-4 and 1e15, scientific outside; trailing zeros are kept so
// that bounds line up. Digits are true: a value that is not 1 never
// prints as 1 (0.999999 stays 0.999999, and one too close to 1 for 15
// digits reads "1 - 1.1e-16"), exactly 1 prints as "1", and an undefined
// value (NaN) reads "undefined".
func (s *Session) num(x float64) string { return formatNum(x, s.Set.Digits) }

// numFine formats a value that the reader compares with a whole number
// next to it (an unrounded sample size): at least two decimals, so
// 8733.49 does not print as 8733 under n = 8734.
func (s *Session) numFine(x float64) string {
	if math.Abs(x) < 1e12 && x != math.Trunc(x) {
		return formatNum(x, max(s.Set.Digits, int(math.Floor(math.Log10(math.Abs(x))))+3))
	}
	return s.num(x)
}

func formatNum(x float64, digits int) string {
	switch {
	case math.IsNaN(x):
		return "undefined"
	case math.IsInf(x, 1):
		return "+Inf"
	case math.IsInf(x, -1):
		return "-Inf"
	case x == 0:
		return "0"
	case x == 1 || x == -1:
		return strconv.FormatFloat(x, 'f', 0, 64)
	}
	out := formatDigits(x, digits)
	if a := math.Abs(x); a > 0.5 && a < 1 {
		// Never show a value below 1 as 1.000.
		for d := digits + 1; d <= 15 && (out == "1" || strings.TrimRight(strings.TrimLeft(out, "-"), "0") == "1."); d++ {
			out = formatDigits(x, d)
		}
		if v, _ := strconv.ParseFloat(out, 64); math.Abs(v) == 1 {
			sign := ""
			if x < 0 {
				sign = "-"
			}
			return sign + "1 - " + strconv.FormatFloat(1-a, 'g', 2, 64)
		}
	}
	return out
}

// formatDigits formats x with the given significant digits (see num).
func formatDigits(x float64, digits int) string {
	e := int(math.Floor(math.Log10(math.Abs(x))))
	if e >= -4 && e < 15 {
		dec := max(0, digits-1-e)
		out := strconv.FormatFloat(x, 'f', dec, 64)
		// rounding may carry into a new digit (0.99996 -> 1.0000): drop one.
		if dec > 0 && strings.TrimLeft(out, "-0.") != "" && len(strings.TrimLeft(strings.ReplaceAll(out, ".", ""), "-0")) > digits {
			out = strconv.FormatFloat(x, 'f', dec-1, 64)
		}
		return out
	}
	out := strconv.FormatFloat(x, 'e', digits-1, 64)
	mant, exp, _ := strings.Cut(out, "e")
	ev, _ := strconv.Atoi(exp)
	return mant + "e" + strconv.Itoa(ev)
}

// logNum formats a probability given by its natural log: as a number while
// it is representable (above 1e-300), else as a power of ten, so a tail of
// e^-12345 reads "10^-5361.3".
func (s *Session) logNum(lp float64) string {
	if math.IsInf(lp, -1) {
		return "0"
	}
	if lp > -690 {
		return s.num(math.Exp(lp))
	}
	return "10^" + strconv.FormatFloat(lp/math.Ln10, 'f', 1, 64)
}

// pct formats a level as a percentage: 0.95 -> "95%".
func pct(x float64) string {
	return strconv.FormatFloat(100*x, 'g', 10, 64) + "%"
}

// count formats a whole number.
func count(n int64) string { return strconv.FormatInt(n, 10) }

// kn formats a count pair.
func kn(k, n int64) string { return count(k) + "/" + count(n) }

// in formats an input value the way a user would write it (shortest
// round-trip form).
func in(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }

// stat formats a test statistic: whole numbers plainly (a count), others
// with the session's digits.
func (s *Session) stat(x float64) string {
	if x == math.Trunc(x) && math.Abs(x) < 1e15 {
		return strconv.FormatInt(int64(x), 10)
	}
	return s.num(x)
}

// complement returns 1 - x rounded to 12 significant digits, so that the
// alpha of a 95% level prints as 0.05, not 0.050000000000000044.
func complement(x float64) float64 {
	v, _ := strconv.ParseFloat(strconv.FormatFloat(1-x, 'g', 12, 64), 64)
	return v
}

// numApart formats x with the session's digits, or with more when those
// would print x equal to ref although it differs (0.94996 against 0.95).
func (s *Session) numApart(x, ref float64) string {
	for d := s.Set.Digits; d < 17; d++ {
		if x == ref || formatNum(x, d) != formatNum(ref, d) {
			return formatNum(x, d)
		}
	}
	return formatNum(x, 17)
}

// axisNum formats a plot's axis label: like num, but a round value keeps
// its decimals ("1.0" beside "0.95") so labels line up.
func axisNum(x float64, digits int) string {
	if x == 0 || math.IsNaN(x) || math.IsInf(x, 0) {
		return formatNum(x, digits)
	}
	return formatDigits(x, digits)
}

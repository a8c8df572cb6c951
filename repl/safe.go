package repl

import (
	"fmt"
	"strconv"
	"strings"
	"unicode/utf8"
)

// safeText returns s with every control character (C0 but for the line
// breaks kept by keepNewlines, DEL, C1), every bidirectional-override
// character and every byte of invalid UTF-8 written as a Go escape
// (\x1b, \u202e), so text derived from input cannot move the cursor,
// clear the screen or retitle the terminal when shown.
func safeText(s string, keepNewlines bool) string {
	if !needsEscape(s, keepNewlines) {
		return s
	}
	var sb strings.Builder
	for i := 0; i < len(s); {
		r, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && size == 1:
			sb.WriteString(`\x` + strconv.FormatUint(uint64(s[i])|0x100, 16)[1:])
		case r == '\n' && keepNewlines:
			sb.WriteByte('\n')
		case unsafeRune(r):
			q := strconv.QuoteRuneToASCII(r)
			sb.WriteString(q[1 : len(q)-1])
		default:
			sb.WriteString(s[i : i+size])
		}
		i += size
	}
	return sb.String()
}

// needsEscape reports whether safeText would change s.
func needsEscape(s string, keepNewlines bool) bool {
	for i := 0; i < len(s); {
		r, size := utf8.DecodeRuneInString(s[i:])
		if r == utf8.RuneError && size == 1 || unsafeRune(r) && !(r == '\n' && keepNewlines) {
			return true
		}
		i += size
	}
	return false
}

// unsafeRune reports whether r can change the terminal's state or the
// reading order of the line.
func unsafeRune(r rune) bool {
	return r < 0x20 || r == 0x7f || r >= 0x80 && r < 0xa0 ||
		r >= 0x202a && r <= 0x202e || r >= 0x2066 && r <= 0x2069 || r == 0x200e || r == 0x200f
}

// shortToken shortens a long token for an error message: its first and
// last 24 characters around the number of characters left out.
func shortToken(tok string) string {
	const keep = 24
	if utf8.RuneCountInString(tok) <= 3*keep {
		return tok
	}
	r := []rune(tok)
	return string(r[:keep]) + "…(" + strconv.Itoa(len(r)-2*keep) + " more characters)…" + string(r[len(r)-keep:])
}

// shellMessage is the one-line text of a failed command's error: package
// errors put in the shell's words (see shellWords), line breaks as
// blanks, long words shortened and control characters escaped.
func shellMessage(t *table, verb string, err error) string {
	return safeText(shortenWords(shellError(t, verb, err)), false)
}

// jsonSafe escapes, as \uXXXX, the runes that encoding/json leaves raw
// but a terminal acts on (DEL, C1 controls, bidirectional overrides).
// They can only stand inside JSON strings, so the result is the same JSON
// value, safe to show.
func jsonSafe(b []byte) []byte {
	if !needsEscape(string(b), true) {
		return b
	}
	var out []byte
	for _, r := range string(b) {
		if unsafeRune(r) && r >= 0x20 {
			out = fmt.Appendf(out, `\u%04x`, r)
			continue
		}
		out = utf8.AppendRune(out, r)
	}
	return out
}

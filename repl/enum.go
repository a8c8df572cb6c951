package repl

import (
	"fmt"
	"strings"
)

// methodWord turns a package method name into a shell word: lowercase,
// blanks as hyphens ("Blaker mid-p" -> "blaker-mid-p").
func methodWord(name string) string {
	return strings.ToLower(strings.ReplaceAll(strings.TrimSpace(name), " ", "-"))
}

// enumWords lists the shell words of an enum's values 0, 1, 2, ... as
// long as String() gives a name (the packages print "Type(n)" past the
// last value). The first word is the zero value, the package default.
func enumWords[T ~int](name func(T) string) []string {
	var out []string
	for i := 0; i < 64; i++ {
		s := name(T(i))
		if strings.Contains(s, "(") && strings.HasSuffix(s, ")") && strings.Contains(s, fmt.Sprint(i)) {
			break
		}
		out = append(out, methodWord(s))
	}
	return out
}

// enumValue returns the enum value whose shell word is word (words come
// from enumWords, so the index is the value).
func enumValue[T ~int](words []string, word string) T {
	for i, w := range words {
		if w == word {
			return T(i)
		}
	}
	return 0
}

// sideWords are the values of side=: the direction of the claim.
var sideWords = []string{"two", "high", "low"}

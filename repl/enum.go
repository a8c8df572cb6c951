package repl

import "strings"

// methodWord turns a package method name into a shell word: lowercase,
// blanks as hyphens ("Blaker mid-p" -> "blaker-mid-p").
func methodWord(name string) string {
	return strings.ToLower(strings.ReplaceAll(strings.TrimSpace(name), " ", "-"))
}

// enumWords lists the shell words of an enum's values, from the package's
// list of values (values[i] is the value i, so the index is the value).
// The first word is the zero value, the package default.
func enumWords[T ~int](values []T, name func(T) string) []string {
	out := make([]string, len(values))
	for i, v := range values {
		out[i] = methodWord(name(v))
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

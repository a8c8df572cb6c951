package test

import (
	"fmt"
	"strings"

	"github.com/kofnlab/kofn/internal/argerr"
)

// enumName returns names[i], or "typ(i)" for a value outside the enum.
func enumName(i int, names []string, typ string) string {
	if i < 0 || i >= len(names) {
		return fmt.Sprintf("%s(%d)", typ, i)
	}
	return names[i]
}

// parseEnum returns the index of the name equal to s ignoring case and
// surrounding space, also without the given prefix; otherwise an error of
// function fn listing the names.
func parseEnum(fn, s string, names []string, prefix, what string) (int, error) {
	t := strings.TrimSpace(s)
	for i, name := range names {
		if strings.EqualFold(t, name) || prefix != "" && strings.EqualFold(t, strings.TrimPrefix(name, prefix)) {
			return i, nil
		}
	}
	return 0, argerr.Invalid(fn, "s", s, "is not "+what+"; use one of "+strings.Join(names, ", "))
}

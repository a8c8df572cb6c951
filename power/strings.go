package power

import "strings"

// equalFold compares a user-typed name with a canonical one, ignoring case
// and surrounding space.
func equalFold(s, name string) bool { return strings.EqualFold(strings.TrimSpace(s), name) }

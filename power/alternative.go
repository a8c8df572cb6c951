package power

import "github.com/kofnlab/kofn/test"

// checkAlternative validates the Alternative option of fn; the type is
// test.Alternative, so one value serves both the plan and the analysis it
// plans for.
func checkAlternative(fn string, a test.Alternative) error { return a.Check(fn, "Alternative") }

package power

import "github.com/kofnlab/kofn/internal/argerr"

// ExactTest selects the two-sample test whose exact power is enumerated.
// The zero value, Fisher, is the default because it is the exact test most
// protocols name; Barnard's unconditional test is more powerful at the
// same level and costs far more to evaluate.
type ExactTest int

const (
	// Fisher is Fisher's exact conditional test.
	Fisher ExactTest = iota
	// Barnard is Barnard's exact unconditional test (pooled z statistic,
	// p-value maximized over the nuisance proportion).
	Barnard
	// ZPooled is the asymptotic pooled z test (the chi-square test without
	// continuity correction), whose exact power and size are enumerated.
	ZPooled
)

var exactTestNames = [...]string{"fisher", "barnard", "z"}

// String returns "fisher", "barnard" or "z".
func (t ExactTest) String() string {
	if t < 0 || int(t) >= len(exactTestNames) {
		return "ExactTest(" + argerr.Format(int(t)) + ")"
	}
	return exactTestNames[t]
}

// ParseExactTest converts "fisher", "barnard" or "z" (case insensitive).
func ParseExactTest(s string) (ExactTest, error) {
	for i, n := range exactTestNames {
		if equalFold(s, n) {
			return ExactTest(i), nil
		}
	}
	return 0, argerr.Invalid("power.ParseExactTest", "s", s, `is not a test; use "fisher", "barnard" or "z"`)
}

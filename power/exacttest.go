package power

import "github.com/kofnlab/kofn/internal/enum"

// ExactTest selects the two-sample test whose exact power is enumerated.
// The zero value, FisherExactTest, is the default because it is the exact
// test most protocols name; Barnard's unconditional test is more powerful
// at the same level and costs far more to evaluate.
type ExactTest int

const (
	// FisherExactTest is Fisher's exact conditional test (test.Fisher,
	// two-sided by the point-probability rule).
	FisherExactTest ExactTest = iota
	// BarnardExactTest is Barnard's exact unconditional test
	// (test.Barnard: pooled z statistic, p-value maximized over the
	// nuisance proportion).
	BarnardExactTest
	// ZPooledTest is the asymptotic pooled z test (test.TwoSample with
	// test.ZPooled, the chi-square test without continuity correction),
	// whose exact power and size are enumerated.
	ZPooledTest
)

var exactTestNames = enum.New[ExactTest]("power.ExactTest", []string{"fisher", "barnard", "z-pooled"},
	map[string]ExactTest{"z": ZPooledTest})

// String returns "fisher", "barnard" or "z-pooled".
func (t ExactTest) String() string { return exactTestNames.String(t) }

// MarshalText encodes the test by its String form.
func (t ExactTest) MarshalText() ([]byte, error) { return exactTestNames.MarshalText(t) }

// UnmarshalText decodes any spelling ParseExactTest accepts.
func (t *ExactTest) UnmarshalText(b []byte) error { return exactTestNames.UnmarshalText(t, b) }

// ParseExactTest converts "fisher", "barnard" or "z-pooled" (also "z"),
// ignoring case.
func ParseExactTest(s string) (ExactTest, error) {
	return exactTestNames.Parse("power.ParseExactTest", s)
}

// ExactTestValues lists the tests in order.
func ExactTestValues() []ExactTest { return exactTestNames.Values() }

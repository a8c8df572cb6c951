package power

import "github.com/kofnlab/kofn/internal/jsonfloat"

// NormalSize is a sample size from a normal-approximation formula.
type NormalSize struct {
	// Method names the formula, for example "Fleiss (pooled null variance)
	// with Casagrande-Pike-Smith correction".
	Method string `json:"method"`
	// N is the sample size (per group n1 for two samples, pairs for a
	// paired design), Real rounded up.
	N int64 `json:"n"`
	// N2 is the size of the second group, ceil(Ratio * Real) (two samples
	// only; 0 otherwise).
	N2 int64 `json:"n2,omitempty"`
	// Real is the unrounded size the formula gives (after any continuity
	// correction).
	Real float64 `json:"real"`
	// Uncorrected is the unrounded size before a continuity correction;
	// equal to Real when none was applied.
	Uncorrected float64 `json:"uncorrected"`
	// Power is the approximate power at N by the same approximation; 0,
	// and omitted from JSON, where the formula is not a test's (the
	// margin-of-error sizes).
	Power float64 `json:"power,omitempty"`
	// Warnings lists caveats that do not stop the answer.
	Warnings []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the result with non-finite floats as strings.
func (r NormalSize) MarshalJSON() ([]byte, error) {
	type plain NormalSize
	return jsonfloat.Marshal(plain(r))
}

// UnmarshalJSON decodes what MarshalJSON writes, non-finite numbers
// included.
func (r *NormalSize) UnmarshalJSON(b []byte) error {
	type plain NormalSize
	return jsonfloat.Unmarshal(b, (*plain)(r))
}

// Point is one point of a curve: power (or another probability) y at x.
type Point struct {
	X float64 `json:"x"`
	Y float64 `json:"y"`
}

// MarshalJSON encodes the point with non-finite floats as strings.
func (p Point) MarshalJSON() ([]byte, error) {
	type plain Point
	return jsonfloat.Marshal(plain(p))
}

// UnmarshalJSON decodes what MarshalJSON writes, non-finite numbers
// included.
func (p *Point) UnmarshalJSON(b []byte) error {
	type plain Point
	return jsonfloat.Unmarshal(b, (*plain)(p))
}

// smallSampleWarning is added when a normal-approximation size is small
// enough that the exact calculation should be preferred.
const smallSampleWarning = "normal approximation at a small sample size: check with the exact power"

package interval

import (
	"math"

	"github.com/kofnlab/kofn/internal/enum"

	"github.com/kofnlab/kofn/internal/score"
)

// RatioMethod selects how an interval for the ratio p1/p2 (relative risk)
// of two independent proportions is computed. The zero value is
// RatioKoopman, the score interval, which keeps coverage near the nominal
// level down to small samples and handles zero counts without adjustment;
// Fagerland, Lydersen and Laake (2015) recommend it (recalled).
type RatioMethod int

const (
	// RatioKoopman inverts the score test with the restricted variance
	// (Koopman 1984, "Confidence intervals for the ratio of two binomial
	// proportions", Biometrics 40:513-517).
	RatioKoopman RatioMethod = iota
	// RatioKatz is the Wald interval on the log scale,
	// ln(p1/p2) +- z sqrt(1/k1 - 1/n1 + 1/k2 - 1/n2) (Katz et al. 1978).
	// With a zero count it is undefined; the adjusted log interval is used
	// then, with a warning.
	RatioKatz
	// RatioAdjustedLog is the log-scale Wald interval after adding 1/2 to
	// each count and each n (Walter 1975, Biometrika 62:371-374; recalled).
	RatioAdjustedLog
	// RatioMiettinenNurminen inverts the score test with the restricted
	// variance times N/(N-1) (Miettinen and Nurminen 1985).
	RatioMiettinenNurminen
	numRatioMethods
)

var ratioMethodNames = []string{
	RatioKoopman:           "Koopman",
	RatioKatz:              "Katz log",
	RatioAdjustedLog:       "adjusted log",
	RatioMiettinenNurminen: "Miettinen-Nurminen",
}

// String returns the published name of the method.
func (m RatioMethod) String() string { return ratioMethodNamesSet.String(m) }

// MarshalText encodes the method by its published name.
func (m RatioMethod) MarshalText() ([]byte, error) { return ratioMethodNamesSet.MarshalText(m) }

// UnmarshalText decodes any spelling ParseRatioMethod accepts.
func (m *RatioMethod) UnmarshalText(b []byte) error { return ratioMethodNamesSet.UnmarshalText(m, b) }

// RatioMethodValues lists the methods in order.
func RatioMethodValues() []RatioMethod { return ratioMethodNamesSet.Values() }

// ParseRatioMethod returns the method whose published name matches s
// case-insensitively; "katz", "score" (Koopman) and "mn" are accepted too.
func ParseRatioMethod(s string) (RatioMethod, error) {
	return ratioMethodNamesSet.Parse("interval.ParseRatioMethod", s)
}

var ratioMethodNamesSet = enum.New[RatioMethod]("interval.RatioMethod", ratioMethodNames, map[string]RatioMethod{
	"katz": RatioKatz, "score": RatioKoopman, "mn": RatioMiettinenNurminen, "log": RatioKatz,
})

// RatioOptions configures Ratio. The zero value asks for a two-sided 95%
// Koopman score interval.
type RatioOptions struct {
	Level  float64     // confidence level in (0, 1); 0 means 0.95
	Method RatioMethod // the zero value is RatioKoopman
	Side   Side        // two-sided (zero value) or one bound
}

// Ratio returns a confidence interval for p1/p2 from k1 of n1 and k2 of n2,
// independent, with Estimate (k1/n1)/(k2/n2).
//
// Special cases: k2 = 0 makes the estimate +Inf (k1 > 0) or undefined (NaN,
// k1 = 0, with a warning) and the score upper limit +Inf; k1 = 0 makes the
// score lower limit 0. The score limits are found by Brent's method on the
// log scale to 1e-15 relative and checked by inversion in the tests.
// One-sided bounds leave the other limit at 0 or +Inf.
//
// Errors: as Difference.
func Ratio(k1, n1, k2, n2 int64, opt RatioOptions) (Interval, error) {
	const fn = "interval.Ratio"
	d, lv, err := setupTwoSample(fn, k1, n1, k2, n2, opt.Level, opt.Side, int(opt.Method), int(numRatioMethods))
	if err != nil {
		return Interval{}, err
	}
	iv := Interval{Estimate: d.p1 / d.p2, Level: lv.level, Side: lv.side, Method: opt.Method.String(), Parameter: "p1 / p2"}
	if k1 == 0 && k2 == 0 {
		iv.Estimate = math.NaN()
		iv.warn("estimate undefined: both counts are 0")
	}
	z := lv.z
	m := opt.Method
	if m == RatioKatz && (k1 == 0 || k2 == 0) {
		m = RatioAdjustedLog
		iv.warn("Katz log: undefined with a zero count; the adjusted log interval (1/2 added to counts and n) is used")
	}
	switch m {
	case RatioKatz, RatioAdjustedLog:
		a1, b1, a2, b2 := float64(k1), float64(n1), float64(k2), float64(n2)
		if m == RatioAdjustedLog {
			a1, b1, a2, b2 = a1+0.5, b1+0.5, a2+0.5, b2+0.5
		}
		c := math.Log(a1/b1) - math.Log(a2/b2)
		h := z * math.Sqrt(1/a1-1/b1+1/a2-1/b2)
		iv.Lower, iv.Upper = math.Exp(c-h), math.Exp(c+h)
	case RatioKoopman, RatioMiettinenNurminen:
		v := score.MiettinenNurminen
		if m == RatioKoopman {
			v = score.FarringtonManning
		}
		zf := func(rho float64) float64 { return score.RatioZ(k1, n1, k2, n2, rho, v) }
		guess := ((float64(k1) + 0.5) / float64(n1)) / ((float64(k2) + 0.5) / float64(n2))
		if lv.wantLower() {
			iv.Lower = logScaleRoot(func(x float64) float64 { return z - zf(x) }, guess)
		}
		if lv.wantUpper() {
			iv.Upper = logScaleRoot(func(x float64) float64 { return -z - zf(x) }, guess)
		}
	}
	iv.sided(0, math.Inf(1))
	return iv, nil
}

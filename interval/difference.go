package interval

import (
	"math"

	"github.com/kofnlab/kofn/internal/enum"

	"github.com/kofnlab/kofn/internal/score"
)

// DiffMethod selects how an interval for the difference p1 - p2 of two
// independent proportions is computed. The zero value is DiffNewcombe,
// the hybrid score interval that Newcombe (1998, difference) found to
// combine coverage near the nominal level with closed form and no
// aberrations, and that Fagerland, Lydersen and Laake (2015, "Recommended
// confidence intervals for two independent binomial proportions",
// Statistical Methods in Medical Research 24:224-254) recommend for
// general use (recalled).
type DiffMethod int

const (
	// DiffNewcombe is Newcombe's (1998) hybrid score interval (his method
	// 10): the Wilson limits (l_i, u_i) of each proportion combined as
	// d - sqrt((p1-l1)^2 + (u2-p2)^2), d + sqrt((u1-p1)^2 + (p2-l2)^2).
	DiffNewcombe DiffMethod = iota
	// DiffWald is d +- z sqrt(p1(1-p1)/n1 + p2(1-p2)/n2) (Newcombe's method 1).
	DiffWald
	// DiffWaldCC widens the Wald interval by (1/n1 + 1/n2)/2 (method 2).
	DiffWaldCC
	// DiffAgrestiCaffo is the Wald interval after adding one success and
	// one failure to each sample (Agresti and Caffo 2000).
	DiffAgrestiCaffo
	// DiffNewcombeCC is the hybrid interval built from continuity-corrected
	// Wilson limits (Newcombe's method 11).
	DiffNewcombeCC
	// DiffMee inverts the score test with the restricted variance
	// (Mee 1984; Newcombe's method 5).
	DiffMee
	// DiffMiettinenNurminen inverts the score test with the restricted
	// variance times N/(N-1) (Miettinen and Nurminen 1985; method 6).
	DiffMiettinenNurminen
	numDiffMethods
)

var diffMethodNames = []string{
	DiffNewcombe:          "Newcombe hybrid score",
	DiffWald:              "Wald",
	DiffWaldCC:            "Wald with continuity correction",
	DiffAgrestiCaffo:      "Agresti-Caffo",
	DiffNewcombeCC:        "Newcombe hybrid score with continuity correction",
	DiffMee:               "Mee",
	DiffMiettinenNurminen: "Miettinen-Nurminen",
}

// String returns the published name of the method.
func (m DiffMethod) String() string { return diffMethodNamesSet.String(m) }

// MarshalText encodes the method by its published name.
func (m DiffMethod) MarshalText() ([]byte, error) { return diffMethodNamesSet.MarshalText(m) }

// UnmarshalText decodes any spelling ParseDiffMethod accepts.
func (m *DiffMethod) UnmarshalText(b []byte) error { return diffMethodNamesSet.UnmarshalText(m, b) }

// DiffMethodValues lists the methods in order.
func DiffMethodValues() []DiffMethod { return diffMethodNamesSet.Values() }

// ParseDiffMethod returns the method whose published name matches s
// case-insensitively; "newcombe", "newcombe-cc", "mn" and "score" (for
// Miettinen-Nurminen) are accepted too.
func ParseDiffMethod(s string) (DiffMethod, error) {
	return diffMethodNamesSet.Parse("interval.ParseDiffMethod", s)
}

var diffMethodNamesSet = enum.New[DiffMethod]("interval.DiffMethod", diffMethodNames, map[string]DiffMethod{
	"newcombe": DiffNewcombe, "newcombe-cc": DiffNewcombeCC, "mn": DiffMiettinenNurminen,
	"score": DiffMiettinenNurminen, "wald-cc": DiffWaldCC,
})

// DiffOptions configures Difference. The zero value asks for a two-sided
// 95% Newcombe hybrid score interval.
type DiffOptions struct {
	Level  float64    // confidence level in (0, 1); 0 means 0.95
	Method DiffMethod // the zero value is DiffNewcombe
	Side   Side       // two-sided (zero value) or one bound
}

// Difference returns a confidence interval for p1 - p2 from k1 successes
// in n1 trials and k2 in n2, independent, with Estimate k1/n1 - k2/n2.
//
// Wald, Wald with cc and Agresti-Caffo limits outside [-1, 1] are clipped
// (Clipped, with a warning); the other methods stay inside. The score
// limits (Mee, Miettinen-Nurminen) are found by Brent's method to 1e-15
// relative (1e-20 absolute near 0) and are checked by inversion in the
// tests: at each limit the score statistic equals z. One-sided bounds use
// z at tail 1 - Level; the missing limit is -1 or 1.
//
// Errors: a count pair with k < 0, k > n, n = 0 or n > 2^53, a Level outside
// (0, 1), or an unknown Method or Side.
func Difference(k1, n1, k2, n2 int64, opt DiffOptions) (Interval, error) {
	const fn = "interval.Difference"
	d, lv, err := setupTwoSample(fn, k1, n1, k2, n2, opt.Level, opt.Side, int(opt.Method), int(numDiffMethods))
	if err != nil {
		return Interval{}, err
	}
	est := d.p1 - d.p2
	iv := Interval{Estimate: est, Level: lv.level, Side: lv.side, Method: opt.Method.String(), Parameter: "p1 - p2"}
	z := lv.z
	switch opt.Method {
	case DiffNewcombe, DiffNewcombeCC:
		lower, upper := wilsonLower, wilsonUpper
		if opt.Method == DiffNewcombeCC {
			lower, upper = wilsonCCLower, wilsonCCUpper
		}
		l1, u1 := lower(k1, n1, z), upper(k1, n1, z)
		l2, u2 := lower(k2, n2, z), upper(k2, n2, z)
		iv.Lower = est - math.Hypot(d.p1-l1, u2-d.p2)
		iv.Upper = est + math.Hypot(u1-d.p1, d.p2-l2)
	case DiffWald, DiffWaldCC, DiffAgrestiCaffo:
		f1, f2 := float64(n1), float64(n2)
		c, v, cc := est, d.p1*(1-d.p1)/f1+d.p2*(1-d.p2)/f2, 0.0
		switch opt.Method {
		case DiffWaldCC:
			cc = 0.5 * (1/f1 + 1/f2)
		case DiffAgrestiCaffo:
			q1, q2 := (float64(k1)+1)/(f1+2), (float64(k2)+1)/(f2+2)
			c, v = q1-q2, q1*(1-q1)/(f1+2)+q2*(1-q2)/(f2+2)
		}
		h := z*math.Sqrt(v) + cc
		iv.Lower, iv.Upper = c-h, c+h
		if v == 0 && opt.Method != DiffAgrestiCaffo {
			// Both samples are all successes or all failures: the
			// estimated variance is 0 and the interval has no width
			// beyond the continuity correction.
			iv.warn(opt.Method.String() + ": estimated variance 0 (each sample is all successes or all failures); the interval's width is only the continuity correction, if any: use the Newcombe or a score method")
		}
		iv.sided(-1, 1)
		iv.clipRange(-1, 1)
	case DiffMee, DiffMiettinenNurminen:
		v := score.MiettinenNurminen
		if opt.Method == DiffMee {
			v = score.FarringtonManning
		}
		zf := func(delta float64) float64 { return score.DiffZ(k1, n1, k2, n2, delta, v) }
		if lv.wantLower() {
			iv.Lower = rootIncreasing(func(x float64) float64 { return z - zf(x) }, -1, est, 1e-20)
		}
		if lv.wantUpper() {
			iv.Upper = rootIncreasing(func(x float64) float64 { return -z - zf(x) }, est, 1, 1e-20)
		}
	}
	iv.sided(-1, 1)
	return iv, nil
}

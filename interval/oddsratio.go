package interval

import (
	"math"

	"github.com/kofnlab/kofn/internal/enum"

	"github.com/kofnlab/kofn/internal/score"
)

// OddsMethod selects how an interval for the odds ratio
// [p1/(1-p1)] / [p2/(1-p2)] of two independent proportions is computed.
// The zero value is OddsMiettinenNurminen, the score interval, which keeps
// coverage near the nominal level without adjusting zero cells (Miettinen
// and Nurminen 1985); use OddsCornfield where coverage must never fall
// below the level, or OddsCornfieldMidP for its less conservative mid-p
// version.
type OddsMethod int

const (
	// OddsMiettinenNurminen inverts the score test for the odds ratio with
	// the restricted variance times N/(N-1) (Miettinen and Nurminen 1985).
	OddsMiettinenNurminen OddsMethod = iota
	// OddsWoolf is the Wald interval on the log scale,
	// ln(ad/bc) +- z sqrt(1/a + 1/b + 1/c + 1/d) (Woolf 1955), with 1/2
	// added to every cell when one is 0 (Haldane 1956), with a warning.
	OddsWoolf
	// OddsCornfield is the exact conditional interval (Cornfield 1956):
	// the odds ratios at which the observed count is in the tail of
	// Fisher's noncentral hypergeometric distribution given the margins.
	OddsCornfield
	// OddsCornfieldMidP is the mid-p version of the exact conditional
	// interval (half the probability of the observed table in each tail).
	OddsCornfieldMidP
	numOddsMethods
)

var oddsMethodNames = []string{
	OddsMiettinenNurminen: "Miettinen-Nurminen",
	OddsWoolf:             "Woolf logit",
	OddsCornfield:         "Cornfield exact conditional",
	OddsCornfieldMidP:     "Cornfield mid-p",
}

// String returns the published name of the method.
func (m OddsMethod) String() string { return oddsMethodNamesSet.String(m) }

// MarshalText encodes the method by its published name.
func (m OddsMethod) MarshalText() ([]byte, error) { return oddsMethodNamesSet.MarshalText(m) }

// UnmarshalText decodes any spelling ParseOddsMethod accepts.
func (m *OddsMethod) UnmarshalText(b []byte) error { return oddsMethodNamesSet.UnmarshalText(m, b) }

// OddsMethodValues lists the methods in order.
func OddsMethodValues() []OddsMethod { return oddsMethodNamesSet.Values() }

// ParseOddsMethod returns the method whose published name matches s
// case-insensitively; "woolf", "logit", "mn", "score", "exact",
// "cornfield" and "mid-p" are accepted too.
func ParseOddsMethod(s string) (OddsMethod, error) {
	return oddsMethodNamesSet.Parse("interval.ParseOddsMethod", s)
}

var oddsMethodNamesSet = enum.New[OddsMethod]("interval.OddsMethod", oddsMethodNames, map[string]OddsMethod{
	"woolf": OddsWoolf, "logit": OddsWoolf, "mn": OddsMiettinenNurminen, "score": OddsMiettinenNurminen,
	"exact": OddsCornfield, "cornfield": OddsCornfield, "mid-p": OddsCornfieldMidP, "midp": OddsCornfieldMidP,
})

// OddsOptions configures OddsRatio. The zero value asks for a two-sided
// 95% Miettinen-Nurminen score interval.
type OddsOptions struct {
	Level  float64    // confidence level in (0, 1); 0 means 0.95
	Method OddsMethod // the zero value is OddsMiettinenNurminen
	Side   Side       // two-sided (zero value) or one bound
}

// OddsRatio returns a confidence interval for the odds ratio of p1 and p2
// from k1 of n1 and k2 of n2, independent. The table is
//
//	a = k1, b = n1 - k1
//	c = k2, d = n2 - k2
//
// Estimate is the sample odds ratio ad/(bc) for the Woolf and score
// intervals (+Inf when bc = 0 < ad, NaN with a warning when ad = bc = 0),
// and the conditional maximum-likelihood estimate (see OddsRatioCMLE) for
// the Cornfield intervals.
//
// The score and exact limits are found by Brent's method on the log scale
// to 1e-15 relative and checked by inversion in the tests. A lower limit is
// 0 and an upper limit +Inf where the data allow any odds ratio that
// small or large (a zero cell). One-sided bounds leave the other limit at
// 0 or +Inf.
//
// Errors: as Difference; for the Cornfield intervals also ErrTooLarge
// beyond MaxConditionalStdDev (all four cells in the millions), where the
// error points to OddsMiettinenNurminen.
func OddsRatio(k1, n1, k2, n2 int64, opt OddsOptions) (Interval, error) {
	const fn = "interval.OddsRatio"
	_, lv, err := setupTwoSample(fn, k1, n1, k2, n2, opt.Level, opt.Side, int(opt.Method), int(numOddsMethods))
	if err != nil {
		return Interval{}, err
	}
	a, b, c, d := float64(k1), float64(n1-k1), float64(k2), float64(n2-k2)
	iv := Interval{Estimate: (a * d) / (b * c), Level: lv.level, Side: lv.side, Method: opt.Method.String(), Parameter: "odds ratio"}
	if a*d == 0 && b*c == 0 {
		iv.Estimate = math.NaN()
		iv.warn("estimate undefined: ad = bc = 0")
	}
	z := lv.z
	switch opt.Method {
	case OddsWoolf:
		if a == 0 || b == 0 || c == 0 || d == 0 {
			a, b, c, d = a+0.5, b+0.5, c+0.5, d+0.5
			iv.warn("Woolf logit: a cell is 0, so 1/2 was added to every cell (Haldane 1956)")
		}
		lc := math.Log(a) + math.Log(d) - math.Log(b) - math.Log(c)
		h := z * math.Sqrt(1/a+1/b+1/c+1/d)
		iv.Lower, iv.Upper = math.Exp(lc-h), math.Exp(lc+h)
	case OddsMiettinenNurminen:
		zf := func(psi float64) float64 { return score.OddsZ(k1, n1, k2, n2, psi, score.MiettinenNurminen) }
		guess := ((a + 0.5) * (d + 0.5)) / ((b + 0.5) * (c + 0.5))
		if lv.wantLower() {
			iv.Lower = logScaleRoot(func(x float64) float64 { return z - zf(x) }, guess)
		}
		if lv.wantUpper() {
			iv.Upper = logScaleRoot(func(x float64) float64 { return -z - zf(x) }, guess)
		}
	case OddsCornfield, OddsCornfieldMidP:
		if err := cornfield(&iv, k1, n1, k2, n2, lv, opt.Method == OddsCornfieldMidP); err != nil {
			return Interval{}, err
		}
	}
	iv.sided(0, math.Inf(1))
	return iv, nil
}

package power

import (
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/enum"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"gonum.org/v1/gonum/mathext"
)

// Spending is a family of Lan-DeMets error-spending functions: how much of
// a total error rate a (alpha for efficacy bounds, beta for futility
// bounds) a group-sequential design may have used by information fraction
// t in [0, 1]. The zero value, OBrienFleming, is the default because it
// spends almost nothing at early looks, so that the final analysis keeps
// nearly the level of a single-stage test, which is what most protocols
// choose.
type Spending int

const (
	// OBrienFleming is the O'Brien-Fleming type function of Lan and DeMets
	// (1983): a(t) = 2 - 2 Phi(z_{1 - a/2} / sqrt(t)).
	OBrienFleming Spending = iota
	// Pocock is the Pocock type function of Lan and DeMets (1983):
	// a(t) = a ln(1 + (e - 1) t).
	Pocock
	// PowerFamily is the power family of Kim and DeMets (1987):
	// a(t) = a t^Rho, Rho > 0 (Rho = 1 spends evenly, Rho = 3 is close to
	// O'Brien-Fleming).
	PowerFamily
)

var spendingNames = enum.New[Spending]("power.Spending", []string{"O'Brien-Fleming", "Pocock", "power family"},
	map[string]Spending{"obf": OBrienFleming, "obrien-fleming": OBrienFleming, "power": PowerFamily, "rho": PowerFamily,
		"kim-demets": PowerFamily})

// String returns "O'Brien-Fleming", "Pocock" or "power family".
func (s Spending) String() string { return spendingNames.String(s) }

// MarshalText encodes the family by its String form.
func (s Spending) MarshalText() ([]byte, error) { return spendingNames.MarshalText(s) }

// UnmarshalText decodes a name accepted by ParseSpending.
func (s *Spending) UnmarshalText(b []byte) error { return spendingNames.UnmarshalText(s, b) }

// ParseSpending accepts the String forms case-insensitively (with '_'
// and ' ' read as '-'), and "obf", "obrien-fleming", "power", "rho" and
// "kim-demets".
func ParseSpending(s string) (Spending, error) { return spendingNames.Parse("power.ParseSpending", s) }

// SpendingValues returns the spending families in order.
func SpendingValues() []Spending { return spendingNames.Values() }

// SpendingFunction is one error-spending function: a family and, for the
// power family, its exponent.
type SpendingFunction struct {
	Family Spending `json:"family"`
	// Rho is the exponent of the power family (> 0); ignored otherwise.
	Rho float64 `json:"rho,omitempty"`
}

// MarshalJSON encodes the function with non-finite floats as strings.
func (f SpendingFunction) MarshalJSON() ([]byte, error) {
	type plain SpendingFunction
	return jsonfloat.Marshal(plain(f))
}

// UnmarshalJSON decodes what MarshalJSON encodes.
func (f *SpendingFunction) UnmarshalJSON(b []byte) error {
	type plain SpendingFunction
	return jsonfloat.Unmarshal(b, (*plain)(f))
}

func (f SpendingFunction) check(fn, arg string) error {
	if err := spendingNames.Check(fn, arg+".Family", f.Family); err != nil {
		return err
	}
	if f.Family == PowerFamily && !(f.Rho > 0 && f.Rho <= 100) {
		return argerr.Invalid(fn, arg+".Rho", f.Rho, "must lie in (0, 100] for the power family")
	}
	return nil
}

// String names the function, for example "power family (rho = 2)".
func (f SpendingFunction) String() string {
	if f.Family == PowerFamily {
		return f.Family.String() + " (rho = " + argerr.Format(f.Rho) + ")"
	}
	return f.Family.String()
}

// Spent returns the error spent by information fraction t of total a:
// 0 at t <= 0, a at t >= 1, increasing in between (Lan KKG, DeMets DL
// (1983), Discrete sequential boundaries for clinical trials, Biometrika
// 70:659-663; Kim K, DeMets DL (1987), Design and analysis of group
// sequential tests based on the type I error spending rate function,
// Biometrika 74:149-154). The O'Brien-Fleming type uses the upper normal
// tail directly (2 Phi(-z/sqrt t)), so small early values keep their
// relative accuracy. It returns NaN when a is not in (0, 1), t is NaN or
// f is not a valid function (an unknown family, or Rho outside (0, 100]
// for the power family).
func (f SpendingFunction) Spent(a, t float64) float64 {
	if !(a > 0 && a < 1) || math.IsNaN(t) || f.check("", "f") != nil {
		return math.NaN()
	}
	if t <= 0 {
		return 0
	}
	if t >= 1 {
		return a
	}
	switch f.Family {
	case Pocock:
		return a * math.Log1p((math.E-1)*t)
	case PowerFamily:
		return a * math.Pow(t, f.Rho)
	default:
		z := -mathext.NormalQuantile(a / 2)
		return math.Min(a, math.Erfc(z/math.Sqrt(t)/math.Sqrt2))
	}
}

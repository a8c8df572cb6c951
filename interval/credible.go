package interval

import (
	"errors"
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/beta"
	"github.com/kofnlab/kofn/internal/enum"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/internal/xmath"
	"gonum.org/v1/gonum/mathext"
)

// Posterior summarises the Beta(A, B) posterior of a binomial proportion
// after K successes in N trials under Prior: A = Prior.A + K,
// B = Prior.B + N - K (Gelman A et al. (2013), Bayesian Data Analysis, 3rd
// ed., section 2.4).
type Posterior struct {
	Prior  Prior   `json:"prior"`  // the prior, with its shapes
	K      int64   `json:"k"`      // successes
	N      int64   `json:"n"`      // trials
	A      float64 `json:"a"`      // posterior first shape
	B      float64 `json:"b"`      // posterior second shape
	Mean   float64 `json:"mean"`   // A / (A + B)
	Median float64 `json:"median"` // the 1/2 quantile (solved, 1e-14 relative)
	// Mode is (A-1)/(A+B-2) when A, B > 1; 0 or 1 when the density is
	// monotone (A <= 1 < B or B <= 1 < A); omitted (HasMode false) for the
	// flat Beta(1, 1) and the U-shaped A, B < 1, which have no single mode.
	Mode     float64  `json:"mode,omitempty"`
	HasMode  bool     `json:"has_mode"`
	StdDev   float64  `json:"std_dev"` // sqrt(A B / ((A+B)^2 (A+B+1)))
	Warnings []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the posterior through jsonfloat.
func (p Posterior) MarshalJSON() ([]byte, error) {
	type plain Posterior
	return jsonfloat.Marshal(plain(p))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (p *Posterior) UnmarshalJSON(b []byte) error {
	type plain Posterior
	return jsonfloat.Unmarshal(b, (*plain)(p))
}

// NewPosterior returns the posterior of a proportion after k successes in
// n trials under prior (the zero Prior is Jeffreys). n = 0 is allowed (the
// posterior is the prior). Errors: k < 0, k > n, an invalid prior, or
// shapes beyond MaxShape (ErrTooLarge). Cost: one quantile solve (the
// median), a few incomplete beta evaluations.
func NewPosterior(k, n int64, prior Prior) (Posterior, error) {
	const fn = "interval.NewPosterior"
	r, a, b, err := prior.Update(fn, "k", "n", k, n)
	if err != nil {
		return Posterior{}, err
	}
	s := a + b
	p := Posterior{Prior: r, K: k, N: n, A: a, B: b, Mean: a / s,
		StdDev: math.Sqrt(a / s * (b / s) / (s + 1))}
	x, _ := beta.XY(beta.Quantile(a, b, -math.Ln2, false))
	p.Median = x
	switch {
	case a > 1 && b > 1:
		p.Mode, p.HasMode = (a-1)/(s-2), true
	case a <= 1 && b > 1:
		p.Mode, p.HasMode = 0, true
	case b <= 1 && a > 1:
		p.Mode, p.HasMode = 1, true
	}
	if n == 0 {
		p.Warnings = append(p.Warnings, "no trials: the posterior is the prior")
	}
	return p, nil
}

// ProbAbove returns P(p > c | data) and its natural logarithm for c in
// [0, 1], the upper tail of the Beta(A, B) posterior computed directly (a
// tail of 1e-300 is not the complement of a number near 1). Accuracy:
// about 1e-14 relative to max(1, |ln P|) (checked against mpmath at 40
// digits), except for c < 1e-3 with (A+B) c <= 1e5, where the upper tail
// is the complement of a positive series for the lower one and keeps about
// 2e-16 absolute (1e-13 relative at P = 1e-3; far smaller tails there are
// taken from the continued fraction when c >= 1e-3 only). Errors: c outside [0, 1] or NaN.
func (p Posterior) ProbAbove(c float64) (prob, logProb float64, err error) {
	if err := argerr.Prob("interval.Posterior.ProbAbove", "c", c); err != nil {
		return 0, 0, err
	}
	l := beta.LogUpper(p.A, p.B, c, 1-c)
	return math.Exp(l), l, nil
}

// Density returns the posterior density at x in [0, 1] (its limit, possibly
// +Inf, at an end), from the log-space Beta density (Loader's saddle-point
// prefactor); 0 outside [0, 1] and NaN for NaN.
func (p Posterior) Density(x float64) float64 {
	if math.IsNaN(x) {
		return math.NaN()
	}
	if x < 0 || x > 1 {
		return 0
	}
	return math.Exp(beta.LogPDF(p.A, p.B, x, 1-x))
}

// Quantile returns the posterior quantile at probability q in (0, 1): the
// x with P(p <= x | data) = q, solved as Credible's limits are (lower tail
// for q <= 1/2, upper tail beyond, so both ends keep full precision); 0
// for q <= 0, 1 for q >= 1, NaN for NaN.
func (p Posterior) Quantile(q float64) float64 {
	switch {
	case math.IsNaN(q):
		return math.NaN()
	case q <= 0:
		return 0
	case q >= 1:
		return 1
	case q <= 0.5:
		x, _ := beta.XY(beta.Quantile(p.A, p.B, math.Log(q), false))
		return x
	}
	x, _ := beta.XY(beta.Quantile(p.A, p.B, math.Log1p(-q), true))
	return x
}

// ProbBelow returns P(p <= c | data) and its logarithm, the lower tail,
// computed directly; see ProbAbove.
func (p Posterior) ProbBelow(c float64) (prob, logProb float64, err error) {
	if err := argerr.Prob("interval.Posterior.ProbBelow", "c", c); err != nil {
		return 0, 0, err
	}
	l := beta.LogCDF(p.A, p.B, c, 1-c)
	return math.Exp(l), l, nil
}

// CredibleKind selects the shape of a credible interval.
type CredibleKind int

const (
	// EqualTailed puts (1 - Level)/2 posterior probability below the lower
	// limit and as much above the upper. It is the zero value because it
	// always exists, is invariant under monotone transformations of p (the
	// interval for the odds is the transformed interval for p), and under
	// the Jeffreys prior it is the Jeffreys interval of Brown, Cai and
	// DasGupta (2001).
	EqualTailed CredibleKind = iota
	// HighestDensity is the highest posterior density (HPD) interval: the
	// shortest interval with posterior probability Level, whose ends have
	// equal posterior density (Box GEP, Tiao GC (1973), Bayesian Inference
	// in Statistical Analysis, section 2.8). It depends on the scale (p,
	// not the odds) and does not exist as one interval for a U-shaped
	// posterior.
	HighestDensity
)

var credibleKindNames = enum.New[CredibleKind]("interval.CredibleKind", []string{"equal-tailed", "highest density"},
	map[string]CredibleKind{"central": EqualTailed, "et": EqualTailed, "hpd": HighestDensity, "shortest": HighestDensity})

// String returns "equal-tailed" or "highest density".
func (k CredibleKind) String() string { return credibleKindNames.String(k) }

// MarshalText encodes the kind by its String form.
func (k CredibleKind) MarshalText() ([]byte, error) { return credibleKindNames.MarshalText(k) }

// UnmarshalText decodes a kind (ParseCredibleKind).
func (k *CredibleKind) UnmarshalText(b []byte) error { return credibleKindNames.UnmarshalText(k, b) }

// ParseCredibleKind accepts the String forms case-insensitively, and
// "central", "et", "hpd" and "shortest".
func ParseCredibleKind(s string) (CredibleKind, error) {
	return credibleKindNames.Parse("interval.ParseCredibleKind", s)
}

// CredibleKindValues returns every CredibleKind in order.
func CredibleKindValues() []CredibleKind { return credibleKindNames.Values() }

// CredibleOptions configures Credible. The zero value asks for the
// two-sided 95% equal-tailed interval under the Jeffreys prior.
type CredibleOptions struct {
	Level float64      // posterior probability in (0, 1); 0 means 0.95
	Side  Side         // two-sided (zero value) or a one-sided bound (equal-tailed only)
	Kind  CredibleKind // EqualTailed (zero value) or HighestDensity
	Prior Prior        // Jeffreys (zero value), uniform or an informative Beta
}

// Credible returns a Bayesian credible interval for a binomial proportion
// p after k successes in n trials: an interval holding posterior
// probability Level under the Beta(Prior.A + k, Prior.B + n - k) posterior.
// Estimate is the posterior mean; Prior is set; Method is "equal-tailed
// credible" or "highest density credible".
//
// Equal-tailed limits are Beta quantiles at (1-Level)/2 from each side (at
// 1-Level for a one-sided bound, the other end 0 or 1), solved on the
// log-odds scale by Newton steps on the log tail (internal/beta.Quantile),
// to about 1e-14 relative in each tail probability. The highest density
// interval [L, U] solves
//
//	F(L) + (1 - F(U)) = 1 - Level,  ln(U/L) + (B-1) ln((1-U)/(1-L)) = 0,
//
// (equal density at both ends) by Newton's method in the log-odds of L,
// U following L through the exact equal-density equation; the densities
// at the limits agree to 1e-12 relative and the coverage to 1e-14
// (checked against mpmath at 40 digits); an upper tail below 1e-3 at a
// limit below 1e-3 with (a+b) x <= 1e5 is the complement of the lower one
// and keeps about 1e-16 absolute. When the posterior density is
// monotone (A <= 1 < B, say after 0 successes under the Jeffreys prior)
// the HPD interval is [0, q] with q the Level quantile (or [q, 1]); for
// the flat Beta(1, 1) every interval of length Level qualifies and the
// equal-tailed one is returned with a warning.
//
// Conventions: unlike the Jeffreys confidence interval (Method Jeffreys),
// the credible interval keeps its lower limit above 0 at k = 0: it is the
// posterior's quantile, with no frequentist boundary modification.
//
// Cost: equal-tailed, two quantile solves of a few Newton steps each;
// highest density, four or five Newton steps of two tail evaluations each
// (BenchmarkCredible*; the README gives the measured figures).
// Errors: k < 0, k > n, Level outside (0, 1), an unknown Side or Kind, a
// one-sided HPD request, an invalid prior, and the HPD of a U-shaped
// posterior (A, B < 1; ErrNoSolution: the region is two pieces).
func Credible(k, n int64, opt CredibleOptions) (Interval, error) {
	const fn = "interval.Credible"
	prior, a, b, err := opt.Prior.Update(fn, "k", "n", k, n)
	if err != nil {
		return Interval{}, err
	}
	lv, err := newLevel(fn, opt.Level, opt.Side)
	if err != nil {
		return Interval{}, err
	}
	if opt.Kind != EqualTailed && opt.Kind != HighestDensity {
		return Interval{}, argerr.Invalid(fn, "Kind", int(opt.Kind), "is not a credible-interval kind; use EqualTailed or HighestDensity")
	}
	iv := Interval{Estimate: a / (a + b), Level: lv.level, Side: lv.side, Parameter: "p", Prior: &prior}
	if n == 0 {
		iv.warn("no trials: the interval is the prior's")
	}
	if opt.Kind == EqualTailed {
		iv.Method = "equal-tailed credible"
		iv.Lower, iv.Upper = equalTailed(a, b, lv)
		return iv, nil
	}
	iv.Method = "highest density credible"
	if lv.side != TwoSided {
		return Interval{}, argerr.Invalid(fn, "Side", int(lv.side), "must be TwoSided for a highest density interval; a one-sided bound is EqualTailed")
	}
	lo, hi, flat, err := HPDBeta(a, b, lv.level)
	if err != nil {
		var e *argerr.Error
		if errors.As(err, &e) && errors.Is(err, argerr.ErrNoSolution) {
			return Interval{}, &argerr.Error{Func: fn, Reason: e.Reason, Err: argerr.ErrNoSolution}
		}
		return Interval{}, err
	}
	if flat {
		iv.warn("flat posterior Beta(1, 1): every interval of length Level has the highest density; the equal-tailed one is given")
	}
	iv.Lower, iv.Upper = lo, hi
	return iv, nil
}

// equalTailed returns the equal-tailed limits for the level's side.
func equalTailed(a, b float64, lv level) (lo, hi float64) {
	lo, hi = 0, 1
	if lv.wantLower() {
		lo, _ = beta.XY(beta.Quantile(a, b, math.Log(lv.tail), false))
	}
	if lv.wantUpper() {
		hi, _ = beta.XY(beta.Quantile(a, b, math.Log(lv.tail), true))
	}
	return lo, hi
}

// HPDBeta returns the highest density interval [lo, hi] of the Beta(a, b)
// distribution with probability level in (0, 1), as Credible describes;
// flat reports a = b = 1 (the central interval is returned). It fails with
// ErrNoSolution for a, b < 1 (U-shaped density: the region is two pieces).
// a and b must lie in [1e-300, MaxShape] and level in (0, 1):
// ErrInvalidArgument otherwise (a shape of 1e300 or +Inf made the solver run
// without end, a subnormal one gave NaN limits).
func HPDBeta(a, b, level float64) (lo, hi float64, flat bool, err error) {
	const fn = "interval.HPDBeta"
	for _, s := range [2]struct {
		name string
		v    float64
	}{{"a", a}, {"b", b}} {
		if !(s.v >= 1e-300 && s.v <= MaxShape) {
			return 0, 0, false, argerr.Invalid(fn, s.name, s.v, "must be a shape in [1e-300, MaxShape = 1e15]")
		}
	}
	if !(level > 0 && level < 1) {
		return 0, 0, false, argerr.Invalid(fn, "level", level, "must lie strictly between 0 and 1")
	}
	switch {
	case a == 1 && b == 1:
		return (1 - level) / 2, (1 + level) / 2, true, nil
	case a < 1 && b < 1:
		return 0, 0, false, argerr.NoSolution("interval.HPDBeta", "the posterior density is U-shaped (both shapes below 1): its highest density region is two intervals, [0, L] and [U, 1]")
	case a <= 1: // decreasing density
		x, _ := beta.XY(beta.Quantile(a, b, math.Log(level), false))
		return 0, x, false, nil
	case b <= 1: // increasing density
		x, _ := beta.XY(beta.Quantile(a, b, math.Log(level), true))
		return x, 1, false, nil
	}
	h := hpdSolver{a: a, b: b, tail: 1 - level}
	tl, tu := h.solve()
	lo, _ = beta.XY(tl)
	hi, _ = beta.XY(tu)
	return lo, hi, false, nil
}

// hpdSolver solves the two HPD equations on the log-odds scale for a, b > 1.
type hpdSolver struct {
	a, b, tail float64
}

// g returns the log density (up to a constant) at log-odds t and its
// derivative in t: (a-1) ln x + (b-1) ln y and (a-1) y - (b-1) x.
func (h hpdSolver) g(t float64) (v, d float64) {
	x, y := beta.XY(t)
	lx, ly := logXY(t)
	return (h.a-1)*lx + (h.b-1)*ly, (h.a-1)*y - (h.b-1)*x
}

// logXY returns ln x and ln y for log-odds t without cancellation.
func logXY(t float64) (lx, ly float64) {
	if t >= 0 {
		l := math.Log1p(math.Exp(-t))
		return -l, -t - l
	}
	l := math.Log1p(math.Exp(t))
	return t - l, -l
}

// softplus returns ln(1 + e^v) without overflow.
func softplus(v float64) float64 {
	if v > 0 {
		return v + math.Log1p(math.Exp(-v))
	}
	return math.Log1p(math.Exp(v))
}

// spDiff returns softplus(v) - softplus(w) without cancellation when v and
// w are close: log1p of the relative change, formed with expm1.
func spDiff(v, w float64) float64 {
	switch {
	case w <= 0 && v-w < 700:
		ew := math.Exp(w)
		return math.Log1p(ew * math.Expm1(v-w) / (1 + ew))
	case w > 0 && w-v < 700:
		ew := math.Exp(-w)
		return (v - w) + math.Log1p(ew*math.Expm1(w-v)/(1+ew))
	}
	return softplus(v) - softplus(w)
}

// gap returns g(u) - g(t), the difference of the log densities at log-odds
// u and t, as (a-1) ln(x_u/x_t) + (b-1) ln(y_u/y_t) with both logarithms
// of ratios formed directly (spDiff): g itself is of order a + b, and its
// difference near the root would otherwise lose all but a few digits at
// shapes of 1e6.
func (h hpdSolver) gap(u, t float64) float64 {
	return (h.a-1)*spDiff(-t, -u) - (h.b-1)*spDiff(u, t)
}

// upper returns the log-odds u > tm with g(u) = g(t), by Newton's method
// from the right: g is concave and decreasing there, so the iterates
// approach the root monotonically after the first step; start is a guess.
func (h hpdSolver) upper(t, tm, start float64) float64 {
	u := math.Max(start, tm+1e-9*math.Max(1, math.Abs(tm)))
	for i := 0; i < 200; i++ {
		_, d := h.g(u)
		if d >= 0 { // at or left of the mode: step right
			u = tm + 2*(u-tm) + 1e-9
			continue
		}
		next := u - h.gap(u, t)/d
		if next <= tm {
			next = tm + 0.5*(u-tm)
		}
		// Quadratic convergence: after a step below 1e-8 the next would be
		// near 1e-16 (and the guess from the outer step is that close).
		if math.Abs(next-u) <= 1e-8*math.Max(1, math.Abs(u)) {
			return next
		}
		u = next
	}
	return u
}

// solve returns the log-odds of L and U: Newton's method on
// R(t) = ln(F(L) + 1 - F(U)) - ln(1 - level) in the log-odds t of L, with U
// following L through the equal-density equation (the logarithm keeps the
// steps well scaled far into the tails), safeguarded by the bracket
// (-745, mode) on which R increases from below 0 to above 0.
func (h hpdSolver) solve() (tl, tu float64) {
	a, b := h.a, h.b
	tm := math.Log((a - 1) / (b - 1))
	z := -mathext.NormalQuantile(h.tail / 2)
	sd := math.Sqrt(1/a + 1/b)
	t := tm - z*sd
	lo, hi := -745.0, tm
	u := tm + z*sd
	lt := math.Log(h.tail)
	for i := 0; i < 200; i++ {
		_, dl := h.g(t)
		u = h.upper(t, tm, u)
		_, du := h.g(u)
		xl, yl := beta.XY(t)
		xu, yu := beta.XY(u)
		ls := xmath.LogAddExp(beta.LogCDF(a, b, xl, yl), beta.LogUpper(a, b, xu, yu))
		r := ls - lt
		if r == 0 {
			return t, u
		}
		if r < 0 {
			lo = t
		} else {
			hi = t
		}
		// dR/dt = f(L) [xL yL - xU yU g'(L)/g'(U)] / (F(L) + 1 - F(U)), f the
		// density, equal at both ends.
		dr := math.Exp(beta.LogPDF(a, b, xl, yl)-ls) * (xl*yl - xu*yu*dl/du)
		next := t - r/dr
		if math.Abs(next-t) <= 1e-8*math.Max(1, math.Abs(t)) && next > lo && next < hi {
			// Quadratic convergence: the step after this one would be
			// about 1e-16; take the point without evaluating the tails.
			u += dl / du * (next - t)
			t = next
			break
		}
		if !(next > lo && next < hi) {
			next = lo + 0.5*(hi-lo)
		}
		// U moves by about g'(L)/g'(U) times L's step: start the next
		// equal-density solve there.
		u += dl / du * (next - t)
		if hi-lo <= 4e-16*math.Max(1, math.Abs(t)) {
			break
		}
		t = next
	}
	return t, h.upper(t, tm, u)
}

package interval

import (
	"fmt"
	"math"
	"strconv"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/enum"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/internal/xmath"
	"gonum.org/v1/gonum/mathext"
)

// MultinomialMethod selects the simultaneous intervals of Multinomial.
//
// The zero value, SisonGlaz, is the default: its coverage stays closest to
// the nominal level with many categories and small counts, where the
// chi-square based intervals are very conservative (Sison and Glaz 1995,
// section 4; May and Johnson 2000, recalled). With few categories and
// large counts the three methods nearly agree.
type MultinomialMethod int

const (
	// SisonGlaz: p_i in [n_i/N - c/N, n_i/N + (c + 2 gamma)/N] with the
	// integer c such that nu(c) < level <= nu(c + 1), where nu(c) is the
	// probability, at the observed proportions, that every count lies
	// within c of its observed value, and gamma = (level - nu(c)) /
	// (nu(c+1) - nu(c)). nu is computed by Levin's (1981) representation
	// through truncated Poisson variables with the Edgeworth expansion of
	// their sum, as published.
	SisonGlaz MultinomialMethod = iota
	// QuesenberryHurst: the projections of the chi-square confidence region
	// with k - 1 degrees of freedom: with A the upper 1 - level quantile of
	// chi-square(k - 1),
	//   (A + 2 n_i -+ sqrt(A (A + 4 n_i (N - n_i)/N))) / (2 (N + A)).
	QuesenberryHurst
	// Goodman: the same formula with A the upper (1 - level)/k quantile of
	// chi-square(1) (a Bonferroni split over the k categories).
	Goodman
)

var multinomialNames = enum.New[MultinomialMethod]("interval.MultinomialMethod",
	[]string{"Sison-Glaz", "Quesenberry-Hurst", "Goodman"}, nil)

// String returns "Sison-Glaz", "Quesenberry-Hurst" or "Goodman".
func (m MultinomialMethod) String() string { return multinomialNames.String(m) }

// MarshalText encodes the method by its published name.
func (m MultinomialMethod) MarshalText() ([]byte, error) { return multinomialNames.MarshalText(m) }

// UnmarshalText decodes a name accepted by ParseMultinomialMethod.
func (m *MultinomialMethod) UnmarshalText(b []byte) error {
	return multinomialNames.UnmarshalText(m, b)
}

// ParseMultinomialMethod returns the method whose published name matches s
// case-insensitively.
func ParseMultinomialMethod(s string) (MultinomialMethod, error) {
	return multinomialNames.Parse("interval.ParseMultinomialMethod", s)
}

// MultinomialMethodValues lists the methods in the order of their values.
func MultinomialMethodValues() []MultinomialMethod { return multinomialNames.Values() }

// Family is a set of intervals meant to hold together: with probability at
// least Level (approximately, for the approximate methods) every interval
// covers its parameter.
type Family struct {
	// Method is the published name of the simultaneous method.
	Method string `json:"method"`
	// Level is the simultaneous (family) confidence level.
	Level float64 `json:"level"`
	// EachLevel is the level each interval was computed at, where that
	// is a separate level (Goodman, the Bonferroni and Sidak
	// differences); omitted otherwise.
	EachLevel float64 `json:"each_level,omitempty"`
	// Intervals, one per category or comparison, in input order. Their
	// own Level field holds the family level.
	Intervals []Interval `json:"intervals"`
	// Warnings concerns the family as a whole.
	Warnings []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the family with non-finite floats as strings.
func (f Family) MarshalJSON() ([]byte, error) {
	type plain Family
	return jsonfloat.Marshal(plain(f))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (f *Family) UnmarshalJSON(b []byte) error {
	type plain Family
	return jsonfloat.Unmarshal(b, (*plain)(f))
}

// MultinomialOptions are the options of Multinomial.
type MultinomialOptions struct {
	Level  float64           // simultaneous confidence level in (0, 1); 0 means 0.95
	Method MultinomialMethod // the zero value is SisonGlaz
}

// Multinomial returns simultaneous confidence intervals for the k >= 2
// category probabilities of a multinomial sample with counts[i] in
// category i (total N > 0), by opt.Method (see MultinomialMethod). Zero
// counts are allowed (sparse tables): their lower limit is 0.
//
// Limits outside [0, 1] (Sison-Glaz only) are clipped, with Clipped set.
// Warnings report small totals for the chi-square methods.
//
// Errors: fewer than 2 categories, a negative count, a zero total, a level
// outside (0, 1), an unknown method; ErrTooLarge for Sison-Glaz when its
// search would sum more than 3e8 terms (its cost is O(k c log c) with c
// about sqrt(N); a million categories of a million counts is refused).
//
// Accuracy: the chi-square methods to about 1e-14 (gonum's incomplete
// gamma inverse); Sison-Glaz's c and gamma as the Edgeworth approximation
// gives them (its error in nu measured below 0.003 against exact
// convolutions for totals of 20 to 467); where the expansion cannot reach
// the level (very uneven or tiny counts) nu is computed exactly by
// convolution instead, with a warning (cost O(k N c) then).
//
// Sources: Quesenberry CP, Hurst DC (1964), Technometrics 6:191-195;
// Goodman LA (1965), Technometrics 7:247-254; Sison CP, Glaz J (1995),
// JASA 90:366-369; Levin B (1981), Ann Statist 9:1123-1126; May WL,
// Johnson WD (2000), Journal of Statistical Software 5(6).
func Multinomial(counts []int64, opt MultinomialOptions) (Family, error) {
	const fn = "interval.Multinomial"
	k := len(counts)
	if k < 2 {
		return Family{}, argerr.Invalid(fn, "counts", k, "categories given; simultaneous intervals need at least 2")
	}
	var N int64
	for i, c := range counts {
		if err := argerr.Count(fn, "counts["+strconv.Itoa(i)+"]", c); err != nil {
			return Family{}, err
		}
		if N > 1<<53-c {
			return Family{}, argerr.TooLarge(fn, "counts["+strconv.Itoa(i)+"]", c, "makes the total exceed 2^53")
		}
		N += c
	}
	if N == 0 {
		return Family{}, argerr.Invalid(fn, "", nil, "every count is 0; the intervals need at least one observation")
	}
	lev := opt.Level
	if lev == 0 {
		lev = 0.95
	}
	if !(lev > 0 && lev < 1) {
		return Family{}, argerr.Invalid(fn, "Level", lev, "must lie strictly between 0 and 1 (0 means 0.95)")
	}
	if opt.Method < SisonGlaz || opt.Method > Goodman {
		return Family{}, argerr.Invalid(fn, "Method", int(opt.Method), "is not a multinomial method")
	}
	f := Family{Method: opt.Method.String(), Level: lev, Intervals: make([]Interval, k)}
	fN := float64(N)
	switch opt.Method {
	case QuesenberryHurst, Goodman:
		var A float64
		if opt.Method == Goodman {
			f.EachLevel = 1 - (1-lev)/float64(k)
			z := -mathext.NormalQuantile((1 - lev) / (2 * float64(k)))
			A = z * z
		} else {
			// Upper quantile of chi-square(k-1): 2 Q^-1((k-1)/2, 1 - level).
			A = 2 * mathext.GammaIncRegCompInv(float64(k-1)/2, 1-lev)
		}
		for i, c := range counts {
			ni := float64(c)
			h := math.Sqrt(A * (A + 4*ni*(fN-ni)/fN))
			lo := (A + 2*ni - h) / (2 * (fN + A))
			hi := (A + 2*ni + h) / (2 * (fN + A))
			if c == 0 {
				lo = 0
			}
			if c == N {
				hi = 1
			}
			f.Intervals[i] = Interval{Lower: math.Max(0, lo), Upper: math.Min(1, hi), Estimate: ni / fN, Level: lev,
				Method: f.Method, Parameter: "p[" + strconv.Itoa(i) + "]"}
		}
		if N < 30 {
			f.Warnings = append(f.Warnings, fmt.Sprintf("total %d is small for a chi-square based interval (common practice: 30 or more); prefer Sison-Glaz", N))
		}
	case SisonGlaz:
		// c is about z sqrt(n_i) for a normal quantile z below 10 at any
		// sensible level and number of categories; cmax bounds the search,
		// and with it the work, which is refused up front beyond about a
		// second.
		var nz, top int64
		for _, ci := range counts {
			if ci > 0 {
				nz++
			}
			top = max(top, ci)
		}
		cmax := min(N, int64(10*math.Sqrt(float64(top)))+20)
		evals := 2*math.Log2(float64(cmax)+1) + 4
		if evals*float64(nz)*float64(2*cmax+1) > maxSisonGlazWork {
			return Family{}, &argerr.Error{Func: fn, Reason: "the counts are too many or too large for Sison-Glaz (its search would take more than about a second); use Goodman", Err: argerr.ErrTooLarge}
		}
		c, gamma, ok := sisonGlaz(counts, N, lev, cmax, sgCoverage)
		if !ok {
			// The expansion saturates below the level (very uneven or tiny
			// counts): compute nu exactly instead, where that is affordable.
			if evals*float64(nz)*float64(N+1)*float64(2*cmax+1) > maxSisonGlazWork {
				return Family{}, argerr.NoSolution(fn, "no c reaches the level: the Edgeworth approximation fails for these counts and the exact computation is too large; use Goodman")
			}
			c, gamma, ok = sisonGlaz(counts, N, lev, cmax, sgCoverageExact)
			if !ok {
				return Family{}, argerr.NoSolution(fn, "no c reaches the level for these counts; use Goodman")
			}
			f.Warnings = append(f.Warnings, "the Edgeworth approximation of Sison and Glaz fails for these counts; the coverage probability nu(c) was computed exactly by convolution instead")
		}
		fc := float64(c)
		for i, ci := range counts {
			p := float64(ci) / fN
			iv := Interval{Lower: p - fc/fN, Upper: p + (fc+2*gamma)/fN, Estimate: p, Level: lev, Method: f.Method, Parameter: "p[" + strconv.Itoa(i) + "]"}
			if iv.Lower < 0 {
				iv.Lower, iv.Clipped = 0, true
			}
			if iv.Upper > 1 {
				iv.Upper, iv.Clipped = 1, true
			}
			f.Intervals[i] = iv
		}
	}
	return f, nil
}

// sisonGlaz returns the c and gamma of the Sison-Glaz intervals: c + 1 is
// the smallest c' with nu(c') >= lev, found by doubling and bisection (nu
// increases with c).
func sisonGlaz(counts []int64, N int64, lev float64, cmax int64, nu func([]int64, int64, int64) float64) (c int64, gamma float64, ok bool) {
	hi := int64(1)
	for nu(counts, N, hi) < lev {
		if hi >= cmax {
			return 0, 0, false
		}
		hi = min(2*hi, cmax)
	}
	lo := hi / 2 // nu(lo) < lev unless lo = 0
	if lo == 0 {
		if nu(counts, N, 0) >= lev {
			return 0, 0, true
		}
	}
	for hi-lo > 1 {
		mid := lo + (hi-lo)/2
		if nu(counts, N, mid) >= lev {
			hi = mid
		} else {
			lo = mid
		}
	}
	nuLo, nuHi := nu(counts, N, lo), nu(counts, N, hi)
	if !(nuHi > nuLo) {
		return 0, 0, false
	}
	return lo, (lev - nuLo) / (nuHi - nuLo), true
}

// maxSisonGlazWork bounds the terms Multinomial's Sison-Glaz search may sum
// (about a second of work).
const maxSisonGlazWork = 3e8

// sgCoverage returns nu(c) = P(n_i - c <= X_i <= n_i + c for all i) for X
// multinomial(N, n/N) by Levin's formula
//
//	nu = N! / (N^N e^-N) prod_i P(a_i <= Y_i <= b_i) P(W = N),
//
// Y_i Poisson(n_i), W the sum of the Y_i truncated to [a_i, b_i] (with
// a_i = max(n_i - c, 0), b_i = min(n_i + c, N)), and P(W = N) from the
// Edgeworth expansion with the truncated moments. The Poisson terms are
// taken relative to the mode by the ratio recursion, and the large
// factorials by Stirling's formula with its error term, so nothing large
// cancels. Cost O(k c).
func sgCoverage(counts []int64, N int64, c int64) float64 {
	fN := float64(N)
	logNu := 0.5*math.Log(fN) + lnSqrt2Pi + xmath.StirlingError(fN)
	var mu, v, m3, m4 float64
	var t []float64
	for _, ni := range counts {
		if ni == 0 {
			continue // Y = 0 with probability 1: no mass lost, no moments
		}
		a, b := max(ni-c, 0), min(ni+c, N)
		lam := float64(ni)
		// t[y-a] = P(Y = y) / P(Y = ni).
		t = t[:0]
		for y := a; y <= b; y++ {
			t = append(t, 0)
		}
		t[ni-a] = 1
		for y := ni + 1; y <= b; y++ {
			t[y-a] = t[y-1-a] * lam / float64(y)
		}
		for y := ni - 1; y >= a; y-- {
			t[y-a] = t[y+1-a] * float64(y+1) / lam
		}
		var s, s1 float64
		for i, w := range t {
			s += w
			s1 += w * float64(a+int64(i))
		}
		mean := s1 / s
		var c2, c3, c4 float64
		for i, w := range t {
			d := float64(a+int64(i)) - mean
			d2 := d * d
			w /= s
			c2 += w * d2
			c3 += w * d2 * d
			c4 += w * d2 * d2
		}
		// ln P(Y = ni) = -(ln sqrt(2 pi ni) + se(ni)).
		logNu += math.Log(s) - (0.5*math.Log(lam) + lnSqrt2Pi + xmath.StirlingError(lam))
		mu += mean
		v += c2
		m3 += c3
		m4 += c4 - 3*c2*c2
	}
	if v == 0 {
		return math.Min(1, math.Exp(logNu))
	}
	g1, g2 := m3/math.Pow(v, 1.5), m4/(v*v)
	x := (fN - mu) / math.Sqrt(v)
	x2 := x * x
	fe := math.Exp(-x2/2) / math.Sqrt(2*math.Pi) * (1 + g1/6*(x2*x-3*x) + g2/24*(x2*x2-6*x2+3) +
		g1*g1/72*(x2*x2*x2-15*x2*x2+45*x2-15))
	nu := math.Exp(logNu) * fe / math.Sqrt(v)
	return math.Max(0, math.Min(1, nu))
}

// ControlOptions are the options of VersusControl.
type ControlOptions struct {
	Level  float64    // simultaneous confidence level; 0 means 0.95
	Method DiffMethod // the two-sample interval for each difference (zero value Newcombe)
	// Sidak uses level^(1/(k-1)) for each interval instead of the
	// Bonferroni 1 - (1 - level)/(k - 1). The differences share the
	// control and are positively correlated, for which Sidak's inequality
	// holds asymptotically (Šidák 1967); Bonferroni holds always.
	Sidak bool
}

// VersusControl returns simultaneous intervals for the k - 1 differences
// p_j - p_control of independent proportions (x[j] successes of n[j]),
// j != control in input order: each a two-sample interval (opt.Method)
// at the Bonferroni (or Sidak) per-interval level, so that all k - 1
// cover together with probability at least about opt.Level. Each
// interval's Parameter reads "p[j] - p[control]".
//
// Errors: as Difference for each pair; fewer than 2 arms, lengths that
// differ, a control index outside 0..k-1.
// Sources: Dunn OJ (1961), JASA 56:52-64; Šidák Z (1967), JASA
// 62:626-633; Newcombe RG (1998), Statist Med 17:873-890.
func VersusControl(x, n []int64, control int, opt ControlOptions) (Family, error) {
	const fn = "interval.VersusControl"
	k := len(x)
	if k < 2 || len(n) != k {
		return Family{}, argerr.Invalid(fn, "n", len(n), "sizes for "+strconv.Itoa(k)+" arms; give at least 2 arms and one size per arm")
	}
	if control < 0 || control >= k {
		return Family{}, argerr.Invalid(fn, "control", control, "is not an arm index in 0.."+strconv.Itoa(k-1))
	}
	lev := opt.Level
	if lev == 0 {
		lev = 0.95
	}
	if !(lev > 0 && lev < 1) {
		return Family{}, argerr.Invalid(fn, "Level", lev, "must lie strictly between 0 and 1 (0 means 0.95)")
	}
	m := float64(k - 1)
	each := 1 - (1-lev)/m
	name := "Bonferroni "
	if opt.Sidak {
		each = 1 + math.Expm1(math.Log(lev)/m)
		name = "Sidak "
	}
	f := Family{Method: name + opt.Method.String(), Level: lev, EachLevel: each}
	for j := range x {
		if j == control {
			continue
		}
		iv, err := Difference(x[j], n[j], x[control], n[control], DiffOptions{Level: each, Method: opt.Method})
		if err != nil {
			if e, ok := err.(*Error); ok {
				e.Func = fn
				e.Reason += " (arm " + strconv.Itoa(j) + " against control " + strconv.Itoa(control) + ")"
			}
			return Family{}, err
		}
		iv.Level = lev
		iv.Parameter = "p[" + strconv.Itoa(j) + "] - p[" + strconv.Itoa(control) + "]"
		f.Intervals = append(f.Intervals, iv)
	}
	return f, nil
}

// sgCoverageExact returns nu(c) as sgCoverage does, with P(W = N) by an
// exact convolution of the truncated Poisson distributions (cost
// O(k N c)) instead of the Edgeworth expansion.
func sgCoverageExact(counts []int64, N int64, c int64) float64 {
	fN := float64(N)
	logNu := 0.5*math.Log(fN) + lnSqrt2Pi + xmath.StirlingError(fN)
	// dist[s] is P(partial sum = s) divided by e^logScale, for s = 0..N.
	dist := make([]float64, N+1)
	next := make([]float64, N+1)
	dist[0] = 1
	logScale := 0.0
	for _, ni := range counts {
		if ni == 0 {
			continue
		}
		a, b := max(ni-c, 0), min(ni+c, N)
		lam := float64(ni)
		t := make([]float64, b-a+1) // P(Y = y)/P(Y = ni)
		t[ni-a] = 1
		for y := ni + 1; y <= b; y++ {
			t[y-a] = t[y-1-a] * lam / float64(y)
		}
		for y := ni - 1; y >= a; y-- {
			t[y-a] = t[y+1-a] * float64(y+1) / lam
		}
		clear(next)
		for s, d := range dist {
			if d == 0 {
				continue
			}
			for i, w := range t {
				s2 := int64(s) + a + int64(i)
				if s2 > N {
					break
				}
				next[s2] += d * w
			}
		}
		top := 0.0
		for _, v := range next {
			top = math.Max(top, v)
		}
		if top == 0 {
			return 0
		}
		for s := range next {
			next[s] /= top
		}
		// ln P(Y = ni) = -(ln sqrt(2 pi ni) + se(ni)).
		logScale += math.Log(top) - (0.5*math.Log(lam) + lnSqrt2Pi + xmath.StirlingError(lam))
		dist, next = next, dist
	}
	if dist[N] == 0 {
		return 0
	}
	return math.Min(1, math.Exp(logNu+logScale+math.Log(dist[N])))
}

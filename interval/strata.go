package interval

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/enum"
	"github.com/kofnlab/kofn/internal/root"
	"github.com/kofnlab/kofn/internal/score"
	"github.com/kofnlab/kofn/internal/strata"
)

// Stratum is one stratum of a stratified comparison of two groups (a site,
// a week, a device): K1 successes of N1 trials in group 1 and K2 of N2 in
// group 2. In the 2x2 notation of the sources a = K1, b = N1 - K1, c = K2,
// d = N2 - K2, n_i = N1 + N2.
type Stratum = strata.Table

// CommonMethod selects how a common effect across strata is estimated.
//
// The zero value, CommonMantelHaenszel, is the default: the
// Mantel-Haenszel estimators stay consistent both with many sparse strata
// and with few large ones, and their variances (Robins-Breslow-Greenland
// for the odds ratio, Greenland-Robins for the risk ratio, Sato for the
// risk difference) share that property; the exact conditional interval of
// the odds ratio is the choice when the strata are small and coverage must
// not fall below the level.
type CommonMethod int

const (
	// CommonMantelHaenszel: the Mantel-Haenszel estimate with a Wald
	// interval on the log scale (odds ratio: Robins, Breslow and Greenland
	// 1986, Biometrics 42:311-323; risk ratio: Greenland and Robins 1985,
	// Biometrics 41:55-68) or the natural scale (risk difference: Sato
	// 1989, Biometrics 45:1323-1324).
	CommonMantelHaenszel CommonMethod = iota
	// CommonMantelHaenszelGR: for the risk difference only, the
	// Greenland-Robins (1985) variance, which assumes large strata.
	CommonMantelHaenszelGR
	// CommonExactConditional: for the odds ratio only, the exact
	// conditional interval from the distribution of the sum of the first
	// cells given every stratum's margins (the stratified Cornfield
	// interval), with the conditional maximum-likelihood estimate.
	CommonExactConditional
	// CommonExactConditionalMidP: its mid-p version.
	CommonExactConditionalMidP
	// CommonStratifiedScore: for the risk difference, the risk ratio and
	// the odds ratio, the stratified Miettinen-Nurminen score interval:
	// the values theta
	// whose stratified score statistic
	//
	//	Z(theta) = sum w_i (e_i - theta) / sqrt( sum w_i^2 V_i(theta) )
	//
	// (e_i the stratum's observed effect, V_i its variance restricted to
	// theta with the factor N/(N-1)) lies within -+z, with the weights
	// CommonOptions.Weights selects: Mantel-Haenszel weights (the default)
	// or inverse-variance score weights 1/V_i(theta) recomputed at every
	// trial value (Miettinen O, Nurminen M (1985), Statistics in Medicine
	// 4:213-226, section on stratified analysis; Tang Y (2020), Score
	// confidence intervals and sample sizes for stratified comparisons of
	// binomial proportions, Statistics in Medicine 39:3427-3457, which
	// studies this statistic with both weightings; both recalled, the
	// paper not consulted here: the limits are checked against an
	// independent high-precision solution of the same equations,
	// testdata/gen/strata_score.py). With one stratum every weighting
	// gives the Miettinen-Nurminen interval of Difference, Ratio or
	// OddsRatio.
	CommonStratifiedScore
)

var commonNames = enum.New[CommonMethod]("interval.CommonMethod",
	[]string{"Mantel-Haenszel", "Mantel-Haenszel Greenland-Robins", "exact conditional", "exact conditional mid-p", "stratified Miettinen-Nurminen"},
	map[string]CommonMethod{"mh": CommonMantelHaenszel, "exact": CommonExactConditional, "mid-p": CommonExactConditionalMidP, "gr": CommonMantelHaenszelGR, "score": CommonStratifiedScore})

// String returns the published name of the method.
func (m CommonMethod) String() string { return commonNames.String(m) }

// MarshalText encodes the method by its String form.
func (m CommonMethod) MarshalText() ([]byte, error) { return commonNames.MarshalText(m) }

// UnmarshalText decodes any spelling ParseCommonMethod accepts.
func (m *CommonMethod) UnmarshalText(b []byte) error { return commonNames.UnmarshalText(m, b) }

// ParseCommonMethod returns the method whose String() is s, ignoring case;
// "mh", "gr", "exact" and "mid-p" are accepted too.
func ParseCommonMethod(s string) (CommonMethod, error) {
	return commonNames.Parse("interval.ParseCommonMethod", s)
}

// CommonMethodValues lists the methods in order.
func CommonMethodValues() []CommonMethod { return commonNames.Values() }

// CommonOptions configures the common-effect intervals. The zero value
// asks for a two-sided 95% Mantel-Haenszel interval.
type CommonOptions struct {
	Level  float64      // confidence level in (0, 1); 0 means 0.95
	Method CommonMethod // the zero value is CommonMantelHaenszel
	Side   Side         // two-sided (zero value) or one bound
	// Weights are the stratum weights of CommonStratifiedScore (the zero
	// value, WeightsMantelHaenszel, is its default); another method takes
	// only the zero value.
	Weights ScoreWeights
}

// commonSetup validates the common-effect arguments.
func commonSetup(fn string, ts []Stratum, opt CommonOptions) (level, error) {
	if err := strata.Check(fn, ts); err != nil {
		return level{}, err
	}
	if err := commonNames.Check(fn, "Method", opt.Method); err != nil {
		return level{}, err
	}
	if err := scoreWeightNames.Check(fn, "Weights", opt.Weights); err != nil {
		return level{}, err
	}
	if opt.Weights != WeightsMantelHaenszel && opt.Method != CommonStratifiedScore {
		return level{}, argerr.Invalid(fn, "Weights", opt.Weights.String(), "applies to the stratified score method only; set Method to CommonStratifiedScore")
	}
	return newLevel(fn, opt.Level, opt.Side)
}

// logWald returns the interval exp(log est +- z se) with the side's limits.
func logWald(lv level, est, se float64) (lo, hi float64) {
	lo, hi = 0, math.Inf(1)
	if lv.wantLower() {
		lo = math.Exp(math.Log(est) - lv.z*se)
	}
	if lv.wantUpper() {
		hi = math.Exp(math.Log(est) + lv.z*se)
	}
	if math.IsNaN(lo) {
		lo = 0
	}
	if math.IsNaN(hi) {
		hi = math.Inf(1)
	}
	return lo, hi
}

// CommonOddsRatio returns a confidence interval for the odds ratio common
// to all strata, (p1/(1-p1)) / (p2/(1-p2)) in each stratum.
//
// CommonMantelHaenszel: the Mantel-Haenszel estimate
//
//	OR_MH = sum a_i d_i / n_i  /  sum b_i c_i / n_i
//
// with the Robins-Breslow-Greenland variance of ln OR_MH,
//
//	sum P_i R_i / (2 R^2) + sum (P_i S_i + Q_i R_i) / (2 R S) + sum Q_i S_i / (2 S^2),
//
// P_i = (a_i + d_i)/n_i, Q_i = (b_i + c_i)/n_i, R_i = a_i d_i / n_i,
// S_i = b_i c_i / n_i, R = sum R_i, S = sum S_i (Robins J, Breslow N,
// Greenland S (1986), Biometrics 42:311-323), and limits
// exp(ln OR_MH -+ z se). CommonExactConditional: the exact conditional
// interval, the odds ratios psi at which the observed sum of first cells
// lies in the tail of its conditional distribution given every stratum's
// margins (P(S >= s | psi_L) = tail, P(S <= s | psi_U) = tail; mid-p
// halves the observed point), found by Brent's method on ln psi to 1e-12
// relative, with the conditional maximum-likelihood estimate (E[S | psi]
// = s) as Estimate. The exact interval is 0 at the smallest possible sum
// and +Inf at the largest.
//
// CommonStratifiedScore: the stratified score interval of the odds ratio
// (score.StratifiedOddsZ: each stratum's Miettinen-Nurminen odds-ratio
// score (p1^ - p1~)/(p1~ q1~) - (p2^ - p2~)/(p2~ q2~) with variance
// f (1/(n1 p1~ q1~) + 1/(n2 p2~ q2~)), recalled), with either weighting,
// its limits searched on ln psi as CommonRiskRatio's inverse-variance
// interval (65 values from about 1e-20 to 1e20, then Brent's method) for
// both weightings; the Estimate is the zero of the statistic nearest the
// Mantel-Haenszel estimate. With one stratum it is OddsRatio's
// Miettinen-Nurminen interval. More than MaxScoreStrata strata are
// refused.
//
// Errors: no strata, a count outside [0, N], a Method for another effect
// (CommonMantelHaenszelGR), a bad Level or Side, a conditional support
// above strata.MaxSupport (ErrTooLarge: use Mantel-Haenszel, which has no
// limit), a cancelled ctx. Warnings: an undefined Mantel-Haenszel estimate
// (no stratum with both discordant products), strata that carry no
// information. Cost: O(K) for Mantel-Haenszel; the exact method convolves
// the strata's hypergeometric distributions, O(sum of support widths
// squared / K), then about 100 passes over the support.
func CommonOddsRatio(ctx context.Context, ts []Stratum, opt CommonOptions) (Interval, error) {
	const fn = "interval.CommonOddsRatio"
	lv, err := commonSetup(fn, ts, opt)
	if err != nil {
		return Interval{}, err
	}
	iv := Interval{Level: lv.level, Side: lv.side, Method: opt.Method.String(), Parameter: "common odds ratio"}
	if m := strata.MH(ts); m.Used < len(ts) {
		iv.Warnings = append(iv.Warnings, strataCount(len(ts)-m.Used, "with an empty group carries", "with an empty group carry")+" no information and "+map[bool]string{true: "was", false: "were"}[len(ts)-m.Used == 1]+" left out")
	}
	switch opt.Method {
	case CommonMantelHaenszelGR:
		return Interval{}, argerr.Invalid(fn, "Method", opt.Method.String(), "is a risk-difference method; use CommonMantelHaenszel, CommonStratifiedScore or an exact conditional method")
	case CommonExactConditional, CommonExactConditionalMidP:
		if ctx == nil {
			ctx = context.Background()
		}
		c, err := strata.NewConditional(ctx, fn, ts)
		if err != nil {
			return Interval{}, err
		}
		mid := opt.Method == CommonExactConditionalMidP
		iv.Estimate = c.MLE()
		iv.Lower, iv.Upper = 0, math.Inf(1)
		if lv.wantLower() && c.Obs > c.Lo {
			iv.Lower = c.Limit(lv.tail, mid, true)
		}
		if lv.wantUpper() && c.Obs < c.Hi() {
			iv.Upper = c.Limit(lv.tail, mid, false)
		}
		if c.Lo == c.Hi() {
			iv.Warnings = append(iv.Warnings, "the margins allow only one sum of first cells: the data carry no information on the odds ratio")
		}
		return iv, nil
	}
	m := strata.MH(ts)
	if m.Used == 0 || m.R == 0 && m.S == 0 {
		iv.Estimate, iv.Lower, iv.Upper = math.NaN(), 0, math.Inf(1)
		iv.Warnings = append(iv.Warnings, "no stratum has a discordant product (a d or b c): the Mantel-Haenszel odds ratio is undefined")
		return iv, nil
	}
	if opt.Method == CommonStratifiedScore {
		if len(ts) > MaxScoreStrata {
			return Interval{}, scoreTooLarge(fn, len(ts))
		}
		iv.Method = "stratified Miettinen-Nurminen score"
		if opt.Weights == WeightsInverseVariance {
			iv.Method += " with inverse-variance score weights"
		}
		iv.Estimate = m.R / m.S
		z, stopped := cancelable(ctx, fn)
		scoreOdds(ts, lv, opt.Weights, z, &iv)
		if err := stopped(); err != nil {
			return Interval{}, err
		}
		return iv, nil
	}
	iv.Method = "Mantel-Haenszel Robins-Breslow-Greenland"
	iv.Estimate = m.R / m.S
	if m.R == 0 || m.S == 0 {
		iv.Lower, iv.Upper = 0, math.Inf(1)
		iv.Warnings = append(iv.Warnings, "every informative stratum has a zero product on the same diagonal: the estimate is at the end of its range and the Wald interval carries no information (use CommonExactConditional)")
		return iv, nil
	}
	se := math.Sqrt(m.PR/(2*m.R*m.R) + m.PSQR/(2*m.R*m.S) + m.QS/(2*m.S*m.S))
	iv.Lower, iv.Upper = logWald(lv, iv.Estimate, se)
	return iv, nil
}

// CommonRiskRatio returns a confidence interval for the risk ratio p1/p2
// common to all strata: the Mantel-Haenszel estimate
//
//	RR_MH = sum a_i n2_i / n_i  /  sum c_i n1_i / n_i
//
// with the Greenland-Robins variance of ln RR_MH,
//
//	sum (n1_i n2_i m_i - a_i c_i n_i) / n_i^2  /  (sum a_i n2_i / n_i)(sum c_i n1_i / n_i),
//
// m_i = a_i + c_i (Greenland S, Robins JM (1985), Estimation of a common
// effect parameter from sparse follow-up data, Biometrics 41:55-68), and
// limits exp(ln RR_MH -+ z se). CommonStratifiedScore gives the
// stratified score interval on ln rho, as CommonRiskDifference describes
// (with inverse-variance weights the grid spans rho from about 1e-20 to
// 1e20, a limit beyond it reported as 0 or +Inf, and a stratum with only
// successes in both groups keeps 1 inside the interval, with a warning;
// strata without successes carry no information on a ratio and are left
// out). Errors and warnings as CommonOddsRatio.
func CommonRiskRatio(ctx context.Context, ts []Stratum, opt CommonOptions) (Interval, error) {
	const fn = "interval.CommonRiskRatio"
	lv, err := commonSetup(fn, ts, opt)
	if err != nil {
		return Interval{}, err
	}
	if opt.Method != CommonMantelHaenszel && opt.Method != CommonStratifiedScore {
		return Interval{}, argerr.Invalid(fn, "Method", opt.Method.String(), "does not apply to the risk ratio; use CommonMantelHaenszel or CommonStratifiedScore")
	}
	iv := Interval{Level: lv.level, Side: lv.side, Method: "Mantel-Haenszel Greenland-Robins", Parameter: "common risk ratio"}
	m := strata.MH(ts)
	if m.Used == 0 || m.RRNum == 0 && m.RRDen == 0 {
		iv.Estimate, iv.Lower, iv.Upper = math.NaN(), 0, math.Inf(1)
		iv.Warnings = append(iv.Warnings, "no successes in any informative stratum: the Mantel-Haenszel risk ratio is undefined")
		return iv, nil
	}
	iv.Estimate = m.RRNum / m.RRDen
	if opt.Method == CommonStratifiedScore && len(ts) > MaxScoreStrata {
		return Interval{}, scoreTooLarge(fn, len(ts))
	}
	if opt.Method == CommonStratifiedScore && m.RRNum > 0 && m.RRDen > 0 {
		iv.Method = "stratified Miettinen-Nurminen score"
		if opt.Weights == WeightsInverseVariance {
			iv.Method += " with inverse-variance score weights"
		}
		z, stopped := cancelable(ctx, fn)
		if opt.Weights == WeightsInverseVariance {
			ivsRatio(ts, lv, z, &iv)
		} else {
			stratifiedRatioScore(ts, lv, z, &iv)
		}
		if err := stopped(); err != nil {
			return Interval{}, err
		}
		return iv, nil
	}
	se := math.Sqrt(m.RRVar / (m.RRNum * m.RRDen))
	iv.Lower, iv.Upper = logWald(lv, iv.Estimate, se)
	if m.RRNum == 0 || m.RRDen == 0 {
		iv.Lower, iv.Upper = 0, math.Inf(1)
		iv.Warnings = append(iv.Warnings, "one group has no successes in any informative stratum: the estimate is at the end of its range and the interval is unbounded")
	}
	return iv, nil
}

// CommonRiskDifference returns a confidence interval for the risk
// difference p1 - p2 common to all strata: the Mantel-Haenszel estimate
//
//	RD_MH = sum (a_i n2_i - c_i n1_i) / n_i  /  W,   W = sum n1_i n2_i / n_i,
//
// with Sato's variance (RD_MH P + Q) / W^2 (the zero value),
//
//	P = sum (n1_i^2 c_i - n2_i^2 a_i + n1_i n2_i (n2_i - n1_i)/2) / n_i^2,
//	Q = sum (a_i (n2_i - c_i) + c_i (n1_i - a_i)) / (2 n_i)
//
// (Sato T (1989), On the variance estimator for the Mantel-Haenszel risk
// difference, Biometrics 45:1323-1324), consistent for sparse and for
// large strata, or, with CommonMantelHaenszelGR, the Greenland-Robins
// (1985) variance sum (a_i b_i n2_i^3 + c_i d_i n1_i^3)/(n1_i n2_i n_i^2) / W^2,
// which needs large strata; limits RD_MH -+ z se, clipped to [-1, 1]
// (Clipped, with a warning).
//
// CommonStratifiedScore: the stratified score interval (see the method's
// doc) on (-1, 1). With Mantel-Haenszel weights the statistic decreases
// in delta and each limit is its root by Brent's method, the Estimate the
// Mantel-Haenszel one (where Z = 0). With WeightsInverseVariance the
// statistic is evaluated at 65 equally spaced values and at 0 and the
// Mantel-Haenszel estimate; the lower limit is the first value with
// Z <= z, the upper the last with Z >= -z, and Estimate the zero of Z
// nearest the Mantel-Haenszel estimate, each refined by Brent's method
// (1e-15) between neighbouring values. A stratum with no successes, or
// only successes, in both groups has restricted variance 0 at delta = 0:
// its inverse-variance weight grows without bound there, Z tends to 0,
// and 0 is always inside the interval (a warning says so; the
// Mantel-Haenszel weights have no such defect). When the accepted values
// on the grid are not one interval the limits are their outermost ends,
// with a warning. More than MaxScoreStrata strata are refused.
//
// Errors and warnings as CommonOddsRatio.
//
// Where the interval supports a clinical or safety decision, the choice
// of method and weights belongs to the study's qualified statistician and
// its applicable guidance, fixed before the data are seen.
func CommonRiskDifference(ctx context.Context, ts []Stratum, opt CommonOptions) (Interval, error) {
	const fn = "interval.CommonRiskDifference"
	lv, err := commonSetup(fn, ts, opt)
	if err != nil {
		return Interval{}, err
	}
	if opt.Method != CommonMantelHaenszel && opt.Method != CommonMantelHaenszelGR && opt.Method != CommonStratifiedScore {
		return Interval{}, argerr.Invalid(fn, "Method", opt.Method.String(), "does not apply to the risk difference; use CommonMantelHaenszel (Sato), CommonMantelHaenszelGR or CommonStratifiedScore")
	}
	name := "Mantel-Haenszel Sato"
	if opt.Method == CommonMantelHaenszelGR {
		name = "Mantel-Haenszel Greenland-Robins"
	}
	iv := Interval{Level: lv.level, Side: lv.side, Method: name, Parameter: "common risk difference"}
	m := strata.MH(ts)
	if m.Used == 0 {
		iv.Estimate, iv.Lower, iv.Upper = math.NaN(), -1, 1
		iv.Warnings = append(iv.Warnings, "no stratum has trials in both groups: the risk difference is undefined")
		return iv, nil
	}
	iv.Estimate = m.RDNum / m.W
	if opt.Method == CommonStratifiedScore && len(ts) > MaxScoreStrata {
		return Interval{}, scoreTooLarge(fn, len(ts))
	}
	if opt.Method == CommonStratifiedScore {
		iv.Method = "stratified Miettinen-Nurminen score"
		if opt.Weights == WeightsInverseVariance {
			iv.Method += " with inverse-variance score weights"
		}
		z, stopped := cancelable(ctx, fn)
		if opt.Weights == WeightsInverseVariance {
			ivsDifference(ts, lv, z, &iv)
		} else {
			stratifiedScore(ts, lv, z, &iv)
		}
		if err := stopped(); err != nil {
			return Interval{}, err
		}
		return iv, nil
	}
	v := (iv.Estimate*m.SatoP + m.SatoQ) / (m.W * m.W)
	if opt.Method == CommonMantelHaenszelGR {
		v = m.GRRD / (m.W * m.W)
	}
	se := math.Sqrt(math.Max(v, 0))
	iv.Lower, iv.Upper = -1, 1
	if lv.wantLower() {
		iv.Lower = iv.Estimate - lv.z*se
	}
	if lv.wantUpper() {
		iv.Upper = iv.Estimate + lv.z*se
	}
	if iv.Lower < -1 || iv.Upper > 1 {
		iv.Lower, iv.Upper = math.Max(iv.Lower, -1), math.Min(iv.Upper, 1)
		iv.Clipped = true
		iv.Warnings = append(iv.Warnings, "a limit fell outside [-1, 1] and was clipped")
	}
	if se == 0 {
		iv.Warnings = append(iv.Warnings, "the estimated variance is 0 (every stratum at 0 or 1 in both groups): the interval has no width")
	}
	return iv, nil
}

// stratifiedScore fills the limits of the stratified Miettinen-Nurminen
// interval: the roots of Z(delta) = +-z in (-1, 1), found by Brent's
// method (Z decreases in delta), or the end of the range where Z never
// reaches the bound.
func stratifiedScore(ts []Stratum, lv level, wrap zWrap, iv *Interval) {
	var x1, n1, x2, n2 []int64
	for _, t := range ts {
		x1, n1, x2, n2 = append(x1, t.K1), append(n1, t.N1), append(x2, t.K2), append(n2, t.N2)
	}
	z := wrap(func(d float64) float64 {
		return score.StratifiedDiffZ(x1, n1, x2, n2, d, score.MiettinenNurminen, score.MantelHaenszelWeights)
	})
	iv.Lower, iv.Upper = -1, 1
	est := iv.Estimate
	if lv.wantLower() {
		f := func(d float64) float64 { return z(d) - lv.z }
		if f(-1+1e-15) > 0 && f(est) < 0 {
			if r, err := root.Brent(f, -1+1e-15, est, 1e-15, 1e-20); err == nil {
				iv.Lower = r
			}
		} else if f(est) >= 0 {
			iv.Lower = est
		}
	}
	if lv.wantUpper() {
		f := func(d float64) float64 { return z(d) + lv.z }
		if f(est) > 0 && f(1-1e-15) < 0 {
			if r, err := root.Brent(f, est, 1-1e-15, 1e-15, 1e-20); err == nil {
				iv.Upper = r
			}
		} else if f(est) <= 0 {
			iv.Upper = est
		}
	}
}

// stratifiedRatioScore fills the limits of the stratified
// Miettinen-Nurminen interval of a common ratio: the roots of Z(rho) = -+z
// on ln rho (Z decreases in rho), bracketed by doubling from the estimate;
// 0 or +Inf where Z never reaches the bound.
func stratifiedRatioScore(ts []Stratum, lv level, wrap zWrap, iv *Interval) {
	var x1, n1, x2, n2 []int64
	for _, t := range ts {
		x1, n1, x2, n2 = append(x1, t.K1), append(n1, t.N1), append(x2, t.K2), append(n2, t.N2)
	}
	z := wrap(func(l float64) float64 {
		return score.StratifiedRatioZ(x1, n1, x2, n2, math.Exp(l), score.MiettinenNurminen, score.MantelHaenszelWeights)
	})
	le := math.Log(iv.Estimate)
	iv.Lower, iv.Upper = 0, math.Inf(1)
	find := func(target float64, dir float64) (float64, bool) {
		f := func(l float64) float64 { return z(l) - target }
		a, b := le, le+dir
		for i := 0; i < 60 && f(b)*f(a) > 0; i++ {
			a, b = b, b+dir*math.Pow(2, float64(i))
		}
		if f(a)*f(b) > 0 {
			return 0, false
		}
		lo, hi := math.Min(a, b), math.Max(a, b)
		r, err := root.Brent(f, lo, hi, 1e-15, 1e-15)
		return r, err == nil
	}
	if lv.wantLower() {
		if r, ok := find(lv.z, -1); ok {
			iv.Lower = math.Exp(r)
		}
	}
	if lv.wantUpper() {
		if r, ok := find(-lv.z, 1); ok {
			iv.Upper = math.Exp(r)
		}
	}
}

// strataCount returns "1 stratum " + one or "n strata " + many (the verb
// or phrase that follows the count), for warnings.
func strataCount(n int, one, many string) string {
	if n == 1 {
		return "1 stratum " + one
	}
	return argerr.Format(n) + " strata " + many
}

// zWrap wraps a score statistic for cancellation (see cancelable).
type zWrap func(func(float64) float64) func(float64) float64

// cancelable returns a wrapper for the score statistics of the stratified
// score intervals, each evaluation O(K), that checks ctx before every
// evaluation and, once it is done, returns NaN at once without evaluating
// (so the grid and root searches run out their bounded iterations at no
// cost), and a function giving the error to return then (nil while ctx is
// not done). A nil ctx never stops.
func cancelable(ctx context.Context, fn string) (zWrap, func() error) {
	if ctx == nil {
		ctx = context.Background()
	}
	var err error
	wrap := func(z func(float64) float64) func(float64) float64 {
		return func(x float64) float64 {
			if err != nil {
				return math.NaN()
			}
			if err = argerr.Canceled(fn, ctx); err != nil {
				return math.NaN()
			}
			return z(x)
		}
	}
	return wrap, func() error { return err }
}

package interval

import (
	"math"
	"sort"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/enum"
	"github.com/kofnlab/kofn/internal/root"
	"github.com/kofnlab/kofn/internal/score"
)

// ScoreWeights selects the stratum weights of the stratified score
// intervals (CommonStratifiedScore).
//
// The zero value, WeightsMantelHaenszel, is the default: its weights do
// not depend on the trial value, its statistic decreases in it, so the
// values accepted always form one interval, and a stratum with no
// successes (or only successes) in both groups cannot dominate.
// WeightsInverseVariance comes close to the most efficient combination
// when the strata's effects are equal and the strata are large.
type ScoreWeights int

const (
	// WeightsMantelHaenszel: the Cochran-Mantel-Haenszel weights
	// w_i = n1_i n2_i / (n1_i + n2_i).
	WeightsMantelHaenszel ScoreWeights = iota
	// WeightsInverseVariance: inverse-variance score weights
	// w_i = 1 / V_i(theta), V_i the stratum's restricted
	// (Miettinen-Nurminen) variance at the trial value theta, recomputed
	// at every value the limit search tries (the iterative weights of
	// Miettinen and Nurminen 1985, one of the weightings Tang 2020
	// studies; both recalled).
	WeightsInverseVariance
)

var scoreWeightNames = enum.New[ScoreWeights]("interval.ScoreWeights",
	[]string{"Mantel-Haenszel", "inverse-variance score"},
	map[string]ScoreWeights{"mh": WeightsMantelHaenszel, "cmh": WeightsMantelHaenszel, "ivs": WeightsInverseVariance, "inverse-variance": WeightsInverseVariance})

// String returns the name of the weighting.
func (w ScoreWeights) String() string { return scoreWeightNames.String(w) }

// MarshalText encodes the weighting by its String form.
func (w ScoreWeights) MarshalText() ([]byte, error) { return scoreWeightNames.MarshalText(w) }

// UnmarshalText decodes any spelling ParseScoreWeights accepts.
func (w *ScoreWeights) UnmarshalText(b []byte) error { return scoreWeightNames.UnmarshalText(w, b) }

// ParseScoreWeights returns the weighting whose String() is s, ignoring
// case; "mh", "cmh", "ivs" and "inverse-variance" are accepted too.
func ParseScoreWeights(s string) (ScoreWeights, error) {
	return scoreWeightNames.Parse("interval.ParseScoreWeights", s)
}

// ScoreWeightsValues lists the weightings in order.
func ScoreWeightsValues() []ScoreWeights { return scoreWeightNames.Values() }

// MaxScoreStrata bounds the strata of the stratified score intervals
// (CommonStratifiedScore): every trial value costs one restricted
// maximum-likelihood fit per stratum, and the limit search tries about 60
// values with Mantel-Haenszel weights and about 160 with inverse-variance
// weights, so a call near the limit takes a good part of a second (the
// README's table gives measured figures); the context passed to
// CommonOddsRatio, CommonRiskRatio and CommonRiskDifference is checked
// before every trial value, so a cancellation returns within one value's
// fits (O(K)). The Mantel-Haenszel methods have no such limit.
const MaxScoreStrata = 10_000

// scoreTooLarge is the error of a stratified score call over
// MaxScoreStrata.
func scoreTooLarge(fn string, k int) error {
	return argerr.TooLarge(fn, "strata", k, "exceeds the 10000 strata of the stratified score method (MaxScoreStrata); use CommonMantelHaenszel, which has no limit")
}

// uniformStrata counts the strata with trials in both groups whose
// outcomes are all failures or all successes in both groups (only the
// latter when ratio is set: a stratum without successes carries no
// information on a ratio).
func uniformStrata(ts []Stratum, ratio bool) int {
	n := 0
	for _, t := range ts {
		if t.N1 == 0 || t.N2 == 0 {
			continue
		}
		if (t.K1 == 0 && t.K2 == 0 && !ratio) || (t.K1 == t.N1 && t.K2 == t.N2) {
			n++
		}
	}
	return n
}

// scoreGrid is the number of equally spaced trial values at which the
// inverse-variance-weighted statistic is first evaluated.
const scoreGrid = 64 // 65 values with both ends

// weightedScoreLimits fills Estimate, Lower and Upper of the stratified
// score interval with inverse-variance weights. z is the statistic as a
// function of theta on [a, b] (the difference, or the log of the ratio),
// decreasing where the weights behave; specials are values to add to the
// grid (the Mantel-Haenszel estimate, and the value where a stratum's
// restricted variance vanishes). The statistic is evaluated on the grid;
// the lower limit is the first value with Z <= z_alpha, the upper the
// last with Z >= -z_alpha, the estimate the sign change of Z nearest the
// Mantel-Haenszel estimate, each refined by Brent's method between
// neighbouring grid values. It reports whether the accepted values on the
// grid form more than one run (the interval is then their hull).
func weightedScoreLimits(z func(float64) float64, a, b float64, specials []float64, lv level) (est, lo, hi float64, gap bool) {
	g := make([]float64, 0, scoreGrid+len(specials)+1)
	for j := 0; j <= scoreGrid; j++ {
		g = append(g, a+(b-a)*float64(j)/scoreGrid)
	}
	special := map[float64]bool{}
	for _, s := range specials {
		if s > a && s < b {
			g = append(g, s)
			special[s] = true
		}
	}
	sort.Float64s(g)
	zs := make([]float64, len(g))
	for j, x := range g {
		zs[j] = z(x)
	}
	refine := func(f func(float64) float64, x0, x1 float64) float64 {
		r, err := root.Brent(f, x0, x1, 1e-15, 1e-15)
		if err != nil {
			return x1
		}
		return r
	}
	// The estimate: the sign change nearest the Mantel-Haenszel estimate
	// (specials[0]), skipping exact zeros at special values (the limit
	// of Z where a variance vanishes, not a crossing).
	est = math.NaN()
	prev, best := -1, math.Inf(1)
	for j := range g {
		if zs[j] == 0 && special[g[j]] && g[j] != specials[0] {
			continue
		}
		if zs[j] == 0 {
			if d := math.Abs(g[j] - specials[0]); d < best {
				est, best = g[j], d
			}
		} else if prev >= 0 && zs[prev] > 0 && zs[j] < 0 {
			r := refine(z, g[prev], g[j])
			if d := math.Abs(r - specials[0]); d < best {
				est, best = r, d
			}
		}
		if zs[j] != 0 {
			prev = j
		}
	}
	if math.IsNaN(est) {
		est = specials[0]
	}
	accepted := func(j int) bool {
		return (!lv.wantLower() || zs[j] <= lv.z) && (!lv.wantUpper() || zs[j] >= -lv.z)
	}
	lo, hi = a, b
	first, last := -1, -1
	for j := range g {
		if accepted(j) {
			if first < 0 {
				first = j
			}
			last = j
		}
	}
	if first < 0 {
		// No grid value is accepted: the statistic jumps over the band
		// between two neighbours; the interval shrinks to the estimate.
		return est, est, est, false
	}
	if lv.wantLower() && first > 0 {
		f := func(x float64) float64 { return z(x) - lv.z }
		lo = refine(f, g[first-1], g[first])
	}
	if lv.wantUpper() && last < len(g)-1 {
		f := func(x float64) float64 { return z(x) + lv.z }
		hi = refine(f, g[last], g[last+1])
	}
	for j := first; j <= last; j++ {
		gap = gap || !accepted(j)
	}
	if !lv.wantLower() {
		lo = a
	}
	if !lv.wantUpper() {
		hi = b
	}
	return est, lo, hi, gap
}

// weightsGapWarning is the warning of an inverse-variance-weighted
// interval whose accepted values are not one interval; near names the
// value where a stratum's weight grows without bound.
func weightsGapWarning(near string) string {
	return "the values the inverse-variance-weighted score statistic accepts do not form one interval " +
		"(a stratum with no successes, or only successes, in both groups takes an unbounded weight near " + near + "); " +
		"the limits are their outermost ends: prefer the Mantel-Haenszel weights"
}

// stratumColumns splits strata into count columns.
func stratumColumns(ts []Stratum) (x1, n1, x2, n2 []int64) {
	for _, t := range ts {
		x1, n1, x2, n2 = append(x1, t.K1), append(n1, t.N1), append(x2, t.K2), append(n2, t.N2)
	}
	return x1, n1, x2, n2
}

// ivsDifference fills the stratified score interval of the risk
// difference with inverse-variance score weights; iv.Estimate holds the
// Mantel-Haenszel estimate on entry and the score estimate on return.
func ivsDifference(ts []Stratum, lv level, wrap zWrap, iv *Interval) {
	x1, n1, x2, n2 := stratumColumns(ts)
	z := wrap(func(d float64) float64 {
		return score.StratifiedDiffZ(x1, n1, x2, n2, d, score.MiettinenNurminen, score.InverseVarianceWeights)
	})
	const e = 1e-15
	est, lo, hi, gap := weightedScoreLimits(z, -1+e, 1-e, []float64{iv.Estimate, 0}, lv)
	if lo <= -1+e {
		lo = -1
	}
	if hi >= 1-e {
		hi = 1
	}
	iv.Estimate, iv.Lower, iv.Upper = est, lo, hi
	if u := uniformStrata(ts, false); u > 0 {
		iv.Warnings = append(iv.Warnings, strataCount(u, "has", "have")+" no successes, or only successes, in both groups: "+
			"the inverse-variance weights grow without bound near a difference of 0, so 0 is always inside the interval; prefer the Mantel-Haenszel weights")
	}
	if gap {
		iv.Warnings = append(iv.Warnings, weightsGapWarning("a difference of 0"))
	}
}

// ratioSpan is the range of ln rho the inverse-variance-weighted ratio
// interval searches: rho from about 1e-20 to 1e20; a limit beyond it is
// reported as 0 or +Inf.
const ratioSpan = 46.0

// logScaleLimits runs weightedScoreLimits for a ratio on its logarithm
// over [-ratioSpan, ratioSpan], starting from iv.Estimate (the
// Mantel-Haenszel estimate), and fills iv's estimate and limits, a limit
// at the end of the span reported as 0 or +Inf; it returns the estimate
// on the log scale and the gap flag.
func logScaleLimits(z func(float64) float64, lv level, iv *Interval) (est float64, gap bool) {
	est, lo, hi, gap := weightedScoreLimits(z, -ratioSpan, ratioSpan, []float64{math.Log(iv.Estimate), 0}, lv)
	iv.Estimate, iv.Lower, iv.Upper = math.Exp(est), math.Exp(lo), math.Exp(hi)
	if lo <= -ratioSpan {
		iv.Lower = 0
	}
	if hi >= ratioSpan {
		iv.Upper = math.Inf(1)
	}
	return est, gap
}

// ivsRatio is ivsDifference for the risk ratio, on ln rho.
func ivsRatio(ts []Stratum, lv level, wrap zWrap, iv *Interval) {
	x1, n1, x2, n2 := stratumColumns(ts)
	z := wrap(func(l float64) float64 {
		return score.StratifiedRatioZ(x1, n1, x2, n2, math.Exp(l), score.MiettinenNurminen, score.InverseVarianceWeights)
	})
	_, gap := logScaleLimits(z, lv, iv)
	if u := uniformStrata(ts, true); u > 0 {
		iv.Warnings = append(iv.Warnings, strataCount(u, "has", "have")+" only successes in both groups: "+
			"the inverse-variance weights grow without bound near a ratio of 1, so 1 is always inside the interval; prefer the Mantel-Haenszel weights")
	}
	if gap {
		iv.Warnings = append(iv.Warnings, weightsGapWarning("a ratio of 1"))
	}
}

// scoreOdds fills the stratified score interval of the common odds ratio
// with either weighting, on ln psi; iv.Estimate holds the Mantel-Haenszel
// estimate on entry (0 or +Inf when one product vanishes) and the score
// estimate on return.
func scoreOdds(ts []Stratum, lv level, w ScoreWeights, wrap zWrap, iv *Interval) {
	x1, n1, x2, n2 := stratumColumns(ts)
	sw := score.MantelHaenszelWeights
	if w == WeightsInverseVariance {
		sw = score.InverseVarianceWeights
	}
	z := wrap(func(l float64) float64 {
		return score.StratifiedOddsZ(x1, n1, x2, n2, math.Exp(l), score.MiettinenNurminen, sw)
	})
	est, gap := logScaleLimits(z, lv, iv)
	if est <= -ratioSpan {
		iv.Estimate = 0
	}
	if est >= ratioSpan {
		iv.Estimate = math.Inf(1)
	}
	if gap {
		iv.Warnings = append(iv.Warnings, "the values the stratified score statistic accepts do not form one interval; the limits are their outermost ends")
	}
}

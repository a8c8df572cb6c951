package power

import (
	"context"
	"math"
	"strconv"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"gonum.org/v1/gonum/mathext"
)

// SequentialTwoLook is one look of a two-proportion group-sequential
// design.
type SequentialTwoLook struct {
	// N is the cumulative size of each group at the look, Fraction the
	// planned information fraction.
	N        int64   `json:"n"`
	Fraction float64 `json:"fraction"`
	// Z is the efficacy bound on the pooled z statistic (stop rejecting H0
	// when z >= Z); ZFutility the futility bound (stop when z <=
	// ZFutility), -Inf without futility bounds.
	Z         float64 `json:"z"`
	ZFutility float64 `json:"z_futility"`
	// AlphaSpent is the cumulative alpha allowed by this look, and
	// AlphaNormal the normal-theory cumulative probability of rejecting by
	// this look under H0 (equal to AlphaSpent up to the integration error).
	AlphaSpent  float64 `json:"alpha_spent"`
	AlphaNormal float64 `json:"alpha_normal"`
	// AlphaExact and PowerExact are the exact cumulative probabilities of
	// rejecting by this look at the null value ExactNull (both groups) and
	// at (p1, p2), by enumeration; omitted when the enumeration was
	// skipped.
	AlphaExact float64 `json:"alpha_exact,omitempty"`
	PowerExact float64 `json:"power_exact,omitempty"`
}

// MarshalJSON encodes the look with non-finite floats as strings.
func (l SequentialTwoLook) MarshalJSON() ([]byte, error) {
	type plain SequentialTwoLook
	return jsonfloat.Marshal(plain(l))
}

// UnmarshalJSON decodes what MarshalJSON encodes.
func (l *SequentialTwoLook) UnmarshalJSON(b []byte) error {
	type plain SequentialTwoLook
	return jsonfloat.Unmarshal(b, (*plain)(l))
}

// SequentialTwoDesign is a group-sequential design comparing two
// proportions with equal group sizes.
type SequentialTwoDesign struct {
	P1    float64 `json:"p1"`    // success probability of group 1 under H1
	P2    float64 `json:"p2"`    // success probability of group 2 under H1 (< P1)
	Alpha float64 `json:"alpha"` // one-sided size
	Beta  float64 `json:"beta"`  // type II error
	// Spending, FutilitySpending and Binding as in SequentialOneDesign.
	Spending         string              `json:"spending"`
	FutilitySpending string              `json:"futility_spending,omitempty"`
	Binding          bool                `json:"binding"`
	Looks            []SequentialTwoLook `json:"looks"`
	// FixedN is the single-stage size per group by the normal
	// approximation (Fleiss' pooled formula, no continuity correction) and
	// Inflation the ratio of the group-sequential maximum to it; MaxN is
	// the final size per group.
	FixedN    float64 `json:"fixed_n"`
	Inflation float64 `json:"inflation"`
	MaxN      int64   `json:"max_n"`
	// PowerNormal, ExpectedN0Normal and ExpectedN1Normal are the
	// normal-theory power and expected sizes per group under H0 and H1.
	PowerNormal      float64 `json:"power_normal"`
	ExpectedN0Normal float64 `json:"expected_n0_normal"`
	ExpectedN1Normal float64 `json:"expected_n1_normal"`
	// Exact is true when the exact enumeration ran; ExactNull is the
	// common success probability at which the exact size is reported (of
	// p2, (p1 + p2)/2 and p1, the one giving the largest size), and AlphaExact,
	// PowerExact, ExpectedN0 and ExpectedN1 the exact size, power and
	// expected sizes per group.
	Exact      bool    `json:"exact"`
	ExactNull  float64 `json:"exact_null,omitempty"`
	AlphaExact float64 `json:"alpha_exact,omitempty"`
	PowerExact float64 `json:"power_exact,omitempty"`
	ExpectedN0 float64 `json:"expected_n0,omitempty"`
	ExpectedN1 float64 `json:"expected_n1,omitempty"`
	// Warnings lists caveats that do not stop the answer.
	Warnings []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the design with non-finite floats as strings.
func (d SequentialTwoDesign) MarshalJSON() ([]byte, error) {
	type plain SequentialTwoDesign
	return jsonfloat.Marshal(plain(d))
}

// UnmarshalJSON decodes what MarshalJSON encodes.
func (d *SequentialTwoDesign) UnmarshalJSON(b []byte) error {
	type plain SequentialTwoDesign
	return jsonfloat.Unmarshal(b, (*plain)(d))
}

// MaxExactTwoN is the largest final group size for which SequentialTwo
// enumerates the exact error rates (each enumeration then costs about
// 0.1 s); beyond it only the normal-theory values are given, with a
// warning.
const MaxExactTwoN int64 = 300

// SequentialTwo designs a one-sided group-sequential test of H0: p1 = p2
// against H1: p1 > p2 for two groups of equal size, with looks at the
// information fractions t (strictly increasing, the last 1; for example
// 1/3, 2/3, 1), by the normal approximation: the efficacy bounds on the
// pooled z statistic
//
//	z = (x1/n - x2/n) / sqrt(pbar (1 - pbar) 2/n),  pbar = (x1 + x2)/(2n)
//
// are the normal-theory spending bounds (SpendingBounds; with futility
// bounds from beta spending computed at the drift of H1), and the maximum
// size per group is the fixed-sample size (Fleiss' pooled formula) times
// the inflation factor (eta / (z_alpha + z_beta))^2, where eta is the drift
// at which the group-sequential test has power 1 - beta (Jennison C,
// Turnbull BW (2000), Group Sequential Methods with Applications to
// Clinical Trials, sections 7.2-7.3). Group sizes at the looks are
// round(t_k N). For a decrease, count the other outcome (p -> 1 - p).
//
// The attained error rates are then checked exactly by enumerating the
// counts of both groups look by look (dynamic programming over the pair of
// counts; a look whose counts make pbar 0 or 1 has z = 0): the size at the
// common null values p2, (p1 + p2)/2 and p1, reported at the largest, the
// power at (p1, p2) and the expected sizes; when the final group size
// exceeds MaxExactTwoN the enumeration is skipped with a warning. Errors:
// p1, p2 in (0, 1) with p1 > p2; alpha in (0, 0.5); beta in (0, 0.5);
// invalid fractions; a size above stagewise limits (ErrTooLarge). Cost:
// the bounds (SpendingBounds) plus four enumerations of O(N^3) each; ctx
// checked inside.
func SequentialTwo(ctx context.Context, p1, p2, alpha, beta float64, t []float64, opt SequentialOptions) (SequentialTwoDesign, error) {
	const fn = "power.SequentialTwo"
	if err := argerr.OpenProb(fn, "p1", p1); err != nil {
		return SequentialTwoDesign{}, err
	}
	if err := argerr.OpenProb(fn, "p2", p2); err != nil {
		return SequentialTwoDesign{}, err
	}
	if p1 <= p2 {
		return SequentialTwoDesign{}, argerr.Invalid(fn, "p1", p1, "must exceed p2 = "+argerr.Format(p2)+" (for a decrease count the other outcome)")
	}
	if !(alpha > 0 && alpha < 0.5) {
		return SequentialTwoDesign{}, argerr.Invalid(fn, "alpha", alpha, "must lie in (0, 0.5)")
	}
	if !(beta > 0 && beta < 0.5) {
		return SequentialTwoDesign{}, argerr.Invalid(fn, "beta", beta, "must lie in (0, 0.5)")
	}
	if err := checkFractions(fn, t); err != nil {
		return SequentialTwoDesign{}, err
	}
	if err := opt.check(fn); err != nil {
		return SequentialTwoDesign{}, err
	}
	nb, err := driftFor(ctx, t, alpha, beta, opt)
	if err != nil {
		return SequentialTwoDesign{}, argerr.Canceled(fn, ctx)
	}
	za, zb := -mathext.NormalQuantile(alpha), -mathext.NormalQuantile(beta)
	pbar := (p1 + p2) / 2
	delta := p1 - p2
	fixed := math.Pow(za*math.Sqrt(2*pbar*(1-pbar))+zb*math.Sqrt(p1*(1-p1)+p2*(1-p2)), 2) / (delta * delta)
	infl := math.Pow(nb.eta/(za+zb), 2)
	real := fixed * infl
	if real > 1e7 {
		return SequentialTwoDesign{}, argerr.TooLarge(fn, "p1", p1, "gives more than 1e7 per group; the difference is too small to plan")
	}
	maxN := int64(math.Ceil(real - 1e-9))
	d := SequentialTwoDesign{P1: p1, P2: p2, Alpha: alpha, Beta: beta, Spending: opt.Spending.String(),
		Binding: opt.Binding && opt.Futility, FixedN: fixed, Inflation: infl, MaxN: maxN}
	if opt.Futility {
		d.FutilitySpending = opt.FutilitySpending.String()
	}
	sizes := make([]int64, len(t))
	for k, x := range t {
		sizes[k] = int64(math.Round(x * float64(maxN)))
		if k > 0 && sizes[k] <= sizes[k-1] {
			sizes[k] = sizes[k-1] + 1
		}
	}
	sizes[len(t)-1] = maxN
	if sizes[0] < 1 {
		return SequentialTwoDesign{}, argerr.Invalid(fn, "t[0]", t[0], "gives an empty first look at "+argerr.Format(maxN)+" per group")
	}
	var c0, cp float64
	for k, x := range t {
		c0 += nb.up0[k]
		cp += nb.up1[k]
		d.PowerNormal = cp
		d.Looks = append(d.Looks, SequentialTwoLook{N: sizes[k], Fraction: x, Z: nb.upper[k], ZFutility: nb.lower[k],
			AlphaSpent: opt.Spending.Spent(alpha, x), AlphaNormal: c0})
		d.ExpectedN0Normal += x * float64(maxN) * (nb.up0[k] + nb.low0[k])
		d.ExpectedN1Normal += x * float64(maxN) * (nb.up1[k] + nb.low1[k])
	}
	if !opt.Binding && opt.Futility {
		// the drift-0 stop probabilities ignored the futility bound; the
		// expected size under H0 must count futility stops.
		en, err := normalEN(ctx, t, nb.upper, nb.lower, 0, maxN)
		if err != nil {
			return SequentialTwoDesign{}, argerr.Canceled(fn, ctx)
		}
		d.ExpectedN0Normal = en
	}
	if maxN > MaxExactTwoN {
		d.Warnings = append(d.Warnings, "exact check skipped: "+argerr.Format(maxN)+" per group exceeds MaxExactTwoN = "+argerr.Format(MaxExactTwoN)+"; the error rates are normal-theory values")
		return d, nil
	}
	d.Exact = true
	worst := -1.0
	for _, p0 := range []float64{p2, pbar, p1} {
		e, err := exactTwo(ctx, sizes, nb.upper, nb.lower, p0, p0)
		if err != nil {
			return SequentialTwoDesign{}, argerr.Canceled(fn, ctx)
		}
		if e.reject > worst {
			worst = e.reject
			d.ExactNull, d.AlphaExact, d.ExpectedN0 = p0, e.reject, e.en
			for k := range d.Looks {
				d.Looks[k].AlphaExact = e.cumReject[k]
			}
		}
	}
	e, err := exactTwo(ctx, sizes, nb.upper, nb.lower, p1, p2)
	if err != nil {
		return SequentialTwoDesign{}, argerr.Canceled(fn, ctx)
	}
	d.PowerExact, d.ExpectedN1 = e.reject, e.en
	for k := range d.Looks {
		d.Looks[k].PowerExact = e.cumReject[k]
	}
	if d.AlphaExact > alpha {
		d.Warnings = append(d.Warnings, "the exact size "+strconv.FormatFloat(d.AlphaExact, 'f', 4, 64)+" exceeds alpha at p = "+
			strconv.FormatFloat(d.ExactNull, 'g', 4, 64)+": the normal approximation is liberal here")
	}
	if d.PowerExact < 1-beta {
		d.Warnings = append(d.Warnings, "the exact power "+strconv.FormatFloat(d.PowerExact, 'f', 4, 64)+" is below the target "+
			strconv.FormatFloat(1-beta, 'f', 4, 64))
	}
	return d, nil
}

// normalEN returns the normal-theory expected size at drift eta with both
// bounds obeyed.
func normalEN(ctx context.Context, t, upper, lower []float64, eta float64, maxN int64) (float64, error) {
	g := &gsGrid{first: true, eta: eta}
	h := gridStep(t)
	var en float64
	for k, tk := range t {
		u, l := g.cross(tk, upper[k], lower[k])
		if k == len(t)-1 {
			// everything left stops here
			en += tk * float64(maxN) * (u + l)
			break
		}
		en += tk * float64(maxN) * (u + l)
		var err error
		if g, err = g.next(ctx, tk, upper[k], lower[k], h); err != nil {
			return 0, err
		}
	}
	return en, nil
}

type exactTwoResult struct {
	reject    float64
	cumReject []float64
	en        float64
}

// exactTwo enumerates the pairs of cumulative counts look by look: the
// density of (x1, x2) on the paths still running, convolved separately
// with the binomial probabilities of each group's new subjects.
func exactTwo(ctx context.Context, sizes []int64, upper, lower []float64, p1, p2 float64) (exactTwoResult, error) {
	res := exactTwoResult{cumReject: make([]float64, len(sizes))}
	g := []float64{1} // (prevN+1)^2, index x1*(prevN+1) + x2
	var prevN int64
	for k, n := range sizes {
		m := n - prevN
		w1 := pmfFull(m, p1)
		w2 := pmfFull(m, p2)
		w := int(n + 1)
		pw := int(prevN + 1)
		// convolve in x1: tmp[(x1)*pw + x2]
		tmp := make([]float64, w*pw)
		for a := 0; a < pw; a++ {
			if a%16 == 15 && ctx.Err() != nil {
				return res, ctx.Err()
			}
			for b := 0; b < pw; b++ {
				v := g[a*pw+b]
				if v == 0 {
					continue
				}
				for j, wj := range w1 {
					tmp[(a+j)*pw+b] += v * wj
				}
			}
		}
		h := make([]float64, w*w)
		for a := 0; a < w; a++ {
			if a%16 == 15 && ctx.Err() != nil {
				return res, ctx.Err()
			}
			for b := 0; b < pw; b++ {
				v := tmp[a*pw+b]
				if v == 0 {
					continue
				}
				row := h[a*w+b : a*w+b+len(w2)]
				for j, wj := range w2 {
					row[j] += v * wj
				}
			}
		}
		last := k == len(sizes)-1
		var rej, stop float64
		nf := float64(n)
		for a := 0; a < w; a++ {
			for b := 0; b < w; b++ {
				v := h[a*w+b]
				if v == 0 {
					continue
				}
				z := equalPooledZ(float64(a), float64(b), nf)
				switch {
				case z >= upper[k]:
					rej += v
					stop += v
					h[a*w+b] = 0
				case last || z <= lower[k]:
					stop += v
					h[a*w+b] = 0
				}
			}
		}
		res.reject += rej
		res.cumReject[k] = res.reject
		res.en += nf * stop
		g = h
		prevN = n
	}
	return res, nil
}

// equalPooledZ is the pooled z statistic of x1 and x2 successes in n each; 0
// when the pooled proportion is 0 or 1.
func equalPooledZ(x1, x2, n float64) float64 {
	pb := (x1 + x2) / (2 * n)
	v := pb * (1 - pb) * 2 / n
	if v <= 0 {
		return 0
	}
	return (x1 - x2) / n / math.Sqrt(v)
}

// pmfFull returns b(j; m, p), j = 0..m, from binom's log-space density.
func pmfFull(m int64, p float64) []float64 {
	d := binom.Dist{N: m, P: p}
	w := make([]float64, m+1)
	for j := range w {
		w[j] = math.Exp(d.LogProb(int64(j)))
	}
	return w
}

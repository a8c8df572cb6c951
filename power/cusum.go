package power

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/enum"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/internal/root"
)

// Shift is the direction of the change in a rate that a CUSUM chart
// watches for. The zero value, Increase, is the default because the
// usual watched rate is a defect or error rate, where an increase is the
// harm.
type Shift int

// The directions.
const (
	Increase Shift = iota // the rate rises from P0 to P1 > P0
	Decrease              // the rate falls from P0 to P1 < P0
)

var shiftNames = enum.New[Shift]("power.Shift", []string{"increase", "decrease"}, nil)

// String returns "increase" or "decrease".
func (s Shift) String() string { return shiftNames.String(s) }

// MarshalText encodes the direction by its name.
func (s Shift) MarshalText() ([]byte, error) { return shiftNames.MarshalText(s) }

// UnmarshalText decodes a name accepted by ParseShift.
func (s *Shift) UnmarshalText(b []byte) error { return shiftNames.UnmarshalText(s, b) }

// ParseShift returns the direction named s ("increase" or "decrease",
// ignoring case).
func ParseShift(s string) (Shift, error) { return shiftNames.Parse("power.ParseShift", s) }

// ShiftValues returns the directions in order.
func ShiftValues() []Shift { return shiftNames.Values() }

// MaxCUSUMUnit is the largest denominator of the chart's reference value.
const MaxCUSUMUnit = 100000

// MaxCUSUMWork bounds the exact run-length calculation: the chart's states
// times the width of the band of the transition matrix (memory, 8 bytes
// each) must stay below it, and so must the states times the two jump
// sizes (operations). Beyond it the functions return ErrTooLarge.
const MaxCUSUMWork = 1e7

// CUSUM is a Bernoulli CUSUM chart (Reynolds and Stoumbos 1999) for a
// change of a rate from P0 to P1, item by item. With X_t = 1 for an item
// that is a success (a defect, an error) and the reference value
//
//	gamma = ln((1-P0)/(1-P1)) / ln(P1 (1-P0) / (P0 (1-P1))),
//
// the chart for an increase is B_t = max(0, B_(t-1) + X_t - gamma) and
// the one for a decrease B_t = max(0, B_(t-1) + gamma - X_t), both from
// B_0 = 0; the chart signals at the first t with B_t >= H. Each is the
// log likelihood-ratio CUSUM of Page (1954) divided by |ln(P1 (1-P0) /
// (P0 (1-P1)))|, so it is the quickest detector of the stated change in
// Moustakides's (1986) sense.
//
// The chart is run on integers: gamma is replaced by the fraction
// Ref/Unit nearest to it (Unit the smallest denominator within a
// relative 1e-3, or the one asked for), the statistic S_t = Unit B_t
// moves by Unit - Ref on a success and by -Ref on a failure (the other way
// round for a decrease), and the chart signals at S_t >= Threshold. The
// chart so defined is exactly the likelihood-ratio CUSUM for the rate
// AdjustedP1 (close to P1), and its run lengths are exact (CUSUMRunLength).
// Step and Batch cost O(1).
//
// Sources: Reynolds MR Jr, Stoumbos ZG (1999), A CUSUM chart for
// monitoring a proportion when inspecting continuously, Journal of
// Quality Technology 31:87-108; Page ES (1954), Continuous inspection
// schemes, Biometrika 41:100-115; Moustakides GV (1986), Annals of
// Statistics 14:1379-1387.
type CUSUM struct {
	P0    float64 `json:"p0"`    // in-control rate
	P1    float64 `json:"p1"`    // out-of-control rate the chart is designed to detect
	Shift Shift   `json:"shift"` // direction of the change
	// Gamma is the exact reference value for (P0, P1); Ref/Unit the
	// fraction the chart uses.
	Gamma float64 `json:"gamma"`
	Ref   int64   `json:"ref"`
	Unit  int64   `json:"unit"`
	// Threshold is the signal limit on the integer scale; H =
	// Threshold/Unit the limit on the scale of B.
	Threshold int64   `json:"threshold"`
	H         float64 `json:"h"`
	// AdjustedP1 is the rate for which Ref/Unit is the exact reference
	// value; 0, omitted from JSON and explained in Warnings, when no rate
	// in floating point has that reference value (rates within about
	// 1e-15 of 0 or 1).
	AdjustedP1 float64 `json:"adjusted_p1,omitempty"`
	// Warnings lists things that do not stop the chart.
	Warnings []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the chart with non-finite floats as strings.
func (c CUSUM) MarshalJSON() ([]byte, error) {
	type plain CUSUM
	return jsonfloat.Marshal(plain(c))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (c *CUSUM) UnmarshalJSON(b []byte) error {
	type plain CUSUM
	return jsonfloat.Unmarshal(b, (*plain)(c))
}

// CUSUMOptions are the options of NewCUSUM and CUSUMForARL; the zero
// value is an increase chart with an automatic denominator.
type CUSUMOptions struct {
	Shift Shift
	// Unit is the denominator of the reference value; 0 means the
	// smallest one that puts Ref/Unit within a relative 1e-3 of gamma
	// (at most MaxCUSUMUnit).
	Unit int64
}

// refValue returns gamma for (p0, p1).
func refValue(p0, p1 float64) float64 {
	num := math.Log1p(-p0) - math.Log1p(-p1)
	den := math.Log(p1) - math.Log(p0) + num
	// for a decrease both are negative: ln((1-p1)/(1-p0)) / ln(p0 (1-p1) / (p1 (1-p0)))
	return num / den
}

// newChart validates (p0, p1, opt) and fixes the reference fraction.
func newChart(fn string, p0, p1 float64, opt CUSUMOptions) (CUSUM, error) {
	if err := argerr.OpenProb(fn, "p0", p0); err != nil {
		return CUSUM{}, err
	}
	if err := argerr.OpenProb(fn, "p1", p1); err != nil {
		return CUSUM{}, err
	}
	switch opt.Shift {
	case Increase:
		if !(p1 > p0) {
			return CUSUM{}, argerr.Invalid(fn, "p1", p1, "is not above p0 = "+argerr.Format(p0)+" for an increase chart")
		}
	case Decrease:
		if !(p1 < p0) {
			return CUSUM{}, argerr.Invalid(fn, "p1", p1, "is not below p0 = "+argerr.Format(p0)+" for a decrease chart")
		}
	default:
		return CUSUM{}, argerr.Invalid(fn, "Shift", int(opt.Shift), "is not a shift; use Increase or Decrease")
	}
	if opt.Unit < 0 || opt.Unit > MaxCUSUMUnit {
		return CUSUM{}, argerr.Invalid(fn, "Unit", opt.Unit, "must lie in [1, 100000] (0 means automatic)")
	}
	c := CUSUM{P0: p0, P1: p1, Shift: opt.Shift, Gamma: refValue(p0, p1)}
	if opt.Unit > 0 {
		c.Unit = opt.Unit
		c.Ref = int64(math.Round(c.Gamma * float64(c.Unit)))
	} else {
		for m := int64(1); m <= MaxCUSUMUnit; m++ {
			a := int64(math.Round(c.Gamma * float64(m)))
			if a >= 1 && a < m && math.Abs(float64(a)/float64(m)-c.Gamma) <= 1e-3*c.Gamma {
				c.Unit, c.Ref = m, a
				break
			}
		}
		if c.Unit == 0 {
			return CUSUM{}, argerr.TooLarge(fn, "p0", p0, "gives a reference value "+argerr.Format(c.Gamma)+" that needs a denominator above 100000")
		}
	}
	if c.Ref < 1 || c.Ref >= c.Unit {
		return CUSUM{}, argerr.Invalid(fn, "Unit", c.Unit, "is too small for the reference value "+argerr.Format(c.Gamma)+"; Ref/Unit must lie strictly between 0 and 1")
	}
	c.AdjustedP1 = adjustedP1(p0, float64(c.Ref)/float64(c.Unit), opt.Shift)
	if math.IsNaN(c.AdjustedP1) {
		c.AdjustedP1 = 0
		c.Warnings = append(c.Warnings, "no rate has the rounded reference value Ref/Unit exactly in floating point; the chart is the one for P1 as given")
	}
	return c, nil
}

// adjustedP1 returns the p1 whose reference value is g.
func adjustedP1(p0, g float64, s Shift) float64 {
	f := func(p1 float64) float64 { return refValue(p0, p1) - g }
	lo, hi := p0, 1.0
	if s == Decrease {
		lo, hi = 0, p0
	}
	eps := 1e-15
	r, err := root.Brent(f, lo+eps*(hi-lo), hi-eps*(hi-lo), 1e-14, 0)
	if err != nil {
		return math.NaN()
	}
	return r
}

// NewCUSUM returns the chart for a change from p0 to p1 in the direction
// opt.Shift with signal limit h on the scale of B (rounded up to a
// multiple of 1/Unit). Domain: p0, p1 in (0, 1) in the stated order, h >
// 0 and h Unit <= 1e9.
func NewCUSUM(p0, p1, h float64, opt CUSUMOptions) (CUSUM, error) {
	const fn = "power.NewCUSUM"
	c, err := newChart(fn, p0, p1, opt)
	if err != nil {
		return CUSUM{}, err
	}
	if !(h > 0) || h*float64(c.Unit) > 1e9 {
		return CUSUM{}, argerr.Invalid(fn, "h", h, "must be positive with h x Unit at most 1e9")
	}
	c.Threshold = int64(math.Ceil(h*float64(c.Unit) - 1e-9))
	c.H = float64(c.Threshold) / float64(c.Unit)
	return c, nil
}

// steps returns the jumps of the integer statistic: up (the harmful
// direction) and down, and whether a success is the up-step.
func (c CUSUM) steps() (up, down int64, successUp bool) {
	if c.Shift == Increase {
		return c.Unit - c.Ref, c.Ref, true
	}
	return c.Ref, c.Unit - c.Ref, false
}

// Step returns the chart's integer statistic after one more item (success
// reports a success: a defect, an error) from statistic s, and whether
// the chart signals (s >= Threshold). s = 0 starts the chart. No
// validation; s must be in [0, Threshold).
func (c CUSUM) Step(s int64, success bool) (int64, bool) {
	up, down, su := c.steps()
	if success == su {
		s += up
	} else {
		s -= down
		if s < 0 {
			s = 0
		}
	}
	return s, s >= c.Threshold
}

// Batch returns the statistic after a group of items with k successes
// among m, when their order is unknown: the binomial CUSUM update
// max(0, s + k Unit - m Ref) (for a decrease, max(0, s + m Ref - k Unit)),
// which equals the item-by-item chart when the group's items that raise
// the statistic come first (successes for an increase, failures for a
// decrease), so that no reset happens inside the group. Its
// run lengths are not those of CUSUMRunLength (those count single
// items). Errors: k < 0, k > m, or s < 0.
func (c CUSUM) Batch(s, k, m int64) (int64, bool, error) {
	const fn = "power.CUSUM.Batch"
	if err := argerr.KN(fn, "k", "m", k, m); err != nil {
		return 0, false, err
	}
	if err := argerr.Count(fn, "s", s); err != nil {
		return 0, false, err
	}
	if m > 1<<40 {
		return 0, false, argerr.TooLarge(fn, "m", m, "exceeds 2^40")
	}
	d := k*c.Unit - m*c.Ref
	if c.Shift == Decrease {
		d = -d
	}
	s += d
	if s < 0 {
		s = 0
	}
	return s, s >= c.Threshold, nil
}

// RunLength is the exact run-length behaviour of a CUSUM chart at one
// rate, from the start B_0 = 0.
type RunLength struct {
	P float64 `json:"p"` // the rate
	// ARL is the average run length, the expected number of items to the
	// first signal; SDRL its standard deviation. Both are +Inf when the
	// chart can never signal at P (the statistic cannot rise).
	ARL  float64 `json:"arl"`
	SDRL float64 `json:"sdrl"`
	// States is the number of transient states of the Markov chain solved.
	States int64 `json:"states"`
}

// MarshalJSON encodes the result with non-finite floats as strings.
func (r RunLength) MarshalJSON() ([]byte, error) {
	type plain RunLength
	return jsonfloat.Marshal(plain(r))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (r *RunLength) UnmarshalJSON(b []byte) error {
	type plain RunLength
	return jsonfloat.Unmarshal(b, (*plain)(r))
}

// CUSUMRunLength returns the exact average run length (and its standard
// deviation) of chart c when items are independent with success rate p:
// in control (p = P0), out of control (p = P1) or at any other rate.
//
// Method: the Markov chain of Brook and Evans (1972). The integer
// statistic takes the values 0 .. Threshold - 1 before the signal; with Q
// the transitions among them, the vector of ARLs from each state solves
// (I - Q) L = 1 and the second moments (I - Q) S = 1 + 2 Q L. I - Q is
// banded (Ref below, Unit - Ref above the diagonal for an increase) and
// an M-matrix, solved by a subtraction-free elimination (see solve) whose
// relative accuracy does not degrade with the size of the ARL; cost
// O(Threshold Ref (Unit - Ref)) operations and O(Threshold Unit) memory,
// limited by MaxCUSUMWork (BenchmarkCUSUMRunLength measures charts of 344
// to 3465 states; the figures are in the README's speed table).
// ctx is checked every 1024 rows.
//
// Accuracy: about 1e-13 relative for the ARL at any size (checked against
// 60-digit mpmath solves up to ARL 1.7e7 and dense LAPACK solves); the
// SDRL, a difference of moments, to about 1e-12 relative.
//
// Domain: a chart from NewCUSUM or CUSUMForARL, p in [0, 1]. At p = 0
// (increase) or p = 1 (decrease) the chart never signals: ARL = +Inf.
// A run length beyond 1e150 items (a limit far too high for any use)
// returns ErrTooLarge rather than an overflowed value.
//
// Source: Brook D, Evans DA (1972), An approach to the probability
// distribution of CUSUM run length, Biometrika 59:539-549; Reynolds and
// Stoumbos (1999), section 3.
func CUSUMRunLength(ctx context.Context, c CUSUM, p float64) (RunLength, error) {
	return cusumRunLength(ctx, "power.CUSUMRunLength", c, p)
}

func cusumRunLength(ctx context.Context, fn string, c CUSUM, p float64) (RunLength, error) {
	if c.Unit < 1 || c.Ref < 1 || c.Ref >= c.Unit || c.Threshold < 1 {
		return RunLength{}, argerr.Invalid(fn, "c", "CUSUM", "is not built; use NewCUSUM or CUSUMForARL")
	}
	if err := argerr.Prob(fn, "p", p); err != nil {
		return RunLength{}, err
	}
	if err := cusumSize(fn, c, c.Threshold); err != nil {
		return RunLength{}, err
	}
	_, _, su := c.steps()
	pu := p // probability of the up-step
	if !su {
		pu = 1 - p
	}
	if pu == 0 {
		return RunLength{P: p, ARL: math.Inf(1), SDRL: math.Inf(1), States: c.Threshold}, nil
	}
	l, s, err := c.solve(ctx, fn, pu)
	if err != nil {
		return RunLength{}, err
	}
	if !(l <= 1e150) || math.IsInf(s, 0) || math.IsNaN(s) {
		return RunLength{}, argerr.TooLarge(fn, "Threshold", c.Threshold, "gives an average run length beyond 1e150 items at p = "+
			argerr.Format(p)+", past what floating point holds with its spread; no chart needs a limit this high")
	}
	v := s - l*l
	if v < 0 {
		v = 0
	}
	return RunLength{P: p, ARL: l, SDRL: math.Sqrt(v), States: c.Threshold}, nil
}

// cusumSize refuses charts whose chain exceeds MaxCUSUMWork.
func cusumSize(fn string, c CUSUM, threshold int64) error {
	up, down, _ := c.steps()
	t := float64(threshold)
	if t*float64(up+down+1) > MaxCUSUMWork || t*float64(up)*float64(down) > 200*MaxCUSUMWork {
		return argerr.TooLarge(fn, "Threshold", threshold, "with jumps of "+argerr.Format(up)+" and "+argerr.Format(down)+
			" needs a Markov chain of more than 1e7 entries, the limit of the exact run lengths; use a coarser reference value (a smaller Unit) or a lower limit")
	}
	return nil
}

// solve returns E[T] and E[T^2] from state 0 for up-step probability pu.
//
// The elimination is subtraction-free: I - Q is kept as the magnitudes
// of its off-diagonal entries and its row sums (the one-step signal
// probabilities, pu or 0), each pivot is recomputed as the row sum plus
// the remaining off-diagonal magnitudes, and every update adds
// nonnegative terms (the GTH idea for M-matrices: Grassmann, Taksar and
// Heyman 1985; Alfa, Xue and Ye 2002, Mathematics of Computation
// 71:217-236). So the solution has a small relative error however large
// the run length is; plain elimination loses about one digit for every
// factor of ten in the ARL.
func (c CUSUM) solve(ctx context.Context, fn string, pu float64) (float64, float64, error) {
	up, down, _ := c.steps()
	n := int(c.Threshold)
	U, D := int(up), int(down)
	w := D + U + 1
	// mag[r*w + (col - r + D)] = |(I - Q)[r][col]| for col != r in [r-D, r+U]
	mag := make([]float64, n*w)
	rs := make([]float64, n) // row sums of I - Q: the chance to signal in one step
	pd := 1 - pu
	for r := 0; r < n; r++ {
		if t := max(r-D, 0); t != r {
			mag[r*w+t-r+D] += pd
		}
		if r+U < n {
			mag[r*w+U+D] += pu
		} else {
			rs[r] = pu
		}
	}
	piv := make([]float64, n)
	b1 := make([]float64, n)
	for i := range b1 {
		b1[i] = 1
	}
	for col := 0; col < n; col++ {
		if col&1023 == 1023 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return 0, 0, err
			}
		}
		prow := mag[col*w : (col+1)*w]
		d := rs[col]
		for j := 1; j <= U && col+j < n; j++ {
			d += prow[D+j]
		}
		piv[col] = d
		last := min(col+D, n-1)
		for r := col + 1; r <= last; r++ {
			rrow := mag[r*w : (r+1)*w]
			x := rrow[col-r+D]
			if x == 0 {
				continue
			}
			f := x / d
			rrow[col-r+D] = f // the multiplier, for the second solve
			for j := 1; j <= U && col+j < n; j++ {
				if k := col + j; k != r {
					rrow[k-r+D] += f * prow[D+j]
				}
			}
			rs[r] += f * rs[col]
			b1[r] += f * b1[col]
		}
	}
	back := func(b []float64) {
		for r := n - 1; r >= 0; r-- {
			row := mag[r*w : (r+1)*w]
			v := b[r]
			for j := 1; j <= U && r+j < n; j++ {
				v += row[D+j] * b[r+j]
			}
			b[r] = v / piv[r]
		}
	}
	back(b1)
	// S: right-hand side 1 + 2 Q L, Q L from the chain itself
	b2 := make([]float64, n)
	for r := 0; r < n; r++ {
		ql := pd * b1[max(r-D, 0)]
		if r+U < n {
			ql += pu * b1[r+U]
		}
		b2[r] = 1 + 2*ql
	}
	for col := 0; col < n; col++ {
		last := min(col+D, n-1)
		for r := col + 1; r <= last; r++ {
			if f := mag[r*w+col-r+D]; f != 0 {
				b2[r] += f * b2[col]
			}
		}
	}
	back(b2)
	return b1[0], b2[0], nil
}

// CUSUMForARL returns the chart for a change from p0 to p1 with the
// smallest integer Threshold whose in-control ARL (at p0) is at least
// arl0, found by doubling and bisection over Threshold, each step an
// exact CUSUMRunLength. The achieved in-control ARL is at least arl0 and,
// the threshold being an integer on the Unit scale, usually above it.
// Domain: p0, p1 and opt as NewCUSUM, arl0 in (1, 1e12]. Errors:
// ErrTooLarge when the threshold needed exceeds MaxCUSUMWork's chain.
func CUSUMForARL(ctx context.Context, p0, p1, arl0 float64, opt CUSUMOptions) (CUSUM, RunLength, error) {
	const fn = "power.CUSUMForARL"
	c, err := newChart(fn, p0, p1, opt)
	if err != nil {
		return CUSUM{}, RunLength{}, err
	}
	if !(arl0 > 1 && arl0 <= 1e12) {
		return CUSUM{}, RunLength{}, argerr.Invalid(fn, "arl0", arl0, "must lie in (1, 1e12]")
	}
	at := func(t int64) (RunLength, error) {
		c.Threshold = t
		return cusumRunLength(ctx, fn, c, p0)
	}
	lo, hi := int64(0), int64(1) // ARL(lo) < arl0 (lo = 0 signals at once), ARL(hi) to be found >= arl0
	var rhi RunLength
	for {
		if err := cusumSize(fn, c, hi); err != nil {
			return CUSUM{}, RunLength{}, err
		}
		r, err := at(hi)
		if err != nil {
			return CUSUM{}, RunLength{}, err
		}
		if r.ARL >= arl0 {
			rhi = r
			break
		}
		lo, hi = hi, hi*2
	}
	for hi-lo > 1 {
		mid := lo + (hi-lo)/2
		r, err := at(mid)
		if err != nil {
			return CUSUM{}, RunLength{}, err
		}
		if r.ARL >= arl0 {
			hi, rhi = mid, r
		} else {
			lo = mid
		}
	}
	c.Threshold = hi
	c.H = float64(hi) / float64(c.Unit)
	return c, rhi, nil
}

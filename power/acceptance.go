package power

import (
	"math"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
)

// Plan is a single sampling plan by attributes: inspect SampleSize items
// from a lot and accept the lot when at most AcceptNumber are defective.
type Plan struct {
	SampleSize   int64 `json:"n"` // items inspected, n >= 1
	AcceptNumber int64 `json:"c"` // largest defective count that accepts, 0 <= c < n
}

func (pl Plan) check(fn string) error {
	if pl.SampleSize < 1 {
		return argerr.Invalid(fn, "SampleSize", pl.SampleSize, "must be at least 1")
	}
	if pl.SampleSize > binom.MaxN {
		return argerr.TooLarge(fn, "SampleSize", pl.SampleSize, "exceeds 2^53")
	}
	if pl.AcceptNumber < 0 {
		return argerr.Invalid(fn, "AcceptNumber", pl.AcceptNumber, "is negative; the acceptance number is 0 or more")
	}
	if pl.AcceptNumber >= pl.SampleSize {
		return argerr.Invalid(fn, "AcceptNumber", pl.AcceptNumber, "is not below SampleSize = "+argerr.Format(pl.SampleSize)+"; such a plan accepts every lot")
	}
	return nil
}

// AcceptProb returns the operating characteristic of the plan for a large
// lot (or a process) with defect rate p, the binomial probability of
// acceptance
//
//	Pa(p) = P(X <= c),  X ~ Binomial(n, p).
//
// Example (Montgomery, Introduction to Statistical Quality Control, single
// sampling): n = 89, c = 2 accepts with probability 0.93969 at p = 0.01.
// Accuracy is binom's (1e-13 relative). Domain: a valid plan, 0 <= p <= 1.
func AcceptProb(pl Plan, p float64) (float64, error) {
	const fn = "power.AcceptProb"
	if err := pl.check(fn); err != nil {
		return 0, err
	}
	if err := argerr.Prob(fn, "p", p); err != nil {
		return 0, err
	}
	return pl.pa(p), nil
}

func (pl Plan) pa(p float64) float64 {
	return binom.Dist{N: pl.SampleSize, P: p}.CDF(pl.AcceptNumber)
}

// checkLot validates a lot size for rectifying inspection.
func (pl Plan) checkLot(fn string, lot int64) error {
	if lot < pl.SampleSize {
		return argerr.Invalid(fn, "lot", lot, "is smaller than the sample size "+argerr.Format(pl.SampleSize))
	}
	return nil
}

// OCCurve returns the plan's operating characteristic (binomial) at
// points+1 defect rates evenly spaced on [0, pMax], for plotting; X is the
// defect rate and Y the acceptance probability. Domain: 0 < pMax <= 1,
// 1 <= points <= 100000.
func OCCurve(pl Plan, pMax float64, points int) ([]Point, error) {
	const fn = "power.OCCurve"
	if err := pl.check(fn); err != nil {
		return nil, err
	}
	if !(pMax > 0 && pMax <= 1) {
		return nil, argerr.Invalid(fn, "pMax", pMax, "must lie in (0, 1]")
	}
	if points < 1 || points > 100000 {
		return nil, argerr.Invalid(fn, "points", points, "must be between 1 and 100000")
	}
	out := make([]Point, points+1)
	for i := range out {
		p := pMax * float64(i) / float64(points)
		out[i] = Point{X: p, Y: pl.pa(p)}
	}
	return out, nil
}

// Rectifying describes a plan under rectifying inspection: rejected lots
// are inspected in full and every defective found is replaced by a good
// item.
type Rectifying struct {
	// P is the incoming defect rate.
	P float64 `json:"p"`
	// AcceptProb is Pa(P), binomial.
	AcceptProb float64 `json:"accept_prob"`
	// AOQ is the average outgoing quality, Pa p (N - n) / N.
	AOQ float64 `json:"aoq"`
	// ATI is the average total inspection per lot, n + (1 - Pa)(N - n).
	ATI float64 `json:"ati"`
}

// MarshalJSON encodes the result with non-finite floats as strings.
func (r Rectifying) MarshalJSON() ([]byte, error) {
	type plain Rectifying
	return jsonfloat.Marshal(plain(r))
}

// UnmarshalJSON decodes what MarshalJSON writes, non-finite numbers
// included.
func (r *Rectifying) UnmarshalJSON(b []byte) error {
	type plain Rectifying
	return jsonfloat.Unmarshal(b, (*plain)(r))
}

// Rectify returns the average outgoing quality and the average total
// inspection of the plan for lots of size lot with incoming defect rate p:
//
//	AOQ = Pa(p) p (N - n) / N,   ATI = n + (1 - Pa(p)) (N - n),
//
// with Pa binomial (defectives in the sample are replaced too, so only
// the uninspected N - n items of accepted lots carry defects out).
// Example (Montgomery, single sampling with rectification): n = 89,
// c = 2, N = 10000, p = 0.01 gives ATI = 687 (686.7). 1 - Pa is
// computed as the upper tail directly. Domain: valid plan, lot >= n,
// 0 <= p <= 1.
func Rectify(pl Plan, lot int64, p float64) (Rectifying, error) {
	const fn = "power.Rectify"
	if err := pl.check(fn); err != nil {
		return Rectifying{}, err
	}
	if err := pl.checkLot(fn, lot); err != nil {
		return Rectifying{}, err
	}
	if err := argerr.Prob(fn, "p", p); err != nil {
		return Rectifying{}, err
	}
	return pl.rectify(lot, p), nil
}

func (pl Plan) rectify(lot int64, p float64) Rectifying {
	d := binom.Dist{N: pl.SampleSize, P: p}
	pa := d.CDF(pl.AcceptNumber)
	rest := float64(lot - pl.SampleSize)
	return Rectifying{
		P:          p,
		AcceptProb: pa,
		AOQ:        pa * p * rest / float64(lot),
		ATI:        float64(pl.SampleSize) + d.Survival(pl.AcceptNumber)*rest,
	}
}

// AOQLimit is the worst average outgoing quality over incoming defect
// rates.
type AOQLimit struct {
	// AOQL is the maximum of AOQ(p) over 0 <= p <= 1.
	AOQL float64 `json:"aoql"`
	// P is the incoming defect rate at which the maximum is reached.
	P float64 `json:"p"`
	// Curve is the AOQ at the grid of defect rates scanned before the
	// refinement (X = p, Y = AOQ), for plotting.
	Curve []Point `json:"curve"`
}

// MarshalJSON encodes the result with non-finite floats as strings.
func (r AOQLimit) MarshalJSON() ([]byte, error) {
	type plain AOQLimit
	return jsonfloat.Marshal(plain(r))
}

// UnmarshalJSON decodes what MarshalJSON writes, non-finite numbers
// included.
func (r *AOQLimit) UnmarshalJSON(b []byte) error {
	type plain AOQLimit
	return jsonfloat.Unmarshal(b, (*plain)(r))
}

// AOQL returns the average outgoing quality limit of the plan for lots of
// size lot: the maximum over p of AOQ(p) = Pa(p) p (N - n)/N. AOQ(p) is
// zero at both ends and, for binomial Pa, unimodal (p Pa(p) is
// log-concave in p), so a grid scan of 400 points on [0, p_hi], where p_hi
// is the rate beyond which Pa < 1e-12, brackets the maximum and a
// golden-section search refines it to 1e-12 relative in p. Domain: valid
// plan, lot >= n.
func AOQL(pl Plan, lot int64) (AOQLimit, error) {
	const fn = "power.AOQL"
	if err := pl.check(fn); err != nil {
		return AOQLimit{}, err
	}
	if err := pl.checkLot(fn, lot); err != nil {
		return AOQLimit{}, err
	}
	frac := float64(lot-pl.SampleSize) / float64(lot)
	aoq := func(p float64) float64 { return pl.pa(p) * p * frac }
	// p_hi: Pa(p_hi) < 1e-12, found by doubling from (c+1)/n.
	hi := math.Min(1, float64(pl.AcceptNumber+1)/float64(pl.SampleSize))
	for hi < 1 && pl.pa(hi) >= 1e-12 {
		hi = math.Min(1, 2*hi)
	}
	const grid = 400
	res := AOQLimit{Curve: make([]Point, grid+1)}
	best := 0
	for i := 0; i <= grid; i++ {
		p := hi * float64(i) / grid
		res.Curve[i] = Point{X: p, Y: aoq(p)}
		if res.Curve[i].Y > res.Curve[best].Y {
			best = i
		}
	}
	a := hi * float64(max(best-1, 0)) / grid
	b := hi * float64(min(best+1, grid)) / grid
	const g = 0.6180339887498949
	x1, x2 := b-g*(b-a), a+g*(b-a)
	f1, f2 := aoq(x1), aoq(x2)
	for i := 0; i < 200 && b-a > 1e-12*b; i++ {
		if f1 < f2 {
			a, x1, f1 = x1, x2, f2
			x2 = a + g*(b-a)
			f2 = aoq(x2)
		} else {
			b, x2, f2 = x2, x1, f1
			x1 = b - g*(b-a)
			f1 = aoq(x1)
		}
	}
	res.P = 0.5 * (a + b)
	res.AOQL = aoq(res.P)
	if v := res.Curve[best].Y; v > res.AOQL {
		res.P, res.AOQL = res.Curve[best].X, v
	}
	return res, nil
}

// AcceptProbLot returns the operating characteristic of the plan for a
// finite lot of lot items of which defectives are defective, sampled
// without replacement (type A OC curve): the hypergeometric probability
//
//	Pa = P(X <= c),  X ~ Hypergeometric(lot, defectives, n),
//
// from binom.Hyper. For lots much larger than n it approaches AcceptProb
// at p = defectives/lot. Domain: valid plan, n <= lot <= binom.MaxN,
// 0 <= defectives <= lot; ErrTooLarge beyond binom.MaxHyperStdDev (lots of
// billions with samples and defectives in the millions), where AcceptProb
// at p = defectives/lot answers.
func AcceptProbLot(pl Plan, lot, defectives int64) (float64, error) {
	const fn = "power.AcceptProbLot"
	if err := pl.check(fn); err != nil {
		return 0, err
	}
	if err := pl.checkLot(fn, lot); err != nil {
		return 0, err
	}
	if lot > binom.MaxN {
		return 0, argerr.TooLarge(fn, "lot", lot, "exceeds 2^53")
	}
	if err := argerr.KN(fn, "defectives", "lot", defectives, lot); err != nil {
		return 0, err
	}
	h, err := binom.NewHyper(lot, defectives, pl.SampleSize)
	if err != nil {
		return 0, argerr.TooLarge(fn, "lot", lot, "with this sample and these defectives is beyond the exact hypergeometric sum ("+err.Error()+"); use AcceptProb at p = defectives/lot")
	}
	return h.CDF(pl.AcceptNumber), nil
}

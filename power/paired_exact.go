package power

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/xmath"
	"github.com/kofnlab/kofn/test"
)

type condPower struct {
	next  func(d int64) (pw, size float64)
	base  int64
	c, c0 []float64
}

func newCondPower(p12, p21, alpha float64, o PairedOptions) *condPower {
	psi := p12 + p21
	q := 0.5
	if psi > 0 {
		q = p12 / psi
	}
	cp := &condPower{}
	if o.Method == test.McNemarAsymptotic {
		// Given d, the chi-square test rejects outside an interval of n10
		// around d/2, decided by test.McNemar; the interval of d seeds d+1.
		la := xmath.Log(alpha)
		opt := test.McNemarOptions{Method: test.McNemarAsymptotic, Alternative: o.Alternative}
		ga, gb := int64(0), int64(0)
		cp.next = func(d int64) (float64, float64) {
			ok := func(x int64) bool {
				r, err := test.McNemar(x, d-x, opt)
				return err != nil || r.LogPValue >= la
			}
			peak := d / 2
			switch o.Alternative {
			case test.Higher:
				peak = 0
			case test.Lower:
				peak = d
			}
			a, b := acceptInterval(ok, 0, d, peak, min(ga, d), min(gb+1, d))
			if a <= b {
				ga, gb = a, b
			}
			return rejectProb(d, q, a, b), rejectProb(d, 0.5, a, b)
		}
		return cp
	}
	oo := OneSampleOptions{Alternative: o.Alternative, Rule: test.Central, MidP: o.MidP}
	alt, null := newCurve(0.5, q, alpha, oo), newCurve(0.5, 0.5, alpha, oo)
	cp.next = func(d int64) (float64, float64) { return alt.power(d), null.power(d) }
	return cp
}

// extend makes c and c0 cover d = lo..hi (and keeps at most a short stretch
// below lo). ctx is checked every 256 values of d.
func (cp *condPower) extend(ctx context.Context, fn string, lo, hi int64) error {
	if len(cp.c) == 0 || lo < cp.base || lo > cp.base+int64(len(cp.c)) {
		cp.base, cp.c, cp.c0 = lo, cp.c[:0], cp.c0[:0]
	} else if drop := lo - cp.base; drop > 1024 && drop > int64(len(cp.c))/2 {
		cp.c, cp.c0 = append(cp.c[:0], cp.c[drop:]...), append(cp.c0[:0], cp.c0[drop:]...)
		cp.base = lo
	}
	for d := cp.base + int64(len(cp.c)); d <= hi; d++ {
		if d&255 == 0 {
			if err := argerr.Canceled(fn, ctx); err != nil {
				return err
			}
		}
		var pw, size float64
		if d > 0 {
			pw, size = cp.next(d)
		}
		cp.c = append(cp.c, pw)
		cp.c0 = append(cp.c0, size)
	}
	return nil
}

// at returns the unconditional power and size at n pairs with discordant
// probability psi: sum over d of Binomial(d; n, psi) c(d).
func (cp *condPower) at(ctx context.Context, fn string, n int64, psi float64, buf []float64) (pw, size float64, _ []float64, _ error) {
	lo, w := pmfWindow(n, psi, buf)
	if err := cp.extend(ctx, fn, lo, lo+int64(len(w))-1); err != nil {
		return 0, 0, w, err
	}
	for i, b := range w {
		j := lo + int64(i) - cp.base
		pw += b * cp.c[j]
		size += b * cp.c0[j]
	}
	return math.Min(pw, 1), math.Min(size, 1), w, nil
}

// PairedPower returns the exact power of McNemar's test (o.Method: exact
// conditional, mid-p, or the asymptotic chi-square test) with n pairs when
// the discordant cell probabilities are p12 and p21, by enumeration of the
// number of discordant pairs D ~ Binomial(n, p12 + p21) and, given D = d,
// of N10 ~ Binomial(d, p12/(p12 + p21)):
//
//	power = sum_d P(D = d) P(reject | d),
//
// with the test package's decisions: the conditional tests through
// onesample (p0 = 1/2, central, as test.McNemar computes them), the
// asymptotic one (test.McNemarAsymptotic with o.Enumerate) through
// test.McNemar itself. Size is the same sum under H0 with the same
// discordant probability (the asymptotic and mid-p tests can exceed
// alpha). For test.McNemarAsymptotic without Enumerate the power is Connor's
// closed form (PairedNormalPower) and Size is Alpha.
// AcceptLo/AcceptHi are not used (-1). Cost: a few p-values for each d in
// the window of D's distribution above 1e-17 of its mode, O(sqrt(n));
// memory O(sqrt(n)) (under 2 MB at MaxSearchN).
// ctx is checked every 256 values of d; a cancelled call returns the
// context's error wrapped.
func PairedPower(ctx context.Context, n int64, p12, p21 float64, o PairedOptions) (ExactPower, error) {
	const fn = "power.PairedPower"
	if n < 1 {
		return ExactPower{}, argerr.Invalid(fn, "n", n, "must be at least 1")
	}
	if n > MaxSearchN {
		return ExactPower{}, argerr.TooLarge(fn, "n", n, "exceeds MaxSearchN = "+argerr.Format(MaxSearchN))
	}
	alpha, _, err := o.check(fn, p12, p21, false)
	if err != nil {
		return ExactPower{}, err
	}
	if err := o.checkMethod(fn); err != nil {
		return ExactPower{}, err
	}
	r := ExactPower{Test: o.testName(), N: n, Alpha: alpha, AcceptLo: -1, AcceptHi: -1}
	if o.Method == test.McNemarAsymptotic && !o.Enumerate {
		r.Power, r.Size = pairedNormalPower(float64(n), p12, p21, alpha, o.Alternative), alpha
		return r, nil
	}
	cp := newCondPower(p12, p21, alpha, o)
	r.Power, r.Size, _, err = cp.at(ctx, fn, n, p12+p21, nil)
	if err != nil {
		return ExactPower{}, err
	}
	return r, nil
}

// PairedN returns the number of pairs for McNemar's test to reach the
// target power, searched on the exact power of PairedPower (the first n
// and the stable n, as OneSampleN), with Connor's normal-approximation n
// beside it. The scan starts at n = 1 and stops at o.MaxN (default
// DefaultMaxN, at most MaxSearchN) with ErrNoSolution; ctx is checked
// every 16 n. Cost O(N^1.5) for a result N.
func PairedN(ctx context.Context, p12, p21 float64, o PairedOptions) (ExactSize, error) {
	const fn = "power.PairedN"
	alpha, pw, err := o.check(fn, p12, p21, true)
	if err != nil {
		return ExactSize{}, err
	}
	if err := o.checkMethod(fn); err != nil {
		return ExactSize{}, err
	}
	limit, err := maxN(fn, o.MaxN, DefaultMaxN, MaxSearchN)
	if err != nil {
		return ExactSize{}, err
	}
	psi := p12 + p21
	var cp *condPower
	var buf []float64
	power := func(n int64) (float64, error) {
		return pairedNormalPower(float64(n), p12, p21, alpha, o.Alternative), nil
	}
	if o.Method != test.McNemarAsymptotic || o.Enumerate {
		cp = newCondPower(p12, p21, alpha, o)
		power = func(n int64) (float64, error) {
			var v float64
			var err error
			v, _, buf, err = cp.at(ctx, fn, n, psi, buf)
			return v, err
		}
	}
	r, err := scanStable(ctx, fn, scan{start: 1, maxN: limit, target: pw, extend: true,
		horizon: func(first int64) int64 { return max(2*first, first+100) }}, power)
	if err != nil {
		return ExactSize{}, err
	}
	r.Test = o.testName()
	at := r.Stable
	if at == 0 {
		at = r.First
	}
	r.Size = alpha
	if cp != nil {
		if _, r.Size, _, err = cp.at(ctx, fn, at, psi, nil); err != nil {
			return ExactSize{}, err
		}
	}
	if ns, err := PairedNormalN(p12, p21, o); err == nil {
		r.Normal = ns
	}
	return r, nil
}

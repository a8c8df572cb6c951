package power

import (
	"context"
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/xmath"
	"github.com/kofnlab/kofn/test"
)

// PairedMethod selects the McNemar test whose power is computed. The zero
// value, McNemarExact, is the default for planning because its size never
// exceeds alpha; the test package's McNemar defaults to mid-p, which is
// more powerful but only approximately keeps the size (Fagerland, Lydersen,
// Laake 2013).
type PairedMethod int

const (
	// McNemarExact is the exact conditional test: given d discordant
	// pairs, the count n10 is Binomial(d, 1/2) under H0, two-sided by
	// doubling the smaller tail.
	McNemarExact PairedMethod = iota
	// McNemarMidP is its mid-p version.
	McNemarMidP
	// McNemarAsymptotic is the chi-square test without continuity
	// correction, with the power of Connor's (1987) normal formula
	// (PairedNormalPower), or, with PairedOptions.Enumerate, its exact
	// power by enumeration (the test's real power, not the formula's).
	McNemarAsymptotic
)

var pairedNames = [...]string{"exact", "mid-p", "asymptotic"}

// String returns "exact", "mid-p" or "asymptotic".
func (m PairedMethod) String() string {
	if m < 0 || int(m) >= len(pairedNames) {
		return "PairedMethod(" + argerr.Format(int(m)) + ")"
	}
	return pairedNames[m]
}

// ParsePairedMethod converts "exact", "mid-p" or "asymptotic" (case
// insensitive).
func ParsePairedMethod(s string) (PairedMethod, error) {
	for i, n := range pairedNames {
		if equalFold(s, n) {
			return PairedMethod(i), nil
		}
	}
	return 0, argerr.Invalid("power.ParsePairedMethod", "s", s, `is not a McNemar method; use "exact", "mid-p" or "asymptotic"`)
}

// condPower holds P(reject | d discordant pairs) for d = base ..
// base+len(c)-1, under the alternative (c) and under H0 (c0), for the
// conditional McNemar tests. Only the window of d that carries the
// Binomial(n, psi) weight is kept, so memory is O(sqrt(n)), not O(n).
type condPower struct {
	next  func(d int64) (pw, size float64)
	base  int64
	c, c0 []float64
}

func newCondPower(p10, p01, alpha float64, o PairedOptions) *condPower {
	psi := p10 + p01
	q := 0.5
	if psi > 0 {
		q = p10 / psi
	}
	cp := &condPower{}
	if o.Method == McNemarAsymptotic {
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
			case Greater:
				peak = 0
			case Less:
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
	oo := OneSampleOptions{Alternative: o.Alternative, Method: Central, Mid: o.Method == McNemarMidP}
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
// the discordant cell probabilities are p10 and p01, by enumeration of the
// number of discordant pairs D ~ Binomial(n, p10 + p01) and, given D = d,
// of N10 ~ Binomial(d, p10/(p10 + p01)):
//
//	power = sum_d P(D = d) P(reject | d),
//
// with the test package's decisions: the conditional tests through
// onesample (p0 = 1/2, central, as test.McNemar computes them), the
// asymptotic one (McNemarAsymptotic with o.Enumerate) through
// test.McNemar itself. Size is the same sum under H0 with the same
// discordant probability (the asymptotic and mid-p tests can exceed
// alpha). For McNemarAsymptotic without Enumerate the power is Connor's
// closed form (PairedNormalPower) and Size is Alpha.
// AcceptLo/AcceptHi are not used (-1). Cost: a few p-values for each d in
// the window of D's distribution above 1e-17 of its mode, O(sqrt(n)) (about
// 0.1 s at n = MaxSearchN); memory O(sqrt(n)) (under 2 MB at MaxSearchN).
// ctx is checked every 256 values of d; a cancelled call returns the
// context's error wrapped.
func PairedPower(ctx context.Context, n int64, p10, p01 float64, o PairedOptions) (ExactPower, error) {
	const fn = "power.PairedPower"
	if n < 1 {
		return ExactPower{}, argerr.Invalid(fn, "n", n, "must be at least 1")
	}
	if n > MaxSearchN {
		return ExactPower{}, argerr.TooLarge(fn, "n", n, "exceeds MaxSearchN = "+argerr.Format(MaxSearchN))
	}
	alpha, _, err := o.check(fn, p10, p01, false)
	if err != nil {
		return ExactPower{}, err
	}
	if o.Method < McNemarExact || o.Method > McNemarAsymptotic {
		return ExactPower{}, argerr.Invalid(fn, "Method", int(o.Method), "is not a defined PairedMethod")
	}
	r := ExactPower{Test: "McNemar " + o.Method.String() + ", " + o.Alternative.String(), N: n, Alpha: alpha, AcceptLo: -1, AcceptHi: -1}
	if o.Method == McNemarAsymptotic && !o.Enumerate {
		r.Power, r.Size = pairedNormalPower(float64(n), p10, p01, alpha, o.Alternative), alpha
		return r, nil
	}
	cp := newCondPower(p10, p01, alpha, o)
	r.Power, r.Size, _, err = cp.at(ctx, fn, n, p10+p01, nil)
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
// every 256 n. Cost O(N^1.5) for a result N.
func PairedN(ctx context.Context, p10, p01 float64, o PairedOptions) (ExactSize, error) {
	const fn = "power.PairedN"
	alpha, pw, err := o.check(fn, p10, p01, true)
	if err != nil {
		return ExactSize{}, err
	}
	if o.Method < McNemarExact || o.Method > McNemarAsymptotic {
		return ExactSize{}, argerr.Invalid(fn, "Method", int(o.Method), "is not a defined PairedMethod")
	}
	limit, err := maxN(fn, o.MaxN, DefaultMaxN, MaxSearchN)
	if err != nil {
		return ExactSize{}, err
	}
	psi := p10 + p01
	var cp *condPower
	var buf []float64
	power := func(n int64) (float64, error) {
		return pairedNormalPower(float64(n), p10, p01, alpha, o.Alternative), nil
	}
	if o.Method != McNemarAsymptotic || o.Enumerate {
		cp = newCondPower(p10, p01, alpha, o)
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
	r.Test = "McNemar " + o.Method.String() + ", " + o.Alternative.String()
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
	if ns, err := PairedNormalN(p10, p01, o); err == nil {
		r.Normal = ns
	}
	return r, nil
}

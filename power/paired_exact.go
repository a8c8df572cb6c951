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

// condPower holds P(reject | d discordant pairs) for d = 0..len-1, under
// the alternative (c) and under H0 (c0), for the conditional McNemar
// tests.
type condPower struct {
	next  func(d int64) (pw, size float64)
	c, c0 []float64
}

func newCondPower(p10, p01, alpha float64, o PairedOptions) *condPower {
	psi := p10 + p01
	q := 0.5
	if psi > 0 {
		q = p10 / psi
	}
	cp := &condPower{c: []float64{0}, c0: []float64{0}}
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

// extend makes c and c0 cover d = 0..n.
func (cp *condPower) extend(n int64) {
	for d := int64(len(cp.c)); d <= n; d++ {
		pw, size := cp.next(d)
		cp.c = append(cp.c, pw)
		cp.c0 = append(cp.c0, size)
	}
}

// at returns the unconditional power and size at n pairs with discordant
// probability psi: sum over d of Binomial(d; n, psi) c(d).
func (cp *condPower) at(n int64, psi float64, buf []float64) (pw, size float64, _ []float64) {
	cp.extend(n)
	lo, w := pmfWindow(n, psi, buf)
	for i, b := range w {
		pw += b * cp.c[lo+int64(i)]
		size += b * cp.c0[lo+int64(i)]
	}
	return math.Min(pw, 1), math.Min(size, 1), w
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
// AcceptLo/AcceptHi are not used (-1). Cost O(n) plus O(sqrt(n)) per call.
func PairedPower(n int64, p10, p01 float64, o PairedOptions) (ExactPower, error) {
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
	r.Power, r.Size, _ = cp.at(n, p10+p01, nil)
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
	power := func(n int64) float64 { return pairedNormalPower(float64(n), p10, p01, alpha, o.Alternative) }
	if o.Method != McNemarAsymptotic || o.Enumerate {
		cp = newCondPower(p10, p01, alpha, o)
		power = func(n int64) float64 {
			var v float64
			v, _, buf = cp.at(n, psi, buf)
			return v
		}
	}
	r, err := searchStable(ctx, fn, power, pw, limit)
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
		_, r.Size, _ = cp.at(at, psi, nil)
	}
	if ns, err := PairedNormalN(p10, p01, o); err == nil {
		r.Normal = ns
	}
	return r, nil
}

package test

import (
	"math"

	"github.com/kofnlab/kofn/internal/argerr"
	"github.com/kofnlab/kofn/internal/jsonfloat"
	"github.com/kofnlab/kofn/interval"
)

// MixtureSequence is the always-valid test of H0: p = P0 for one
// proportion, with its confidence sequence, from the beta-binomial
// mixture martingale of interval.ConfidenceSequence:
//
//	M_n(P0) = B(a + k, b + n - k) / B(a, b) / (P0^k (1 - P0)^(n - k)),
//	p-value after look j = min(1, min over looks i <= j of 1 / M_(n_i)(P0)).
//
// Under H0, M_n(P0) is a nonnegative martingale with mean 1, so by Ville's
// inequality P(the p-value ever falls to Alpha or below) <= Alpha, at
// whatever looks, as many as wanted, chosen while watching, and with
// stopping at any look (Robbins 1970; Howard, Ramdas, McAuliffe, Sekhon
// 2021; Johari, Koomen, Pekelis, Walsh 2022 call it the always-valid
// p-value). H0 is rejected at the first look where the p-value is at most
// Alpha (the sequence at level 1 - Alpha then excludes P0). The
// hypotheses, Alpha and the mixture must be fixed before the data are
// seen; only the look schedule is free. Exact: no approximation enters the
// guarantee. interval.SequenceErrorProb gives the exact probability of a
// false rejection up to a horizon.
//
// A value is safe for concurrent use; each look costs O(1).
type MixtureSequence struct {
	P0    float64          `json:"p0"`    // the null value, in (0, 1)
	Alpha float64          `json:"alpha"` // the significance level, in (0, 1)
	Mix   interval.Mixture `json:"mixture"`
}

// MarshalJSON encodes the value with non-finite floats as strings.
func (s MixtureSequence) MarshalJSON() ([]byte, error) {
	type plain MixtureSequence
	return jsonfloat.Marshal(plain(s))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (s *MixtureSequence) UnmarshalJSON(b []byte) error {
	type plain MixtureSequence
	return jsonfloat.Unmarshal(b, (*plain)(s))
}

// MixtureLook is the state of a MixtureSequence after a look.
type MixtureLook struct {
	N int64 `json:"n"` // trials so far
	K int64 `json:"k"` // successes so far
	// LogMartingale is ln M_n(P0) at this look.
	LogMartingale float64 `json:"log_martingale"`
	// PValue is the always-valid p-value, the running minimum over the
	// looks so far of min(1, 1/M); LogPValue is its logarithm.
	PValue    float64 `json:"p_value"`
	LogPValue float64 `json:"log_p_value"`
	// Interval is the confidence sequence at level 1 - Alpha at this look;
	// Running is the intersection of the sequences at all looks so far
	// (also valid, never wider). An empty intersection (Lower > Upper)
	// is reported with a warning.
	Interval interval.Interval `json:"interval"`
	Running  interval.Interval `json:"running"`
	// Decision is RejectNull from the first look with PValue <= Alpha on,
	// Continue before.
	Decision Decision `json:"decision"`
	Warnings []string `json:"warnings,omitempty"`
}

// MarshalJSON encodes the look with non-finite floats as strings.
func (l MixtureLook) MarshalJSON() ([]byte, error) {
	type plain MixtureLook
	return jsonfloat.Marshal(plain(l))
}

// UnmarshalJSON decodes what MarshalJSON writes.
func (l *MixtureLook) UnmarshalJSON(b []byte) error {
	type plain MixtureLook
	return jsonfloat.Unmarshal(b, (*plain)(l))
}

// NewMixtureSequence returns the always-valid test of H0: p = p0 at level
// alpha with the mixing prior chosen by opt (see interval.SequenceOptions;
// the zero value is the centred prior tuned for 1000 observations).
// Domain: p0 and alpha in (0, 1).
func NewMixtureSequence(p0, alpha float64, opt interval.SequenceOptions) (MixtureSequence, error) {
	const fn = "test.NewMixtureSequence"
	if err := argerr.OpenProb(fn, "p0", p0); err != nil {
		return MixtureSequence{}, err
	}
	if err := argerr.OpenProb(fn, "alpha", alpha); err != nil {
		return MixtureSequence{}, err
	}
	mx, err := interval.SequenceMixture(1-alpha, opt)
	if err != nil {
		return MixtureSequence{}, err
	}
	return MixtureSequence{P0: p0, Alpha: alpha, Mix: mx}, nil
}

// checkLook validates cumulative counts against the previous look.
func checkLook(fn string, prevN, prevK, k, n int64, kArg, nArg string) error {
	if err := argerr.KN(fn, kArg, nArg, k, n); err != nil {
		return err
	}
	if n > 1<<53 {
		return argerr.TooLarge(fn, nArg, n, "exceeds 2^53")
	}
	if n < prevN {
		return argerr.Invalid(fn, nArg, n, "is below the previous look's "+argerr.Format(prevN)+"; counts are cumulative")
	}
	if k < prevK {
		return argerr.Invalid(fn, kArg, k, "is below the previous look's "+argerr.Format(prevK)+"; counts are cumulative")
	}
	if n-k < prevN-prevK {
		return argerr.Invalid(fn, kArg, k, "leaves fewer failures than the previous look ("+argerr.Format(prevN-prevK)+"); counts are cumulative")
	}
	return nil
}

// Look returns the state after a look at cumulative counts: k successes
// in n trials. prev is the previous look's state (nil at the first look);
// the counts must not decrease, nor the failures n - k.
func (s MixtureSequence) Look(prev *MixtureLook, k, n int64) (MixtureLook, error) {
	const fn = "test.MixtureSequence.Look"
	if !(s.P0 > 0 && s.P0 < 1) || !(s.Alpha > 0 && s.Alpha < 1) {
		return MixtureLook{}, argerr.Invalid(fn, "s", "MixtureSequence{}", "is not built; use NewMixtureSequence")
	}
	var pn, pk int64
	if prev != nil {
		pn, pk = prev.N, prev.K
	}
	if err := checkLook(fn, pn, pk, k, n, "k", "n"); err != nil {
		return MixtureLook{}, err
	}
	lm, err := interval.SequenceLogMartingale(k, n, s.P0, s.Mix)
	if err != nil {
		return MixtureLook{}, err
	}
	l := MixtureLook{N: n, K: k, LogMartingale: lm}
	l.LogPValue = math.Min(0, -lm)
	l.Interval = interval.SequenceInterval(k, n, 1-s.Alpha, s.Mix)
	l.Running = l.Interval
	l.Running.Warnings = nil
	if prev != nil {
		l.LogPValue = math.Min(l.LogPValue, prev.LogPValue)
		l.Running.Lower = math.Max(l.Running.Lower, prev.Running.Lower)
		l.Running.Upper = math.Min(l.Running.Upper, prev.Running.Upper)
	}
	l.PValue = math.Exp(l.LogPValue)
	if l.LogPValue <= math.Log(s.Alpha) {
		l.Decision = RejectNull
	}
	if l.Running.Lower > l.Running.Upper {
		l.Warnings = append(l.Warnings, "the running intersection is empty: no constant proportion fits every look at this level (the trials may not be identically distributed)")
	}
	return l, nil
}

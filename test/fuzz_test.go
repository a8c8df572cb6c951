package test

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"
)

// checkFuzz verifies the contract of every entry point: an error is typed
// and names the function; a result has a p-value in [0, 1] and a log
// p-value in [-Inf, 0], never NaN.
func checkFuzz(t *testing.T, fn string, r Result, err error) {
	t.Helper()
	if err != nil {
		var e *Error
		if !errors.As(err, &e) || !strings.HasPrefix(err.Error(), fn+": ") ||
			!(errors.Is(err, ErrInvalidArgument) || errors.Is(err, ErrTooLarge)) {
			t.Fatalf("%s: untyped or unnamed error %v", fn, err)
		}
		return
	}
	if !(r.PValue >= 0 && r.PValue <= 1) || math.IsNaN(r.LogPValue) || r.LogPValue > 0 {
		t.Fatalf("%s: p = %v, log p = %v", fn, r.PValue, r.LogPValue)
	}
	if r.Interval != nil && (math.IsNaN(r.Interval.Lower) && len(r.Warnings) == 0 || r.Interval.Lower > r.Interval.Upper) {
		t.Fatalf("%s: interval %+v", fn, *r.Interval)
	}
}

func FuzzBinomial(f *testing.F) {
	f.Add(int64(3), int64(10), 0.2, 0, 0, false)
	f.Add(int64(0), int64(0), 0.5, 4, 1, true)
	f.Add(int64(81), int64(263), 0.3, 8, 2, false)
	f.Add(int64(5), int64(4), math.NaN(), 1, 0, true)
	f.Fuzz(func(t *testing.T, k, n int64, p0 float64, m, a int, skip bool) {
		if n > 100000 && !skip {
			skip = true // keep the interval search quick
		}
		r, err := Binomial(k, n, p0, BinomialOptions{Method: BinomialMethod(m), Alternative: Alternative(a), SkipInterval: skip})
		checkFuzz(t, "test.Binomial", r, err)
	})
}

func FuzzMcNemar(f *testing.F) {
	f.Add(int64(1), int64(7), 0, 0)
	f.Add(int64(-1), int64(7), 3, 2)
	f.Fuzz(func(t *testing.T, b, c int64, m, a int) {
		r, err := McNemar(b, c, McNemarOptions{Method: McNemarMethod(m), Alternative: Alternative(a)})
		checkFuzz(t, "test.McNemar", r, err)
	})
}

func FuzzFisher(f *testing.F) {
	f.Add(int64(3), int64(4), int64(1), int64(4), 0, false, 0)
	f.Add(int64(7), int64(15), int64(12), int64(15), 1, true, 1)
	f.Fuzz(func(t *testing.T, k1, n1, k2, n2 int64, m int, mid bool, a int) {
		r, err := Fisher(k1, n1, k2, n2, FisherOptions{Rule: TwoSidedRule(m), MidP: mid, Alternative: Alternative(a)})
		checkFuzz(t, "test.Fisher", r, err)
	})
}

func FuzzUnconditional(f *testing.F) {
	f.Add(int64(7), int64(15), int64(12), int64(15), 1, 0.0, 0, false)
	f.Add(int64(0), int64(3), int64(3), int64(3), 0, 0.001, 1, true)
	f.Fuzz(func(t *testing.T, k1, n1, k2, n2 int64, a int, gamma float64, fm int, bos bool) {
		if n1 > 40 || n2 > 40 {
			if n1 < 1<<20 && n2 < 1<<20 {
				return // valid but slow sizes are covered by the unit tests
			}
		}
		opt := UnconditionalOptions{Alternative: Alternative(a), BergerBoos: gamma, Rule: TwoSidedRule(fm)}
		if bos {
			r, err := Boschloo(context.Background(), k1, n1, k2, n2, opt)
			checkFuzz(t, "test.Boschloo", r, err)
			return
		}
		r, err := Barnard(context.Background(), k1, n1, k2, n2, opt)
		checkFuzz(t, "test.Barnard", r, err)
	})
}

func FuzzTwoSample(f *testing.F) {
	f.Add(int64(56), int64(70), int64(48), int64(80), 0, 0)
	f.Add(int64(0), int64(5), int64(5), int64(5), 1, 2)
	f.Fuzz(func(t *testing.T, k1, n1, k2, n2 int64, m, a int) {
		r, err := TwoSample(k1, n1, k2, n2, TwoSampleOptions{Method: TwoSampleMethod(m), Alternative: Alternative(a)})
		checkFuzz(t, "test.TwoSample", r, err)
	})
}

func FuzzMargin(f *testing.F) {
	f.Add(int64(56), int64(70), int64(48), int64(80), -0.1, 0.1, 0, 2)
	f.Add(int64(0), int64(5), int64(5), int64(5), 0.5, 2.0, 1, 1)
	f.Fuzz(func(t *testing.T, k1, n1, k2, n2 int64, lo, hi float64, m, a int) {
		opt := MarginOptions{Method: MarginMethod(m), Alternative: Alternative(a)}
		r, err := DifferenceMargin(k1, n1, k2, n2, lo, opt)
		checkFuzz(t, "test.DifferenceMargin", r, err)
		r, err = RatioMargin(k1, n1, k2, n2, hi, opt)
		checkFuzz(t, "test.RatioMargin", r, err)
		r, err = DifferenceEquivalence(k1, n1, k2, n2, lo, hi, opt)
		checkFuzz(t, "test.DifferenceEquivalence", r, err)
		r, err = RatioEquivalence(k1, n1, k2, n2, lo, hi, opt)
		checkFuzz(t, "test.RatioEquivalence", r, err)
	})
}

func FuzzParse(f *testing.F) {
	for _, s := range []string{"two-sided", "Blaker mid-p", "exact", "Fisher central", "z pooled", "Miettinen-Nurminen", ""} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		type parsed interface{ String() string }
		check := func(v parsed, err error) {
			if err == nil && !strings.EqualFold(strings.TrimSpace(s), v.String()) && !strings.HasSuffix(strings.ToLower(v.String()), strings.ToLower(strings.TrimSpace(s))) {
				t.Fatalf("parsed %q as %q", s, v.String())
			}
		}
		check(ParseAlternative(s))
		check(ParseBinomialMethod(s))
		check(ParseMcNemarMethod(s))
		check(ParseTwoSidedRule(s))
		check(ParseTwoSampleMethod(s))
		check(ParseMarginMethod(s))
	})
}

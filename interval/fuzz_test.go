package interval_test

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/kofnlab/kofn/interval"
)

// checkResult fails on a panic-free but wrong answer: an error that is not
// a typed *interval.Error naming its argument, or NaN limits.
func checkResult(t *testing.T, r result) {
	t.Helper()
	iv, err := r.iv, r.err
	if err != nil {
		var e *interval.Error
		if !errors.As(err, &e) || !strings.HasPrefix(err.Error(), "interval.") {
			t.Fatalf("untyped error %v", err)
		}
		return
	}
	if math.IsNaN(iv.Lower) || math.IsNaN(iv.Upper) || iv.Lower > iv.Upper {
		t.Fatalf("bad limits %+v", iv)
	}
}

func FuzzProportion(f *testing.F) {
	f.Add(int64(3), int64(10), 0.95, 0, 0)
	f.Add(int64(0), int64(1), 0.5, 6, 2)
	f.Add(int64(5), int64(1e12), 0.999999, 7, 1)
	f.Add(int64(-1), int64(10), math.NaN(), 99, 5)
	f.Fuzz(func(t *testing.T, k, n int64, level float64, method, side int) {
		if method == int(interval.Blaker) && n > 1e5 {
			return // milliseconds per call; covered by the tests
		}
		iv, err := interval.Proportion(k, n, interval.Options{Level: level, Method: interval.Method(method), Side: interval.Side(side)})
		checkResult(t, result{iv, err})
		if err == nil && !(iv.Lower >= 0 && iv.Upper <= 1) {
			t.Fatalf("limits outside [0, 1]: %+v", iv)
		}
	})
}

func FuzzTwoSample(f *testing.F) {
	f.Add(int64(56), int64(70), int64(48), int64(80), 0.95, 0, 0)
	f.Add(int64(0), int64(10), int64(0), int64(20), 0.9, 3, 1)
	f.Add(int64(10), int64(10), int64(0), int64(10), 0.99, 2, 2)
	f.Fuzz(func(t *testing.T, k1, n1, k2, n2 int64, level float64, method, side int) {
		opt := interval.Side(side)
		checkResult(t, errPair(interval.Difference(k1, n1, k2, n2, interval.DiffOptions{Level: level, Method: interval.DiffMethod(method), Side: opt})))
		checkResult(t, errPair(interval.Ratio(k1, n1, k2, n2, interval.RatioOptions{Level: level, Method: interval.RatioMethod(method), Side: opt})))
		if n1+n2 < 1e5 {
			checkResult(t, errPair(interval.OddsRatio(k1, n1, k2, n2, interval.OddsOptions{Level: level, Method: interval.OddsMethod(method), Side: opt})))
		}
	})
}

func FuzzPaired(f *testing.F) {
	f.Add(int64(1), int64(1), int64(7), int64(12), 0.95, 0, 0)
	f.Add(int64(0), int64(0), int64(0), int64(0), 0.95, 2, 0)
	f.Fuzz(func(t *testing.T, a, b, c, d int64, level float64, method, side int) {
		checkResult(t, errPair(interval.PairedDifference(a, b, c, d, interval.PairedOptions{Level: level, Method: interval.PairedMethod(method), Side: interval.Side(side)})))
		if method != int(interval.Blaker) || b+c < 1e5 {
			checkResult(t, errPair(interval.DiscordantRatio(b, c, interval.Options{Level: level, Method: interval.Method(method), Side: interval.Side(side)})))
		}
	})
}

func FuzzCoverage(f *testing.F) {
	f.Add(int64(30), 0.2, 0.95, 1)
	f.Add(int64(1), 0.0, 0.5, 6)
	f.Fuzz(func(t *testing.T, n int64, p, level float64, method int) {
		if n > 2000 || method == int(interval.Blaker) && n > 100 {
			return
		}
		perf, err := interval.Coverage(context.Background(), n, p, interval.Options{Level: level, Method: interval.Method(method)})
		if err != nil {
			var e *interval.Error
			if !errors.As(err, &e) {
				t.Fatalf("untyped error %v", err)
			}
			return
		}
		if !(perf.Coverage >= 0 && perf.Coverage <= 1+1e-12) || math.IsNaN(perf.ExpectedWidth) {
			t.Fatalf("bad performance %+v", perf)
		}
	})
}

func FuzzParse(f *testing.F) {
	for _, s := range []string{"Wilson", "mid-p", "exact", "", "Miettinen-Nurminen", "two-sided", "\x00"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		for _, err := range []error{errOf(interval.ParseMethod(s)), errOf(interval.ParseDiffMethod(s)), errOf(interval.ParseRatioMethod(s)), errOf(interval.ParseOddsMethod(s)), errOf(interval.ParsePairedMethod(s)), errOf(interval.ParseSide(s))} {
			if err != nil && !strings.Contains(err.Error(), "s = ") {
				t.Fatalf("error does not name the argument: %v", err)
			}
		}
	})
}

type result struct {
	iv  interval.Interval
	err error
}

func errPair(iv interval.Interval, err error) result { return result{iv, err} }

func errOf[T any](_ T, err error) error { return err }

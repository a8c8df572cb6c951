package onesample

import (
	"math"
	"strings"
	"testing"
)

func FuzzLogPValue(f *testing.F) {
	f.Add(int64(3), int64(10), 0.2, 0, false, 0)
	f.Add(int64(500), int64(1000), 0.5, 2, true, 0)
	f.Add(int64(0), int64(0), 1.0, 1, false, 2)
	f.Fuzz(func(t *testing.T, k, n int64, p0 float64, m int, mid bool, a int) {
		tt := Test{P0: p0, Rule: Rule(m), MidP: mid, Alternative: Alternative(a)}
		lp, err := LogPValue(k, n, tt)
		if err != nil {
			if !strings.HasPrefix(err.Error(), "onesample.LogPValue: ") {
				t.Fatalf("unnamed error %v", err)
			}
			return
		}
		if math.IsNaN(lp) || lp > 0 {
			t.Fatalf("LogPValue(%d, %d, %+v) = %v", k, n, tt, lp)
		}
	})
}

func FuzzAcceptance(f *testing.F) {
	f.Add(int64(100), 0.05, 0.3, 0, false, 0)
	f.Add(int64(1), 0.5, 0.5, 1, true, 0)
	f.Fuzz(func(t *testing.T, n int64, alpha, p0 float64, m int, mid bool, a int) {
		if n > 100000 {
			n %= 100000
		}
		tt := Test{P0: p0, Rule: Rule(m), MidP: mid, Alternative: Alternative(a)}
		lo, hi, err := Acceptance(n, alpha, tt)
		if err != nil {
			if !strings.HasPrefix(err.Error(), "onesample.Acceptance: ") {
				t.Fatalf("unnamed error %v", err)
			}
			return
		}
		if lo > hi && !(lo == 0 && hi == -1) || lo < 0 || hi > n {
			t.Fatalf("Acceptance(%d, %v, %+v) = [%d, %d]", n, alpha, tt, lo, hi)
		}
	})
}

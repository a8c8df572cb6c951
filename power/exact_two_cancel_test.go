package power

import (
	"context"
	"errors"
	"os"
	"slices"
	"testing"
	"time"
)

// twoCancelCases are exact two-sample searches long enough to be stopped
// in the middle: sizes near 20,000 per group for Fisher and the z test,
// some hundreds for Barnard.
var twoCancelCases = []struct {
	name   string
	p1, p2 float64
	o      TwoSampleOptions
}{
	{"Fisher 10% vs 10.9%", 0.10, 0.109, TwoSampleOptions{MaxN: 40000}},
	{"z test 10% vs 10.9%", 0.10, 0.109, TwoSampleOptions{Test: ZPooledTest, MaxN: 40000}},
	{"Barnard 30% vs 35%", 0.30, 0.35, TwoSampleOptions{Test: BarnardExactTest, MaxN: 40000}},
}

// A search stopped by its context returns the context's error, whatever
// the moment.
func TestTwoSampleNCanceled(t *testing.T) {
	t.Parallel()
	if testing.Short() {
		t.Skip("runs searches for tens of milliseconds")
	}
	for _, c := range twoCancelCases {
		ctx, cancel := context.WithTimeout(context.Background(), 30*time.Millisecond)
		_, err := TwoSampleN(ctx, c.p1, c.p2, c.o)
		cancel()
		if !errors.Is(err, context.DeadlineExceeded) {
			t.Errorf("%s: %v, want the deadline's error", c.name, err)
		}
	}
}

// The time from cancellation to return, at five moments into each search
// (the rule is 10 ms; this fails beyond 100 ms, the margin of the contract
// sweep's latency check for a loaded machine). Run it with
// KOFN_CANCEL_LATENCY=1.
func TestTwoSampleNCancelLatency(t *testing.T) {
	if os.Getenv("KOFN_CANCEL_LATENCY") == "" {
		t.Skip("set KOFN_CANCEL_LATENCY=1 to measure cancellation latency")
	}
	for _, c := range twoCancelCases {
		var lats []time.Duration
		for _, after := range []time.Duration{20, 40, 60, 100, 150} {
			ctx, cancel := context.WithCancel(context.Background())
			done := make(chan error, 1)
			go func() {
				_, err := TwoSampleN(ctx, c.p1, c.p2, c.o)
				done <- err
			}()
			time.Sleep(after * time.Millisecond)
			t0 := time.Now()
			cancel()
			err := <-done
			lat := time.Since(t0)
			if !errors.Is(err, context.Canceled) {
				t.Errorf("%s after %v ms: %v, want the cancellation's error", c.name, after, err)
			}
			lats = append(lats, lat)
		}
		slices.Sort(lats)
		t.Logf("%s: median %v, worst %v", c.name, lats[len(lats)/2], lats[len(lats)-1])
		if lats[len(lats)-1] > 100*time.Millisecond {
			t.Errorf("%s: returned %v after cancellation", c.name, lats[len(lats)-1])
		}
	}
}

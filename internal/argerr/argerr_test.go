package argerr

import (
	"context"
	"errors"
	"math"
	"testing"
)

func TestMessages(t *testing.T) {
	t.Parallel()
	// The message shape is the project's own convention (DESIGN.md section 2).
	tests := []struct {
		err  error
		want string
		is   error
	}{
		{KN("interval.Proportion", "k", "n", 12, 10), "interval.Proportion: k = 12 exceeds n = 10", ErrInvalidArgument},
		{KN("f", "k", "n", -1, 10), "f: k = -1 is negative; counts are 0 or more", ErrInvalidArgument},
		{KN("f", "k", "n", 0, -3), "f: n = -3 is negative; counts are 0 or more", ErrInvalidArgument},
		{Prob("binom.New", "p", math.NaN()), "binom.New: p = NaN is not a probability in [0, 1]", ErrInvalidArgument},
		{Prob("binom.New", "p", 1.5), "binom.New: p = 1.5 is not a probability in [0, 1]", ErrInvalidArgument},
		{OpenProb("f", "p0", 0), "f: p0 = 0 must lie strictly between 0 and 1", ErrInvalidArgument},
		{TooLarge("f", "n", int64(7), "is over the limit"), "f: n = 7 is over the limit", ErrTooLarge},
		{NoSolution("f", "no plan"), "f: no plan", ErrNoSolution},
	}
	for _, tc := range tests {
		if tc.err == nil {
			t.Fatalf("want error %q, got nil", tc.want)
		}
		if got := tc.err.Error(); got != tc.want {
			t.Errorf("message = %q, want %q", got, tc.want)
		}
		if !errors.Is(tc.err, tc.is) {
			t.Errorf("%q does not match its sentinel", tc.want)
		}
		var e *Error
		if !errors.As(tc.err, &e) {
			t.Errorf("%q is not an *Error", tc.want)
		}
	}
	for _, ok := range []error{KN("f", "k", "n", 3, 3), Prob("f", "p", 0), Prob("f", "p", 1), OpenProb("f", "p", 0.5), Count("f", "n", 0)} {
		if ok != nil {
			t.Errorf("valid argument rejected: %v", ok)
		}
	}
}

func TestCanceled(t *testing.T) {
	t.Parallel()
	ctx, cancel := context.WithCancel(context.Background())
	if err := Canceled("f", ctx); err != nil {
		t.Fatalf("live context: %v", err)
	}
	cancel()
	err := Canceled("f", ctx)
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("got %v, want context.Canceled", err)
	}
}

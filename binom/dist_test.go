package binom

import (
	"errors"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

func TestNewRejects(t *testing.T) {
	t.Parallel()
	tests := []struct {
		n    int64
		p    float64
		want string
		is   error
	}{
		{-1, 0.5, "binom.New: n = -1 is negative; counts are 0 or more", ErrInvalidArgument},
		{10, math.NaN(), "binom.New: p = NaN is not a probability in [0, 1]", ErrInvalidArgument},
		{10, -0.1, "binom.New: p = -0.1 is not a probability in [0, 1]", ErrInvalidArgument},
		{10, math.Inf(1), "binom.New: p = +Inf is not a probability in [0, 1]", ErrInvalidArgument},
		{MaxN + 1, 0.5, "binom.New: n = 9007199254740993 exceeds 2^53, the largest count held exactly in float64", ErrTooLarge},
	}
	for _, tc := range tests {
		_, err := New(tc.n, tc.p)
		if err == nil || err.Error() != tc.want || !errors.Is(err, tc.is) {
			t.Errorf("New(%d, %v) error = %v, want %q", tc.n, tc.p, err, tc.want)
		}
	}
}

func TestSmallValues(t *testing.T) {
	t.Parallel()
	// Acceptance plan n = 89, c = 2: Montgomery DC, Introduction to Statistical
	// Quality Control, single sampling plans (values in shared REFERENCES.md).
	d, err := New(89, 0.01)
	if err != nil {
		t.Fatal(err)
	}
	got := []float64{}
	for _, p := range []float64{0.01, 0.02, 0.03, 0.04, 0.05} {
		d.P = p
		got = append(got, d.CDF(2))
	}
	want := []float64{0.93969, 0.736578, 0.498483, 0.304158, 0.172077}
	if diff := cmp.Diff(want, got, cmpopts.EquateApprox(5e-6, 0)); diff != "" {
		t.Errorf("P(X <= 2), n = 89 (-want +got):\n%s", diff)
	}
}

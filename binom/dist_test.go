package binom

import (
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/golden"
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

// TestMoments compares the closed forms with direct sums of the PMF (the
// definitions) and pins the documented values at point masses.
func TestMoments(t *testing.T) {
	t.Parallel()
	for _, c := range []Dist{{1, 0.5}, {7, 0.2}, {30, 0.9}, {100, 0.5}, {250, 0.03}} {
		var m [5]float64
		for k := int64(0); k <= c.N; k++ {
			m[1] += float64(k) * c.Prob(k)
		}
		for k := int64(0); k <= c.N; k++ {
			d := float64(k) - m[1]
			m[2] += d * d * c.Prob(k)
			m[3] += d * d * d * c.Prob(k)
			m[4] += d * d * d * d * c.Prob(k)
		}
		want := []float64{m[1], m[2], math.Sqrt(m[2]), m[3] / math.Pow(m[2], 1.5), m[4]/(m[2]*m[2]) - 3}
		got := []float64{c.Mean(), c.Variance(), c.StdDev(), c.Skewness(), c.ExKurtosis()}
		if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-12, 1e-13)); diff != "" {
			t.Errorf("%v moments (-want +got):\n%s", c, diff)
		}
	}
	for _, c := range []Dist{{0, 0.3}, {10, 0}, {10, 1}} {
		if c.Variance() != 0 || !math.IsNaN(c.Skewness()) || !math.IsNaN(c.ExKurtosis()) || c.Entropy() != 0 {
			t.Errorf("%v: point mass moments %g %g %g %g", c, c.Variance(), c.Skewness(), c.ExKurtosis(), c.Entropy())
		}
	}
}

// TestEntropyGolden checks Dist.Entropy and Hyper.Entropy against
// testdata/binom_extra_entropy.tsv (mpmath 1.2.1 50-digit sums, and for
// variances above 2e5 the expansion derived and checked there; generator
// testdata/gen/binom_extra_entropy.py).
func TestEntropyGolden(t *testing.T) {
	t.Parallel()
	rows := 0
	for _, fs := range golden.Read(t, "../testdata/binom_extra_entropy.tsv") {
		line := strings.Join(fs.Fields, "\t")
		want := fs.Float(4)
		n := fs.Int(1)
		var got float64
		var what string
		switch fs.Fields[0] {
		case "binom":
			p := fs.Float(2)
			d, err := New(n, p)
			if err != nil {
				t.Fatal(err)
			}
			got, what = d.Entropy(), strconv.Quote(line)
		case "hyper":
			K, m := fs.Int(2), fs.Int(3)
			h, err := NewHyper(n, K, m)
			if err != nil {
				t.Fatal(err)
			}
			got, what = h.Entropy(), strconv.Quote(line)
		}
		rows++
		if math.Abs(got-want) > 1e-14*want {
			t.Errorf("%s: Entropy = %.17g, want %.17g (rel %.2g)", what, got, want, (got-want)/want)
		}
	}
	if rows < 100 {
		t.Errorf("only %d rows", rows)
	}
}

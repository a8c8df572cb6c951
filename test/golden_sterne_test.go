package test

import (
	"math"
	"strings"
	"testing"

	"github.com/kofnlab/kofn/internal/golden"
)

// TestGoldenSterne compares the interval of the point-probability test
// (Sterne's) with testdata/test_sterne.tsv, written by
// testdata/gen/test_sterne.py from SciPy 1.10.1's exact binomial test on a grid of
// 20001 null values with bisection at the outermost transitions, and the
// gap warning with the gaps that grid sees.
func TestGoldenSterne(t *testing.T) {
	t.Parallel()
	for _, r := range golden.Read(t, "../testdata/test_sterne.tsv") {
		k, n := r.Int(1), r.Int(2)
		lo, hi, gaps := r.Float(3), r.Float(4), r.Fields[5] == "1"
		got, err := Binomial(k, n, 0.5, BinomialOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(got.Interval.Lower-lo) > 1e-9 || math.Abs(got.Interval.Upper-hi) > 1e-9 {
			t.Errorf("%s: interval %+v", strings.Join(r.Fields, " "), *got.Interval)
		}
		if warned := len(got.Warnings) > 0; warned != gaps {
			t.Errorf("%s: warnings %v", strings.Join(r.Fields, " "), got.Warnings)
		}
	}
}

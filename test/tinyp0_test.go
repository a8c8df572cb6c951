package test

import (
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/golden"
)

// TestAsymptoticTinyP0 checks the score, score-cc and likelihood-ratio log
// p-values at p0 from the smallest subnormal double up to 1e-20 against
// mpmath at 60 digits (testdata/test_tinyp0.tsv, testdata/gen/test_tinyp0.py):
// finite wherever the true log p-value is a double (down to -1.25e308 for
// score at p0 = 4e-310, where z^2 itself overflows), -Inf only where it is
// below the most negative double, never NaN; the interval stays inside [0, 1].
func TestAsymptoticTinyP0(t *testing.T) {
	t.Parallel()
	for _, r := range golden.Read(t, "../testdata/test_tinyp0.tsv") {
		m, err := binomialSpec(r.Fields[0])
		if err != nil {
			t.Fatal(err)
		}
		k, n, p0, a, want := r.Int(1), r.Int(2), r.Float(3), alt(t, r.Str(4)), r.Float(5)
		got, err := Binomial(k, n, p0, with(m, a))
		if err != nil {
			t.Errorf("%v %d/%d p0=%g %v: %v", m, k, n, p0, a, err)
			continue
		}
		// 1e-12 relative: the statistic carries the rounding of n p0 (1-p0)
		// and, for likelihood-ratio, of the deviance sum.
		if diff := cmp.Diff(want, got.LogPValue, cmpopts.EquateApprox(1e-12, 0)); diff != "" {
			t.Errorf("%v %d/%d p0=%g %v: LogPValue (-want +got):\n%s", m, k, n, p0, a, diff)
		}
		if iv := got.Interval; iv == nil || math.IsNaN(iv.Lower) || math.IsNaN(iv.Upper) || iv.Lower < 0 || iv.Upper > 1 || iv.Lower > iv.Upper {
			t.Errorf("%v %d/%d p0=%g %v: interval %+v", m, k, n, p0, a, iv)
		}
		if math.IsNaN(got.Statistic.Value) || math.IsNaN(got.PValue) {
			t.Errorf("%v %d/%d p0=%g %v: NaN statistic %v or p-value %v", m, k, n, p0, a, got.Statistic.Value, got.PValue)
		}
	}
}

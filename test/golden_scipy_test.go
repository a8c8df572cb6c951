package test

import (
	"context"
	"strings"
	"testing"

	"github.com/kofnlab/kofn/internal/golden"
)

// TestGoldenSciPy compares with testdata/test_scipy.tsv, written by
// testdata/gen/test_scipy.py with SciPy 1.10.1 (Debian python3-scipy):
// exact binomial test p-values and its Clopper-Pearson, Wilson and Wilson
// continuity-corrected intervals; Fisher's exact test; Barnard's and
// Boschloo's tests (Boschloo one-sided only).
func TestGoldenSciPy(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	for _, r := range golden.Read(t, "../testdata/test_scipy.tsv") {
		what := strings.Join(r.Fields, " ")
		switch r.Fields[0] {
		case "binom":
			k, n, p0, a := r.Int(1), r.Int(2), r.Float(3), alt(t, r.Str(4))
			want := r.Float(5)
			got, err := Binomial(k, n, p0, skipIv(with(optPoint, a)))
			if err != nil || !relClose(got.PValue, want, 1e-9) {
				t.Errorf("%s: p = %v (%v)", what, got.PValue, err)
			}
			for i, m := range []BinomialOptions{optCentral, optScore, optScoreCC} {
				res, _ := Binomial(k, n, p0, with(m, a))
				checkInterval(t, what+" "+m.Method.String(), res.Interval, r.Float(6+2*i), r.Float(7+2*i), 1e-9)
			}
		case "fisher":
			k1, n1, k2, n2, a := r.Int(1), r.Int(2), r.Int(3), r.Int(4), alt(t, r.Str(5))
			got, err := Fisher(k1, n1, k2, n2, FisherOptions{Alternative: a})
			if want := r.Float(6); err != nil || !relClose(got.PValue, want, 1e-9) {
				t.Errorf("%s: p = %v (%v)", what, got.PValue, err)
			}
		case "barnard", "boschloo":
			// SciPy's Barnard test compares floating-point statistics
			// without tolerance and so drops tables tied with the observed
			// one in exact arithmetic (the Mehta and Senchaudhuri 2003 case:
			// 0.034077 instead of 0.034109), and both functions take the
			// supremum over a finite sample of nuisance values; either can
			// only lower their p-value. So here the check is one-sided: ours
			// is never below theirs. The two-sided check is against the
			// generator's own exact-order reference (the _ref rows).
			// (Measured on this file: SciPy's Barnard test is lower in 49 of 780
			// rows; its Boschloo test, one-sided only, agrees within 1e-6 in
			// all 520, which is checked too.)
			got := uncondP(t, ctx, r)
			want := r.Float(7)
			if got.PValue < want*(1-1e-9) || r.Fields[0] == "boschloo" && !relClose(got.PValue, want, 1e-6) {
				t.Errorf("%s: p = %v against SciPy's %v", what, got.PValue, want)
			}
			if !relClose(got.Statistic.Value, r.Float(6), 1e-9) {
				t.Errorf("%s: statistic %v", what, got.Statistic.Value)
			}
		case "barnard_ref", "boschloo_ref":
			// The reference refines the best three maxima of a 4001-point
			// grid; measured agreement 6e-14 relative over the 1560 rows.
			got := uncondP(t, ctx, r)
			if want := r.Float(6); !relClose(got.PValue, want, 1e-9) {
				t.Errorf("%s: p = %v at %v (rel %.3g)", what, got.PValue, got.Nuisance.At, got.PValue/want-1)
			}
		}
	}
}

// uncondP runs Barnard or Boschloo on a golden row.
func uncondP(t *testing.T, ctx context.Context, r golden.Row) Result {
	t.Helper()
	k1, n1, k2, n2, a := r.Int(1), r.Int(2), r.Int(3), r.Int(4), alt(t, r.Str(5))
	f := Barnard
	if strings.HasPrefix(r.Fields[0], "boschloo") {
		f = Boschloo
	}
	got, err := f(ctx, k1, n1, k2, n2, UnconditionalOptions{Alternative: a})
	if err != nil {
		t.Fatal(err)
	}
	return got
}

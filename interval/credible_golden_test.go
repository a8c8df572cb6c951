package interval_test

import (
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/golden"
	"github.com/kofnlab/kofn/interval"
)

// TestCredibleGolden compares equal-tailed and HPD limits with
// testdata/interval_credible.tsv: mpmath 1.2.1 at 40 digits, tanh-sinh
// quadrature of the Beta density and bisection
// (testdata/gen/interval_credible.py), to 1e-12 relative.
func TestCredibleGolden(t *testing.T) {
	t.Parallel()
	opt := cmpopts.EquateApprox(1e-12, 0)
	for _, r := range golden.Read(t, "../testdata/interval_credible.tsv") {
		k, n, pa, pb := r.Int(0), r.Int(1), r.Float(2), r.Float(3)
		prior := interval.BetaPrior(pa, pb)
		switch kind := r.Str(5); kind {
		case "et", "hpd":
			o := interval.CredibleOptions{Level: r.Float(4), Prior: prior}
			if kind == "hpd" {
				o.Kind = interval.HighestDensity
			}
			iv, err := interval.Credible(k, n, o)
			if err != nil {
				t.Fatalf("%s: %v", r.Pos(), err)
			}
			want := []float64{r.Float(6), r.Float(7)}
			if diff := cmp.Diff(want, []float64{iv.Lower, iv.Upper}, opt); diff != "" {
				t.Errorf("%s: %d/%d %v %s (-want +got):\n%s", r.Pos(), k, n, prior, kind, diff)
			}
		default:
			t.Fatalf("%s: unknown kind %q", r.Pos(), kind)
		}
	}
}

// TestPosteriorTailGolden compares ProbAbove and ProbBelow with
// testdata/interval_posterior_tail.tsv (mpmath 1.2.1 at 40 digits, each
// tail integrated directly; testdata/gen/interval_posterior_tail.py), to
// 1e-13 relative to max(1, |ln P|), except where ProbAbove documents less.
func TestPosteriorTailGolden(t *testing.T) {
	t.Parallel()
	for _, r := range golden.Read(t, "../testdata/interval_posterior_tail.tsv") {
		post, err := interval.NewPosterior(r.Int(0), r.Int(1), interval.BetaPrior(r.Float(2), r.Float(3)))
		if err != nil {
			t.Fatalf("%s: %v", r.Pos(), err)
		}
		c := r.Float(4)
		_, la, _ := post.ProbAbove(c)
		_, lb, _ := post.ProbBelow(c)
		// ProbAbove's documented exception: below c = 1e-3 with
		// (A+B) c <= 1e5 an upper tail is the complement of the lower one,
		// good to about 2e-16 absolute.
		tolUp := 1e-13
		if c < 1e-3 && (post.A+post.B)*c <= 1e5 {
			tolUp = math.Max(tolUp, 4e-16/math.Exp(r.Float(5)))
		}
		for i, pair := range [][2]float64{{r.Float(5), la}, {r.Float(6), lb}} {
			tol := 1e-13
			if i == 0 {
				tol = tolUp
			}
			if e := math.Abs(pair[1]-pair[0]) / math.Max(1, math.Abs(pair[0])); !(e <= tol) {
				t.Errorf("%s: tail %d: got %v, want %v (error %.2g)", r.Pos(), i, pair[1], pair[0], e)
			}
		}
	}
}

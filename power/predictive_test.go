package power_test

import (
	"context"
	"errors"
	"fmt"
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/golden"
	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/power"
)

// TestPredictiveGolden compares the predictive tails and the exact
// operating characteristics of predictive-probability designs (Lee and
// Liu 2008) with testdata/power_predictive.tsv, made independently with
// SciPy 1.10 (scipy.stats.beta, betabinom, binom; boundaries by a full
// scan; testdata/gen/power_predictive.py), to 1e-10 relative.
func TestPredictiveGolden(t *testing.T) {
	t.Parallel()
	opt := cmpopts.EquateApprox(1e-10, 0)
	for _, r := range golden.Read(t, "../testdata/power_predictive.tsv") {
		switch r.Str(0) {
		case "atleast":
			got, err := power.PredictiveAtLeast(r.Int(1), r.Int(2), r.Int(3), r.Int(4), interval.BetaPrior(r.Float(5), r.Float(6)))
			if err != nil {
				t.Fatalf("%s: %v", r.Pos(), err)
			}
			if diff := cmp.Diff(r.Float(7), got.Prob, opt); diff != "" {
				t.Errorf("%s: (-want +got):\n%s", r.Pos(), diff)
			}
		case "design":
			var looks []int64
			for _, s := range strings.Split(r.Str(9), ",") {
				v, _ := strconv.ParseInt(s, 10, 64)
				looks = append(looks, v)
			}
			d := power.PredictiveDesign{Final: r.Int(2), P0: r.Float(3), ThetaT: r.Float(4), ThetaL: r.Float(5), ThetaU: r.Float(6),
				Prior: interval.BetaPrior(r.Float(7), r.Float(8)), Looks: looks}
			got, err := d.OC(context.Background(), []float64{r.Float(11)})
			if err != nil {
				t.Fatalf("%s: %v", r.Pos(), err)
			}
			if got.FinalNeed != r.Int(10) {
				t.Errorf("%s: FinalNeed %d, want %d", r.Pos(), got.FinalNeed, r.Int(10))
			}
			oc := got.OC[0]
			want := []float64{r.Float(12), r.Float(13), r.Float(14)}
			if diff := cmp.Diff(want, []float64{oc.Reject, oc.EarlyStop, oc.ExpectedN}, opt); diff != "" {
				t.Errorf("%s: reject, early stop, expected n (-want +got):\n%s", r.Pos(), diff)
			}
		default:
			t.Fatalf("%s: unknown row kind %q", r.Pos(), r.Str(0))
		}
	}
}

// TestPredictiveIdentities: at the final size the predictive probability
// is 0 or 1 (no trials left), and a need of 0 is certain.
func TestPredictiveIdentities(t *testing.T) {
	t.Parallel()
	for _, c := range [][3]int64{{5, 10, 5}, {5, 10, 6}, {0, 10, 0}} {
		r, err := power.PredictiveAtLeast(c[0], c[1], c[1], c[2], interval.Prior{})
		if err != nil {
			t.Fatal(err)
		}
		want := 0.0
		if c[0] >= c[2] {
			want = 1
		}
		if r.Prob != want {
			t.Errorf("%v: %v, want %v", c, r.Prob, want)
		}
	}
}

// TestPredictiveSuccessMatchesDesign: the predictive probability at a look
// is the one the design's boundaries use (same NeedTotal as FinalNeed, and
// the futility boundary is the last count with PP below ThetaL).
func TestPredictiveSuccessMatchesDesign(t *testing.T) {
	t.Parallel()
	prior := interval.BetaPrior(0.6, 0.4)
	d := power.PredictiveDesign{Final: 40, Looks: []int64{20}, P0: 0.2, ThetaT: 0.9, ThetaL: 0.05, Prior: prior}
	r, err := d.OC(context.Background(), nil)
	if err != nil {
		t.Fatal(err)
	}
	f := r.Futility[0]
	below, err := power.PredictiveSuccess(f, 20, 40, 0.2, 0.9, prior)
	if err != nil {
		t.Fatal(err)
	}
	above, _ := power.PredictiveSuccess(f+1, 20, 40, 0.2, 0.9, prior)
	if below.NeedTotal != r.FinalNeed || !(below.Prob < 0.05) || !(above.Prob >= 0.05) {
		t.Errorf("need %d vs %d; PP at %d = %v, at %d = %v", below.NeedTotal, r.FinalNeed, f, below.Prob, f+1, above.Prob)
	}
}

func TestPredictiveErrors(t *testing.T) {
	t.Parallel()
	d := power.PredictiveDesign{Final: 40, P0: 0.2, ThetaT: 0.9, ThetaL: 0.05}
	for _, c := range []struct {
		d    power.PredictiveDesign
		ps   []float64
		arg  string
		want error
	}{
		{power.PredictiveDesign{Final: 0, P0: 0.2, ThetaT: 0.9}, nil, "Final", power.ErrInvalidArgument},
		{power.PredictiveDesign{Final: 5000, P0: 0.2, ThetaT: 0.9}, nil, "Final", power.ErrTooLarge},
		{power.PredictiveDesign{Final: 40, P0: 1, ThetaT: 0.9}, nil, "P0", power.ErrInvalidArgument},
		{power.PredictiveDesign{Final: 40, P0: 0.2, ThetaT: 0.9, Looks: []int64{10, 5}}, nil, "Looks[1]", power.ErrInvalidArgument},
		{d, []float64{1.5}, "ps[0]", power.ErrInvalidArgument},
	} {
		_, err := c.d.OC(context.Background(), c.ps)
		var e *power.Error
		if !errors.Is(err, c.want) || !errors.As(err, &e) || e.Arg != c.arg {
			t.Errorf("%+v: %v, want %v naming %q", c.d, err, c.want, c.arg)
		}
	}
	if _, err := power.PredictiveAtLeast(3, 10, 9, 5, interval.Prior{}); !errors.Is(err, power.ErrInvalidArgument) {
		t.Errorf("final < n: %v", err)
	}
}

func BenchmarkPredictiveOC(b *testing.B) {
	d := power.PredictiveDesign{Final: 40, P0: 0.2, ThetaT: 0.9, ThetaL: 0.05, Prior: interval.BetaPrior(0.6, 0.4)}
	for b.Loop() {
		d.OC(context.Background(), []float64{0.2, 0.4})
	}
}

// ExamplePredictiveDesign: an invented single-arm pilot monitored after
// every patient from the tenth, up to 40, stopping for futility when the
// predictive probability of a convincing final result falls below 5%.
// Its exact type I error (at p = 0.2) and power (at p = 0.4).
func ExamplePredictiveDesign() {
	looks := make([]int64, 0, 30)
	for n := int64(10); n < 40; n++ {
		looks = append(looks, n)
	}
	d := power.PredictiveDesign{Final: 40, Looks: looks, P0: 0.2, ThetaT: 0.9, ThetaL: 0.05, Prior: interval.BetaPrior(0.6, 0.4)}
	r, err := d.OC(context.Background(), []float64{0.2, 0.4})
	if err != nil {
		panic(err)
	}
	fmt.Printf("prior %v; promising at the end with %d or more of 40\n", r.Prior, r.FinalNeed)
	for _, oc := range r.OC {
		fmt.Printf("p = %.1f: reject %.4f, stop early %.4f, expected n %.1f\n", oc.P, oc.Reject, oc.EarlyStop, oc.ExpectedN)
	}
	// Output:
	// prior beta Beta(0.6, 0.4); promising at the end with 12 or more of 40
	// p = 0.2: reject 0.0751, stop early 0.8887, expected n 22.2
	// p = 0.4: reject 0.8929, stop early 0.0894, expected n 38.4
}

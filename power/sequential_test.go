package power

import (
	"context"
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/internal/golden"
)

func TestSpendingBoundsPublished(t *testing.T) {
	t.Parallel()
	// Lan-DeMets boundaries for five equally spaced looks, two-sided 0.05
	// (one-sided 0.025 in each direction): DeMets DL, Lan KKG (1994),
	// Interim analysis: the alpha spending function approach, Statistics
	// in Medicine 13:1341-1352, and Jennison C, Turnbull BW (2000), Group
	// Sequential Methods with Applications to Clinical Trials, chapter 7.
	// Values recalled (printed to three decimals); recomputed by
	// testdata/gen/power_spending.py (TestSpendingBoundsGolden).
	t5 := []float64{0.2, 0.4, 0.6, 0.8, 1}
	for _, c := range []struct {
		f    SpendingFunction
		want []float64
	}{
		{SpendingFunction{Family: OBrienFleming}, []float64{4.877, 3.357, 2.680, 2.290, 2.031}},
		{SpendingFunction{Family: Pocock}, []float64{2.438, 2.427, 2.410, 2.397, 2.386}},
	} {
		got, err := SpendingBounds(context.Background(), t5, 0.025, c.f)
		if err != nil {
			t.Fatal(err)
		}
		// three printed decimals: half a unit in the last place relative.
		if d := cmp.Diff(c.want, got, cmpopts.EquateApprox(0.0005/2.0, 0)); d != "" {
			t.Errorf("%v (-published +got):\n%s", c.f, d)
		}
	}
}

func TestSpendingBoundsGolden(t *testing.T) {
	t.Parallel()
	// Independent generator: SciPy's multivariate normal CDF (Genz) and
	// brentq, testdata/gen/power_spending.py (accurate to about 1e-4 there,
	// from the Monte Carlo error of the CDF).
	rows := golden.Read(t, "../testdata/power_spending.tsv")
	for _, r := range rows {
		fam, err := ParseSpending(r.Str(1))
		if err != nil {
			t.Fatalf("%s: %v", r.Pos(), err)
		}
		f := SpendingFunction{Family: fam, Rho: r.Float(2)}
		list := func(i int) []float64 {
			var v []float64
			for _, w := range strings.Split(r.Str(i), ",") {
				x, err := strconv.ParseFloat(w, 64)
				if err != nil {
					t.Fatalf("%s field %d: %v", r.Pos(), i, err)
				}
				v = append(v, x)
			}
			return v
		}
		got, err := SpendingBounds(context.Background(), list(4), r.Float(3), f)
		if err != nil {
			t.Fatalf("%s: %v", r.Pos(), err)
		}
		if d := cmp.Diff(list(5), got, cmpopts.EquateApprox(1e-4, 0)); d != "" {
			t.Errorf("%s %s (-SciPy +got):\n%s", r.Pos(), r.Str(0), d)
		}
	}
}

func TestSpent(t *testing.T) {
	t.Parallel()
	// The functions' definitions (Lan and DeMets 1983; Kim and DeMets
	// 1987) at t = 0.5, alpha = 0.025: O'Brien-Fleming type 2 - 2
	// Phi(2.241403/sqrt(0.5)) (z_{0.9875} = 2.241403, common tables),
	// Pocock type 0.025 ln(1 + (e-1)/2), power family 0.025 * 0.5^2.
	obf := math.Erfc(2.2414027276049473 / math.Sqrt(0.5) / math.Sqrt2)
	want := []float64{obf, 0.025 * math.Log(1+(math.E-1)/2), 0.025 * 0.25, 0, 0.025}
	got := []float64{
		SpendingFunction{}.Spent(0.025, 0.5),
		SpendingFunction{Family: Pocock}.Spent(0.025, 0.5),
		SpendingFunction{Family: PowerFamily, Rho: 2}.Spent(0.025, 0.5),
		SpendingFunction{}.Spent(0.025, 0),
		SpendingFunction{Family: Pocock}.Spent(0.025, 1),
	}
	if d := cmp.Diff(want, got, cmpopts.EquateApprox(1e-12, 0)); d != "" {
		t.Errorf("Spent (-want +got):\n%s", d)
	}
	for _, s := range SpendingValues() {
		b, err := s.MarshalText()
		if err != nil {
			t.Fatal(err)
		}
		var back Spending
		if err := back.UnmarshalText(b); err != nil || back != s {
			t.Errorf("Spending %v round trip: %v, %v", s, back, err)
		}
	}
	if _, err := ParseSpending("linear"); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("ParseSpending(linear) = %v", err)
	}
}

// bruteOne recomputes the exact operating characteristics of a
// one-proportion design by enumerating the new successes at every look
// (nested loops over the increments, each path's probability the product
// of binom.Dist.Prob terms), independently of the recursion: the
// cumulative probability of rejecting by each look and the expected size.
func bruteOne(looks []Look, p float64) (cum []float64, en float64) {
	cum = make([]float64, len(looks))
	var rec func(k int, s int64, pr float64, prevN int64)
	rec = func(k int, s int64, pr float64, prevN int64) {
		l := looks[k]
		d := binom.Dist{N: l.N - prevN, P: p}
		for x := int64(0); x <= l.N-prevN; x++ {
			q := pr * d.Prob(x)
			t := s + x
			switch {
			case t >= l.Efficacy:
				for j := k; j < len(looks); j++ {
					cum[j] += q
				}
				en += float64(l.N) * q
			case t <= l.Futility:
				en += float64(l.N) * q
			default:
				rec(k+1, t, q, l.N)
			}
		}
	}
	rec(0, 0, 1, 0)
	return cum, en
}

func TestSequentialOneExact(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	for _, c := range []struct {
		p0, p1, alpha, beta float64
		looks               []int64
		opt                 SequentialOptions
	}{
		{0.2, 0.4, 0.05, 0.2, []int64{15, 30, 45}, SequentialOptions{}},
		{0.2, 0.4, 0.05, 0.2, []int64{15, 30, 45}, SequentialOptions{Spending: SpendingFunction{Family: Pocock}}},
		{0.1, 0.3, 0.025, 0.1, []int64{10, 25, 32, 40}, SequentialOptions{Futility: true}},
		{0.1, 0.3, 0.025, 0.1, []int64{10, 25, 32, 40}, SequentialOptions{Futility: true, Binding: true,
			FutilitySpending: SpendingFunction{Family: PowerFamily, Rho: 2}}},
		{0.5, 0.7, 0.05, 0.2, []int64{20, 40}, SequentialOptions{Spending: SpendingFunction{Family: PowerFamily, Rho: 3}, Futility: true}},
	} {
		d, err := SequentialOne(ctx, c.p0, c.p1, c.alpha, c.beta, c.looks, c.opt)
		if err != nil {
			t.Fatal(err)
		}
		st := d.StageLooks()
		cum0, en0 := bruteOne(st, c.p0)
		cum1, en1 := bruteOne(st, c.p1)
		nb := make([]Look, len(st))
		for i, l := range st {
			nb[i] = Look{N: l.N, Futility: -1, Efficacy: l.Efficacy}
		}
		nb[len(nb)-1].Futility = nb[len(nb)-1].Efficacy - 1
		cumNB, _ := bruteOne(nb, c.p0)
		// EvaluateStages on the same looks: the enumeration's rejection
		// chance and expected size, and the stop chances summing to 1.
		for _, p := range []float64{c.p0, c.p1} {
			ev, err := EvaluateStages(ctx, st, p)
			if err != nil {
				t.Fatal(err)
			}
			cum, en := bruteOne(st, p)
			var stops float64
			for _, l := range ev.Looks {
				stops += l.Futile + l.Reject
			}
			if diff := cmp.Diff([]float64{cum[len(cum)-1], en, 1, 1}, []float64{ev.Reject, ev.ExpectedN, stops, ev.Looks[0].Reach}, cmpopts.EquateApprox(1e-11, 0)); diff != "" {
				t.Errorf("%+v EvaluateStages at %v: reject, expected n, total stop, first reach (-enumeration +got):\n%s", c, p, diff)
			}
		}
		var gotCum []float64
		for _, l := range d.Looks {
			gotCum = append(gotCum, l.AlphaCumulative)
		}
		opt := cmpopts.EquateApprox(1e-11, 0)
		if diff := cmp.Diff(cum0, gotCum, opt); diff != "" {
			t.Errorf("%+v cumulative alpha (-enumeration +design):\n%s", c, diff)
		}
		want := []float64{cum0[len(cum0)-1], cumNB[len(cumNB)-1], cum1[len(cum1)-1], en0, en1}
		got := []float64{d.AttainedAlpha, d.AlphaNonBinding, d.Power, d.ExpectedN0, d.ExpectedN1}
		if diff := cmp.Diff(want, got, opt); diff != "" {
			t.Errorf("%+v alpha, non-binding alpha, power, EN0, EN1 (-enumeration +design):\n%s", c, diff)
		}
		// The spending constraint holds at every look, and each efficacy
		// count is the smallest that keeps it: one count lower at look k
		// (with the later looks as designed) spends more than allowed.
		ref := cumNB
		if d.Binding {
			ref = cum0
		}
		for k, l := range d.Looks {
			if ref[k] > l.AlphaSpent*(1+1e-12) {
				t.Errorf("%+v look %d: attained %v exceeds spent %v", c, k+1, ref[k], l.AlphaSpent)
			}
			if st[k].Efficacy <= 1 || (k < len(st)-1 && st[k].Efficacy-1 <= st[k].Futility+1) {
				continue
			}
			lower := append([]Look(nil), nb...)
			if d.Binding {
				lower = append([]Look(nil), st...)
			}
			lower[k].Efficacy--
			if k == len(st)-1 {
				lower[k].Futility--
			}
			cl, _ := bruteOne(lower, c.p0)
			if cl[k] <= l.AlphaSpent {
				t.Errorf("%+v look %d: efficacy count %d is not the smallest (one lower attains %v <= %v)", c, k+1, st[k].Efficacy, cl[k], l.AlphaSpent)
			}
		}
		if c.opt.Futility {
			for k, l := range d.Looks[:len(d.Looks)-1] {
				if l.BetaCumulative > l.BetaSpent*(1+1e-12) {
					t.Errorf("%+v look %d: futility stops under p1 %v exceed the beta spent %v", c, k+1, l.BetaCumulative, l.BetaSpent)
				}
			}
		}
	}
}

func TestSequentialOneN(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	opt := SequentialOptions{Futility: true}
	d, err := SequentialOneN(ctx, 0.2, 0.4, 0.05, 0.2, 3, 0, opt)
	if err != nil {
		t.Fatal(err)
	}
	if d.Power < 0.8 {
		t.Errorf("SequentialOneN power %v below 0.8", d.Power)
	}
	prev, err := SequentialOne(ctx, 0.2, 0.4, 0.05, 0.2, EqualLooks(d.MaxN-1, 3), opt)
	if err != nil {
		t.Fatal(err)
	}
	if prev.Power >= 0.8 {
		t.Errorf("N = %d already has power %v; SequentialOneN returned %d", d.MaxN-1, prev.Power, d.MaxN)
	}
	// A single look is the exact single-stage binomial test: the smallest n
	// whose exact one-sided test at 0.05 has power 0.8 for 0.2 against 0.4
	// (checked here by direct tails).
	one, err := SequentialOneN(ctx, 0.2, 0.4, 0.05, 0.2, 1, 0, SequentialOptions{})
	if err != nil {
		t.Fatal(err)
	}
	var first int64
	for n := int64(1); n < 200 && first == 0; n++ {
		c := binom.Dist{N: n, P: 0.2}.UpperQuantile(0.05) // smallest c with P(X > c) <= 0.05
		if (binom.Dist{N: n, P: 0.4}).Survival(c) >= 0.8 {
			first = n
		}
	}
	if one.MaxN != first {
		t.Errorf("single look: SequentialOneN = %d, direct search %d", one.MaxN, first)
	}
}

// bruteTwo enumerates every pair of new counts at each look of a
// two-proportion design by nested loops, deciding each path by the pooled z
// against the bounds: the probability of rejecting.
func bruteTwo(sizes []int64, upper, lower []float64, p1, p2 float64) float64 {
	var rej float64
	var rec func(k int, s1, s2 int64, pr float64, prevN int64)
	rec = func(k int, s1, s2 int64, pr float64, prevN int64) {
		n := sizes[k]
		m := n - prevN
		d1, d2 := binom.Dist{N: m, P: p1}, binom.Dist{N: m, P: p2}
		for a := int64(0); a <= m; a++ {
			for b := int64(0); b <= m; b++ {
				q := pr * d1.Prob(a) * d2.Prob(b)
				x1, x2 := s1+a, s2+b
				pb := float64(x1+x2) / float64(2*n)
				z := 0.0
				if pb > 0 && pb < 1 {
					z = (float64(x1) - float64(x2)) / float64(n) / math.Sqrt(pb*(1-pb)*2/float64(n))
				}
				switch {
				case z >= upper[k]:
					rej += q
				case k == len(sizes)-1 || z <= lower[k]:
				default:
					rec(k+1, x1, x2, q, n)
				}
			}
		}
	}
	rec(0, 0, 0, 1, 0)
	return rej
}

func TestSequentialTwo(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	for _, c := range []struct {
		p1, p2, alpha, beta float64
		t                   []float64
		opt                 SequentialOptions
	}{
		{0.8, 0.4, 0.025, 0.2, []float64{0.5, 1}, SequentialOptions{}},
		{0.7, 0.3, 0.05, 0.1, []float64{1.0 / 3, 2.0 / 3, 1}, SequentialOptions{Futility: true}},
	} {
		d, err := SequentialTwo(ctx, c.p1, c.p2, c.alpha, c.beta, c.t, c.opt)
		if err != nil {
			t.Fatal(err)
		}
		if !d.Exact {
			t.Fatalf("%+v: exact check skipped", c)
		}
		var sizes []int64
		var up, lo []float64
		for _, l := range d.Looks {
			sizes, up, lo = append(sizes, l.N), append(up, l.Z), append(lo, l.ZFutility)
		}
		want := []float64{bruteTwo(sizes, up, lo, d.ExactNull, d.ExactNull), bruteTwo(sizes, up, lo, c.p1, c.p2)}
		got := []float64{d.AlphaExact, d.PowerExact}
		if diff := cmp.Diff(want, got, cmpopts.EquateApprox(1e-10, 0)); diff != "" {
			t.Errorf("%+v exact alpha, power (-nested enumeration +design):\n%s", c, diff)
		}
		// The normal-theory power is the target, and the sizes are those
		// of the fixed design inflated.
		if diff := cmp.Diff(1-c.beta, d.PowerNormal, cmpopts.EquateApprox(1e-6, 0)); diff != "" {
			t.Errorf("%+v normal power (-want +got):\n%s", c, diff)
		}
		if d.MaxN != int64(math.Ceil(d.FixedN*d.Inflation-1e-9)) || d.Inflation < 1 {
			t.Errorf("%+v: max n %d, fixed %v, inflation %v", c, d.MaxN, d.FixedN, d.Inflation)
		}
	}
	// No futility bounds with one look is the fixed design: inflation 1.
	d, err := SequentialTwo(ctx, 0.6, 0.4, 0.025, 0.2, []float64{1}, SequentialOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(1.0, d.Inflation, cmpopts.EquateApprox(1e-8, 0)); diff != "" {
		t.Errorf("one look inflation (-want +got):\n%s", diff)
	}
	// Beyond MaxExactTwoN the enumeration is skipped with a warning.
	d, err = SequentialTwo(ctx, 0.5, 0.4, 0.025, 0.2, []float64{0.5, 1}, SequentialOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if d.Exact || len(d.Warnings) == 0 || !strings.Contains(d.Warnings[0], "exact check skipped") {
		t.Errorf("large design: exact %v warnings %q", d.Exact, d.Warnings)
	}
}

func TestSequentialErrors(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	for _, c := range []struct {
		looks []int64
		opt   SequentialOptions
		want  error
	}{
		{nil, SequentialOptions{}, ErrInvalidArgument},
		{[]int64{10, 10}, SequentialOptions{}, ErrInvalidArgument},
		{[]int64{0, 10}, SequentialOptions{}, ErrInvalidArgument},
		{[]int64{10, 30000}, SequentialOptions{}, ErrTooLarge},
		{[]int64{10, 20}, SequentialOptions{Spending: SpendingFunction{Family: PowerFamily}}, ErrInvalidArgument},
		{[]int64{10, 20}, SequentialOptions{Spending: SpendingFunction{Family: 7}}, ErrInvalidArgument},
	} {
		if _, err := SequentialOne(ctx, 0.2, 0.4, 0.05, 0.2, c.looks, c.opt); !errors.Is(err, c.want) {
			t.Errorf("SequentialOne(%v, %+v) = %v, want %v", c.looks, c.opt, err, c.want)
		}
	}
	if _, err := SequentialOne(ctx, 0.4, 0.2, 0.05, 0.2, []int64{10, 20}, SequentialOptions{}); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("p1 < p0: %v", err)
	}
	for _, tt := range [][]float64{nil, {0.5}, {0.5, 0.5, 1}, {0, 1}, {0.5, 1.2}} {
		if _, err := SequentialTwo(ctx, 0.6, 0.4, 0.025, 0.2, tt, SequentialOptions{}); !errors.Is(err, ErrInvalidArgument) {
			t.Errorf("SequentialTwo fractions %v: %v", tt, err)
		}
		if _, err := SpendingBounds(ctx, tt, 0.025, SpendingFunction{}); !errors.Is(err, ErrInvalidArgument) {
			t.Errorf("SpendingBounds fractions %v: %v", tt, err)
		}
	}
	if _, err := SequentialTwo(ctx, 0.4, 0.6, 0.025, 0.2, []float64{1}, SequentialOptions{}); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("SequentialTwo p1 < p2: %v", err)
	}
	cctx, cancel := context.WithCancel(ctx)
	cancel()
	if _, err := SequentialOneN(cctx, 0.2, 0.4, 0.05, 0.2, 3, 0, SequentialOptions{}); !errors.Is(err, context.Canceled) {
		t.Errorf("SequentialOneN cancelled: %v", err)
	}
}

func BenchmarkSequential(b *testing.B) {
	ctx := context.Background()
	b.Run("one/3looks/n=45", func(b *testing.B) {
		for b.Loop() {
			if _, err := SequentialOne(ctx, 0.2, 0.4, 0.05, 0.2, []int64{15, 30, 45}, SequentialOptions{Futility: true}); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("bounds/5looks", func(b *testing.B) {
		for b.Loop() {
			if _, err := SpendingBounds(ctx, []float64{0.2, 0.4, 0.6, 0.8, 1}, 0.025, SpendingFunction{}); err != nil {
				b.Fatal(err)
			}
		}
	})
}

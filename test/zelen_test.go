package test

import (
	"context"
	"errors"
	"fmt"
	"math"
	"testing"
	"time"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"

	"github.com/kofnlab/kofn/internal/golden"
	"github.com/kofnlab/kofn/interval"
)

// stratumList reads k1,n1,k2,n2,... into strata.
func stratumList(t *testing.T, s string) []interval.Stratum {
	t.Helper()
	v := floatList(t, s)
	var ts []interval.Stratum
	for i := 0; i+3 < len(v); i += 4 {
		ts = append(ts, interval.Stratum{K1: int64(v[i]), N1: int64(v[i+1]), K2: int64(v[i+2]), N2: int64(v[i+3])})
	}
	return ts
}

// TestZelenAgainstEnumeration: the p-value and the conditional
// probability of the observed configuration against
// testdata/strata_zelen.tsv, made by listing every configuration in exact
// rational arithmetic (testdata/gen/strata_zelen.py, Python fractions;
// invented strata); 1e-10 relative.
func TestZelenAgainstEnumeration(t *testing.T) {
	t.Parallel()
	for _, r := range golden.Read(t, "../testdata/strata_zelen.tsv") {
		got, err := ZelenExact(context.Background(), stratumList(t, r.Str(1)))
		if err != nil {
			t.Fatalf("%s: %v", r.Pos(), err)
		}
		if diff := cmp.Diff([]float64{r.Float(2), r.Float(3)}, []float64{got.PValue, got.Statistic.Value}, cmpopts.EquateApprox(1e-10, 0)); diff != "" {
			t.Errorf("%s %s (-enumeration +kofn):\n%s", r.Pos(), r.Str(0), diff)
		}
		if got.Method != "Zelen exact" || got.Null != 1 || got.Alternative != TwoSided {
			t.Errorf("%s: %+v", r.Pos(), got)
		}
	}
}

// TestZelenAgreesWithBreslowDay: on larger invented strata, where the
// Breslow-Day-Tarone chi-square (checked against mpmath in
// TestBreslowDayAgainstIndependent) is a good approximation, the exact
// test agrees with it in direction: both reject homogeneity at 0.01 for
// strata that disagree, both accept at 0.2 for strata that agree, and
// their p-values are within a factor 2 of each other.
func TestZelenAgreesWithBreslowDay(t *testing.T) {
	t.Parallel()
	disagree := []interval.Stratum{{K1: 40, N1: 80, K2: 20, N2: 80}, {K1: 30, N1: 70, K2: 28, N2: 75}, {K1: 22, N1: 60, K2: 35, N2: 62}, {K1: 45, N1: 90, K2: 25, N2: 88}}
	agree := []interval.Stratum{{K1: 40, N1: 80, K2: 28, N2: 80}, {K1: 30, N1: 70, K2: 20, N2: 75}, {K1: 25, N1: 60, K2: 18, N2: 62}, {K1: 45, N1: 90, K2: 33, N2: 88}}
	for _, c := range []struct {
		name   string
		ts     []interval.Stratum
		reject bool
	}{{"disagree", disagree, true}, {"agree", agree, false}} {
		z, err := ZelenExact(context.Background(), c.ts)
		if err != nil {
			t.Fatal(err)
		}
		bd, _ := BreslowDay(c.ts, BreslowDayOptions{})
		t.Logf("%s: Zelen p = %.6g, Breslow-Day-Tarone p = %.6g", c.name, z.PValue, bd.PValue)
		if c.reject && !(z.PValue < 0.01 && bd.PValue < 0.01) || !c.reject && !(z.PValue > 0.2 && bd.PValue > 0.2) {
			t.Errorf("%s: Zelen %v, Breslow-Day %v", c.name, z.PValue, bd.PValue)
		}
		if r := z.PValue / bd.PValue; r < 0.5 || r > 2 {
			t.Errorf("%s: ratio of p-values %v", c.name, r)
		}
	}
}

// TestZelenEdges: fixed strata enter as constants (adding one changes
// nothing); fewer than two varying strata give p = 1 with a warning; one
// stratum is refused; oversized problems are refused before starting; a
// cancelled context stops the call.
func TestZelenEdges(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	base := []interval.Stratum{{K1: 6, N1: 10, K2: 2, N2: 10}, {K1: 5, N1: 9, K2: 1, N2: 8}, {K1: 1, N1: 8, K2: 6, N2: 9}}
	a, _ := ZelenExact(ctx, base)
	b, err := ZelenExact(ctx, append(append([]interval.Stratum{}, base...), interval.Stratum{K1: 0, N1: 5, K2: 0, N2: 7}, interval.Stratum{K1: 4, N1: 4, K2: 3, N2: 3}))
	if err != nil || b.PValue != a.PValue {
		t.Errorf("fixed strata changed the p-value: %v, %v (%v)", a.PValue, b.PValue, err)
	}
	one, err := ZelenExact(ctx, []interval.Stratum{{K1: 6, N1: 10, K2: 2, N2: 10}, {K1: 0, N1: 5, K2: 0, N2: 7}})
	if err != nil || one.PValue != 1 || len(one.Warnings) == 0 {
		t.Errorf("one varying stratum: %+v, %v", one, err)
	}
	if _, err := ZelenExact(ctx, base[:1]); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("one stratum: %v", err)
	}
	huge := make([]interval.Stratum, 40)
	for i := range huge {
		huge[i] = interval.Stratum{K1: 500, N1: 1000, K2: 500, N2: 1000}
	}
	if _, err := ZelenExact(ctx, huge); !errors.Is(err, ErrTooLarge) {
		t.Errorf("oversized: %v", err)
	}
	cctx, cancel := context.WithCancel(ctx)
	cancel()
	if _, err := ZelenExact(cctx, base); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: %v", err)
	}
}

// TestZelenCancel: a long search returns soon after its context ends.
func TestZelenCancel(t *testing.T) {
	if testing.Short() {
		t.Skip("long search")
	}
	t.Parallel()
	ts := make([]interval.Stratum, 60)
	for i := range ts {
		ts[i] = interval.Stratum{K1: int64(10 + i%7), N1: 30, K2: int64(12 - i%5), N2: 30}
	}
	ctx, cancel := context.WithTimeout(context.Background(), 20*time.Millisecond)
	defer cancel()
	start := time.Now()
	_, err := ZelenExact(ctx, ts)
	t.Logf("60 strata: %v after %v", err, time.Since(start))
	if err == nil {
		return // finished within the deadline: nothing to check
	}
	if errors.Is(err, ErrTooLarge) {
		return
	}
	if !errors.Is(err, context.DeadlineExceeded) || time.Since(start) > 2*time.Second {
		t.Errorf("after %v: %v", time.Since(start), err)
	}
}

func FuzzZelenExact(f *testing.F) {
	f.Add(int64(6), int64(10), int64(2), int64(10), int64(1), int64(8), int64(6), int64(9), int64(3))
	f.Add(int64(0), int64(0), int64(0), int64(0), int64(-1), int64(5), int64(2), int64(3), int64(1))
	f.Fuzz(func(t *testing.T, a, b, c, d, e, g, h, i, k int64) {
		k = k%6 + 1
		if k < 1 {
			k += 6
		}
		var ts []interval.Stratum
		for j := range k {
			ts = append(ts, interval.Stratum{K1: (a + j*e) % 40, N1: (b + j*g) % 40, K2: (c + j*h) % 40, N2: (d + j*i) % 40})
		}
		ctx, cancel := context.WithTimeout(context.Background(), 2*time.Second)
		defer cancel()
		r, err := ZelenExact(ctx, ts)
		if err != nil {
			return
		}
		if !(r.PValue >= 0 && r.PValue <= 1) || math.IsNaN(r.LogPValue) || !(r.Statistic.Value > 0 && r.Statistic.Value <= 1) {
			t.Fatalf("%+v: %+v", ts, r)
		}
		if r.PValue < r.Statistic.Value*(1-1e-9) {
			t.Fatalf("p-value %v below the observed configuration's probability %v", r.PValue, r.Statistic.Value)
		}
	})
}

func BenchmarkZelenExact(b *testing.B) {
	// invented: 10 strata of 40 trials, observed near the mode (the
	// hardest place for the search)
	ts := make([]interval.Stratum, 10)
	for i := range ts {
		ts[i] = interval.Stratum{K1: int64(6 + i%5), N1: 20, K2: int64(6 + i%3), N2: 20}
	}
	ctx := context.Background()
	c0, n := cpuTime(), 0
	for b.Loop() {
		if _, err := ZelenExact(ctx, ts); err != nil {
			b.Fatal(err)
		}
		n++
	}
	b.ReportMetric(float64(cpuTime()-c0)/float64(n), "cpu-ns/op")
}

// Invented scenario: a handwashing campaign measured in three wards; does
// the odds ratio of infection differ between the wards?
func ExampleZelenExact() {
	wards := []interval.Stratum{{K1: 6, N1: 10, K2: 2, N2: 10}, {K1: 5, N1: 9, K2: 1, N2: 8}, {K1: 1, N1: 8, K2: 6, N2: 9}}
	r, _ := ZelenExact(context.Background(), wards)
	fmt.Printf("%s: p = %.4f\n", r.Method, r.PValue)
	// Output: Zelen exact: p = 0.0055
}

package binom

import (
	"math"
	"strconv"
	"testing"

	"github.com/kofnlab/kofn/internal/golden"
)

// TestProportionWithinExample is the worked example of the specification
// (issue 2): n = 50, p = 0.3, eps = 0.1 counts k = 10..20 and gives 0.9120;
// the probability to 16 digits was recomputed exactly (rational sum) by
// testdata/gen/binom_extra_within.py.
func TestProportionWithinExample(t *testing.T) {
	t.Parallel()
	d, _ := New(50, 0.3)
	if lo, hi := withinRange(50, 0.3, 0.1); lo != 10 || hi != 20 {
		t.Errorf("range = %d..%d, want 10..20", lo, hi)
	}
	if got, want := d.ProportionWithin(0.1), 0.9120045304402759; math.Abs(got-want) > 1e-14 {
		t.Errorf("ProportionWithin(0.1) = %.16g, want %.16g", got, want)
	}
}

func TestProportionWithinSpecial(t *testing.T) {
	t.Parallel()
	d, _ := New(10, 0.3)
	tests := []struct {
		d    Dist
		eps  float64
		want float64
	}{
		{d, -0.01, 0},
		{d, math.Inf(-1), 0},
		{d, 1, 1},
		{d, math.Inf(1), 1},
		{d, 0, d.Prob(3)},          // X/10 == 0.3 exactly at k = 3
		{Dist{0, 0.3}, 0.5, 0},     // no trials
		{Dist{10, 0}, 0, 1},        // X = 0 surely
		{Dist{10, 1}, 0.05, 1},     // X = 10 surely
		{Dist{7, 1.0 / 3}, 0, 0},   // no k/7 equals 0.3333333333333333
		{Dist{3, 0.5}, 1.0 / 6, 0}, // 1/3 and 2/3 lie just outside 0.5 +- 0.16666666666666666
		{Dist{3, 0.5}, 0.17, 0.75},
	}
	for _, tc := range tests {
		if got := tc.d.ProportionWithin(tc.eps); math.Abs(got-tc.want) > 1e-15 {
			t.Errorf("%v.ProportionWithin(%v) = %.17g, want %.17g", tc.d, tc.eps, got, tc.want)
		}
	}
	if got := d.ProportionWithin(math.NaN()); !math.IsNaN(got) {
		t.Errorf("ProportionWithin(NaN) = %v, want NaN", got)
	}
}

// TestProportionWithinGolden checks against testdata/binom_extra_within.tsv
// (exact rational sums for n <= 100, 50-digit mpmath sums beyond; k ranges
// from exact decimal arithmetic in Python's fractions; generator
// testdata/gen/binom_extra_within.py).
func TestProportionWithinGolden(t *testing.T) {
	t.Parallel()
	rows := 0
	for _, fs := range golden.Read(t, "../testdata/binom_extra_within.tsv") {
		v := fs.Floats(0)
		rows++
		n := int64(v[0])
		d, err := New(n, v[1])
		if err != nil {
			t.Fatal(err)
		}
		if lo, hi := withinRange(n, v[1], v[2]); (lo <= hi || v[3] <= v[4]) && (lo != int64(v[3]) || hi != int64(v[4])) {
			t.Errorf("n=%d p=%v eps=%v: range %d..%d, want %v..%v", n, v[1], v[2], lo, hi, v[3], v[4])
		}
		got, want := d.ProportionWithin(v[2]), v[5]
		if math.Abs(got-want) > 1e-13*want*math.Max(1, -math.Log(want)) {
			t.Errorf("n=%d p=%v eps=%v: ProportionWithin = %.17g, want %.17g", n, v[1], v[2], got, want)
		}
	}
	if rows < 1000 {
		t.Errorf("only %d rows", rows)
	}
}

func BenchmarkProportionWithin(b *testing.B) {
	for _, n := range []int64{50, 1e6, 1e12} {
		d := Dist{n, 0.3}
		b.Run(strconv.FormatInt(n, 10), func(b *testing.B) {
			for b.Loop() {
				benchSink = d.ProportionWithin(0.01)
			}
		})
	}
}

func BenchmarkEntropy(b *testing.B) {
	for _, n := range []int64{100, 1e9} {
		d := Dist{n, 0.3}
		b.Run(strconv.FormatInt(n, 10), func(b *testing.B) {
			for b.Loop() {
				benchSink = d.Entropy()
			}
		})
	}
}

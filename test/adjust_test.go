package test

import (
	"context"
	"errors"
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/golden"
)

// floatList parses a comma-separated list of a golden row's field.
func floatList(t *testing.T, s string) []float64 {
	t.Helper()
	var v []float64
	for _, f := range strings.Split(s, ",") {
		x, err := strconv.ParseFloat(f, 64)
		if err != nil {
			t.Fatalf("bad number %q in %q", f, s)
		}
		v = append(v, x)
	}
	return v
}

// TestAdjustGoldenR compares with the "adjust" rows of
// testdata/test_karms_r.tsv, written by testdata/gen/test_karms.R with R
// 4.2.2 (the adjusted p-values of its stats package for Holm, Hochberg,
// Hommel, Bonferroni, Benjamini-Hochberg and Benjamini-Yekutieli; vectors
// with ties, 0 and 1, lengths 1 to 1000).
func TestAdjustGoldenR(t *testing.T) {
	t.Parallel()
	names := map[string]Adjustment{"holm": Holm, "hochberg": Hochberg, "hommel": Hommel,
		"bonferroni": Bonferroni, "BH": BenjaminiHochberg, "BY": BenjaminiYekutieli}
	n := 0
	for _, r := range golden.Read(t, "../testdata/test_karms_r.tsv") {
		if r.Str(0) != "adjust" {
			continue
		}
		n++
		m, ok := names[r.Str(1)]
		if !ok {
			t.Fatalf("%s: unknown method %s", r.Pos(), r.Str(1))
		}
		p, want := floatList(t, r.Str(2)), floatList(t, r.Str(3))
		got, err := AdjustPValues(context.Background(), p, m)
		if err != nil {
			t.Fatalf("%s: %v", r.Pos(), err)
		}
		if d := cmp.Diff(want, got, cmpopts.EquateApprox(1e-13, 0)); d != "" {
			t.Errorf("%s: %v m = %d (-want +got):\n%s", r.Pos(), m, len(p), d)
		}
	}
	if n < 60 {
		t.Errorf("only %d adjust rows", n)
	}
}

// TestAdjustWorked checks published and hand-computed examples.
func TestAdjustWorked(t *testing.T) {
	t.Parallel()
	bg := context.Background()
	// Benjamini and Hochberg (1995), section 4.2: 15 p-values of a
	// myocardial-infarction trial; at q = 0.05 the step-up procedure rejects
	// the four smallest, Bonferroni (0.05/15 = 0.0033) only three (recalled;
	// recomputed by hand: p(4) = 0.0095 <= 4 (0.05)/15 = 0.0133 while p(5) =
	// 0.0201 > 0.0167 and no later p(i) <= 0.05 i/15; Holm stops at
	// 12 p(4) = 0.114). The same vector is among the R rows of
	// TestAdjustGoldenR.
	bh := []float64{0.0001, 0.0004, 0.0019, 0.0095, 0.0201, 0.0278, 0.0298, 0.0344, 0.0459, 0.3240, 0.4262, 0.5719, 0.6528, 0.7590, 1.000}
	for _, c := range []struct {
		m    Adjustment
		want int
	}{{BenjaminiHochberg, 4}, {Bonferroni, 3}, {Holm, 3}} {
		r, err := Adjust(bg, bh, 0.05, c.m)
		if err != nil || r.Rejections != c.want {
			t.Errorf("%v on Benjamini-Hochberg's example: %d rejections (%v), want %d", c.m, r.Rejections, err, c.want)
		}
	}
	// Hand computation: Sidak 1 - 0.99^5 = 0.0490099501 exactly; Holm on
	// (0.01, 0.04, 0.03): sorted 0.01, 0.03, 0.04 -> 0.03, 0.06, 0.06.
	got, _ := AdjustPValues(bg, []float64{0.01}, Sidak)
	s5, _ := AdjustPValues(bg, []float64{0.01, 1, 1, 1, 1}, Sidak)
	if !relClose(s5[0], 0.0490099501, 1e-14) || got[0] != 0.01 {
		t.Errorf("Sidak: %v %v", s5, got)
	}
	h, _ := AdjustPValues(bg, []float64{0.01, 0.04, 0.03}, Holm)
	if d := cmp.Diff([]float64{0.03, 0.06, 0.06}, h, cmpopts.EquateApprox(1e-15, 0)); d != "" {
		t.Errorf("Holm (-want +got):\n%s", d)
	}
}

// simes returns Simes's p-value of the members of p selected by the bit mask.
func simes(p []float64, mask int) float64 {
	var v []float64
	for i := range p {
		if mask&(1<<i) != 0 {
			v = append(v, p[i])
		}
	}
	for i := 1; i < len(v); i++ { // insertion sort
		for j := i; j > 0 && v[j] < v[j-1]; j-- {
			v[j], v[j-1] = v[j-1], v[j]
		}
	}
	best := math.Inf(1)
	for j, x := range v {
		best = math.Min(best, float64(len(v))*x/float64(j+1))
	}
	return best
}

// TestHommelClosedTesting checks Hommel's adjusted p-values against their
// definition (Hommel 1988): the closed test of Simes's tests, so the
// largest Simes p-value over all 2^(m-1) subsets containing the
// hypothesis, for m up to 11 with ties, zeros and ones.
func TestHommelClosedTesting(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(7, 16))
	for trial := 0; trial < 400; trial++ {
		m := 1 + trial%11
		p := make([]float64, m)
		for i := range p {
			switch rng.IntN(6) {
			case 0:
				p[i] = float64(rng.IntN(5)) / 4 // ties, 0 and 1
			default:
				p[i] = math.Pow(rng.Float64(), 3)
			}
		}
		want := make([]float64, m)
		for i := range p {
			for mask := 1; mask < 1<<m; mask++ {
				if mask&(1<<i) != 0 {
					want[i] = math.Max(want[i], simes(p, mask))
				}
			}
		}
		got, err := AdjustPValues(context.Background(), p, Hommel)
		if err != nil {
			t.Fatal(err)
		}
		if d := cmp.Diff(want, got, cmpopts.EquateApprox(1e-14, 0)); d != "" {
			t.Fatalf("p = %v (-want +got):\n%s", p, d)
		}
	}
}

// TestAdjustProperties: over long random vectors (the radix sort's range),
// each adjusted value lies in [p, 1], the order of the p-values is kept,
// ties get equal values, Bonferroni >= Holm >= Hochberg >= Hommel >= p
// (Hommel 1989; Hochberg 1988) and BY >= BH (common practice checks, exact
// consequences of the definitions).
func TestAdjustProperties(t *testing.T) {
	t.Parallel()
	rng := rand.New(rand.NewPCG(3, 1))
	bg := context.Background()
	for _, m := range []int{5000, 70000} {
		p := make([]float64, m)
		for i := range p {
			p[i] = math.Pow(rng.Float64(), 4)
			if i%97 == 0 {
				p[i] = p[i/2] // ties
			}
		}
		p[0], p[1] = 0, 1
		all := map[Adjustment][]float64{}
		for _, a := range AdjustmentValues() {
			v, err := AdjustPValues(bg, p, a)
			if err != nil {
				t.Fatal(err)
			}
			all[a] = v
			for i := range v {
				if !(v[i] >= p[i] && v[i] <= 1) {
					t.Fatalf("%v m=%d: adjusted %v for p %v", a, m, v[i], p[i])
				}
				if j := i / 2; (p[j] < p[i] && v[j] > v[i]) || (p[j] == p[i] && v[j] != v[i]) {
					t.Fatalf("%v m=%d: order broken: p %v -> %v, p %v -> %v", a, m, p[j], v[j], p[i], v[i])
				}
			}
		}
		const slack = 1 + 1e-12
		for i := range p {
			if !(all[Bonferroni][i] >= all[Holm][i] && all[Holm][i] >= all[Hochberg][i] && all[Hochberg][i]*slack >= all[Hommel][i] &&
				all[BenjaminiYekutieli][i] >= all[BenjaminiHochberg][i]) {
				t.Fatalf("m=%d p=%v: bonf %v holm %v hoch %v hommel %v bh %v by %v", m, p[i], all[Bonferroni][i], all[Holm][i],
					all[Hochberg][i], all[Hommel][i], all[BenjaminiHochberg][i], all[BenjaminiYekutieli][i])
			}
		}
	}
}

func TestAdjustErrors(t *testing.T) {
	t.Parallel()
	bg := context.Background()
	for _, c := range []struct {
		p    []float64
		m    Adjustment
		want string
	}{
		{[]float64{0.1, math.NaN()}, Holm, "p[1] = NaN"},
		{[]float64{-0.1}, Holm, "p[0] = -0.1"},
		{[]float64{1.5}, Hommel, "p[0] = 1.5"},
		{[]float64{0.5}, Adjustment(99), "method = 99"},
	} {
		_, err := AdjustPValues(bg, c.p, c.m)
		if !errors.Is(err, ErrInvalidArgument) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%v %v: %v, want %q", c.p, c.m, err, c.want)
		}
	}
	if err := AdjustPValuesInto(bg, make([]float64, 1), []float64{0.1, 0.2}, Holm); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("short dst: %v", err)
	}
	if _, err := Adjust(bg, []float64{0.1}, 1, Holm); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("alpha 1: %v", err)
	}
	ctx, cancel := context.WithCancel(bg)
	cancel()
	if _, err := AdjustPValues(ctx, make([]float64, 100000), Hommel); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: %v", err)
	}
	if v, err := AdjustPValues(bg, nil, Hommel); err != nil || len(v) != 0 {
		t.Errorf("empty: %v %v", v, err)
	}
	for _, a := range AdjustmentValues() {
		if b, err := ParseAdjustment(strings.ToUpper(a.String())); err != nil || b != a {
			t.Errorf("parse %v: %v %v", a, b, err)
		}
	}
	if a, err := ParseAdjustment("BH"); err != nil || a != BenjaminiHochberg {
		t.Errorf("BH: %v %v", a, err)
	}
}

func BenchmarkAdjustMillion(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 2))
	p := make([]float64, 1_000_000)
	for i := range p {
		p[i] = rng.Float64()
	}
	dst := make([]float64, len(p))
	for _, a := range []Adjustment{Holm, Hommel, BenjaminiHochberg} {
		b.Run(a.String(), func(b *testing.B) {
			c0, n := cpuTime(), 0
			for b.Loop() {
				if err := AdjustPValuesInto(context.Background(), dst, p, a); err != nil {
					b.Fatal(err)
				}
				n++
			}
			b.ReportMetric(float64(cpuTime()-c0)/float64(n), "cpu-ns/op")
		})
	}
}

// TestFamilyLevel: Bonferroni 1 - 0.05/5 = 0.99; Sidak 0.95^(1/5) =
// 0.98979378... (hand computation: exp(ln 0.95 / 5)); the false
// coverage-statement level 1 - 3 (0.05)/10 = 0.985 (Benjamini and
// Yekutieli 2005, section 2, the formula).
func TestFamilyLevel(t *testing.T) {
	t.Parallel()
	b, err1 := FamilyLevel(0.95, 5, Bonferroni)
	s, err2 := FamilyLevel(0.95, 5, Sidak)
	f, err3 := SelectedLevel(0.95, 3, 10)
	if err1 != nil || err2 != nil || err3 != nil || !relClose(b, 0.99, 1e-15) || !relClose(s, math.Exp(math.Log(0.95)/5), 1e-15) || !relClose(f, 0.985, 1e-15) {
		t.Errorf("%v %v %v (%v %v %v)", b, s, f, err1, err2, err3)
	}
	if _, err := FamilyLevel(0.95, 5, Holm); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("Holm: %v", err)
	}
	if _, err := SelectedLevel(0.95, 11, 10); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("selected > m: %v", err)
	}
}

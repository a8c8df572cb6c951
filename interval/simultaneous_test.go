package interval

import (
	"encoding/json"
	"errors"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/golden"
)

func list(t *testing.T, s string) []float64 {
	t.Helper()
	var v []float64
	for _, f := range strings.Split(s, ",") {
		x, err := strconv.ParseFloat(f, 64)
		if err != nil {
			t.Fatalf("bad number %q", f)
		}
		v = append(v, x)
	}
	return v
}

func counts(t *testing.T, s string) []int64 {
	var c []int64
	for _, f := range list(t, s) {
		c = append(c, int64(f))
	}
	return c
}

// TestMultinomialGoldenR compares with testdata/interval_multinomial_r.tsv,
// written by testdata/gen/interval_multinomial.R with R 4.2.2 base: the
// Quesenberry-Hurst and Goodman limits from its chi-square quantiles, the
// Sison-Glaz c and gamma from Levin's formula on its Poisson functions
// (an independent implementation), and exact multinomial box probabilities
// by convolution, against which the Edgeworth approximation of nu is
// checked (it is an approximation: within 0.005 absolute at these counts
// for N >= 20; the exact convolution used as a fallback must match to
// 1e-10).
func TestMultinomialGoldenR(t *testing.T) {
	t.Parallel()
	rows := 0
	for _, r := range golden.Read(t, "../testdata/interval_multinomial_r.tsv") {
		rows++
		x := counts(t, r.Str(1))
		switch kind := r.Str(0); kind {
		case "qh", "goodman":
			m := QuesenberryHurst
			if kind == "goodman" {
				m = Goodman
			}
			f, err := Multinomial(x, MultinomialOptions{Level: r.Float(2), Method: m})
			if err != nil {
				t.Fatalf("%s: %v", r.Pos(), err)
			}
			var lo, hi []float64
			for _, iv := range f.Intervals {
				lo, hi = append(lo, iv.Lower), append(hi, iv.Upper)
			}
			opt := cmpopts.EquateApprox(1e-12, 0)
			if d := cmp.Diff(list(t, r.Str(3)), lo, opt) + cmp.Diff(list(t, r.Str(4)), hi, opt); d != "" {
				t.Errorf("%s: %v (-want +got):\n%s", r.Pos(), m, d)
			}
		case "sg":
			lev := r.Float(2)
			c, g, ok := sisonGlaz(x, sum(x), lev, sum(x), sgCoverage)
			if !ok || c != r.Int(3) || !relClose(g, r.Float(4), 1e-9) {
				t.Errorf("%s: c %d gamma %v (%v), want %d %v", r.Pos(), c, g, ok, r.Int(3), r.Float(4))
			}
			f, err := Multinomial(x, MultinomialOptions{Level: lev})
			if err != nil {
				t.Fatal(err)
			}
			N := float64(sum(x))
			for i, iv := range f.Intervals {
				p := float64(x[i]) / N
				if want := math.Max(0, p-float64(c)/N); !relClose(iv.Lower, want, 1e-12) && iv.Lower != want {
					t.Errorf("%s: lower %d %v want %v", r.Pos(), i, iv.Lower, want)
				}
				if want := math.Min(1, p+(float64(c)+2*g)/N); !relClose(iv.Upper, want, 1e-12) {
					t.Errorf("%s: upper %d %v want %v", r.Pos(), i, iv.Upper, want)
				}
			}
		case "box":
			nu := sgCoverage(x, sum(x), r.Int(2))
			if ex := sgCoverageExact(x, sum(x), r.Int(2)); !relClose(ex, r.Float(3), 1e-10) {
				t.Errorf("%s: exact nu %v, want %v", r.Pos(), ex, r.Float(3))
			}
			if sum(x) >= 20 && math.Abs(nu-r.Float(3)) > 0.005 {
				t.Errorf("%s: Edgeworth nu %v, exact %v", r.Pos(), nu, r.Float(3))
			}
		}
	}
	if rows < 70 {
		t.Errorf("only %d rows", rows)
	}
}

func sum(x []int64) int64 {
	var s int64
	for _, v := range x {
		s += v
	}
	return s
}

func relClose(got, want, rel float64) bool {
	return got == want || math.Abs(got-want) <= rel*math.Abs(want)
}

// TestMultinomialProperties: intervals contain their estimates, widen with
// the level, zero counts get lower limit 0 (sparse tables); Goodman is
// narrower than Quesenberry-Hurst for k >= 3 at usual levels (Goodman
// 1965, section 3; a consequence of chi-square quantiles: chi2_1 at
// 1 - 0.05/k is below chi2_{k-1} at 0.95 for k >= 3).
func TestMultinomialProperties(t *testing.T) {
	t.Parallel()
	for _, x := range [][]int64{{0, 0, 5, 0, 1, 0, 0, 0, 0, 2}, {1000, 2, 0}, {3, 3, 3, 3}, {0, 7}} {
		var prev []Family
		for _, lev := range []float64{0.8, 0.95, 0.999} {
			var fam []Family
			for _, m := range MultinomialMethodValues() {
				f, err := Multinomial(x, MultinomialOptions{Level: lev, Method: m})
				if err != nil {
					t.Fatalf("%v %v %v: %v", x, lev, m, err)
				}
				for i, iv := range f.Intervals {
					if !(iv.Lower <= iv.Estimate && iv.Estimate <= iv.Upper && iv.Lower >= 0 && iv.Upper <= 1) {
						t.Errorf("%v %v %v: interval %d %+v", x, lev, m, i, iv)
					}
					if x[i] == 0 && iv.Lower != 0 {
						t.Errorf("%v %v %v: zero count %d has lower %v", x, lev, m, i, iv.Lower)
					}
					if prev != nil {
						p := prev[m].Intervals[i]
						if iv.Lower > p.Lower+1e-15 || iv.Upper < p.Upper-1e-15 {
							t.Errorf("%v %v %v: interval %d shrank with the level: %v,%v after %v,%v", x, lev, m, i, iv.Lower, iv.Upper, p.Lower, p.Upper)
						}
					}
				}
				fam = append(fam, f)
			}
			if len(x) >= 3 && lev == 0.95 {
				for i := range x {
					if fam[Goodman].Intervals[i].Width() > fam[QuesenberryHurst].Intervals[i].Width() {
						t.Errorf("%v: Goodman wider than Quesenberry-Hurst at %d", x, i)
					}
				}
			}
			prev = fam
		}
	}
}

// TestVersusControlIntervals: each difference is the two-sample interval
// at the Bonferroni level 1 - 0.05/3 (Dunn 1961), or Sidak 0.95^(1/3).
func TestVersusControlIntervals(t *testing.T) {
	t.Parallel()
	x, n := []int64{30, 41, 25, 52}, []int64{100, 110, 95, 120}
	for _, sidak := range []bool{false, true} {
		f, err := VersusControl(x, n, 0, ControlOptions{Sidak: sidak})
		if err != nil || len(f.Intervals) != 3 {
			t.Fatalf("%+v %v", f, err)
		}
		each := 1 - 0.05/3
		if sidak {
			each = math.Pow(0.95, 1.0/3)
		}
		if !relClose(f.EachLevel, each, 1e-14) {
			t.Errorf("each level %v, want %v", f.EachLevel, each)
		}
		for i, j := range []int{1, 2, 3} {
			d, _ := Difference(x[j], n[j], x[0], n[0], DiffOptions{Level: each})
			iv := f.Intervals[i]
			if iv.Lower != d.Lower || iv.Upper != d.Upper || iv.Parameter != "p["+strconv.Itoa(j)+"] - p[0]" || iv.Level != 0.95 {
				t.Errorf("arm %d: %+v, want %+v", j, iv, d)
			}
		}
	}
	if _, err := VersusControl(x, n, 9, ControlOptions{}); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("bad control: %v", err)
	}
	if _, err := VersusControl(x, []int64{100, 110, 95, 0}, 0, ControlOptions{}); !errors.Is(err, ErrInvalidArgument) || !strings.Contains(err.Error(), "arm 3") {
		t.Errorf("empty arm: %v", err)
	}
}

func TestMultinomialErrors(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		x    []int64
		opt  MultinomialOptions
		want string
	}{
		{[]int64{3}, MultinomialOptions{}, "at least 2"},
		{[]int64{3, -1}, MultinomialOptions{}, "counts[1] = -1"},
		{[]int64{0, 0}, MultinomialOptions{}, "every count is 0"},
		{[]int64{1, 2}, MultinomialOptions{Level: 1}, "Level = 1"},
		{[]int64{1, 2}, MultinomialOptions{Method: 5}, "Method = 5"},
	} {
		if _, err := Multinomial(c.x, c.opt); !errors.Is(err, ErrInvalidArgument) || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%v: %v, want %q", c.x, err, c.want)
		}
	}
}

// TestFamilyJSONRoundTrip: a family survives encoding/json unchanged.
func TestFamilyJSONRoundTrip(t *testing.T) {
	t.Parallel()
	f, err := Multinomial([]int64{0, 3, 9}, MultinomialOptions{})
	if err != nil {
		t.Fatal(err)
	}
	b, err := json.Marshal(f)
	if err != nil {
		t.Fatal(err)
	}
	var g Family
	if err := json.Unmarshal(b, &g); err != nil {
		t.Fatalf("%v in %s", err, b)
	}
	if d := cmp.Diff(f, g); d != "" || !strings.Contains(string(b), `"intervals":[{"lower":0,`) {
		t.Errorf("%s (-in +out):\n%s", b, d)
	}
}

// TestMultinomialLarge: Sison-Glaz at a billion observations in two
// categories stays fast and close to Goodman's width (both are about
// z sqrt(p (1-p)/N)); a million categories of large counts are refused.
func TestMultinomialLarge(t *testing.T) {
	t.Parallel()
	sg, err := Multinomial([]int64{600_000_000, 400_000_000}, MultinomialOptions{})
	if err != nil {
		t.Fatal(err)
	}
	gd, _ := Multinomial([]int64{600_000_000, 400_000_000}, MultinomialOptions{Method: Goodman})
	if r := sg.Intervals[0].Width() / gd.Intervals[0].Width(); r < 0.8 || r > 1.1 {
		t.Errorf("width ratio %v: %+v vs %+v", r, sg.Intervals[0], gd.Intervals[0])
	}
	big := make([]int64, 1_000_000)
	for i := range big {
		big[i] = 1_000_000
	}
	if _, err := Multinomial(big, MultinomialOptions{}); !errors.Is(err, ErrTooLarge) {
		t.Errorf("a million large categories: %v", err)
	}
}

// FuzzMultinomial: four categories, any method and level; limits in
// [0, 1] around the estimate, errors typed.
func FuzzMultinomial(f *testing.F) {
	f.Add(int64(41), int64(27), int64(0), int64(5), 0.95, 0)
	f.Add(int64(0), int64(0), int64(0), int64(1), 0.5, 2)
	f.Add(int64(-3), int64(2), int64(9), int64(1), math.NaN(), 1)
	f.Fuzz(func(t *testing.T, a, b, c, d int64, lev float64, m int) {
		if a > 1e7 || b > 1e7 || c > 1e7 || d > 1e7 {
			return
		}
		fam, err := Multinomial([]int64{a, b, c, d}, MultinomialOptions{Level: lev, Method: MultinomialMethod(m)})
		if err != nil {
			var e *Error
			if !errors.As(err, &e) || !strings.HasPrefix(err.Error(), "interval.Multinomial: ") {
				t.Fatalf("untyped error %v", err)
			}
			return
		}
		for _, iv := range fam.Intervals {
			if !(iv.Lower >= 0 && iv.Upper <= 1 && iv.Lower <= iv.Estimate && iv.Estimate <= iv.Upper) {
				t.Fatalf("%v %v %v: %+v", []int64{a, b, c, d}, lev, m, iv)
			}
		}
	})
}

package interval_test

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/kofnlab/kofn/interval"
)

// parseLimit reads a golden limit: "+Inf" or a decimal.
func parseLimit(t *testing.T, s string) float64 {
	t.Helper()
	if s == "+Inf" {
		return math.Inf(1)
	}
	return atof(t, s)
}

// TestGoldenMpmath checks the methods SciPy and R base lack against
// testdata/interval_mpmath.tsv, independent mpmath code at 50 digits (see
// testdata/gen/interval_mpmath.py): root-found and score limits to 1e-12
// relative, closed forms to 1e-13; limits of differences, which can be
// near 0, also pass within 1e-15 absolute.
func TestGoldenMpmath(t *testing.T) {
	t.Parallel()
	worst := map[string]float64{}
	for _, r := range readGolden(t, "interval_mpmath.tsv") {
		c, name, lev := r[0], r[1], atof(t, r[2])
		want := [3]float64{parseLimit(t, r[3]), parseLimit(t, r[4]), parseLimit(t, r[5])}
		var iv interval.Interval
		var err error
		checkEst := true
		switch kind, rest, _ := strings.Cut(name, " "); kind {
		case "difference":
			m, _ := interval.ParseDiffMethod(rest)
			x := nums(t, c, "/-")
			iv, err = interval.Difference(x[0], x[1], x[2], x[3], interval.DiffOptions{Method: m, Level: lev})
		case "ratio":
			m, _ := interval.ParseRatioMethod(rest)
			x := nums(t, c, "/-")
			iv, err = interval.Ratio(x[0], x[1], x[2], x[3], interval.RatioOptions{Method: m, Level: lev})
		case "odds":
			m, _ := interval.ParseOddsMethod(rest)
			x := nums(t, c, "/-")
			iv, err = interval.OddsRatio(x[0], x[1], x[2], x[3], interval.OddsOptions{Method: m, Level: lev})
		case "paired":
			m, _ := interval.ParsePairedMethod(rest)
			x := nums(t, c, ",")
			iv, err = interval.PairedDifference(x[0], x[1], x[2], x[3], interval.PairedOptions{Method: m, Level: lev})
		case "discordant":
			x := nums(t, c, ":")
			iv, err = interval.DiscordantRatio(x[0], x[1], interval.Options{Method: interval.ClopperPearson, Level: lev})
		default:
			m, perr := interval.ParseMethod(name)
			if perr != nil {
				t.Fatal(perr)
			}
			x := nums(t, c, "/")
			iv, err = interval.Proportion(x[0], x[1], interval.Options{Method: m, Level: lev})
		}
		if err != nil {
			t.Fatalf("%s %s: %v", c, name, err)
		}
		got := [3]float64{iv.Lower, iv.Upper, iv.Estimate}
		if !checkEst {
			got[2] = want[2]
		}
		tol := 1e-12
		for i := range 3 {
			w, g := want[i], got[i]
			if math.IsInf(w, 1) || math.IsInf(g, 1) {
				if w != g {
					t.Errorf("%s %s level %v: value %d = %v, want %v", c, name, lev, i, g, w)
				}
				continue
			}
			e := relErr(g, w)
			if math.Abs(g-w) <= 1e-15 && (strings.HasPrefix(name, "difference") || strings.HasPrefix(name, "paired")) {
				e = 0
			}
			if e > worst[name] {
				worst[name] = e
			}
			if e > tol {
				t.Errorf("%s %s level %v: value %d = %.17g, want %.17g (rel %.2g)", c, name, lev, i, g, w, e)
			}
		}
	}
	t.Logf("worst relative errors: %v", fmt.Sprint(worst))
}

// nums splits a case label like "56/70-48/80" into its integers.
func nums(t *testing.T, s, seps string) []int64 {
	t.Helper()
	f := strings.FieldsFunc(s, func(r rune) bool { return strings.ContainsRune(seps, r) })
	out := make([]int64, len(f))
	for i, x := range f {
		v, err := strconv.ParseInt(x, 10, 64)
		if err != nil {
			t.Fatal(err)
		}
		out[i] = v
	}
	return out
}

func TestJeffreysMirrorLargeN(t *testing.T) {
	t.Parallel()
	// The mirror images of the mpmath golden's large-n Jeffreys rows:
	// limits for n - k are 1 minus those for k (Beta symmetry). A float64
	// near 1 holds 1 - L only to 1.1e-16 absolute, so the check is that the
	// lower limit is the double nearest 1 - U (to one unit in the last
	// place), which is what full relative accuracy of L means there.
	for _, c := range []struct{ k, n int64 }{{5, 1e6}, {2, 1e9}, {5, 1e12}} {
		iv, err := interval.Proportion(c.k, c.n, interval.Options{Method: interval.Jeffreys})
		if err != nil {
			t.Fatal(err)
		}
		mv, err := interval.Proportion(c.n-c.k, c.n, interval.Options{Method: interval.Jeffreys})
		if err != nil {
			t.Fatal(err)
		}
		if d := math.Abs(mv.Lower - (1 - iv.Upper)); d > 1.2e-16 {
			t.Errorf("%d/%d: lower = %.17g, 1 - upper of the mirror = %.17g (off by %.2g)", c.n-c.k, c.n, mv.Lower, 1-iv.Upper, d)
		}
	}
}

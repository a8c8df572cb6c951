package binom

import (
	"math"
	"testing"

	"github.com/kofnlab/kofn/internal/golden"
)

// goldenCase is one line of testdata/binom_golden.tsv: the natural logs of
// P(X = k), P(X <= k) and P(X > k) computed by mpmath at 40-60 digits
// (testdata/gen/binom_golden.py: exact sums for n <= 3000, quadrature of the
// incomplete beta integral beyond).
type goldenCase struct {
	n               int64
	p               float64
	k               int64
	lpmf, lcdf, lsf float64
}

func readGolden(t *testing.T) []goldenCase {
	t.Helper()
	var cases []goldenCase
	for _, r := range golden.Read(t, "../testdata/binom_golden.tsv") {
		if r.Len() != 6 {
			t.Fatalf("%s: bad golden line %q", r.Pos(), r.Fields)
		}
		cases = append(cases, goldenCase{n: r.Int(0), p: r.Float(1), k: r.Int(2), lpmf: r.Float(3), lcdf: r.Float(4), lsf: r.Float(5)})
	}
	return cases
}

// logErr is the error of a log-probability as issue 2's bar defines it:
// |got - want| / max(1, |want|), 0 when both are -Inf, +Inf when only one is.
func logErr(got, want float64) float64 {
	if got == want {
		return 0
	}
	if math.IsInf(want, 0) || math.IsInf(got, 0) || math.IsNaN(got) {
		return math.Inf(1)
	}
	return math.Abs(got-want) / math.Max(1, math.Abs(want))
}

// plainErr is the error of a probability v = exp(lnWant) under the bar:
// relative error over max(1, |ln v|) where v >= 1e-300; below that only
// the rule that 0 be returned where the truth rounds to 0 (ln v < -745.13)
// and a value not above 1e-300 otherwise is checked. 1 is accepted only
// where the truth rounds to 1 (1 - v < 2^-53).
func plainErr(got, lnWant float64) float64 {
	if math.IsNaN(got) {
		return math.Inf(1)
	}
	if got == 1 && lnWant < -0x1p-53 {
		return math.Inf(1)
	}
	if lnWant < math.Log(1e-300) {
		switch {
		case got == 0 && lnWant > math.Log(math.SmallestNonzeroFloat64)-math.Ln2:
			return math.Inf(1)
		case got > 1.0000001e-300:
			return math.Inf(1)
		}
		return 0
	}
	v := math.Exp(lnWant)
	return math.Abs(got-v) / v / math.Max(1, -lnWant)
}

// accuracyBar is issue 2's accuracy bar for all six functions.
const accuracyBar = 1e-13

// regressionBar guards the accuracy reached: the worst errors measured on
// the golden file are 5e-15 (LogProb, LogCDF, CDF), 4.6e-15 (Prob) and
// 3.4e-15 (LogSurvival, Survival); a change that quadruples them fails.
const regressionBar = 2e-14

func TestGoldenAccuracy(t *testing.T) {
	t.Parallel()
	cases := readGolden(t)
	if len(cases) < 2000 {
		t.Fatalf("golden file has %d cases, want >= 2000", len(cases))
	}
	type fn struct {
		name string
		err  func(d Dist, c goldenCase) float64
	}
	fns := []fn{
		{"LogProb", func(d Dist, c goldenCase) float64 { return logErr(d.LogProb(c.k), c.lpmf) }},
		{"LogCDF", func(d Dist, c goldenCase) float64 { return logErr(d.LogCDF(c.k), c.lcdf) }},
		{"LogSurvival", func(d Dist, c goldenCase) float64 { return logErr(d.LogSurvival(c.k), c.lsf) }},
		{"Prob", func(d Dist, c goldenCase) float64 { return plainErr(d.Prob(c.k), c.lpmf) }},
		{"CDF", func(d Dist, c goldenCase) float64 { return plainErr(d.CDF(c.k), c.lcdf) }},
		{"Survival", func(d Dist, c goldenCase) float64 { return plainErr(d.Survival(c.k), c.lsf) }},
	}
	for _, f := range fns {
		worst, at := 0.0, goldenCase{}
		bad := 0
		for _, c := range cases {
			d, err := New(c.n, c.p)
			if err != nil {
				t.Fatal(err)
			}
			e := f.err(d, c)
			if e > accuracyBar {
				bad++
				if bad <= 5 || testing.Verbose() {
					t.Errorf("%s: n=%d p=%v k=%d error %.3g > %.0e", f.name, c.n, c.p, c.k, e, accuracyBar)
				}
			}
			if e > worst || math.IsNaN(e) {
				worst, at = e, c
			}
		}
		if bad > 5 && !testing.Verbose() {
			t.Errorf("%s: %d cases over the bar in all", f.name, bad)
		}
		t.Logf("%-12s worst error %.3g over %d cases (n=%d p=%v k=%d)", f.name, worst, len(cases), at.n, at.p, at.k)
		if worst > regressionBar && worst <= accuracyBar {
			t.Errorf("%s: worst error %.3g, above the %.0e reached before (n=%d p=%v k=%d)", f.name, worst, regressionBar, at.n, at.p, at.k)
		}
	}
}

package test

import (
	"strings"
	"testing"

	"github.com/kofnlab/kofn/internal/golden"
)

// TestGoldenR compares with testdata/test_r.tsv, written by
// testdata/gen/test_r.R with R 4.2.2 (its stats package): the exact
// binomial test (point-probability p-value and Clopper-Pearson interval),
// the one-sample proportion test (score test with and without continuity
// correction, Wilson intervals), Fisher's exact test, the two-sample
// proportion test (Pearson chi-square with and without Yates) and
// McNemar's test.
func TestGoldenR(t *testing.T) {
	t.Parallel()
	for _, r := range golden.Read(t, "../testdata/test_r.tsv") {
		what := strings.Join(r.Fields, " ")
		switch r.Fields[0] {
		case "binom":
			k, n, p0, a := r.Int(1), r.Int(2), r.Float(3), alt(t, r.Str(4))
			got, err := Binomial(k, n, p0, BinomialOptions{Alternative: a})
			if err != nil || !relClose(got.PValue, r.Float(5), 1e-9) {
				t.Errorf("%s: p = %v (%v)", what, got.PValue, err)
			}
			cp, _ := Binomial(k, n, p0, with(optCentral, a))
			checkInterval(t, what, cp.Interval, r.Float(6), r.Float(7), 1e-9)
		case "score1":
			k, n, p0, a := r.Int(1), r.Int(2), r.Float(3), alt(t, r.Str(4))
			m := optScore
			if r.Fields[5] == "TRUE" {
				m = optScoreCC
			}
			got, err := Binomial(k, n, p0, with(m, a))
			if err != nil || !relClose(got.PValue, r.Float(6), 1e-9) {
				t.Errorf("%s: p = %v (%v)", what, got.PValue, err)
			}
			// R's proportion test shrinks the interval's continuity correction to
			// |k - n p0| when that is below 1/2, so its interval then depends
			// on p0; it is the Wilson interval with continuity correction
			// (which inverts the corrected score test) only otherwise.
			if d := float64(k) - float64(n)*p0; m.Method == Score || d >= 0.5 || d <= -0.5 {
				checkInterval(t, what, got.Interval, r.Float(7), r.Float(8), 1e-9)
			}
		case "fisher":
			k1, n1, k2, n2, a := r.Int(1), r.Int(2), r.Int(3), r.Int(4), alt(t, r.Str(5))
			got, err := Fisher(k1, n1, k2, n2, FisherOptions{Alternative: a})
			if err != nil || !relClose(got.PValue, r.Float(6), 1e-9) {
				t.Errorf("%s: p = %v (%v)", what, got.PValue, err)
			}
		case "score2":
			k1, n1, k2, n2, a := r.Int(1), r.Int(2), r.Int(3), r.Int(4), alt(t, r.Str(5))
			m := ChiSquare
			if r.Fields[6] == "TRUE" {
				m = ChiSquareYates
			}
			got, err := TwoSample(k1, n1, k2, n2, TwoSampleOptions{Alternative: a, Method: m})
			// Where the exact statistic is 0, R's floating-point cell
			// arithmetic leaves about 1e-31; the integer numerator gives 0.
			if w := r.Float(7); w < 1e-20 && got.Statistic.Value < 1e-20 {
				r.Fields[7] = "0"
			}
			if err != nil || !relClose(got.Statistic.Value, r.Float(7), 1e-9) || !relClose(got.PValue, r.Float(8), 1e-9) {
				t.Errorf("%s: X2 = %v, p = %v (%v)", what, got.Statistic.Value, got.PValue, err)
			}
		case "mcnemar":
			m := McNemarAsymptotic
			if r.Fields[3] == "TRUE" {
				m = McNemarAsymptoticCC
			}
			got, err := McNemar(r.Int(1), r.Int(2), McNemarOptions{Method: m})
			if err != nil || !relClose(got.Statistic.Value, r.Float(4), 1e-9) || !relClose(got.PValue, r.Float(5), 1e-9) {
				t.Errorf("%s: X2 = %v, p = %v (%v)", what, got.Statistic.Value, got.PValue, err)
			}
		}
	}
}

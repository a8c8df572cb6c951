package repl

import (
	"strings"
	"testing"

	"github.com/kofnlab/kofn/test"
)

func TestCheckAndFlipsValues(t *testing.T) {
	t.Parallel()
	tests := []valueCase{
		// Fagerland MW, Lydersen S, Laake P (2013), BMC Med Res Methodol 13:91: pairs 1, 1, 7, 12
		// (data read; p-values recalled, recomputed): exact 18/256, mid-p 10/256, asymptotic 0.034, cc 0.077.
		{"flips 1 1 7 12 method=exact", "p_value", 18.0 / 256, 1e-12, "Fagerland 2013"},
		{"flips 1 1 7 12 midp=on", "p_value", 10.0 / 256, 1e-12, "Fagerland 2013"},
		{"flips 1 1 7 12 method=asymptotic", "statistic.value", 4.5, 1e-12, "Fagerland 2013"},
		{"flips 1 1 7 12 method=asymptotic", "p_value", 0.0339, 2e-3, "Fagerland 2013"},
		{"flips 1 1 7 12 method=asymptotic-cc", "p_value", 0.0771, 2e-3, "Fagerland 2013"},
		// Newcombe RG (1998), Stat Med 17:857-872, Table II, method 3 (Wilson score, which the score
		// test inverts), 81/263 (recalled, recomputed): 0.2553 to 0.3662.
		{"check 81/263 p=0.3 method=score", "interval.lower", 0.2553, 2e-4, "Newcombe 1998 single"},
		{"check 81/263 p=0.3 method=score", "interval.upper", 0.3662, 2e-4, "Newcombe 1998 single"},
		// Same table, method 5 (Clopper-Pearson, which the central test inverts): 0.2527 to 0.3676.
		{"check 81/263 p=0.3 rule=central", "interval.lower", 0.2527, 2e-4, "Newcombe 1998 single"},
		{"check 81/263 p=0.3 rule=central", "interval.upper", 0.3676, 2e-4, "Newcombe 1998 single"},
		// NIST/SEMATECH e-Handbook 7.2.4: 4 defectives in 20, 90% (limits recalled, recomputed).
		{"check 4/20 p=0.2 rule=central level=90%", "interval.lower", 0.0714, 1e-3, "NIST 7.2.4"},
		{"check 4/20 p=0.2 rule=central level=90%", "interval.upper", 0.4010, 1e-3, "NIST 7.2.4"},
	}
	checkValues(t, tests)
}

// TestCheckMatchesPackage checks that the shell passes its options through
// unchanged: its JSON equals the package's result for the same call.
func TestCheckMatchesPackage(t *testing.T) {
	t.Parallel()
	type form struct {
		words string
		o     test.BinomialOptions
	}
	var forms []form
	for _, r := range test.TwoSidedRuleValues() {
		for _, mid := range []bool{false, true} {
			w := "method=exact rule=" + methodWord(r.String())
			if mid {
				w += " midp=on"
			}
			forms = append(forms, form{w, test.BinomialOptions{Rule: r, MidP: mid}})
		}
	}
	for _, m := range test.BinomialMethodValues()[1:] {
		forms = append(forms, form{"method=" + methodWord(m.String()), test.BinomialOptions{Method: m}})
	}
	for _, f := range forms {
		for _, alt := range test.AlternativeValues() {
			line := "check 17/40 p=0.3 " + f.words + " alt=" + alt.String() + " level=0.9"
			obj := runJSON(t, line)
			o := f.o
			o.Alternative, o.Level = alt, 0.9
			want, err := test.Binomial(17, 40, 0.3, o)
			if err != nil {
				t.Fatal(err)
			}
			if got := num(t, obj, "p_value"); got != want.PValue {
				t.Errorf("%s: p-value %v, package %v", line, got, want.PValue)
			}
			if got := num(t, obj, "interval.upper"); got != want.Interval.Upper {
				t.Errorf("%s: upper %v, package %v", line, got, want.Interval.Upper)
			}
		}
	}
	// A rule of an asymptotic test does not apply, and says so.
	if _, err := runErr("check 17/40 p=0.3 method=score rule=central"); err == nil || !strings.Contains(err.Error(), "does not apply") {
		t.Errorf("rule= with method=score: %v", err)
	}
}

func TestDistributionValues(t *testing.T) {
	t.Parallel()
	checkValues(t, []valueCase{
		// binom.ProportionWithin's documented example: n = 50, p = 0.3, eps = 0.1 counts k = 10..20,
		// probability 0.9120 (k = 20 kept because 0.3 + 0.1 is read as 0.4).
		{"spread n=50 p=0.3 within=0.1", "within_prob", 0.9120, 1e-4, "binom doc example"},
		// Montgomery, single sampling plan n = 89, c = 2: P(X <= 2) at p = 0.03 and 0.04.
		{"tail 2/89 p=0.03", "at_most", 0.498483, 1e-6, "Montgomery"},
		{"tail 2/89 p=0.04", "at_most", 0.304158, 2e-6, "Montgomery"},
		// Success run (REFERENCES.md): 299 trials without failure at p = 0.01: 0.99^299 = 0.049536.
		{"tail 0/299 p=0.01", "exactly", 0.0495362, 1e-5, "success run"},
		// Binomial mean and standard deviation n p and sqrt(n p (1-p)) (textbook identities).
		{"spread n=40 p=0.3", "mean", 12, 1e-15, "identity"},
		{"spread n=40 p=0.3", "std_dev", 2.8982753492378876, 1e-14, "identity"},
		// Hypergeometric mean n K / N = 50 * 25 / 500 = 2.5 (identity).
		{"urn total=500 marked=25 draws=50", "mean", 2.5, 1e-14, "identity"},
	})
}

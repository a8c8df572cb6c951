package repl

import (
	"math"
	"strings"
	"testing"
)

func TestParseRejectsNamingTheToken(t *testing.T) {
	t.Parallel()
	// Bad spellings the shell must refuse (issue: bad input), each with
	// the token quoted in the message and the reason's key words.
	tests := []struct {
		line, token, reason string
	}{
		{"tail 17/ p=0.3", "17/", "lacks the number of trials"},
		{"tail /40 p=0.3", "/40", "lacks the number of successes"},
		{"tail 41/40 p=0.3", "41/40", "more successes than trials"},
		{"tail -1/5 p=0.3", "-1/5", "negative"},
		{"tail 1.5/5 p=0.3", "1.5/5", "not a whole number"},
		{"tail 17/40/2 p=0.3", "17/40/2", "more than one /"},
		{"tail 17/40 p=nan", "p=nan", "NaN"},
		{"tail 17/40 p=NaN", "p=NaN", "NaN"},
		{"tail 17/40 p=inf", "p=inf", "infinite"},
		{"tail 17/40 p=-Inf", "p=-Inf", "infinite"},
		{"tail 17/40 p=0x1p-3", "p=0x1p-3", "hexadecimal"},
		{"tail 17/40 p=0.3_0", "p=0.3_0", "digit separator"},
		{"spread n=1,000 p=0.3", "n=1,000", "digit separator"},
		{"spread n=1_000 p=0.3", "n=1_000", "digit separator"},
		{"tail 1_7/40 p=0.3", "1_7/40", "digit separator"},
		{"spread n=40 p=1.5", "p=1.5", "not a probability"},
		{"spread n=40 p=30", "p=30", "30%"},
		{"spread n=40 p=0.3 level=95", "level=95", "95%"},
		{"spread n=40 p=0.3 level=1", "level=1", "strictly between 0 and 1"},
		{"spread n=40 p=0.3 level=0", "level=0", "strictly between 0 and 1"},
		{"spread n=40 p=0.3 level=-0.5", "level=-0.5", "strictly between 0 and 1"},
		{"spread n=40 p=0.3 level=1e999", "level=1e999", "too large"},
		{"spread n=1e20 p=0.3", "n=1e20", "too large"},
		{"spread n=99999999999999999999 p=0.3", "n=99999999999999999999", "too large"},
		{"spred n=40 p=0.3", "spred", "did you mean spread"},
		{"spread n=40 p=0.3 levl=0.9", "levl=0.9", "did you mean level"},
		{"spread n=40 p=0.3 n=41", "n=41", "repeats option n"},
		{"spread n= p=0.3", "n=", "no value"},
		{"spread =4 p=0.3", "=4", "no option name"},
		{"spread n=40", "spread", "needs p="},
		{"spread n=40 p=0.3 extra", "extra", "too many"},
		{"tail 17/40 p=0.3 p=0.4", "p=0.4", "repeats"},
		{"set digits=0", "digits=0", "outside 1 to 15"},
		{"set json=maybe", "json=maybe", "not a choice"},
		{"set width=5", "width=5", "outside 20 to 400"},
		{"help nosuch", "nosuch", "not a command"},
		{"urn total=5 marked=6 draws=2", "marked=6", "exceeds total"},
		{"spread n=40 p=0.3 k=9..3", "k=9..3", "empty range"},
	}
	for _, tc := range tests {
		stderr, err := runErr(tc.line)
		if err == nil {
			t.Errorf("%q: no error", tc.line)
			continue
		}
		msg := err.Error()
		if !strings.Contains(msg, `"`+tc.token+`"`) || !strings.Contains(msg, tc.reason) {
			t.Errorf("%q: error %q, want the token %q quoted and %q", tc.line, msg, tc.token, tc.reason)
		}
		if strings.Count(stderr, "\n") != 1 || !strings.HasPrefix(stderr, "error: ") {
			t.Errorf("%q: stderr %q, want one error line", tc.line, stderr)
		}
	}
}

func TestParseAccepts(t *testing.T) {
	t.Parallel()
	probs := map[string]float64{"0.3": 0.3, "30%": 0.3, ".5": 0.5, "1e-6": 1e-6, "0": 0, "1": 1, "+0.25": 0.25, "2.5%": 0.025}
	for tok, want := range probs {
		got, err := parseProb(tok)
		if err != nil || got != want {
			t.Errorf("parseProb(%q) = %v, %v; want %v", tok, got, err, want)
		}
	}
	counts := map[string]int64{"0": 0, "40": 40, "1e6": 1000000, "9007199254740992": 1 << 53, "2.0": 2}
	for tok, want := range counts {
		got, err := parseCount(tok)
		if err != nil || got != want {
			t.Errorf("parseCount(%q) = %v, %v; want %v", tok, got, err, want)
		}
	}
	k, n, err := parseKN("17/40")
	if err != nil || k != 17 || n != 40 {
		t.Errorf("parseKN(17/40) = %d, %d, %v", k, n, err)
	}
	if _, _, err := parseKN("0/0"); err != nil {
		t.Errorf("parseKN(0/0): %v", err)
	}
}

func TestNearest(t *testing.T) {
	t.Parallel()
	cands := []string{"spread", "tail", "cut", "urn", "help", "set"}
	for word, want := range map[string]string{"spred": "spread", "tial": "tail", "spr": "spread", "xyzzy": "", "hlep": "help"} {
		if got := nearest(word, cands); got != want {
			t.Errorf("nearest(%q) = %q, want %q", word, got, want)
		}
	}
}

func TestFormatNum(t *testing.T) {
	t.Parallel()
	tests := []struct {
		x    float64
		d    int
		want string
	}{
		{0.2813, 4, "0.2813"}, {0.425, 4, "0.4250"}, {12, 4, "12.00"}, {1e-35, 4, "1.000e-35"},
		{0.99996, 4, "0.99996"}, {0.0001234, 3, "0.000123"}, {1234567, 4, "1234567"}, {-0.5, 2, "-0.50"},
		{0, 4, "0"}, {1, 4, "1"}, {0.999999, 4, "0.999999"}, {0.9999989999999999, 4, "0.999999"},
		{1 - 0x1p-53, 4, "1 - 1.1e-16"}, {math.NaN(), 4, "undefined"}, {0.9994, 4, "0.9994"}, {0.99995, 3, "0.99995"},
	}
	for _, tc := range tests {
		if got := formatNum(tc.x, tc.d); got != tc.want {
			t.Errorf("formatNum(%v, %d) = %q, want %q", tc.x, tc.d, got, tc.want)
		}
	}
}

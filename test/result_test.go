package test

import (
	"encoding/json"
	"strings"
	"testing"
)

// TestResultJSON: the result's JSON has the project's schema (lower_snake
// keys, statistic with its name, no nuisance for a conditional test) and
// the alternative decodes from its shell word only.
func TestResultJSON(t *testing.T) {
	t.Parallel()
	r, err := Binomial(0, 1000000, 0.5, BinomialOptions{})
	if err != nil {
		t.Fatal(err)
	}
	b, err := json.Marshal(r)
	if err != nil {
		t.Fatal(err)
	}
	s := string(b)
	for _, want := range []string{`"alternative":"two-sided"`, `"p_value":0`, `"log_p_value":-693146.4`, `"statistic":{"name":"k","value":0}`, `"interval":{"lower":0,"upper":`} {
		if !strings.Contains(s, want) {
			t.Errorf("JSON %s lacks %s", s, want)
		}
	}
	if strings.Contains(s, "nuisance") || strings.Contains(s, "NaN") {
		t.Errorf("JSON %s has a field that does not apply", s)
	}
	var a struct{ Alternative Alternative }
	if err := json.Unmarshal([]byte(`{"Alternative":"higher"}`), &a); err != nil || a.Alternative != Higher {
		t.Errorf("unmarshal: %v, %v", a.Alternative, err)
	}
	for _, bad := range []string{"greater", "up", "less"} {
		if err := json.Unmarshal([]byte(`{"Alternative":"`+bad+`"}`), &a); err == nil {
			t.Errorf("unmarshal of alternative %q: no error", bad)
		}
	}
}

// TestEnumRoundTrips: every enum value's String() parses back to itself,
// and out-of-range values print their number and do not marshal.
func TestEnumRoundTrips(t *testing.T) {
	t.Parallel()
	type named interface{ String() string }
	check := func(v named, parse func(string) (named, error)) {
		t.Helper()
		got, err := parse(v.String())
		if err != nil || got != v {
			t.Errorf("%v: parsed back as %v, %v", v, got, err)
		}
	}
	for _, v := range AlternativeValues() {
		check(v, func(s string) (named, error) { return ParseAlternative(s) })
	}
	for _, v := range TwoSidedRuleValues() {
		check(v, func(s string) (named, error) { return ParseTwoSidedRule(s) })
	}
	for _, v := range BinomialMethodValues() {
		check(v, func(s string) (named, error) { return ParseBinomialMethod(s) })
	}
	for _, v := range McNemarMethodValues() {
		check(v, func(s string) (named, error) { return ParseMcNemarMethod(s) })
	}
	for _, v := range TwoSampleMethodValues() {
		check(v, func(s string) (named, error) { return ParseTwoSampleMethod(s) })
	}
	for _, v := range MarginMethodValues() {
		check(v, func(s string) (named, error) { return ParseMarginMethod(s) })
	}
	if s := BinomialMethod(42).String() + Alternative(7).String() + TwoSidedRule(-1).String(); s != "test.BinomialMethod(42)test.Alternative(7)test.TwoSidedRule(-1)" {
		t.Errorf("out-of-range names: %q", s)
	}
	if _, err := json.Marshal(struct{ A Alternative }{7}); err == nil {
		t.Error("an out-of-range alternative marshalled")
	}
}

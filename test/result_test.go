package test

import (
	"encoding/json"
	"strings"
	"testing"
)

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
	for _, want := range []string{`"Alternative":"two-sided"`, `"PValue":0`, `"LogPValue":-693146.4`, `"Nuisance":"NaN"`, `"Interval":{"Lower":0,"Upper":`} {
		if !strings.Contains(s, want) {
			t.Errorf("JSON %s lacks %s", s, want)
		}
	}
	var a struct{ Alternative Alternative }
	if err := json.Unmarshal([]byte(`{"Alternative":"greater"}`), &a); err != nil || a.Alternative != Greater {
		t.Errorf("unmarshal: %v, %v", a.Alternative, err)
	}
	if err := json.Unmarshal([]byte(`{"Alternative":"up"}`), &a); err == nil {
		t.Error("unmarshal of a bad alternative: no error")
	}
}

// TestEnumRoundTrips: every method's String() parses back to itself, and
// out-of-range values print their number.
func TestEnumRoundTrips(t *testing.T) {
	t.Parallel()
	for a := TwoSided; a <= Greater; a++ {
		if got, err := ParseAlternative(a.String()); err != nil || got != a {
			t.Errorf("alternative %v: %v, %v", a, got, err)
		}
	}
	for m := FisherPointProbability; m <= FisherCentral; m++ {
		if got, err := ParseFisherMethod(m.String()); err != nil || got != m {
			t.Errorf("%v: %v, %v", m, got, err)
		}
	}
	for m := ZPooled; m <= ChiSquareYates; m++ {
		if got, err := ParseTwoSampleMethod(m.String()); err != nil || got != m {
			t.Errorf("%v: %v, %v", m, got, err)
		}
	}
	for m := MiettinenNurminen; m <= FarringtonManning; m++ {
		if got, err := ParseMarginMethod(m.String()); err != nil || got != m {
			t.Errorf("%v: %v, %v", m, got, err)
		}
	}
	if s := BinomialMethod(42).String() + Alternative(7).String() + FisherMethod(-1).String(); s != "BinomialMethod(42)Alternative(7)FisherMethod(-1)" {
		t.Errorf("out-of-range names: %q", s)
	}
}

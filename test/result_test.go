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

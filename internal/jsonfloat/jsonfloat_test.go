package jsonfloat

import (
	"math"
	"testing"
)

type method int

func (m method) MarshalJSON() ([]byte, error) { return []byte(`"Wilson"`), nil }

type inner struct{ X float64 }

type result struct {
	Lower    float64
	Upper    float64 `json:"upper"`
	Skip     float64 `json:"-"`
	Method   method
	Warnings []string `json:",omitempty"`
	Curve    []inner
	hidden   int
}

func TestMarshal(t *testing.T) {
	t.Parallel()
	r := result{Lower: math.Inf(-1), Upper: 0.25, Skip: 1, Method: 3, Curve: []inner{{math.NaN()}, {1e-300}}, hidden: 1}
	_ = r.hidden
	got, err := Marshal(r)
	if err != nil {
		t.Fatal(err)
	}
	want := `{"Lower":"-Inf","upper":0.25,"Method":"Wilson","Curve":[{"X":"NaN"},{"X":1e-300}]}`
	if string(got) != want {
		t.Errorf("got  %s\nwant %s", got, want)
	}
	if Float(math.Inf(1)) != `"+Inf"` || Float(0.1) != "0.1" {
		t.Error("Float encoding")
	}
}

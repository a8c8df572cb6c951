package power

import (
	"context"
	"encoding/json"
	"strings"
	"testing"

	"github.com/kofnlab/kofn/test"
)

// Results marshal to JSON; fields that do not apply (the power of a
// margin-of-error size) are left out rather than written as "NaN".
func TestResultsMarshal(t *testing.T) {
	t.Parallel()
	r, err := PrecisionN(context.Background(), 0.3, 0.1, PrecisionOptions{MaxN: 300})
	if err != nil {
		t.Fatal(err)
	}
	b, err := json.Marshal(r)
	if err != nil {
		t.Fatal(err)
	}
	// The normal approximation's own probability at its n (81 trials:
	// erf(0.1 sqrt(81 / 0.42)) = 0.9512), a number, not "NaN".
	if strings.Contains(string(b), `"NaN"`) || !strings.Contains(string(b), `"power":0.951`) || !strings.Contains(string(b), `"first":70`) {
		t.Errorf("unexpected JSON %.200s", b)
	}
	d, err := DesignPlan(context.Background(), 0.01, 0.06, DesignOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if b, err = json.Marshal(d); err != nil || !strings.Contains(string(b), `"plan":{"n":110,"c":3}`) {
		t.Errorf("DesignPlan JSON %s, %v", b, err)
	}
	for _, v := range []any{Demonstration{}, Rectifying{}, AOQLimit{}, ExactPower{}, WidthPlan{}, NPower{}, Point{}, Candidate{}, NormalSize{}} {
		if _, err := json.Marshal(v); err != nil {
			t.Errorf("%T: %v", v, err)
		}
	}
}

// goldenAlt reads an alternative written in a golden file, whose
// generators use the reference libraries' words "less" and "greater".
func goldenAlt(s string) (test.Alternative, error) {
	switch s {
	case "less":
		return test.Lower, nil
	case "greater":
		return test.Higher, nil
	}
	return test.ParseAlternative(s)
}

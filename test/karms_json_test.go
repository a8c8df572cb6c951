package test

import (
	"context"
	"encoding/json"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

// TestKArmsJSONRoundTrip: every result of the k-sample, sample-ratio,
// comparison and adjustment functions survives encoding/json unchanged
// (the project's schema rule), with lower_snake keys.
func TestKArmsJSONRoundTrip(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	ks, _ := EqualProportions(ctx, []int64{3, 0, 5}, []int64{10, 9, 12}, KSampleOptions{MidP: true})
	sr, _ := SampleRatio(ctx, []int64{5100, 4900}, []float64{1, 1}, SampleRatioOptions{})
	cr, _ := Pairwise(ctx, []int64{3, 0, 5}, []int64{10, 9, 12}, ComparisonOptions{})
	ad, _ := Adjust(ctx, []float64{0.01, 0.2, 0}, 0.05, Hommel)
	check := func(name string, in, out any, key string) {
		b, err := json.Marshal(in)
		if err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if err := json.Unmarshal(b, out); err != nil {
			t.Fatalf("%s: %v in %s", name, err, b)
		}
		if !json.Valid(b) || !contains(string(b), key) {
			t.Errorf("%s: %s lacks %s", name, b, key)
		}
	}
	var ks2 KSampleResult
	var sr2 SampleRatioResult
	var cr2 ComparisonsResult
	var ad2 Adjusted
	check("k-sample", ks, &ks2, `"log_p_value"`)
	check("sample ratio", sr, &sr2, `"observed_share"`)
	check("comparisons", cr, &cr2, `"adjusted_p_value"`)
	check("adjusted", ad, &ad2, `"adjusted_p_values"`)
	opt := cmpopts.EquateNaNs()
	for _, d := range []string{cmp.Diff(ks, ks2, opt), cmp.Diff(sr, sr2, opt), cmp.Diff(cr, cr2, opt), cmp.Diff(ad, ad2, opt)} {
		if d != "" {
			t.Errorf("round trip (-in +out):\n%s", d)
		}
	}
}

func contains(s, sub string) bool {
	for i := 0; i+len(sub) <= len(s); i++ {
		if s[i:i+len(sub)] == sub {
			return true
		}
	}
	return false
}

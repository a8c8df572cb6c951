package power

import (
	"context"
	"errors"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/golden"
	"github.com/kofnlab/kofn/test"
)

// Normal-approximation sizes against an independent SciPy implementation
// of the same published formulas (testdata/gen/power_normal.py): Fleiss
// (1981) eq. 3.14 with the Casagrande-Pike-Smith correction generalized by
// Fleiss, Tytun and Ury (1980); Blackwelder (1982) for non-inferiority;
// Schuirmann's TOST for equivalence; Connor (1987) for pairs.
func TestNormalGolden(t *testing.T) {
	t.Parallel()
	_, rows := golden.ReadCases(t, "../testdata/power_normal.tsv")
	for _, r := range rows {
		p1, p2, alpha, pw := r.Float(1), r.Float(2), r.Float(3), r.Float(4)
		var alt test.Alternative
		if r.Fields[5] != "-" {
			var err error
			if alt, err = goldenAlt(r.Fields[5]); err != nil {
				t.Fatal(err)
			}
		}
		var got NormalSize
		var err error
		switch r.Fields[0] {
		case "one":
			got, err = OneSampleNormalN(p1, p2, OneSampleOptions{Alpha: alpha, Power: pw, Alternative: alt})
		case "paired":
			got, err = PairedNormalN(p1, p2, PairedOptions{Alpha: alpha, Power: pw, Alternative: alt})
		default:
			o := TwoSampleOptions{Alpha: alpha, Power: pw, Alternative: alt, Ratio: r.Float(6), Margin: r.Float(9)}
			switch r.Fields[0] {
			case "ni":
				o.Hypothesis = NonInferiority
			case "eq":
				o.Hypothesis = Equivalence
			}
			if r.Fields[7] == "unpooled" {
				o.Variance = Unpooled
			}
			if r.Fields[8] == "none" {
				o.Correction = NoCorrection
			}
			got, err = TwoSampleNormalN(p1, p2, o)
		}
		if err != nil {
			t.Fatalf("%v: %v", r, err)
		}
		if diff := cmp.Diff(r.Float(10), got.Real, cmpopts.EquateApprox(1e-9, 0)); diff != "" {
			t.Errorf("%v (-want +got):\n%s", r.Fields[:10], diff)
		}
		if got.Power < pw-1e-9 && r.Fields[8] != "cps" {
			t.Errorf("%v: power %v at the rounded n below the target", r.Fields[:10], got.Power)
		}
	}
}

// Properties of the exact one-sample power: it increases with the effect
// and with alpha at fixed n (for the one-sided test, whose region only
// grows with alpha), and the normal n is close to the stable exact n for
// large samples (within 5% at n near 1000).
func TestOneSampleProperties(t *testing.T) {
	t.Parallel()
	prev := 0.0
	for _, p1 := range []float64{0.31, 0.33, 0.36, 0.4, 0.5} {
		r, err := OneSamplePower(200, 0.3, p1, OneSampleOptions{Alternative: test.Higher})
		if err != nil {
			t.Fatal(err)
		}
		if r.Power < prev {
			t.Errorf("power fell to %v at p1 = %v", r.Power, p1)
		}
		prev = r.Power
	}
	for _, o := range []OneSampleOptions{{}, {Alternative: test.Higher}, {Rule: test.Central}} {
		prev = 0
		for _, a := range []float64{0.001, 0.01, 0.05, 0.1, 0.2} {
			o.Alpha = a
			r, err := OneSamplePower(150, 0.4, 0.5, o)
			if err != nil {
				t.Fatal(err)
			}
			if r.Power < prev {
				t.Errorf("%+v: power fell to %v at alpha = %v", o, r.Power, a)
			}
			if r.Size > a {
				t.Errorf("%+v: size %v above alpha", o, r.Size)
			}
			prev = r.Power
		}
	}
	ex, err := OneSampleN(context.Background(), 0.3, 0.35, OneSampleOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if q := float64(ex.Stable) / float64(ex.Normal.N); q < 0.95 || q > 1.05 {
		t.Errorf("exact stable n %d vs normal n %d", ex.Stable, ex.Normal.N)
	}
}

func TestNormalErrors(t *testing.T) {
	t.Parallel()
	cases := []struct {
		err  error
		want error
		msg  string
	}{
		{errOf(OneSampleNormalN(0.5, 0.5, OneSampleOptions{})), ErrInvalidArgument, "power.OneSampleNormalN: p1 = 0.5 equals p0: a sample size needs an effect to detect"},
		{errOf(OneSampleNormalN(0, 0.5, OneSampleOptions{})), ErrInvalidArgument, "power.OneSampleNormalN: p0 = 0 must lie strictly between 0 and 1"},
		{errOf(OneSampleNormalN(0.5, 0.4, OneSampleOptions{Alternative: test.Higher})), ErrNoSolution, ""},
		{errOf(OneSampleNormalN(0.5, 0.6, OneSampleOptions{Power: 1})), ErrInvalidArgument, "power.OneSampleNormalN: Power = 1 must lie strictly between 0 and 1"},
		{errOf(TwoSampleNormalN(0.5, 0.6, TwoSampleOptions{Ratio: -1})), ErrInvalidArgument, ""},
		{errOf(TwoSampleNormalN(0.5, 0.6, TwoSampleOptions{Hypothesis: Equivalence})), ErrInvalidArgument, ""},
		{errOf(TwoSampleNormalN(0.5, 0.8, TwoSampleOptions{Hypothesis: Equivalence, Margin: 0.1})), ErrNoSolution, ""},
		{errOf(TwoSampleNormalN(0.5, 0.7, TwoSampleOptions{Hypothesis: NonInferiority, Margin: 0.1})), ErrNoSolution, ""},
		{errOf(MarginOfErrorN(0.5, 0, 0.95)), ErrInvalidArgument, "power.MarginOfErrorN: halfWidth = 0 must lie strictly between 0 and 1"},
	}
	for _, tc := range cases {
		if !errors.Is(tc.err, tc.want) || (tc.msg != "" && tc.err.Error() != tc.msg) {
			t.Errorf("error %v, want %v %q", tc.err, tc.want, tc.msg)
		}
	}
	for _, s := range []string{"sideways"} {
		if _, err := test.ParseAlternative(s); !errors.Is(err, ErrInvalidArgument) {
			t.Errorf("test.ParseAlternative(%q): %v", s, err)
		}
	}
}

func errOf[T any](_ T, err error) error { return err }

// Every enum of the package round-trips through String, its parser and
// its text encoding.
func TestEnumsRoundTrip(t *testing.T) {
	t.Parallel()
	type enumValue interface {
		String() string
		MarshalText() ([]byte, error)
	}
	check := func(v enumValue, parse func(string) (enumValue, error)) {
		t.Helper()
		g, err := parse(v.String())
		b, merr := v.MarshalText()
		if err != nil || g != v || merr != nil || string(b) != v.String() {
			t.Errorf("%T %v: parsed %v (%v), text %q (%v)", v, v, g, err, b, merr)
		}
	}
	for _, v := range ExactTestValues() {
		check(v, func(s string) (enumValue, error) { return ParseExactTest(s) })
	}
	for _, v := range VarianceValues() {
		check(v, func(s string) (enumValue, error) { return ParseVariance(s) })
	}
	for _, v := range CorrectionValues() {
		check(v, func(s string) (enumValue, error) { return ParseCorrection(s) })
	}
	for _, v := range HypothesisValues() {
		check(v, func(s string) (enumValue, error) { return ParseHypothesis(s) })
	}
}

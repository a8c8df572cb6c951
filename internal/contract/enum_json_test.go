package contract

import (
	"context"
	"encoding"
	"encoding/json"
	"fmt"
	"go/token"
	"reflect"
	"strings"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/power"
	"github.com/kofnlab/kofn/test"
)

// enumType is what every exported enum offers.
type enumType interface {
	~int
	String() string
	MarshalText() ([]byte, error)
}

// textGrid holds hostile texts for the parsers.
var textGrid = []string{"", " ", "nope", "\x1b[2J", "NaN", "-1", "99", strings.Repeat("x", 5000), "\xff\xfe"}

// problems returns its argument, the result of an enum or JSON call: the
// problem found, or "".
func problems(v any) string { return v.(string) }

// enumEntries covers an enum's String, MarshalText, UnmarshalText, its
// Values list and its parser: every listed value prints a non-empty name
// that parses back to it and round-trips through text; a value outside
// the list still prints (no panic) and either fails to marshal with an
// error or prints something; hostile texts fail to parse with a typed
// error.
func enumEntries[T enumType](name, parseName string, values func() []T, parse func(string) (T, error)) []entry {
	call := func(_ context.Context, a args) (any, error) {
		vs := values()
		if len(vs) == 0 {
			return "empty Values list", nil
		}
		for _, v := range vs {
			s := v.String()
			if s == "" {
				return fmt.Sprintf("value %d has an empty name", int(v)), nil
			}
			if got, err := parse(s); err != nil || got != v {
				return fmt.Sprintf("%s(%q) = %v, %v; want %d", parseName, s, got, err, int(v)), nil
			}
			b, err := v.MarshalText()
			if err != nil {
				return fmt.Sprintf("MarshalText(%d): %v", int(v), err), nil
			}
			var back T
			if err := any(&back).(encoding.TextUnmarshaler).UnmarshalText(b); err != nil || back != v {
				return fmt.Sprintf("UnmarshalText(%q) = %d, %v; want %d", b, int(back), err, int(v)), nil
			}
		}
		odd := T(a.E() * 1000) // mostly outside the list
		if odd.String() == "" {
			return fmt.Sprintf("value %d prints an empty name", int(odd)), nil
		}
		if b, err := odd.MarshalText(); err == nil && len(b) == 0 {
			return fmt.Sprintf("MarshalText(%d) is empty without an error", int(odd)), nil
		}
		s := pick(a, textGrid, len(textGrid))
		if _, err := parse(s); err != nil {
			if p := checkErr(err); p != "" {
				return parseName + ": " + p, nil
			}
		}
		var u T
		if err := any(&u).(encoding.TextUnmarshaler).UnmarshalText([]byte(s)); err != nil {
			if p := checkErr(err); p != "" {
				return "UnmarshalText: " + p, nil
			}
		}
		return "", nil
	}
	return []entry{{name: name + ".String", also: []string{name + ".MarshalText", name + ".UnmarshalText", name + "Values", parseName},
		call: call, check: problems}}
}

// allEnums lists every exported enum with its parser and value list.
func allEnums() []entry {
	var e []entry
	e = append(e, enumEntries("DiffMethod", "ParseDiffMethod", interval.DiffMethodValues, interval.ParseDiffMethod)...)
	e = append(e, enumEntries("Method", "ParseMethod", interval.MethodValues, interval.ParseMethod)...)
	e = append(e, enumEntries("MultinomialMethod", "ParseMultinomialMethod", interval.MultinomialMethodValues, interval.ParseMultinomialMethod)...)
	e = append(e, enumEntries("OddsMethod", "ParseOddsMethod", interval.OddsMethodValues, interval.ParseOddsMethod)...)
	e = append(e, enumEntries("PairedMethod", "ParsePairedMethod", interval.PairedMethodValues, interval.ParsePairedMethod)...)
	e = append(e, enumEntries("RatioMethod", "ParseRatioMethod", interval.RatioMethodValues, interval.ParseRatioMethod)...)
	e = append(e, enumEntries("Side", "ParseSide", interval.SideValues, interval.ParseSide)...)
	e = append(e, enumEntries("Adjustment", "ParseAdjustment", test.AdjustmentValues, test.ParseAdjustment)...)
	e = append(e, enumEntries("Alternative", "ParseAlternative", test.AlternativeValues, test.ParseAlternative)...)
	e = append(e, enumEntries("TwoSidedRule", "ParseTwoSidedRule", test.TwoSidedRuleValues, test.ParseTwoSidedRule)...)
	e = append(e, enumEntries("BinomialMethod", "ParseBinomialMethod", test.BinomialMethodValues, test.ParseBinomialMethod)...)
	e = append(e, enumEntries("FitMethod", "ParseFitMethod", test.FitMethodValues, test.ParseFitMethod)...)
	e = append(e, enumEntries("KSampleMethod", "ParseKSampleMethod", test.KSampleMethodValues, test.ParseKSampleMethod)...)
	e = append(e, enumEntries("MarginMethod", "ParseMarginMethod", test.MarginMethodValues, test.ParseMarginMethod)...)
	e = append(e, enumEntries("McNemarMethod", "ParseMcNemarMethod", test.McNemarMethodValues, test.ParseMcNemarMethod)...)
	e = append(e, enumEntries("TwoSampleMethod", "ParseTwoSampleMethod", test.TwoSampleMethodValues, test.ParseTwoSampleMethod)...)
	e = append(e, enumEntries("Correction", "ParseCorrection", power.CorrectionValues, power.ParseCorrection)...)
	e = append(e, enumEntries("ExactTest", "ParseExactTest", power.ExactTestValues, power.ParseExactTest)...)
	e = append(e, enumEntries("Hypothesis", "ParseHypothesis", power.HypothesisValues, power.ParseHypothesis)...)
	e = append(e, enumEntries("Variance", "ParseVariance", power.VarianceValues, power.ParseVariance)...)
	e = append(e, entry{name: "Adjustment.ControlsFDR", call: func(_ context.Context, a args) (any, error) {
		_ = test.Adjustment(a.E()).ControlsFDR() // any value, listed or not: no panic
		return "", nil
	}, check: problems})
	return e
}

// fill sets every exported field of the struct v points to from the
// grids: floats (NaN, infinities and -0 included), counts, strings, one
// element of each slice and a value behind each pointer; fields of named
// integer (enum) types stay at their zero value, which always has a name.
func fill(v reflect.Value, a args, depth int) {
	switch v.Kind() {
	case reflect.Float64:
		v.SetFloat(a.F())
	case reflect.Int64:
		if v.Type() == reflect.TypeOf(int64(0)) {
			v.SetInt(a.C())
		}
	case reflect.Int:
		if v.Type() == reflect.TypeOf(0) {
			v.SetInt(int64(a.E()))
		}
	case reflect.Bool:
		v.SetBool(a.B())
	case reflect.String:
		v.SetString(pick(a, textGrid[:6], 6))
	case reflect.Struct:
		for i := range v.NumField() {
			if v.Type().Field(i).IsExported() {
				fill(v.Field(i), a, depth)
			}
		}
	case reflect.Slice:
		if depth < 3 && a.B() {
			s := reflect.MakeSlice(v.Type(), 1, 1)
			fill(s.Index(0), a, depth+1)
			v.Set(s)
		}
	case reflect.Pointer:
		if depth < 3 && a.B() {
			p := reflect.New(v.Type().Elem())
			fill(p.Elem(), a, depth+1)
			v.Set(p)
		}
	}
}

// jsonEntries covers a result type's MarshalJSON and UnmarshalJSON: a
// value with every field drawn from the grids marshals without error
// (non-finite floats as strings) and unmarshals back to itself, NaN equal
// to NaN.
func jsonEntries[T any](name string) []entry {
	call := func(_ context.Context, a args) (any, error) {
		var v T
		fill(reflect.ValueOf(&v).Elem(), a, 0)
		b, err := json.Marshal(v)
		if err != nil {
			return fmt.Sprintf("Marshal(%+v): %v", v, err), nil
		}
		var back T
		if err := json.Unmarshal(b, &back); err != nil {
			return fmt.Sprintf("Unmarshal(%s): %v", b, err), nil
		}
		// Only the exported fields travel in JSON; unexported state (a
		// sequence's precomputed tables) is rebuilt or left out.
		unexported := cmp.FilterPath(func(p cmp.Path) bool {
			sf, ok := p.Last().(cmp.StructField)
			return ok && !token.IsExported(sf.Name())
		}, cmp.Ignore())
		if d := cmp.Diff(v, back, cmpopts.EquateNaNs(), cmpopts.EquateEmpty(), unexported); d != "" {
			return fmt.Sprintf("round trip of %s (-sent +received):\n%s", b, d), nil
		}
		// Malformed input must be refused, never panic (run recovers a
		// panic and reports it).
		for _, s := range []string{`{"p_value":"Infinity"}`, `[1,2]`, `{"n":"x"}`, `{"lower":"NaN","upper":"+Inf"}`, `{`} {
			var junk T
			_ = json.Unmarshal([]byte(s), &junk)
		}
		return "", nil
	}
	return []entry{{name: name + ".MarshalJSON", also: []string{name + ".UnmarshalJSON"}, call: call, check: problems}}
}

// allJSON lists every result type with JSON methods.
func allJSON() []entry {
	var e []entry
	e = append(e, jsonEntries[interval.CoverageSummary]("CoverageSummary")...)
	e = append(e, jsonEntries[interval.Family]("Family")...)
	e = append(e, jsonEntries[interval.Interval]("Interval")...)
	e = append(e, jsonEntries[interval.Performance]("Performance")...)
	e = append(e, jsonEntries[test.Adjusted]("Adjusted")...)
	e = append(e, jsonEntries[test.ComparisonsResult]("ComparisonsResult")...)
	e = append(e, jsonEntries[test.KSampleResult]("KSampleResult")...)
	e = append(e, jsonEntries[test.Result]("Result")...)
	e = append(e, jsonEntries[test.SampleRatioResult]("SampleRatioResult")...)
	e = append(e, jsonEntries[power.AOQLimit]("AOQLimit")...)
	e = append(e, jsonEntries[power.Candidate]("Candidate")...)
	e = append(e, jsonEntries[power.Demonstration]("Demonstration")...)
	e = append(e, jsonEntries[power.ExactPower]("ExactPower")...)
	e = append(e, jsonEntries[power.ExactSize]("ExactSize")...)
	e = append(e, jsonEntries[power.NPower]("NPower")...)
	e = append(e, jsonEntries[power.NormalSize]("NormalSize")...)
	e = append(e, jsonEntries[power.PlanDesign]("PlanDesign")...)
	e = append(e, jsonEntries[power.Point]("Point")...)
	e = append(e, jsonEntries[power.Rectifying]("Rectifying")...)
	e = append(e, jsonEntries[power.WidthPlan]("WidthPlan")...)
	e = append(e, jsonEntries[power.WorstPrecision]("WorstPrecision")...)
	return e
}

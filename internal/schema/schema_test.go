package schema_test

import (
	"bufio"
	"context"
	"encoding/json"
	"flag"
	"os"
	"reflect"
	"regexp"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/power"
	"github.com/kofnlab/kofn/test"
)

var update = flag.Bool("update", false, "rewrite testdata/json_schema.golden from the values below")

const goldenPath = "../../testdata/json_schema.golden"

// example is one result value of a result type, computed by the library
// for an invented case.
type example struct {
	name  string // type and case, the golden file's first column
	value any    // the result, by value
}

func must[T any](v T, err error) T {
	if err != nil {
		panic(err)
	}
	return v
}

// examples lists a value of every result type of the library packages;
// a new result type is added here with its MarshalJSON and UnmarshalJSON.
func examples() []example {
	ctx := context.Background()
	curve, summary := func() ([]interval.Performance, interval.CoverageSummary) {
		pts, s, err := interval.CoverageCurve(ctx, 20, []float64{0.1, 0.5}, interval.Options{Method: interval.ClopperPearson})
		if err != nil {
			panic(err)
		}
		return pts, s
	}()
	plan := power.Plan{SampleSize: 89, AcceptNumber: 2}
	design := must(power.DesignPlan(ctx, 0.01, 0.06, power.DesignOptions{}))
	sprt := must(test.NewSPRT(0.05, 0.10, 0.05, 0.2, test.SPRTOptions{MaxN: 2000}))
	ms := must(test.NewMixtureSequence(0.1, 0.05, interval.SequenceOptions{}))
	ds := must(test.NewDifferenceSequence(0, 0.05, test.DifferenceSequenceOptions{}))
	chart := must(power.NewCUSUM(0.01, 0.02, 4, power.CUSUMOptions{}))
	pd := power.PredictiveDesign{Final: 30, Looks: []int64{10, 20}, P0: 0.2, ThetaT: 0.9, ThetaL: 0.05}
	return []example{
		{"interval.Interval wilson", must(interval.Proportion(3, 14, interval.Options{}))},
		{"interval.Interval ratio-infinite", must(interval.Ratio(3, 10, 0, 10, interval.RatioOptions{}))},
		{"interval.Performance", curve[0]},
		{"interval.CoverageSummary", summary},
		{"test.Result binomial", must(test.Binomial(3, 14, 0.5, test.BinomialOptions{}))},
		{"test.Result fisher-one-sided", must(test.Fisher(7, 15, 12, 15, test.FisherOptions{Alternative: test.Lower}))},
		{"test.Result barnard", must(test.Barnard(ctx, 7, 15, 12, 15, test.UnconditionalOptions{Alternative: test.Lower}))},
		{"test.Result mcnemar", must(test.McNemar(31, 14, test.McNemarOptions{}))},
		{"test.KSampleResult", must(test.EqualProportions(ctx, []int64{12, 20, 9}, []int64{40, 41, 38}, test.KSampleOptions{}))},
		{"test.SampleRatioResult", must(test.SampleRatio(ctx, []int64{5021, 4893}, []float64{1, 1}, test.SampleRatioOptions{}))},
		{"test.Adjusted", must(test.Adjust(ctx, []float64{0.01, 0.04, 0.03, 0.2}, 0.05, test.Holm))},
		{"test.ComparisonsResult", must(test.VersusControl(ctx, []int64{12, 20, 9}, []int64{40, 41, 38}, 0, test.ComparisonOptions{}))},
		{"interval.Family multinomial", must(interval.Multinomial([]int64{12, 0, 9}, interval.MultinomialOptions{}))},
		{"interval.Family control", must(interval.VersusControl([]int64{12, 20, 9}, []int64{40, 41, 38}, 0, interval.ControlOptions{}))},
		{"power.ExactPower", must(power.OneSamplePower(50, 0.2, 0.4, power.OneSampleOptions{}))},
		{"power.ExactSize", must(power.OneSampleN(ctx, 0.2, 0.4, power.OneSampleOptions{}))},
		{"power.NormalSize", must(power.TwoSampleNormalN(0.05, 0.10, power.TwoSampleOptions{}))},
		{"power.NPower", must(power.OneSampleCurve(ctx, 0.2, 0.4, 3, power.OneSampleOptions{}))[2]},
		{"power.Demonstration", must(power.DemonstrationTrials(0, 0.99, 0.95))},
		{"power.WidthPlan", must(power.ExpectedWidthN(ctx, 0.3, 0.1, power.WidthOptions{}))},
		{"power.WorstPrecision", must(power.WorstPrecisionAt(ctx, 40, 0.1))},
		{"power.Rectifying", must(power.Rectify(plan, 10000, 0.01))},
		{"power.AOQLimit", must(power.AOQL(plan, 10000))},
		{"power.PlanDesign", design},
		{"power.Candidate", design.Candidates[0]},
		{"power.Point", must(power.OCCurve(plan, 0.1, 3))[1]},
		{"power.SimonResult", must(power.Simon(ctx, 0.05, 0.25, 0.05, 0.2, power.SimonOptions{}))},
		{"power.TwoStageEval", must(power.EvaluateTwoStage(power.TwoStage{R1: 0, N1: 9, R: 2, N: 17}, 0.05))},
		{"power.StagesEval", must(power.EvaluateStages(ctx, power.TwoStage{R1: 0, N1: 9, R: 2, N: 17}.Looks(), 0.05))},
		{"power.SequentialOneDesign", must(power.SequentialOne(ctx, 0.2, 0.4, 0.05, 0.2, []int64{15, 30, 45}, power.SequentialOptions{Futility: true}))},
		{"power.SequentialTwoDesign", must(power.SequentialTwo(ctx, 0.6, 0.3, 0.025, 0.2, []float64{0.5, 1}, power.SequentialOptions{}))},
		{"interval.Posterior", must(interval.NewPosterior(3, 14, interval.Prior{}))},
		{"interval.Interval credible", must(interval.Credible(3, 14, interval.CredibleOptions{}))},
		{"interval.Mixture", must(interval.SequenceMixture(0.95, interval.SequenceOptions{}))},
		{"test.ArmComparison", must(test.Compare(33, 149, 18, 152, test.CompareOptions{}))},
		{"test.BestArm", must(test.ProbBest(ctx, []int64{33, 18, 25}, []int64{149, 152, 150}, nil))},
		{"test.SPRT", sprt},
		{"test.SPRTLook", must(sprt.Decide(9, 120))},
		{"test.MixtureSequence", ms},
		{"test.MixtureLook", must(ms.Look(nil, 9, 120))},
		{"test.DifferenceSequence", ds},
		{"test.DifferenceLook", must(ds.Look(nil, 33, 149, 18, 152))},
		{"power.SPRTOperatingPoint", must(power.SPRTOperating(ctx, sprt, 0.05))},
		{"power.CUSUM", chart},
		{"power.RunLength", must(power.CUSUMRunLength(ctx, chart, 0.01))},
		{"power.Predictive", must(power.PredictiveAtLeast(12, 20, 40, 20, interval.Prior{}))},
		{"power.PredictiveOC", must(pd.OC(ctx, []float64{0.2, 0.4}))},
	}
}

var snake = regexp.MustCompile(`^[a-z][a-z0-9]*(_[a-z0-9]+)*$`)

// checkKeys walks decoded JSON and reports keys outside lower_snake and
// the string "NaN" (a field that does not apply is omitted instead).
func checkKeys(t *testing.T, name, path string, v any) {
	t.Helper()
	switch x := v.(type) {
	case map[string]any:
		for k, e := range x {
			if !snake.MatchString(k) {
				t.Errorf("%s: key %s%s is not lower_snake", name, path, k)
			}
			checkKeys(t, name, path+k+".", e)
		}
	case []any:
		for _, e := range x {
			checkKeys(t, name, path, e)
		}
	case string:
		if x == "NaN" {
			t.Errorf("%s: %s is \"NaN\"; omit a field that does not apply", name, strings.TrimSuffix(path, "."))
		}
	}
}

// TestSchema: every result type's JSON has lower_snake keys and no "NaN",
// matches the golden example, and decodes back to an equal value.
func TestSchema(t *testing.T) {
	var got strings.Builder
	got.WriteString("# The JSON of each kofn result type for an invented case, as the README's \"JSON schema\" section\n" +
		"# quotes it. Generated by: go test ./internal/schema -update (tool: the kofn library itself; the\n" +
		"# numbers are checked against published and reference values by each package's own tests).\n")
	for _, ex := range examples() {
		b, err := json.Marshal(ex.value)
		if err != nil {
			t.Fatalf("%s: %v", ex.name, err)
		}
		var tree any
		if err := json.Unmarshal(b, &tree); err != nil {
			t.Fatalf("%s: not JSON: %v", ex.name, err)
		}
		checkKeys(t, ex.name, "", tree)
		back := reflect.New(reflect.TypeOf(ex.value))
		if err := json.Unmarshal(b, back.Interface()); err != nil {
			t.Fatalf("%s: decoding its own JSON: %v", ex.name, err)
		}
		if diff := cmp.Diff(ex.value, back.Elem().Interface(), cmpopts.EquateNaNs(), cmpopts.EquateEmpty()); diff != "" {
			t.Errorf("%s: round trip (-want +got):\n%s", ex.name, diff)
		}
		got.WriteString(ex.name + "\t" + string(b) + "\n")
	}
	if *update {
		if err := os.WriteFile(goldenPath, []byte(got.String()), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(goldenPath)
	if err != nil {
		t.Fatalf("%v (run with -update to create it)", err)
	}
	wl, gl := lines(string(want)), lines(got.String())
	if len(wl) != len(gl) {
		t.Fatalf("%s has %d lines, the examples make %d; rerun with -update after checking the change", goldenPath, len(wl), len(gl))
	}
	// The shape (keys, their order, types, strings) must match exactly;
	// numbers to 1e-9 relative: this is a check of the schema, and the last
	// digits of a result may move with an equally accurate change of its
	// algorithm (the location of a maximum, such as the AOQL's p, is only
	// determined to about the square root of the rounding). Accuracy is
	// checked against references by each package's own tests.
	for i := range wl {
		if strings.HasPrefix(wl[i], "#") {
			continue
		}
		wn, wj, _ := strings.Cut(wl[i], "\t")
		gn, gj, _ := strings.Cut(gl[i], "\t")
		var wt, gt any
		if wn != gn || json.Unmarshal([]byte(wj), &wt) != nil || json.Unmarshal([]byte(gj), &gt) != nil || keysOf(wj) != keysOf(gj) {
			t.Errorf("%s line %d: %s\nwant %s\n got %s", goldenPath, i+1, gn, wl[i], gl[i])
			continue
		}
		if diff := cmp.Diff(wt, gt, cmpopts.EquateApprox(1e-9, 1e-300)); diff != "" {
			t.Errorf("%s line %d (%s) (-want +got); rerun with -update after checking the change:\n%s", goldenPath, i+1, gn, diff)
		}
	}
}

var keyPattern = regexp.MustCompile(`"[a-z0-9_]+":`)

// keysOf lists the keys of a JSON text in order of appearance.
func keysOf(s string) string { return strings.Join(keyPattern.FindAllString(s, -1), "") }

func lines(s string) []string {
	var out []string
	sc := bufio.NewScanner(strings.NewReader(s))
	sc.Buffer(nil, 1<<20)
	for sc.Scan() {
		out = append(out, sc.Text())
	}
	return out
}

// TestNonFiniteRoundTrip: infinities and NaN are written as strings and
// read back, inside nested values too.
func TestNonFiniteRoundTrip(t *testing.T) {
	t.Parallel()
	iv := must(interval.Ratio(3, 10, 0, 10, interval.RatioOptions{}))
	b, err := json.Marshal(iv)
	if err != nil || !strings.Contains(string(b), `"+Inf"`) {
		t.Fatalf("ratio with an empty reference group: %s, %v", b, err)
	}
	r := test.Result{Estimate: 0, Interval: &interval.Interval{Lower: 0, Upper: 0}}
	r.Interval.Upper = iv.Upper
	b, _ = json.Marshal(r)
	var back test.Result
	if err := json.Unmarshal(b, &back); err != nil || back.Interval == nil || back.Interval.Upper != iv.Upper {
		t.Errorf("nested +Inf: %s -> %+v, %v", b, back.Interval, err)
	}
}

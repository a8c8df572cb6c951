package main

import (
	"context"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"github.com/apache/beam/sdks/v2/go/pkg/beam"
	_ "github.com/apache/beam/sdks/v2/go/pkg/beam/io/filesystem/local"
	"github.com/apache/beam/sdks/v2/go/pkg/beam/testing/passert"
	"github.com/apache/beam/sdks/v2/go/pkg/beam/testing/ptest"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

func TestMain(m *testing.M) { ptest.Main(m) }

// invented returns invented rows of (experiment, segment, k, n): three
// made-up experiments cut by segments, with one malformed row and one
// impossible count.
func invented() []string {
	return []string{
		"experiment,segment,k,n",
		"signup,mobile,33,149", "signup,desktop,18,152", "signup,tablet,7,60", "signup,tv,1,9",
		"checkout,mobile,120,1000", "checkout,desktop,151,1010", "checkout,tablet,40,300",
		"onboarding,mobile,12,40", "onboarding,desktop,9,38", "onboarding,tablet,0,12",
		"onboarding,tv,5,4",  // k > n: the library refuses it, the row carries the reason
		"onboarding,watch,3", // too few fields
		"checkout,tv,22,180",
	}
}

// expected computes the output lines by calling the library directly,
// family by family, in the order of the input.
func expected(t *testing.T, cfg Config, lines []string) []string {
	t.Helper()
	fam := map[string][]Result{}
	var order []string
	for _, l := range lines[1:] {
		r := Analyze(cfg, l)
		if _, ok := fam[r.Group]; !ok {
			order = append(order, r.Group)
		}
		fam[r.Group] = append(fam[r.Group], r)
	}
	var out []string
	for _, g := range order {
		rows, err := AdjustFamily(cfg, fam[g])
		if err != nil {
			t.Fatal(err)
		}
		for _, r := range rows {
			out = append(out, Format(cfg, r))
		}
	}
	return out
}

func run(t *testing.T, cfg Config, lines []string) {
	t.Helper()
	if err := cfg.Validate(); err != nil {
		t.Fatal(err)
	}
	p, s := beam.NewPipelineWithRoot()
	in := beam.CreateList(s, lines)
	out := Build(s, cfg, in)
	want := expected(t, cfg, lines)
	passert.Equals(s, out, toAny(want)...)
	ptest.RunAndValidate(t, p)
}

func toAny(v []string) []any {
	out := make([]any, len(v))
	for i, s := range v {
		out[i] = s
	}
	return out
}

// TestPipelineCheckAdjustedByExperiment: exact binomial tests of every
// row, Holm-adjusted within each experiment, on Beam's local runner,
// equal row for row to the library called directly.
func TestPipelineCheckAdjustedByExperiment(t *testing.T) {
	cfg := Config{Analysis: "check", Columns: []string{"experiment", "segment", "k", "n"}, By: "experiment", P0: 0.15, Alt: "two-sided", Adjust: "Holm"}
	run(t, cfg, invented())
}

// TestPipelineBoundsAndWholeFileBH: Clopper-Pearson bounds per row, and
// Benjamini-Hochberg over the whole file for the tests.
func TestPipelineBoundsAndWholeFileBH(t *testing.T) {
	run(t, Config{Analysis: "bounds", Columns: []string{"experiment", "segment", "k", "n"}, Method: "Clopper-Pearson", Level: 0.9, Side: "two-sided", Adjust: "none"}, invented())
	run(t, Config{Analysis: "check", Columns: []string{"experiment", "segment", "k", "n"}, P0: 0.15, Alt: "higher", Adjust: "BH"}, invented())
}

// TestAnalyzeIsTheLibrary: the per-row step returns exactly what the
// library returns for the same counts and options, and the adjustment
// exactly test.AdjustPValues; the pipeline adds no statistics.
func TestAnalyzeIsTheLibrary(t *testing.T) {
	cols := []string{"id", "k", "n"}
	r := Analyze(Config{Analysis: "bounds", Columns: cols, Method: "Wilson", Level: 0.95, Side: "two-sided"}, "a,17,40")
	iv, _ := interval.Proportion(17, 40, interval.Options{})
	if r.Lower != iv.Lower || r.Upper != iv.Upper || r.Method != iv.Method {
		t.Errorf("bounds %+v, library %+v", r, iv)
	}
	r = Analyze(Config{Analysis: "check", Columns: cols, P0: 0.3, Alt: "lower"}, "a,3,50")
	b, _ := test.Binomial(3, 50, 0.3, test.BinomialOptions{Alternative: test.Lower, SkipInterval: true})
	if r.PValue != b.PValue || r.Method != b.Method {
		t.Errorf("check %+v, library %+v", r, b)
	}
	r = Analyze(Config{Analysis: "versus", Columns: []string{"id", "k1", "n1", "k2", "n2"}, Alt: "lower"}, "a,7,15,12,15")
	f, _ := test.Fisher(7, 15, 12, 15, test.FisherOptions{Alternative: test.Lower})
	if r.PValue != f.PValue {
		t.Errorf("versus %+v, library %+v", r, f)
	}
	rows := []Result{{PValue: 0.01}, {PValue: 0.04}, {Err: "bad"}, {PValue: 0.03}}
	got, _ := AdjustFamily(Config{Analysis: "check", Adjust: "Holm"}, rows)
	want, _ := test.AdjustPValues(context.Background(), []float64{0.01, 0.04, 0.03}, test.Holm)
	if got[0].Adjusted != want[0] || got[1].Adjusted != want[1] || got[3].Adjusted != want[2] || got[2].Adjusted != 0 {
		t.Errorf("adjusted %+v, library %v", got, want)
	}
}

// TestPipelineFiles: the pipeline reads and writes files through Beam's
// text IO; the output has the header and one line per data row, and a
// failed row carries its reason in the error column.
func TestPipelineFiles(t *testing.T) {
	dir := t.TempDir()
	in, out := filepath.Join(dir, "rows.csv"), filepath.Join(dir, "out.csv")
	if err := os.WriteFile(in, []byte(strings.Join(invented(), "\n")+"\n"), 0o600); err != nil {
		t.Fatal(err)
	}
	cfg := Config{Analysis: "check", Columns: []string{"experiment", "segment", "k", "n"}, By: "experiment", P0: 0.15, Alt: "two-sided", Adjust: "Hommel"}
	p, s := beam.NewPipelineWithRoot()
	Write(s, cfg, Build(s, cfg, textioRead(s, in)), out)
	ptest.RunAndValidate(t, p)
	data, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	got := strings.Split(strings.TrimSpace(string(data)), "\n")
	sort.Strings(got)
	if len(got) != len(invented()) {
		t.Fatalf("%d output lines for %d input lines:\n%s", len(got), len(invented()), data)
	}
	if !strings.Contains(string(data), Header(cfg)) || !strings.Contains(string(data), "k = 5 exceeds n = 4") || !strings.Contains(string(data), "has 3 fields") {
		t.Errorf("output:\n%s", data)
	}
}

// TestConfigErrors: bad flags fail before the pipeline runs, in the
// library's words where the library parses them.
func TestConfigErrors(t *testing.T) {
	for _, c := range []Config{
		{Analysis: "median", Columns: []string{"k", "n"}},
		{Analysis: "check", Columns: []string{"id", "k"}, Alt: "two-sided", Adjust: "none"},
		{Analysis: "check", Columns: []string{"k", "n"}, Alt: "greater", Adjust: "none"},
		{Analysis: "check", Columns: []string{"k", "n"}, Alt: "two-sided", Adjust: "fdr-magic"},
		{Analysis: "bounds", Columns: []string{"k", "n"}, Method: "Wilson", Side: "two-sided", Adjust: "Holm"},
		{Analysis: "check", Columns: []string{"k", "n"}, Alt: "two-sided", Adjust: "none", By: "site"},
	} {
		if err := c.Validate(); err == nil {
			t.Errorf("%+v: no error", c)
		}
	}
}

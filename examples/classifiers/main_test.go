package main

import (
	"bytes"
	"errors"
	"math"
	"math/big"
	"os"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"

	"github.com/kofnlab/kofn/test"
)

// z975 is the 0.975 quantile of the standard normal (Abramowitz and Stegun
// 1964, Table 26.5: 1.959964).
const z975 = 1.959963984540054

// printed is the absolute tolerance of a value printed with 4 decimals.
var printed = cmpopts.EquateApprox(0, 5.01e-5)

// TestRun runs the program and checks its key numbers against independent
// computations: the Wilson and Newcombe closed forms, McNemar's exact and
// mid-p values as exact rational binomial sums, and Tango's interval from an
// mpmath inversion of his score statistic (../testdata/reference.tsv).
func TestRun(t *testing.T) {
	t.Parallel()
	var buf bytes.Buffer
	if err := run(&buf); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	if first, _, _ := strings.Cut(out, "\n"); !strings.HasPrefix(first, "Invented data:") {
		t.Errorf("first line %q does not label the data as invented", first)
	}

	n := float64(messages)
	pA, pB := (bothRight+onlyA)/n, (bothRight+onlyB)/n
	lA, uA := wilson(pA, n)
	lB, uB := wilson(pB, n)
	d := pA - pB
	// Newcombe (1998, paired data, method 10): the Wilson limits combined
	// with the phi coefficient of the paired table.
	phi := (bothRight*bothWrong - onlyA*onlyB) /
		math.Sqrt(float64((bothRight+onlyA)*(onlyB+bothWrong)*(bothRight+onlyB)*(onlyA+bothWrong)))
	dl1, du1, dl2, du2 := pA-lA, uA-pA, pB-lB, uB-pB
	paired := []float64{d,
		d - math.Sqrt(dl1*dl1-2*phi*dl1*du2+du2*du2),
		d + math.Sqrt(du1*du1-2*phi*du1*dl2+dl2*dl2), 0}
	unpaired := []float64{d, d - math.Hypot(dl1, du2), d + math.Hypot(du1, dl2), 0}
	ref := reference(t)
	exact, mid := mcnemar(onlyA, onlyB)
	for _, c := range []struct {
		label string
		want  []float64
	}{
		{"model A, Wilson", []float64{pA, lA, uA}},
		{"model B, Wilson", []float64{pB, lB, uB}},
		{"McNemar exact", []float64{exact, 0.05}},
		{"McNemar mid-p", []float64{mid, 0.05}},
		{"Newcombe paired hybrid score", paired},
		{"Tango score", []float64{d, ref["classifiers.tango.lower"], ref["classifiers.tango.upper"], 0}},
		{"unpaired Newcombe hybrid score", unpaired},
	} {
		if diff := cmp.Diff(c.want, values(t, out, c.label), printed); diff != "" {
			t.Errorf("%s (-want +got):\n%s", c.label, diff)
		}
	}
}

// TestMcNemarReference pins the two McNemar versions the program uses to the
// worked example of Fagerland, Lydersen and Laake (2013), BMC Medical
// Research Methodology 13:91: discordant pairs 1 and 7 give the exact
// conditional P = 18/256 and the mid-p 10/256 (p-values recalled, recomputed
// here in exact arithmetic).
func TestMcNemarReference(t *testing.T) {
	t.Parallel()
	wantExact, wantMid := mcnemar(1, 7)
	if diff := cmp.Diff([]float64{18.0 / 256, 10.0 / 256}, []float64{wantExact, wantMid}, cmpopts.EquateApprox(1e-15, 0)); diff != "" {
		t.Fatalf("exact rational McNemar (-want +got):\n%s", diff)
	}
	for _, c := range []struct {
		method test.McNemarMethod
		want   float64
	}{{test.McNemarExact, 18.0 / 256}, {test.McNemarMidP, 10.0 / 256}} {
		res, err := test.McNemar(1, 7, test.McNemarOptions{Method: c.method})
		if err != nil {
			t.Fatal(err)
		}
		if diff := cmp.Diff(c.want, res.PValue, cmpopts.EquateApprox(1e-12, 0)); diff != "" {
			t.Errorf("%v (-want +got):\n%s", c.method, diff)
		}
	}
}

// mcnemar returns the two-sided exact conditional McNemar p-value
// min(1, 2 P(X <= m)) and its mid-p version 2 P(X < m) + P(X = m), m the
// smaller discordant count and X ~ Binomial(n12 + n21, 1/2), in exact
// rational arithmetic.
func mcnemar(n12, n21 int64) (exact, mid float64) {
	nd, m := n12+n21, min(n12, n21)
	below := new(big.Int)
	for j := int64(0); j < m; j++ {
		below.Add(below, new(big.Int).Binomial(nd, j))
	}
	at := new(big.Int).Binomial(nd, m)
	denom := new(big.Int).Lsh(big.NewInt(1), uint(nd))
	e := new(big.Rat).SetFrac(new(big.Int).Lsh(new(big.Int).Add(below, at), 1), denom)
	if e.Cmp(big.NewRat(1, 1)) > 0 {
		e.SetInt64(1)
	}
	md := new(big.Rat).SetFrac(new(big.Int).Add(new(big.Int).Lsh(below, 1), at), denom)
	exact, _ = e.Float64()
	mid, _ = md.Float64()
	return exact, mid
}

// wilson is the Wilson (1927) score interval for the proportion p of n.
func wilson(p, n float64) (lo, hi float64) {
	z2 := z975 * z975
	mid := (p + z2/(2*n)) / (1 + z2/n)
	half := z975 / (1 + z2/n) * math.Sqrt(p*(1-p)/n+z2/(4*n*n))
	return mid - half, mid + half
}

// reference reads the golden values of ../testdata/reference.tsv, written by
// ../testdata/gen/reference.py (SciPy 1.10 and mpmath; see its header).
func reference(t *testing.T) map[string]float64 {
	t.Helper()
	data, err := os.ReadFile("../testdata/reference.tsv")
	if err != nil {
		t.Fatal(err)
	}
	ref := map[string]float64{}
	for _, line := range strings.Split(string(data), "\n") {
		key, val, ok := strings.Cut(line, "\t")
		if !ok || strings.HasPrefix(line, "#") {
			continue
		}
		x, err := strconv.ParseFloat(val, 64)
		if err != nil {
			t.Fatalf("reference.tsv: %q: %v", line, err)
		}
		ref[key] = x
	}
	return ref
}

var number = regexp.MustCompile(`[-+]?\d+(\.\d+)?(e[-+]?\d+)?`)

// values returns the numbers on the output line that starts with label,
// after the label.
func values(t *testing.T, out, label string) []float64 {
	t.Helper()
	for _, line := range strings.Split(out, "\n") {
		rest, ok := strings.CutPrefix(strings.TrimSpace(line), label)
		if !ok {
			continue
		}
		var xs []float64
		for _, s := range number.FindAllString(rest, -1) {
			x, err := strconv.ParseFloat(s, 64)
			if err != nil {
				t.Fatalf("line %q: %v", line, err)
			}
			xs = append(xs, x)
		}
		return xs
	}
	t.Fatalf("no line starting with %q in the output:\n%s", label, out)
	return nil
}

// failWriter fails every write, as a closed pipe would.
type failWriter struct{}

func (failWriter) Write([]byte) (int, error) { return 0, errors.New("write failed") }

// TestRunWriteError checks that a failing output is reported, not ignored.
func TestRunWriteError(t *testing.T) {
	t.Parallel()
	if err := run(failWriter{}); err == nil {
		t.Error("run ignored a failing writer")
	}
}

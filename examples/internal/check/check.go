// Package check holds what the tests of the example programs share: reading
// numbers back from a program's output, the golden reference values, and
// small independent oracles (closed forms and term-by-term sums that do not
// use the kofn packages). The programs themselves use only the public API.
package check

import (
	"bytes"
	"errors"
	"io"
	"math"
	"os"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// Z975 is the 0.975 quantile of the standard normal (Abramowitz and Stegun
// 1964, Table 26.5: 1.959964).
const Z975 = 1.959963984540054

var number = regexp.MustCompile(`[-+]?\d+(\.\d+)?(e[-+]?\d+)?`)

// Rows returns the numbers after label on every line of out that starts
// with label (ignoring indentation), in order; it fails the test when no
// line does.
func Rows(t *testing.T, out, label string) [][]float64 {
	t.Helper()
	var all [][]float64
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
		all = append(all, xs)
	}
	if len(all) == 0 {
		t.Fatalf("no line starting with %q in the output:\n%s", label, out)
	}
	return all
}

// Values returns the numbers after label on the first line that starts with
// it.
func Values(t *testing.T, out, label string) []float64 {
	t.Helper()
	return Rows(t, out, label)[0]
}

// Output runs a program's run function into a buffer, fails the test on an
// error or when the first line does not label the data as invented, and
// returns the output.
func Output(t *testing.T, run func(io.Writer) error) string {
	t.Helper()
	var buf bytes.Buffer
	if err := run(&buf); err != nil {
		t.Fatal(err)
	}
	out := buf.String()
	Invented(t, out)
	return out
}

// Invented fails the test unless the first line of out labels the data as
// invented.
func Invented(t *testing.T, out string) {
	t.Helper()
	if first, _, _ := strings.Cut(out, "\n"); !strings.HasPrefix(first, "Invented data:") {
		t.Errorf("first line %q does not label the data as invented", first)
	}
}

// Reference reads the golden values of examples/testdata/reference.tsv,
// written by examples/testdata/gen/reference.py (SciPy 1.10 and mpmath; see
// its header). Tests run in examples/NAME, hence the relative path.
func Reference(t *testing.T) map[string]float64 {
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

// FailWriter fails every write, as a closed pipe would.
type FailWriter struct{}

func (FailWriter) Write([]byte) (int, error) { return 0, errors.New("write failed") }

// Wilson is the two-sided 95% Wilson (1927) score interval for k successes
// in n trials, in closed form.
func Wilson(k, n float64) (lo, hi float64) {
	p, z2 := k/n, Z975*Z975
	mid := (p + z2/(2*n)) / (1 + z2/n)
	half := Z975 / (1 + z2/n) * math.Sqrt(p*(1-p)/n+z2/(4*n*n))
	return mid - half, mid + half
}

// BinomCDF is P(X <= k) for X ~ Binomial(n, p), summed term by term from
// log-gamma (independent of package binom; accurate to about 1e-12 relative
// for the short sums, k up to a few dozen, that the tests use).
func BinomCDF(k, n int64, p float64) float64 {
	if p == 0 {
		return 1
	}
	lgn, _ := math.Lgamma(float64(n) + 1)
	sum := 0.0
	for j := int64(0); j <= min(k, n); j++ {
		lj, _ := math.Lgamma(float64(j) + 1)
		lr, _ := math.Lgamma(float64(n-j) + 1)
		sum += math.Exp(lgn - lj - lr + float64(j)*math.Log(p) + float64(n-j)*math.Log1p(-p))
	}
	return sum
}

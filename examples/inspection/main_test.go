package main

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"math/big"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"gonum.org/v1/gonum/stat/distuv"
)

// TestRun runs the program and checks its key numbers against Montgomery's
// published values for the plan n = 89, c = 2 and against independent
// computations: exact rational hypergeometric sums for the lot of 500,
// log-gamma binomial sums for AOQ, AOQL and an exhaustive search for the plan
// design, gonum's beta quantile for the Clopper-Pearson bound.
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
	six := cmpopts.EquateApprox(0, 5.01e-6) // 6 printed decimals, or Montgomery's 5
	four := cmpopts.EquateApprox(0, 5.01e-5)

	// Montgomery DC, Introduction to Statistical Quality Control, single
	// sampling plan n = 89, c = 2: P(accept) at p = 0.01, ..., 0.05 (read in
	// a reproduced exercise; see the project's published check values).
	montgomery := map[float64]float64{0.01: 0.93969, 0.02: 0.736578, 0.03: 0.498483, 0.04: 0.304158, 0.05: 0.172077}
	for _, p := range ocRates {
		d := int64(math.Round(p * smallLot))
		bulk := binomCDF(2, 89, p)
		if want, ok := montgomery[p]; ok {
			if diff := cmp.Diff(want, bulk, six); diff != "" {
				t.Errorf("independent OC at p = %g disagrees with Montgomery (-want +got):\n%s", p, diff)
			}
		}
		label := fmt.Sprintf("p = %.2f", p)
		want := []float64{bulk, hyperCDF(2, 89, smallLot, d), float64(d)}
		if diff := cmp.Diff(want, values(t, out, label), six); diff != "" {
			t.Errorf("OC row %s (-want +got):\n%s", label, diff)
		}
	}

	// Rectifying inspection, N = 10000: Montgomery gives ATI = 687 at
	// p = 0.01 (686.7 before rounding).
	for _, p := range ocRates[:3] {
		pa := binomCDF(2, 89, p)
		aoq := pa * p * (bulkLot - 89) / bulkLot
		ati := 89 + (1-pa)*(bulkLot-89)
		row := rows(t, out, fmt.Sprintf("p = %.2f", p))[1]
		if diff := cmp.Diff([]float64{aoq, ati}, row, cmpopts.EquateApprox(0, 0.0501)); diff != "" {
			t.Errorf("rectifying row p = %g (-want +got):\n%s", p, diff)
		}
		if diff := cmp.Diff(aoq, row[0], six); diff != "" {
			t.Errorf("AOQ at p = %g (-want +got):\n%s", p, diff)
		}
	}
	if ati := rows(t, out, "p = 0.01")[1][1]; math.Round(ati) != 687 {
		t.Errorf("ATI at p = 0.01 is %g, Montgomery gives 687", ati)
	}
	aoql, at := maxAOQ(2, 89, bulkLot)
	if diff := cmp.Diff([]float64{aoql, at}, values(t, out, "AOQL "), cmpopts.EquateApprox(0, 2e-4)); diff != "" {
		t.Errorf("AOQL (-want +got):\n%s", diff)
	}

	// The design: the smallest n for which some c meets both risks,
	// found here by trying every plan.
	n, c := smallestPlan(t)
	if diff := cmp.Diff([]float64{float64(n), float64(c)}, values(t, out, "chosen plan")); diff != "" {
		t.Errorf("chosen plan (-want +got):\n%s", diff)
	}
	risks := []float64{1 - binomCDF(c, n, aql), binomCDF(c, n, rql)}
	if diff := cmp.Diff(risks, values(t, out, "achieved risks"), four); diff != "" {
		t.Errorf("achieved risks (-want +got):\n%s", diff)
	}

	// The decision and the bound for the invented lot.
	if !strings.Contains(out, "accept the lot (2 <= c = 3)") {
		t.Errorf("the invented lot should be accepted by the plan n = 132, c = 3:\n%s", out)
	}
	ub := distuv.Beta{Alpha: foundDefective + 1, Beta: float64(n - foundDefective)}.Quantile(0.95)
	if diff := cmp.Diff([]float64{ub, 95}, values(t, out, "Clopper-Pearson upper bound"), four); diff != "" {
		t.Errorf("upper bound (-want +got):\n%s", diff)
	}
}

// smallestPlan returns the plan with the smallest n (then the smallest c)
// whose producer's risk at aql and consumer's risk at rql are within the
// limits, by trying every n up to 400 and every c below n.
func smallestPlan(t *testing.T) (n, c int64) {
	for n := int64(1); n <= 400; n++ {
		for c := int64(0); c < n; c++ {
			if binomCDF(c, n, rql) > consumerRisk {
				break // a larger c accepts even more bad lots
			}
			if 1-binomCDF(c, n, aql) <= producerRisk {
				return n, c
			}
		}
	}
	t.Fatal("no plan with n <= 400 meets both risks")
	return 0, 0
}

// maxAOQ is the AOQL of the plan (n, c) for lots of size lot, and where it
// occurs, by a grid of 20001 defect rates on [0, 0.2].
func maxAOQ(c, n, lot int64) (best, at float64) {
	for i := 0; i <= 20000; i++ {
		p := 0.2 * float64(i) / 20000
		if aoq := binomCDF(c, n, p) * p * float64(lot-n) / float64(lot); aoq > best {
			best, at = aoq, p
		}
	}
	return best, at
}

// binomCDF is P(X <= k) for X ~ Binomial(n, p), summed term by term from
// log-gamma (independent of package binom; accurate to about 1e-12 for the
// short sums used here).
func binomCDF(k, n int64, p float64) float64 {
	if p == 0 {
		return 1
	}
	lgn, _ := math.Lgamma(float64(n) + 1)
	sum := 0.0
	for j := int64(0); j <= k; j++ {
		lj, _ := math.Lgamma(float64(j) + 1)
		lr, _ := math.Lgamma(float64(n-j) + 1)
		sum += math.Exp(lgn - lj - lr + float64(j)*math.Log(p) + float64(n-j)*math.Log1p(-p))
	}
	return sum
}

// hyperCDF is P(X <= k) for the number X of defectives in a sample of n
// drawn without replacement from a lot of size lot holding d defectives,
// in exact rational arithmetic.
func hyperCDF(k, n, lot, d int64) float64 {
	sum := new(big.Int)
	for x := int64(0); x <= min(k, d); x++ {
		sum.Add(sum, new(big.Int).Mul(new(big.Int).Binomial(d, x), new(big.Int).Binomial(lot-d, n-x)))
	}
	f, _ := new(big.Rat).SetFrac(sum, new(big.Int).Binomial(lot, n)).Float64()
	return f
}

var number = regexp.MustCompile(`[-+]?\d+(\.\d+)?(e[-+]?\d+)?`)

// rows returns the numbers after label on every output line that starts
// with it, in order.
func rows(t *testing.T, out, label string) [][]float64 {
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

// values returns the numbers on the first output line that starts with label.
func values(t *testing.T, out, label string) []float64 {
	t.Helper()
	return rows(t, out, label)[0]
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

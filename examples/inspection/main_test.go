package main

import (
	"fmt"
	"math"
	"math/big"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/kofnlab/kofn/examples/internal/check"
)

// TestRun runs the program and checks its key numbers against Montgomery's
// published values for the plan n = 89, c = 2 and against independent
// computations: exact rational hypergeometric sums for the lot of 500,
// log-gamma binomial sums for AOQ, AOQL and an exhaustive search for the plan
// design, gonum's beta quantile for the Clopper-Pearson bound.
func TestRun(t *testing.T) {
	t.Parallel()
	out := check.Output(t, run)
	six := cmpopts.EquateApprox(0, 5.01e-6) // 6 printed decimals, or Montgomery's 5
	four := cmpopts.EquateApprox(0, 5.01e-5)

	// Montgomery DC, Introduction to Statistical Quality Control, single
	// sampling plan n = 89, c = 2: P(accept) at p = 0.01, ..., 0.05 (read in
	// a reproduced exercise; see the project's published check values).
	montgomery := map[float64]float64{0.01: 0.93969, 0.02: 0.736578, 0.03: 0.498483, 0.04: 0.304158, 0.05: 0.172077}
	for _, p := range ocRates {
		d := int64(math.Round(p * smallLot))
		bulk := check.BinomCDF(2, 89, p)
		if want, ok := montgomery[p]; ok {
			if diff := cmp.Diff(want, bulk, six); diff != "" {
				t.Errorf("independent OC at p = %g disagrees with Montgomery (-want +got):\n%s", p, diff)
			}
		}
		label := fmt.Sprintf("p = %.2f", p)
		want := []float64{bulk, hyperCDF(2, 89, smallLot, d), float64(d)}
		if diff := cmp.Diff(want, check.Values(t, out, label), six); diff != "" {
			t.Errorf("OC row %s (-want +got):\n%s", label, diff)
		}
	}

	// Rectifying inspection, N = 10000: Montgomery gives ATI = 687 at
	// p = 0.01 (686.7 before rounding).
	for _, p := range ocRates[:3] {
		pa := check.BinomCDF(2, 89, p)
		aoq := pa * p * (bulkLot - 89) / bulkLot
		ati := 89 + (1-pa)*(bulkLot-89)
		row := check.Rows(t, out, fmt.Sprintf("p = %.2f", p))[1]
		if diff := cmp.Diff([]float64{aoq, ati}, row, cmpopts.EquateApprox(0, 0.0501)); diff != "" {
			t.Errorf("rectifying row p = %g (-want +got):\n%s", p, diff)
		}
		if diff := cmp.Diff(aoq, row[0], six); diff != "" {
			t.Errorf("AOQ at p = %g (-want +got):\n%s", p, diff)
		}
	}
	if ati := check.Rows(t, out, "p = 0.01")[1][1]; math.Round(ati) != 687 {
		t.Errorf("ATI at p = 0.01 is %g, Montgomery gives 687", ati)
	}
	aoql, at := maxAOQ(2, 89, bulkLot)
	if diff := cmp.Diff([]float64{aoql, at}, check.Values(t, out, "AOQL "), cmpopts.EquateApprox(0, 2e-4)); diff != "" {
		t.Errorf("AOQL (-want +got):\n%s", diff)
	}

	// The design: the smallest n for which some c meets both risks,
	// found here by trying every plan.
	n, c := smallestPlan(t)
	if diff := cmp.Diff([]float64{float64(n), float64(c)}, check.Values(t, out, "chosen plan")); diff != "" {
		t.Errorf("chosen plan (-want +got):\n%s", diff)
	}
	risks := []float64{1 - check.BinomCDF(c, n, aql), check.BinomCDF(c, n, rql)}
	if diff := cmp.Diff(risks, check.Values(t, out, "achieved risks"), four); diff != "" {
		t.Errorf("achieved risks (-want +got):\n%s", diff)
	}

	// The decision and the bound for the invented lot.
	if !strings.Contains(out, "accept the lot (2 <= c = 3)") {
		t.Errorf("the invented lot should be accepted by the plan n = 132, c = 3:\n%s", out)
	}
	ub := distuv.Beta{Alpha: foundDefective + 1, Beta: float64(n - foundDefective)}.Quantile(0.95)
	if diff := cmp.Diff([]float64{ub, 95}, check.Values(t, out, "Clopper-Pearson upper bound"), four); diff != "" {
		t.Errorf("upper bound (-want +got):\n%s", diff)
	}
}

// smallestPlan returns the plan with the smallest n (then the smallest c)
// whose producer's risk at aql and consumer's risk at rql are within the
// limits, by trying every n up to 400 and every c below n.
func smallestPlan(t *testing.T) (n, c int64) {
	for n := int64(1); n <= 400; n++ {
		for c := int64(0); c < n; c++ {
			if check.BinomCDF(c, n, rql) > consumerRisk {
				break // a larger c accepts even more bad lots
			}
			if 1-check.BinomCDF(c, n, aql) <= producerRisk {
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
		if aoq := check.BinomCDF(c, n, p) * p * float64(lot-n) / float64(lot); aoq > best {
			best, at = aoq, p
		}
	}
	return best, at
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

// TestRunWriteError checks that a failing output is reported, not ignored.
func TestRunWriteError(t *testing.T) {
	t.Parallel()
	if err := run(check.FailWriter{}); err == nil {
		t.Error("run ignored a failing writer")
	}
}

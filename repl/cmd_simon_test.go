package repl

import (
	"math"
	"testing"
)

func TestStagedDesignValues(t *testing.T) {
	t.Parallel()
	checkValues(t, []valueCase{
		// Simon R (1989), Controlled Clinical Trials 10:1-10, Table 1 (recalled; recomputed by the
		// exhaustive search tests of package power): p0 0.05, p1 0.25, alpha 0.05, beta 0.2.
		{"simon p0=0.05 p1=0.25", "optimal.design.n1", 9, 0, "Simon 1989 Table 1"},
		{"simon p0=0.05 p1=0.25", "optimal.design.n", 17, 0, "Simon 1989 Table 1"},
		{"simon p0=0.05 p1=0.25", "optimal.expected_n0", 11.96, 5e-4, "Simon 1989 Table 1"},
		{"simon p0=0.05 p1=0.25", "optimal.early_stop0", 0.630, 1e-3, "Simon 1989 Table 1"},
		{"simon p0=0.05 p1=0.25", "minimax.design.n1", 12, 0, "Simon 1989 Table 1"},
		{"simon p0=0.05 p1=0.25", "minimax.expected_n0", 13.84, 5e-4, "Simon 1989 Table 1"},
		{"simon p0=0.05 p1=0.25", "minimax.early_stop0", 0.540, 1e-3, "Simon 1989 Table 1"},
		// p0 0.2, p1 0.4: optimal 3/13, 12/43, EN0 20.6, PET 0.75 (Simon 1989 Table 1, recalled).
		{"simon 3/13 12/43 p0=0.2 p1=0.4", "null.expected_n", 20.6, 3e-3, "Simon 1989 Table 1"},
		{"simon 3/13 12/43 p0=0.2 p1=0.4", "null.early_stop", 0.75, 7e-3, "Simon 1989 Table 1"},
		// Stage-one stop: the stage-wise p-value is P(X1 >= x1) (Koyama and Chen 2008); for 1 of 13
		// at p0 = 0.2 that is 1 - 0.8^13 = 0.945024.
		{"simon 3/13 12/43 p0=0.2 observed=1/13", "observed.p_value", 1 - 0.054975581388800036, 1e-12, "Koyama and Chen 2008"},
		// A stop at stage one with x1 responses has Clopper-Pearson's limits for x1 of n1 (Koyama and
		// Chen 2008); for 0 of 13 at 95% the upper limit is 1 - 0.025^(1/13) in closed form.
		{"simon 3/13 12/43 p0=0.2 observed=0/13", "observed.interval.upper", 1 - math.Pow(0.025, 1.0/13), 1e-9, "Clopper and Pearson 1934"},
		// Lan-DeMets O'Brien-Fleming type bounds, five looks, one-sided 0.025 (DeMets and Lan 1994;
		// Jennison and Turnbull 2000, chapter 7; recalled): 4.877 at the first look, 2.031 at the last.
		{"interim p1=0.5 p2=0.3 looks=5", "looks.0.z", 4.877, 1e-4, "DeMets and Lan 1994"},
		{"interim p1=0.5 p2=0.3 looks=5", "looks.4.z", 2.031, 2.5e-4, "DeMets and Lan 1994"},
	})
}

func TestInterimEvaluate(t *testing.T) {
	t.Parallel()
	// One look is the single-stage binomial test: the size of "reject at 5 or more of 10" at 0.2 is
	// P(X >= 5), summed here term by term.
	var tail float64
	for k := 5; k <= 10; k++ {
		c := 1.0
		for j := 0; j < k; j++ {
			c = c * float64(10-j) / float64(j+1)
		}
		tail += c * math.Pow(0.2, float64(k)) * math.Pow(0.8, float64(10-k))
	}
	checkValues(t, []valueCase{
		{"interim looks=10 reject=5 p0=0.2", "null.reject", tail, 1e-12, "binomial tail"},
		{"interim looks=10 reject=5 p0=0.2", "null.expected_n", 10, 1e-15, "one look"},
	})
	// The counts interim designs, evaluated, give the same size and power as the design reports.
	design := runJSON(t, "interim p0=0.2 p1=0.4 looks=15,30,45 futility=obf")
	eval := runJSON(t, "interim looks=15,30,45 reject=10,12,15 futile=1,8 p0=0.2 p1=0.4")
	want := []float64{num(t, design, "design.attained_alpha"), num(t, design, "design.power"), num(t, design, "design.expected_n0")}
	got := []float64{num(t, eval, "null.reject"), num(t, eval, "alternative.reject"), num(t, eval, "null.expected_n")}
	for i := range want {
		if math.Abs(want[i]-got[i]) > 1e-12*want[i] {
			t.Errorf("design %v, evaluation %v", want, got)
			break
		}
	}
	for _, line := range []string{"interim looks=15,30 reject=10,12 futile=3,5 p0=0.2", "interim looks=15,30 reject=10 futile=x p0=0.2",
		"interim looks=15,30 reject=10,12,13 p0=0.2", "interim looks=15,30 reject=10,12", "interim looks=15,30 reject=10,12 p0=0.2 spend=pocock"} {
		if _, err := runErr(line); err == nil {
			t.Errorf("%s: no error", line)
		}
	}
}

func TestStagedDesignErrors(t *testing.T) {
	t.Parallel()
	for _, line := range []string{
		"simon p1=0.25", "simon p0=0.3 p1=0.2", "simon 0/9 p0=0.05", "simon 0/9 2/17 p0=0.05 observed=3/12",
		"simon 0/9 2/17 p0=0.05 observed=1/9", "simon 0/9 2/17 p0=0.05 level=90%", "simon p0=0.1 p1=0.3 upto=5000",
		"interim p0=0.2 p1=0.4", "interim p0=0.2 p1=0.4 looks=15,x", "interim p0=0.2 p1=0.4 looks=15.5,30",
		"interim p0=0.2 p1=0.4 looks=15,30 spend=linear", "interim p0=0.2 p1=0.4 looks=15,30 observed=3/20",
		"interim p1=0.5 p2=0.3 looks=0.5,0.9", "interim p1=0.5 p2=0.3 looks=3 observed=3/20",
	} {
		if _, err := runErr(line); err == nil {
			t.Errorf("%s: no error", line)
		}
	}
}

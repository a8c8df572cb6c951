package interval

import (
	"errors"
	"math"
	"strings"
	"testing"
)

// Tables whose margins allow one table only carry no information on the
// odds ratio: the conditional likelihood is flat (Agresti 2002, section
// 3.6.4, recalled: the conditional MLE maximises it), so no estimate exists.
func TestOddsRatioFlatLikelihood(t *testing.T) {
	t.Parallel()
	for _, tc := range [][4]int64{{0, 10, 0, 20}, {10, 10, 20, 20}} {
		if _, err := OddsRatioCMLE(tc[0], tc[1], tc[2], tc[3]); !errors.Is(err, ErrNoSolution) {
			t.Errorf("OddsRatioCMLE%v: error %v, want ErrNoSolution", tc, err)
		}
		iv, err := OddsRatio(tc[0], tc[1], tc[2], tc[3], OddsOptions{Method: OddsCornfield})
		if err != nil {
			t.Fatal(err)
		}
		if !math.IsNaN(iv.Estimate) || iv.Lower != 0 || !math.IsInf(iv.Upper, 1) || len(iv.Warnings) == 0 {
			t.Errorf("OddsRatio%v Cornfield = %+v, want estimate NaN in [0, +Inf] with a warning", tc, iv)
		}
	}
	// A boundary table with information keeps its boundary estimate 0.
	if e, err := OddsRatioCMLE(0, 10, 5, 20); err != nil || e != 0 {
		t.Errorf("OddsRatioCMLE(0, 10, 5, 20) = %v, %v; want 0", e, err)
	}
}

// The Wald difference interval has zero width when both samples are all
// successes or all failures (Newcombe 1998, difference, on the aberrations
// of methods 1 and 2); it must say so.
func TestDifferenceWaldZeroVariance(t *testing.T) {
	t.Parallel()
	for _, m := range []DiffMethod{DiffWald, DiffWaldCC} {
		iv, err := Difference(0, 10, 0, 20, DiffOptions{Method: m})
		if err != nil {
			t.Fatal(err)
		}
		found := false
		for _, w := range iv.Warnings {
			found = found || strings.Contains(w, "variance 0")
		}
		if !found {
			t.Errorf("%v at 0/10 - 0/20: no zero-variance warning in %q", m, iv.Warnings)
		}
	}
	if iv, _ := Difference(3, 10, 0, 20, DiffOptions{Method: DiffWald}); len(iv.Warnings) != 0 && strings.Contains(strings.Join(iv.Warnings, " "), "variance 0") {
		t.Errorf("3/10 - 0/20 has variance > 0 but warns: %q", iv.Warnings)
	}
}

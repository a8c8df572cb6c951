package repl

import (
	"testing"
)

func TestVersusValues(t *testing.T) {
	t.Parallel()
	tests := []valueCase{
		// Mehta CR, Senchaudhuri P (2003), Table 1 (read): vaccine 7/15, placebo 12/15, one-sided:
		// Fisher 0.0641, Barnard 0.0341 (0.034109 with ties handled; see REFERENCES.md).
		{"versus 7/15 12/15 alt=lower", "p_value", 0.0641, 1e-3, "Mehta 2003"},
		{"versus 7/15 12/15 alt=lower method=barnard", "p_value", 0.034109, 1e-4, "Mehta 2003"},
		// Fisher (1935) tea tasting as in Agresti (2002) 3.5 (recalled, recomputed): [[3,1],[1,3]]
		// one-sided P = 17/70, mid-P = 0.128571.
		{"versus 3/4 1/4 alt=higher", "p_value", 17.0 / 70, 1e-12, "Agresti 2002 3.5"},
		{"versus 3/4 1/4 alt=higher midp=on", "p_value", 0.128571, 1e-5, "Agresti 2002 3.5"},
	}
	checkValues(t, tests)
}

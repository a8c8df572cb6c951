package repl

import (
	"testing"
)

func TestIntervalValues(t *testing.T) {
	t.Parallel()
	// Newcombe RG (1998), Stat Med 17:857-872, Table II (recalled, recomputed): 81/263 and 0/20 by
	// method 1 Wald, 2 Wald cc, 3 Wilson, 4 Wilson cc, 5 Clopper-Pearson, 6 mid-p, 7 likelihood ratio.
	newcombe := []struct {
		count, method string
		lo, hi        float64
	}{
		{"81/263", "wald", 0.2522, 0.3638}, {"81/263", "wald-cc", 0.2503, 0.3657},
		{"81/263", "wilson", 0.2553, 0.3662}, {"81/263", "wilson-cc", 0.2535, 0.3682},
		{"81/263", "clopper-pearson", 0.2527, 0.3676}, {"81/263", "mid-p", 0.2544, 0.3658},
		{"81/263", "likelihood-ratio", 0.2542, 0.3655},
		{"0/20", "wilson", 0, 0.1611}, {"0/20", "wilson-cc", 0, 0.2005}, {"0/20", "clopper-pearson", 0, 0.1684},
		{"0/20", "mid-p", 0, 0.1391}, {"0/20", "likelihood-ratio", 0, 0.0916},
	}
	var tests []valueCase
	for _, c := range newcombe {
		line := "bounds " + c.count + " method=" + c.method
		tests = append(tests, valueCase{line, "upper", c.hi, 5e-4, "Newcombe 1998 single, Table II"})
		if c.lo > 0 {
			tests = append(tests, valueCase{line, "lower", c.lo, 5e-4, "Newcombe 1998 single, Table II"})
		}
	}
	tests = append(tests,
		// NIST/SEMATECH e-Handbook 7.2.4 (inputs read; limits recalled, recomputed): 4 of 20, 90%.
		valueCase{"bounds 4/20 method=clopper-pearson level=90%", "lower", 0.0714, 1e-3, "NIST 7.2.4"},
		valueCase{"bounds 4/20 method=clopper-pearson level=90%", "upper", 0.4010, 1e-3, "NIST 7.2.4"},
		// Hanley and Lippman-Hand (1983): 0 of 14, exact one-sided 95% upper limit 1 - 0.05^(1/14) = 0.1926.
		valueCase{"bounds 0/14 method=clopper-pearson bound=upper", "upper", 0.1926, 5e-4, "Hanley 1983"},
		// Newcombe RG (1998), Stat Med 17:873-890, Table II (recalled, recomputed).
		valueCase{"gap 56/70 48/80", "lower", 0.0524, 1e-3, "Newcombe 1998 difference, method 10"},
		valueCase{"gap 56/70 48/80", "upper", 0.3339, 5e-4, "Newcombe 1998 difference, method 10"},
		valueCase{"gap 56/70 48/80 method=wald", "lower", 0.0575, 1e-3, "Newcombe 1998 difference, method 1"},
		valueCase{"gap 56/70 48/80 method=wald-cc", "upper", 0.3559, 5e-4, "Newcombe 1998 difference, method 2"},
		valueCase{"gap 56/70 48/80 method=mee", "lower", 0.0533, 1e-3, "Newcombe 1998 difference, method 5"},
		valueCase{"gap 56/70 48/80 method=miettinen-nurminen", "lower", 0.0528, 1e-3, "Newcombe 1998 difference, method 6"},
		valueCase{"gap 56/70 48/80 method=miettinen-nurminen", "upper", 0.3382, 5e-4, "Newcombe 1998 difference, method 6"},
		valueCase{"gap 56/70 48/80 method=newcombe-cc", "lower", 0.0428, 1e-3, "Newcombe 1998 difference, method 11"},
		valueCase{"gap 0/10 0/20", "lower", -0.1611, 5e-4, "Newcombe 1998 difference, method 10"},
		valueCase{"gap 0/10 0/20", "upper", 0.2775, 5e-4, "Newcombe 1998 difference, method 10"},
		valueCase{"gap 0/10 0/20 method=newcombe-cc", "upper", 0.3445, 5e-4, "Newcombe 1998 difference, method 11"},
		// Agresti A (2019), section 2.2 (counts read; intervals recalled, recomputed): 189/11034 against
		// 104/11037: relative risk 1.82 (1.43, 2.31), odds ratio 1.83 (1.44, 2.33), log-scale Wald.
		valueCase{"ratio 189/11034 104/11037 method=katz", "estimate", 1.82, 3e-3, "Agresti 2019 2.2"},
		valueCase{"ratio 189/11034 104/11037 method=katz", "lower", 1.43, 4e-3, "Agresti 2019 2.2"},
		valueCase{"ratio 189/11034 104/11037 method=katz", "upper", 2.31, 3e-3, "Agresti 2019 2.2"},
		valueCase{"odds 189/11034 104/11037 method=woolf", "estimate", 1.83, 3e-3, "Agresti 2019 2.2"},
		valueCase{"odds 189/11034 104/11037 method=woolf", "lower", 1.44, 4e-3, "Agresti 2019 2.2"},
		valueCase{"odds 189/11034 104/11037 method=woolf", "upper", 2.33, 3e-3, "Agresti 2019 2.2"},
		// Agresti (2019) 2.2: difference 0.0077 with Wald 95% (0.005, 0.011).
		valueCase{"gap 189/11034 104/11037 method=wald", "estimate", 0.0077, 1e-2, "Agresti 2019 2.2"},
		valueCase{"gap 189/11034 104/11037 method=wald", "lower", 0.005, 0.1, "Agresti 2019 2.2"},
	)
	tests = append(tests,
		// Brown LD, Cai TT, DasGupta A (2001), Statistical Science 16:101-133 (recalled, recomputed):
		// exact coverage of the 95% Wald interval, closed intervals.
		valueCase{"cover n=30 p=0.2 method=wald", "methods.0.points.0.coverage", 0.946, 5e-4, "Brown, Cai, DasGupta 2001"},
		valueCase{"cover n=591 p=0.005 method=wald", "methods.0.points.0.coverage", 0.945, 5e-4, "Brown, Cai, DasGupta 2001"},
		valueCase{"cover n=592 p=0.005 method=wald", "methods.0.points.0.coverage", 0.792, 5e-4, "Brown, Cai, DasGupta 2001"},
		valueCase{"cover n=585..600 p=0.005 method=wald", "methods.0.summary.min_at_n", 592, 0, "Brown, Cai, DasGupta 2001"},
	)
	checkValues(t, tests)
}

func TestMethodWordsDistinct(t *testing.T) {
	t.Parallel()
	for name, list := range map[string][]string{"bounds": boundsMethods, "gap": gapMethods, "ratio": ratioMethods,
		"odds": oddsMethods, "pairs": pairMethods, "check": binomialTestMethods, "flips": mcnemarMethods, "detect": planMethods} {
		seen := map[string]bool{}
		for _, w := range list {
			if seen[w] || w == "" || w != methodWord(w) {
				t.Errorf("%s: method word %q repeated, empty or not a shell word", name, w)
			}
			seen[w] = true
		}
	}
}

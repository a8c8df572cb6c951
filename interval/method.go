package interval

import (
	"github.com/kofnlab/kofn/internal/enum"
)

// Method selects how a one-proportion interval is computed. The zero value
// is Wilson, the recommended default: Newcombe (1998, single proportion)
// found the Wilson score interval's coverage closest to nominal among
// seven methods with few aberrations, and Brown, Cai and DasGupta (2001)
// recommend it (or Jeffreys) for small n and as a default at every n; it is
// closed-form, never leaves [0, 1] and never has zero width. Use
// ClopperPearson (or Blaker, shorter and still exact) when the coverage
// must never fall below the level, as acceptance and safety decisions
// often require.
type Method int

const (
	// Wilson is the score interval of Wilson (1927): the p whose score test
	// |k - np| / sqrt(np(1-p)) <= z, in closed form.
	Wilson Method = iota
	// Wald is p^ +- z sqrt(p^(1-p^)/n) (Laplace 1812). Its coverage is
	// erratic and poor at small n or p near 0 or 1 (Brown, Cai and DasGupta
	// 2001); it is offered for comparison only.
	Wald
	// WaldCC is the Wald interval widened by the continuity correction
	// 1/(2n) (Newcombe 1998, method 2).
	WaldCC
	// WilsonCC is the Wilson score interval with continuity correction
	// (Newcombe 1998, method 4; Fleiss 1981).
	WilsonCC
	// AgrestiCoull is the Wald interval around (k + z^2/2)/(n + z^2) with
	// n + z^2 trials (Agresti and Coull 1998).
	AgrestiCoull
	// Jeffreys is the equal-tailed interval of the Beta(k+1/2, n-k+1/2)
	// posterior under the Jeffreys prior, with the lower limit 0 at k = 0
	// and the upper limit 1 at k = n (Brown, Cai and DasGupta 2001).
	Jeffreys
	// ClopperPearson is the exact interval of Clopper and Pearson (1934),
	// inverting the two one-sided binomial tests: coverage is never below
	// the level.
	ClopperPearson
	// MidP is the mid-p exact interval (Lancaster 1961; Berry and Armitage
	// 1995): the Clopper-Pearson tails with half the probability of the
	// observed count.
	MidP
	// Blaker is the exact interval of Blaker (2000), inverting the test
	// based on the acceptability function: coverage never below the level,
	// and contained in the Clopper-Pearson interval.
	Blaker
	// LikelihoodRatio is the set of p whose likelihood-ratio statistic
	// 2[l(p^) - l(p)] is at most z^2 (Newcombe 1998, method 7).
	LikelihoodRatio
	// Arcsine is the variance-stabilizing interval
	// sin^2(arcsin sqrt(p~) +- z/(2 sqrt n)) with Anscombe's
	// p~ = (k + 3/8)/(n + 3/4) (Brown, Cai and DasGupta 2001).
	Arcsine
	// Logit is the Wald interval on the log-odds scale,
	// logit(p^) +- z sqrt(n/(k(n-k))), transformed back.
	Logit
	numMethods
)

var methodNames = [numMethods]string{
	Wilson:          "Wilson",
	Wald:            "Wald",
	WaldCC:          "Wald with continuity correction",
	WilsonCC:        "Wilson with continuity correction",
	AgrestiCoull:    "Agresti-Coull",
	Jeffreys:        "Jeffreys",
	ClopperPearson:  "Clopper-Pearson",
	MidP:            "mid-p",
	Blaker:          "Blaker",
	LikelihoodRatio: "likelihood ratio",
	Arcsine:         "arcsine",
	Logit:           "logit",
}

// extra spellings ParseMethod accepts besides the String forms.
var methodAliases = map[string]Method{
	"wald-cc": WaldCC, "waldcc": WaldCC, "wilson-cc": WilsonCC, "wilsoncc": WilsonCC,
	"score": Wilson, "exact": ClopperPearson, "clopper pearson": ClopperPearson,
	"midp": MidP, "mid p": MidP, "lr": LikelihoodRatio, "likelihood-ratio": LikelihoodRatio,
	"agresti coull": AgrestiCoull, "asin": Arcsine,
}

// String returns the published name of the method.
func (m Method) String() string { return methodNamesSet.String(m) }

// MarshalText encodes the method by its published name.
func (m Method) MarshalText() ([]byte, error) { return methodNamesSet.MarshalText(m) }

// UnmarshalText decodes any spelling ParseMethod accepts.
func (m *Method) UnmarshalText(b []byte) error { return methodNamesSet.UnmarshalText(m, b) }

// MethodValues lists the methods in order.
func MethodValues() []Method { return methodNamesSet.Values() }

// ParseMethod returns the method whose published name (as String gives
// it) matches s case-insensitively; a few common short forms ("exact",
// "score", "midp", "lr", "wilson-cc", "wald-cc") are accepted too.
func ParseMethod(s string) (Method, error) { return methodNamesSet.Parse("interval.ParseMethod", s) }

var methodNamesSet = enum.New[Method]("interval.Method", methodNames[:], methodAliases)

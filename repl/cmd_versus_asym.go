package repl

import (
	"context"

	"github.com/kofnlab/kofn/test"
)

// The large-sample two-sample tests of versus: pooled and unpooled z,
// Pearson's chi-square with and without Yates's correction.
var asymptoticTwoMethods = enumWords(test.TwoSampleMethodValues(), func(m test.TwoSampleMethod) string { return m.String() })

// asymptoticVersusHelp ends the Methods section of versus's help.
const asymptoticVersusHelp = " Large-sample tests: z-pooled (the score test, the signed root of Pearson's " +
	"chi-square), z-unpooled (Wald), pearson-chi-square and pearson-chi-square-yates (with Yates's " +
	"continuity correction); they need expected counts of about 5 or more (common practice)."

// asymptoticVersus returns the large-sample test called word for the
// alternative alt.
func asymptoticVersus(word string, alt test.Alternative) func(ctx context.Context, k1, n1, k2, n2 int64) (test.Result, error) {
	o := test.TwoSampleOptions{Method: enumValue[test.TwoSampleMethod](asymptoticTwoMethods, word), Alternative: alt}
	return func(_ context.Context, k1, n1, k2, n2 int64) (test.Result, error) {
		return test.TwoSample(k1, n1, k2, n2, o)
	}
}

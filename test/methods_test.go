package test

import "fmt"

// The one-sample tests as option sets (method, two-sided rule, mid-p), in
// the order the tables of this package's tests use.
var (
	optPoint       = BinomialOptions{}
	optPointMidP   = BinomialOptions{MidP: true}
	optCentral     = BinomialOptions{Rule: Central}
	optCentralMidP = BinomialOptions{Rule: Central, MidP: true}
	optBlaker      = BinomialOptions{Rule: Blaker}
	optBlakerMidP  = BinomialOptions{Rule: Blaker, MidP: true}
	optScore       = BinomialOptions{Method: Score}
	optScoreCC     = BinomialOptions{Method: ScoreCC}
	optLR          = BinomialOptions{Method: LikelihoodRatio}

	allOneSample = []BinomialOptions{optPoint, optPointMidP, optCentral, optCentralMidP, optBlaker, optBlakerMidP, optScore, optScoreCC, optLR}
)

// with returns o against alternative a.
func with(o BinomialOptions, a Alternative) BinomialOptions {
	o.Alternative = a
	return o
}

// skipIv returns o without the interval.
func skipIv(o BinomialOptions) BinomialOptions {
	o.SkipInterval = true
	return o
}

// binomialSpec maps the method names written in the golden files to
// options.
func binomialSpec(name string) (BinomialOptions, error) {
	m := map[string]BinomialOptions{
		"point-probability": optPoint, "point-probability mid-p": optPointMidP,
		"central": optCentral, "central mid-p": optCentralMidP,
		"Blaker": optBlaker, "Blaker mid-p": optBlakerMidP,
		"score": optScore, "score-cc": optScoreCC, "likelihood-ratio": optLR,
	}
	if o, ok := m[name]; ok {
		return o, nil
	}
	return BinomialOptions{}, fmt.Errorf("unknown one-sample method %q in a golden file", name)
}

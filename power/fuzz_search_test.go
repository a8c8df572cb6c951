package power

import (
	"context"
	"math"
	"testing"
	"time"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

// checkSize checks an exact sample-size result against its own contract:
// the first n reaches the target, the stable n (when found) is no smaller
// and reaches it too, the horizon covers both, the size and every point
// of the curve are probabilities, and the normal-approximation n beside it
// is finite.
func checkSize(t *testing.T, name string, r ExactSize, err error) {
	t.Helper()
	checkFuzz(t, name, err)
	if err != nil {
		return
	}
	prob := func(v float64) bool { return v >= 0 && v <= 1 }
	switch {
	case r.First < 1 || !(r.FirstPower >= r.Target) || !prob(r.FirstPower):
		t.Fatalf("%s: first n %d with power %g against target %g", name, r.First, r.FirstPower, r.Target)
	case r.Stable != 0 && (r.Stable < r.First || !(r.StablePower >= r.Target) || !prob(r.StablePower)):
		t.Fatalf("%s: stable n %d with power %g (first %d, target %g)", name, r.Stable, r.StablePower, r.First, r.Target)
	case r.Horizon < max(r.First, r.Stable):
		t.Fatalf("%s: horizon %d below first %d / stable %d", name, r.Horizon, r.First, r.Stable)
	case !prob(r.Size):
		t.Fatalf("%s: size %g is not a probability", name, r.Size)
	case math.IsNaN(r.Normal.Real) || math.IsInf(r.Normal.Real, 0) || math.IsNaN(r.Normal.Power):
		t.Fatalf("%s: normal approximation %+v", name, r.Normal)
	}
	for _, pt := range r.Curve {
		if !prob(pt.Power) {
			t.Fatalf("%s: curve point %+v", name, pt)
		}
	}
}

// checkWidth checks a width plan: N >= 1, the value meets the goal (an
// expected half-width at most d, or an assurance at least the target), and
// Previous is NaN only at N = 1, as documented.
func checkWidth(t *testing.T, name string, r WidthPlan, err error, meets func(v float64) bool) {
	t.Helper()
	checkFuzz(t, name, err)
	if err != nil {
		return
	}
	if r.N < 1 || math.IsNaN(r.Value) || !meets(r.Value) || (math.IsNaN(r.Previous) && r.N != 1) {
		t.Fatalf("%s: plan %+v", name, r)
	}
}

// FuzzSampleSize runs the sample-size searches (one-sample, paired and
// two-sample exact searches, the precision and width planners, and their
// normal-approximation twins) on arbitrary proportions, levels, targets
// and options, with small search limits and a deadline so that each input
// costs at most a few hundred milliseconds, and checks each result's
// contract (checkSize, checkWidth) or a typed error.
func FuzzSampleSize(f *testing.F) {
	f.Add(0.2, 0.4, 0.05, 0.8, 0.1, 0, 0, false, 1.0)
	f.Add(0.5, 0.7, 0.01, 0.9, 0.05, 1, 1, true, 2.0)
	f.Add(0.025, 0.005, 0.025, 0.8, 0.05, 0, 2, false, 1.0)
	f.Add(1e-300, 1-1e-16, 0.5, 1-1e-16, 1e-17, 3, 7, true, 0.5)
	f.Add(math.NaN(), math.Inf(1), math.Copysign(0, -1), 5e-324, 0.5, -1, 99, false, math.Inf(1))
	f.Fuzz(func(t *testing.T, p1, p2, alpha, pw, eps float64, alt, method int, mid bool, ratio float64) {
		ctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
		defer cancel()
		a := test.Alternative(alt % 4)
		o1 := OneSampleOptions{Alpha: alpha, Power: pw, Alternative: a, Rule: test.TwoSidedRule(method % 4), MidP: mid, MaxN: 2000}
		r, err := OneSampleN(ctx, p1, p2, o1)
		checkSize(t, "OneSampleN", r, err)
		op := PairedOptions{Alpha: alpha, Power: pw, Alternative: a, Method: test.McNemarMethod(method % 4), MidP: mid && method%2 == 0, Enumerate: mid, MaxN: 2000}
		r, err = PairedN(ctx, p1/2, p2/2, op)
		checkSize(t, "PairedN", r, err)
		// Fisher and the z test only: Barnard's search is minutes long by design.
		o2 := TwoSampleOptions{Alpha: alpha, Power: pw, Alternative: a, Ratio: ratio, Hypothesis: Hypothesis(method % 4),
			Margin: eps, Test: ExactTest(method % 2 * 2), MaxN: 60}
		r, err = TwoSampleN(ctx, p1, p2, o2)
		checkSize(t, "TwoSampleN", r, err)
		ns, err := TwoSampleNormalN(p1, p2, o2)
		checkFuzz(t, "TwoSampleNormalN", err, ns.Real, ns.Power, float64(ns.N), float64(ns.N2))
		po := PrecisionOptions{Level: pw, MaxN: 3000}
		r, err = PrecisionN(ctx, p1, eps, po)
		checkSize(t, "PrecisionN", r, err)
		if eps >= 0.02 { // the worst case scans n up to about 1/eps^2
			r, err = WorstPrecisionN(ctx, eps, po)
			checkSize(t, "WorstPrecisionN", r, err)
		}
		wo := WidthOptions{Interval: interval.Options{Level: 1 - alpha, Method: interval.Method(method % 12)}, Assurance: pw, MaxN: 5000}
		w, err := ExpectedWidthN(ctx, p1, eps, wo)
		checkWidth(t, "ExpectedWidthN", w, err, func(v float64) bool { return v <= eps })
		w, err = AssuranceN(ctx, p1, eps, wo)
		checkWidth(t, "AssuranceN", w, err, func(v float64) bool { return v >= pw })
	})
}

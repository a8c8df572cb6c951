package power

import (
	"context"
	"errors"
	"math"
	"strings"
	"testing"

	"github.com/kofnlab/kofn/test"
)

// checkFuzz fails when err is not a typed power error or a value is NaN
// without an error.
func checkFuzz(t *testing.T, name string, err error, vals ...float64) {
	t.Helper()
	if err != nil {
		var e *Error
		if !errors.As(err, &e) || !strings.HasPrefix(e.Error(), "power.") {
			t.Fatalf("%s: untyped or misnamed error %v", name, err)
		}
		return
	}
	for _, v := range vals {
		if math.IsNaN(v) || v < 0 {
			t.Fatalf("%s: bad value %v", name, v)
		}
	}
}

func FuzzNormalSizes(f *testing.F) {
	f.Add(0.05, 0.10, 0.05, 0.8, 1.0, 0, 0, 0, 0.0)
	f.Add(0.5, 0.7, 0.01, 0.9, 2.0, 1, 1, 1, 0.1)
	f.Add(0.85, 0.85, 0.025, 0.8, 0.5, 0, 1, 2, 0.1)
	f.Fuzz(func(t *testing.T, p1, p2, alpha, pw, ratio float64, alt, variance, hyp int, margin float64) {
		o1 := OneSampleOptions{Alpha: alpha, Power: pw, Alternative: test.Alternative(alt % 4)}
		r, err := OneSampleNormalN(p1, p2, o1)
		checkFuzz(t, "OneSampleNormalN", err, r.Real, r.Power)
		v, err := OneSampleNormalPower(37, p1, p2, o1)
		checkFuzz(t, "OneSampleNormalPower", err, v)
		o2 := TwoSampleOptions{Alpha: alpha, Power: pw, Ratio: ratio, Alternative: test.Alternative(alt % 4),
			Variance: Variance(variance % 3), Hypothesis: Hypothesis(hyp % 4), Margin: margin}
		r, err = TwoSampleNormalN(p1, p2, o2)
		checkFuzz(t, "TwoSampleNormalN", err, r.Real, r.Power, float64(r.N2))
		v, err = TwoSampleNormalPower(20, 30, p1, p2, o2)
		checkFuzz(t, "TwoSampleNormalPower", err, v)
		op := PairedOptions{Alpha: alpha, Power: pw, Alternative: test.Alternative(alt % 4)}
		r, err = PairedNormalN(p1, p2, op)
		checkFuzz(t, "PairedNormalN", err, r.Real, r.Power)
		n, err := MarginOfErrorN(p1, p2, pw)
		checkFuzz(t, "MarginOfErrorN", err, float64(n))
	})
}

func FuzzExactSmall(f *testing.F) {
	f.Add(int64(20), 0.5, 0.7, 0.05, 0, 0, false)
	f.Add(int64(1), 0.01, 0.99, 0.5, 1, 2, true)
	f.Fuzz(func(t *testing.T, n int64, p0, p1, alpha float64, alt, method int, mid bool) {
		if n > 300 {
			n %= 300
		}
		o := OneSampleOptions{Alpha: alpha, Alternative: test.Alternative(alt % 4), Rule: test.TwoSidedRule(method % 4), MidP: mid}
		r, err := OneSamplePower(n, p0, p1, o)
		checkFuzz(t, "OneSamplePower", err, r.Power, r.Size)
		if err == nil && (r.Power > 1 || r.Size > 1) {
			t.Fatalf("probability above 1: %+v", r)
		}
		c, err := OneSampleCurve(context.Background(), p0, p1, max(n, 1), o)
		if err == nil {
			for _, pt := range c {
				checkFuzz(t, "OneSampleCurve", nil, pt.Power)
			}
		} else {
			checkFuzz(t, "OneSampleCurve", err)
		}
		pr, err := PairedPower(context.Background(), n, p0/2, p1/2, PairedOptions{Alpha: alpha, Alternative: test.Alternative(alt % 4), Method: test.McNemarMethod(method % 4), Enumerate: mid})
		checkFuzz(t, "PairedPower", err, pr.Power, pr.Size)
		tp, err := TwoSamplePower(context.Background(), n%40, (n+7)%40, p0, p1, TwoSampleOptions{Alpha: alpha, Alternative: test.Alternative(alt % 4), Test: ExactTest(method % 2 * 2)})
		checkFuzz(t, "TwoSamplePower", err, tp.Power, tp.Size)
	})
}

func FuzzPlans(f *testing.F) {
	f.Add(int64(89), int64(2), int64(10000), 0.01, 0.06, 0.05, 0.10)
	f.Add(int64(1), int64(0), int64(1), 0.5, 0.6, 0.4, 0.4)
	f.Fuzz(func(t *testing.T, n, c, lot int64, p, q, a, b float64) {
		pl := Plan{SampleSize: n, AcceptNumber: c}
		v, err := AcceptProb(pl, p)
		checkFuzz(t, "AcceptProb", err, v)
		r, err := Rectify(pl, lot, p)
		checkFuzz(t, "Rectify", err, r.AOQ, r.ATI)
		if lot < 1e6 {
			v, err = AcceptProbLot(pl, lot, lot/3)
			checkFuzz(t, "AcceptProbLot", err, v)
			l, err := AOQL(pl, lot)
			checkFuzz(t, "AOQL", err, l.AOQL, l.P)
		}
		d, err := DesignPlan(context.Background(), p, q, DesignOptions{ProducerRisk: a, ConsumerRisk: b, MaxN: 5000, Lot: lot % 3000})
		checkFuzz(t, "DesignPlan", err, d.AchievedProducerRisk, d.AchievedConsumerRisk)
		if err == nil && (d.AchievedProducerRisk > d.ProducerRisk || d.AchievedConsumerRisk > d.ConsumerRisk) {
			t.Fatalf("plan misses a risk: %+v", d)
		}
		dm, err := DemonstrationTrials(c%5, p, q)
		checkFuzz(t, "DemonstrationTrials", err, dm.AchievedLevel)
		if err == nil && (dm.AchievedLevel < dm.Level || dm.PreviousLevel >= dm.Level) {
			t.Fatalf("demonstration %+v", dm)
		}
		rl, err := DemonstratedReliability(n, c, q)
		checkFuzz(t, "DemonstratedReliability", err, rl)
	})
}

func FuzzPrecision(f *testing.F) {
	f.Add(0.3, 0.1, 0.95, int64(50))
	f.Add(0.999, 0.001, 0.5, int64(1))
	f.Fuzz(func(t *testing.T, p, eps, target float64, n int64) {
		ctx := context.Background()
		r, err := PrecisionN(ctx, p, eps, PrecisionOptions{Level: target, MaxN: 2000})
		checkFuzz(t, "PrecisionN", err, r.FirstPower)
		w, err := WorstPrecisionAt(ctx, n%3000, eps)
		checkFuzz(t, "WorstPrecisionAt", err, w.Prob)
		if err == nil && w.Prob > 1 {
			t.Fatalf("probability %v", w.Prob)
		}
		mo, err := MarginOfErrorN(p, eps, target)
		checkFuzz(t, "MarginOfErrorN", err, float64(mo))
	})
}

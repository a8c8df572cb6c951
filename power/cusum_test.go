package power

import (
	"context"
	"encoding/json"
	"errors"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/test"
)

func TestCUSUMChart(t *testing.T) {
	t.Parallel()
	// The automatic denominator is the smallest within a relative 1e-3 of
	// gamma; AdjustedP1 has Ref/Unit as its exact reference value.
	for _, d := range []struct {
		p0, p1 float64
		shift  Shift
	}{{0.01, 0.02, Increase}, {0.3, 0.4, Increase}, {0.001, 0.005, Increase}, {0.2, 0.1, Decrease}, {0.5, 0.45, Decrease}} {
		c, err := NewCUSUM(d.p0, d.p1, 4, CUSUMOptions{Shift: d.shift})
		if err != nil {
			t.Fatal(err)
		}
		g := float64(c.Ref) / float64(c.Unit)
		if math.Abs(g-c.Gamma) > 1e-3*c.Gamma {
			t.Errorf("%+v: %d/%d is not within 1e-3 of %g", d, c.Ref, c.Unit, c.Gamma)
		}
		for m := int64(1); m < c.Unit; m++ {
			a := math.Round(c.Gamma * float64(m))
			if a >= 1 && math.Abs(a/float64(m)-c.Gamma) <= 1e-3*c.Gamma {
				t.Errorf("%+v: denominator %d would do, %d chosen", d, m, c.Unit)
			}
		}
		if math.Abs(refValue(d.p0, c.AdjustedP1)-g) > 1e-12 {
			t.Errorf("%+v: adjusted p1 %g has reference %g, want %g", d, c.AdjustedP1, refValue(d.p0, c.AdjustedP1), g)
		}
		if lo, hi := math.Min(d.p0, d.p1), math.Max(d.p0, d.p1); !(c.Gamma > lo && c.Gamma < hi) {
			t.Errorf("%+v: gamma %g outside (p0, p1)", d, c.Gamma)
		}
		if c.Threshold != int64(math.Ceil(4*float64(c.Unit))) {
			t.Errorf("%+v: threshold %d for h = 4 and unit %d", d, c.Threshold, c.Unit)
		}
	}
}

func TestCUSUMStepAndBatch(t *testing.T) {
	t.Parallel()
	// Invented stream: 0 = good item, 1 = defect.
	c, _ := NewCUSUM(0.1, 0.2, 2, CUSUMOptions{Unit: 20}) // Ref 3, Threshold 40
	items := []bool{false, true, true, false, true, true, true, false, true, true}
	// By hand: +17 per defect, -3 per good item, floored at 0.
	want := []int64{0, 17, 34, 31, 48}
	var s int64
	for i, x := range items[:5] {
		var sig bool
		s, sig = c.Step(s, x)
		if s != want[i] || sig != (s >= 40) {
			t.Errorf("item %d: s = %d signal %v, want %d", i, s, sig, want[i])
		}
	}
	// Batch of one item equals Step; a batch with its successes first and
	// no reset equals the items one by one.
	for _, x := range []bool{false, true} {
		k := int64(0)
		if x {
			k = 1
		}
		a, _ := c.Step(10, x)
		b, _, err := c.Batch(10, k, 1)
		if err != nil || a != b {
			t.Errorf("batch of one %v: %d, step %d (%v)", x, b, a, err)
		}
	}
	s1 := int64(5)
	for _, x := range []bool{true, true, false, false, false} {
		s1, _ = c.Step(s1, x)
	}
	s2, _, _ := c.Batch(5, 2, 5)
	if s1 != s2 {
		t.Errorf("batch 2 of 5 from 5: %d, items %d", s2, s1)
	}
	if _, _, err := c.Batch(0, 3, 2); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("k > m: %v", err)
	}
	// decrease chart: a failure adds Ref, a success removes Unit - Ref
	dc, _ := NewCUSUM(0.2, 0.1, 2, CUSUMOptions{Shift: Decrease, Unit: 33}) // Ref 5
	if s, _ := dc.Step(0, false); s != 5 {
		t.Errorf("decrease, good item from 0: %d, want 5", s)
	}
	if s, _ := dc.Step(30, true); s != 2 {
		t.Errorf("decrease, defect from 30: %d, want 2", s)
	}
}

func TestCUSUMRunLengthProperties(t *testing.T) {
	t.Parallel()
	c, _ := NewCUSUM(0.01, 0.03, 3, CUSUMOptions{})
	// the ARL falls as the rate rises (an increase chart), and it is +Inf
	// when no defect can occur
	prev := math.Inf(1)
	for _, p := range []float64{0, 0.005, 0.01, 0.02, 0.03, 0.1, 0.5, 1} {
		r, err := CUSUMRunLength(context.Background(), c, p)
		if err != nil {
			t.Fatal(err)
		}
		if p == 0 {
			if !math.IsInf(r.ARL, 1) {
				t.Errorf("p = 0: ARL %g", r.ARL)
			}
			continue
		}
		if !(r.ARL < prev) || r.ARL < 1 {
			t.Errorf("p %g: ARL %g not below %g", p, r.ARL, prev)
		}
		prev = r.ARL
	}
	// at p = 1 every item is a defect: the chart signals after
	// ceil(Threshold / (Unit - Ref)) items exactly
	r, _ := CUSUMRunLength(context.Background(), c, 1)
	up := c.Unit - c.Ref
	if want := float64((c.Threshold + up - 1) / up); r.ARL != want || r.SDRL != 0 {
		t.Errorf("p = 1: ARL %g SDRL %g, want %g and 0", r.ARL, r.SDRL, want)
	}
	// the threshold search: the chart found meets the target and the
	// threshold one lower does not
	c2, rl, err := CUSUMForARL(context.Background(), 0.01, 0.03, 5000, CUSUMOptions{})
	if err != nil {
		t.Fatal(err)
	}
	c2.Threshold--
	below, _ := CUSUMRunLength(context.Background(), c2, 0.01)
	if !(rl.ARL >= 5000 && below.ARL < 5000) {
		t.Errorf("threshold %d: ARL0 %g; one lower %g", c2.Threshold+1, rl.ARL, below.ARL)
	}
}

func TestCUSUMErrors(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		name   string
		p0, p1 float64
		h      float64
		opt    CUSUMOptions
		arg    string
	}{
		{"direction", 0.1, 0.05, 3, CUSUMOptions{}, "p1"},
		{"decrease", 0.1, 0.2, 3, CUSUMOptions{Shift: Decrease}, "p1"},
		{"p0", 0, 0.2, 3, CUSUMOptions{}, "p0"},
		{"h", 0.1, 0.2, 0, CUSUMOptions{}, "h"},
		{"unit", 0.1, 0.2, 3, CUSUMOptions{Unit: -2}, "Unit"},
		{"unit small", 0.1, 0.2, 3, CUSUMOptions{Unit: 2}, "Unit"},
		{"shift", 0.1, 0.2, 3, CUSUMOptions{Shift: 5}, "Shift"},
	} {
		_, err := NewCUSUM(c.p0, c.p1, c.h, c.opt)
		var e *Error
		if !errors.As(err, &e) || e.Arg != c.arg {
			t.Errorf("%s: err = %v, want one naming %s", c.name, err, c.arg)
		}
	}
	c, _ := NewCUSUM(1e-5, 2e-5, 5, CUSUMOptions{})
	if _, err := CUSUMRunLength(context.Background(), c, 1e-5); !errors.Is(err, ErrTooLarge) {
		t.Errorf("huge chain: %v", err)
	}
	if _, err := CUSUMRunLength(context.Background(), CUSUM{}, 0.1); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("zero chart: %v", err)
	}
	if _, _, err := CUSUMForARL(context.Background(), 0.1, 0.2, 1, CUSUMOptions{}); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("arl0 = 1: %v", err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	c, _ = NewCUSUM(0.001, 0.002, 5, CUSUMOptions{})
	if _, err := CUSUMRunLength(ctx, c, 0.001); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: %v", err)
	}
}

func TestSequentialPowerJSON(t *testing.T) {
	t.Parallel()
	c, _ := NewCUSUM(0.01, 0.02, 4, CUSUMOptions{})
	rl, _ := CUSUMRunLength(context.Background(), c, 0)
	s, _ := test.NewSPRT(0.1, 0.2, 0.05, 0.1, test.SPRTOptions{MaxN: 50})
	op, _ := SPRTOperating(context.Background(), s, 0.15)
	for _, v := range []any{&c, &rl, &op} {
		b, err := json.Marshal(v)
		if err != nil {
			t.Fatal(err)
		}
		var back any
		switch v.(type) {
		case *CUSUM:
			back = new(CUSUM)
		case *RunLength:
			back = new(RunLength)
		case *SPRTOperatingPoint:
			back = new(SPRTOperatingPoint)
		}
		if err := json.Unmarshal(b, back); err != nil {
			t.Fatalf("%s: %v", b, err)
		}
		if diff := cmp.Diff(v, back, cmpopts.EquateNaNs()); diff != "" {
			t.Errorf("round trip of %s (-want +got)\n%s", b, diff)
		}
	}
}

func TestDifferenceSequenceErrorProb(t *testing.T) {
	t.Parallel()
	// The product method is exact: its error never exceeds alpha. The
	// normal mixture is asymptotic; with its default mixing variance it
	// stays below alpha at these proportions and horizons (where it does
	// not, see TestDifferenceNormalGolden).
	horizon := int64(60)
	if !testing.Short() {
		horizon = 200
	}
	for _, m := range test.SequenceMethodValues() {
		s, err := test.NewDifferenceSequence(0, 0.05, test.DifferenceSequenceOptions{Method: m})
		if err != nil {
			t.Fatal(err)
		}
		for _, pp := range [][2]float64{{0.5, 0.5}, {0.02, 0.05}, {0.3, 0.2}} {
			e, err := DifferenceSequenceErrorProb(context.Background(), s, pp[0], pp[1], horizon)
			if err != nil {
				t.Fatal(err)
			}
			if !(e >= 0 && e <= 0.05) {
				t.Errorf("%v at %v: error %g above alpha 0.05", m, pp, e)
			}
		}
	}
}

func BenchmarkCUSUMRunLength(b *testing.B) {
	// The speed goal: exact run lengths within 100 ms for charts of up to
	// 10000 states.
	for _, d := range []struct {
		name   string
		p0, p1 float64
		h      float64
	}{{"rate0.01", 0.01, 0.02, 5}, {"rate0.001", 0.001, 0.002, 5}, {"rate0.3", 0.3, 0.4, 8}} {
		c, err := NewCUSUM(d.p0, d.p1, d.h, CUSUMOptions{})
		if err != nil {
			b.Fatal(err)
		}
		b.Run(d.name, func(b *testing.B) {
			b.ReportMetric(float64(c.Threshold), "states")
			for b.Loop() {
				if _, err := CUSUMRunLength(context.Background(), c, d.p0); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
	b.Run("search", func(b *testing.B) {
		for b.Loop() {
			if _, _, err := CUSUMForARL(context.Background(), 0.01, 0.02, 10000, CUSUMOptions{}); err != nil {
				b.Fatal(err)
			}
		}
	})
}

func FuzzCUSUM(f *testing.F) {
	f.Add(0.01, 0.02, 3.0, int64(0), false, int64(2), int64(9))
	f.Add(0.2, 0.1, 1.5, int64(33), true, int64(0), int64(0))
	f.Fuzz(func(t *testing.T, p0, p1, h float64, unit int64, decrease bool, k, m int64) {
		opt := CUSUMOptions{Unit: unit}
		if decrease {
			opt.Shift = Decrease
		}
		c, err := NewCUSUM(p0, p1, h, opt)
		if err != nil {
			var e *Error
			if !errors.As(err, &e) {
				t.Fatalf("untyped error %v", err)
			}
			return
		}
		if c.Ref < 1 || c.Ref >= c.Unit || c.Threshold < 1 || math.IsNaN(c.Gamma) {
			t.Fatalf("bad chart %+v", c)
		}
		if s, _, err := c.Batch(0, k, m); err == nil && s < 0 {
			t.Fatalf("negative statistic %d", s)
		}
		if float64(c.Threshold)*float64(c.Unit) > 2e5 {
			return // keep the solve small
		}
		r, err := CUSUMRunLength(context.Background(), c, p0)
		if err != nil {
			var e *Error
			if !errors.As(err, &e) {
				t.Fatalf("untyped error %v", err)
			}
			return
		}
		if !(r.ARL >= 1) || math.IsNaN(r.SDRL) {
			t.Fatalf("bad run length %+v for %+v", r, c)
		}
	})
}

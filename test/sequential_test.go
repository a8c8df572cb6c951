package test

import (
	"context"
	"encoding/json"
	"errors"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/interval"
)

func TestSPRTDecide(t *testing.T) {
	t.Parallel()
	// H0 p = 0.2 against H1 p = 0.5, alpha 0.05, beta 0.1. Computed by hand
	// from Wald's definitions (Wald 1947, chapter 5): ln A = ln(0.9/0.05) =
	// 2.8904, ln B = ln(0.1/0.95) = -2.2513, a success adds ln 2.5 =
	// 0.91629, a failure ln(0.5/0.8) = -0.47000.
	s, err := NewSPRT(0.2, 0.5, 0.05, 0.1, SPRTOptions{})
	if err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		k, n int64
		z    float64
		want Decision
	}{
		{0, 0, 0, Continue},
		{3, 3, 2.74887, Continue},
		{4, 4, 3.66516, RejectNull},
		{0, 4, -1.88001, Continue},
		{0, 5, -2.35002, AcceptNull},
		{4, 6, 2.72516, Continue},
		{5, 7, 3.64145, RejectNull},
		{1, 7, -1.90371, Continue},
		{1, 8, -2.37371, AcceptNull},
	}
	for _, c := range cases {
		l, err := s.Decide(c.k, c.n)
		if err != nil {
			t.Fatal(err)
		}
		if l.Decision != c.want || math.Abs(l.LogRatio-c.z) > 1e-4 {
			t.Errorf("Decide(%d, %d) = %v, Z %g; want %v, Z %g", c.k, c.n, l.Decision, l.LogRatio, c.want, c.z)
		}
	}
	// The decision lines are where Z equals the boundaries (identity of
	// Wald's parametrization), and their slope lies between p0 and p1.
	for _, d := range []struct{ p0, p1 float64 }{{0.2, 0.5}, {0.5, 0.2}, {0.001, 0.004}, {0.99, 0.95}} {
		s, _ := NewSPRT(d.p0, d.p1, 0.05, 0.2, SPRTOptions{})
		for _, n := range []float64{0, 10, 1000} {
			kr := s.Lines.Reject + s.Lines.Slope*n
			ka := s.Lines.Accept + s.Lines.Slope*n
			zr := kr*s.Success + (n-kr)*s.Failure
			za := ka*s.Success + (n-ka)*s.Failure
			if math.Abs(zr-s.LogUpper) > 1e-9*(1+n) || math.Abs(za-s.LogLower) > 1e-9*(1+n) {
				t.Errorf("%+v n %g: Z on the lines %g, %g; want %g, %g", d, n, zr, za, s.LogUpper, s.LogLower)
			}
		}
		if lo, hi := math.Min(d.p0, d.p1), math.Max(d.p0, d.p1); !(s.Lines.Slope > lo && s.Lines.Slope < hi) {
			t.Errorf("%+v: slope %g outside (p0, p1)", d, s.Lines.Slope)
		}
	}
}

func TestSPRTTruncatedAndPaired(t *testing.T) {
	t.Parallel()
	s, _ := NewSPRT(0.2, 0.5, 0.05, 0.1, SPRTOptions{MaxN: 6})
	// at n = MaxN an undecided Z decides by its sign (Z(2, 6) = -0.0466... <0)
	for _, c := range []struct {
		k    int64
		want Decision
	}{{2, AcceptNull}, {3, RejectNull}, {4, RejectNull}} {
		l, err := s.Decide(c.k, 6)
		if err != nil {
			t.Fatal(err)
		}
		if l.Decision != c.want || !l.Truncated && c.k < 4 {
			t.Errorf("truncated Decide(%d, 6) = %+v, want %v", c.k, l, c.want)
		}
	}
	if _, err := s.Decide(3, 7); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("n beyond MaxN: err = %v", err)
	}
	// paired: the one-proportion test of theta = 1/2 on discordant pairs
	ps, err := NewPairedSPRT(0.75, 0.05, 0.1, SPRTOptions{})
	if err != nil {
		t.Fatal(err)
	}
	one, _ := NewSPRT(0.5, 0.75, 0.05, 0.1, SPRTOptions{})
	for _, c := range [][2]int64{{0, 0}, {5, 1}, {9, 2}, {2, 7}} {
		a, err := ps.DecidePaired(c[0], c[1])
		if err != nil {
			t.Fatal(err)
		}
		b, _ := one.Decide(c[0], c[0]+c[1])
		if a != b {
			t.Errorf("paired %v: %+v, one-sample %+v", c, a, b)
		}
	}
}

func TestSPRTErrors(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		name                string
		p0, p1, alpha, beta float64
		maxN                int64
		arg                 string
	}{
		{"equal", 0.3, 0.3, 0.05, 0.1, 0, "p1"},
		{"p0", 0, 0.3, 0.05, 0.1, 0, "p0"},
		{"p1", 0.3, 1, 0.05, 0.1, 0, "p1"},
		{"alpha", 0.3, 0.5, math.NaN(), 0.1, 0, "alpha"},
		{"sum", 0.3, 0.5, 0.6, 0.5, 0, "beta"},
		{"maxN", 0.3, 0.5, 0.05, 0.1, -1, "MaxN"},
	} {
		_, err := NewSPRT(c.p0, c.p1, c.alpha, c.beta, SPRTOptions{MaxN: c.maxN})
		var e *Error
		if !errors.As(err, &e) || e.Arg != c.arg || !errors.Is(err, ErrInvalidArgument) {
			t.Errorf("%s: err = %v, want one naming %s", c.name, err, c.arg)
		}
	}
	if _, err := (SPRT{}).Decide(1, 2); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("zero SPRT: %v", err)
	}
	s, _ := NewSPRT(0.3, 0.5, 0.05, 0.1, SPRTOptions{})
	if _, err := s.Decide(3, 2); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("k > n: %v", err)
	}
	if _, err := s.DecidePaired(-1, 2); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("negative n12: %v", err)
	}
}

// The always-valid p-value and the confidence sequence agree: the p-value
// is at most Alpha exactly when some sequence so far excluded P0; and its
// false-rejection probability is the sequence's error at P0.
func TestMixtureSequenceConsistent(t *testing.T) {
	t.Parallel()
	s, err := NewMixtureSequence(0.3, 0.05, interval.SequenceOptions{PlannedN: 200})
	if err != nil {
		t.Fatal(err)
	}
	// Invented stream drifting away from 0.3.
	looks := [][2]int64{{0, 0}, {2, 5}, {10, 30}, {30, 80}, {60, 140}, {95, 200}, {140, 280}}
	var prev *MixtureLook
	excluded := false
	for _, c := range looks {
		l, err := s.Look(prev, c[0], c[1])
		if err != nil {
			t.Fatal(err)
		}
		excluded = excluded || !l.Interval.Contains(0.3)
		if (l.Decision == RejectNull) != excluded {
			t.Errorf("look %v: decision %v but excluded so far %v (p %g, %v)", c, l.Decision, excluded, l.PValue, l.Interval)
		}
		if prev != nil && l.PValue > prev.PValue {
			t.Errorf("look %v: p-value rose from %g to %g", c, prev.PValue, l.PValue)
		}
		if l.Running.Lower < l.Interval.Lower || l.Running.Upper > l.Interval.Upper {
			t.Errorf("look %v: running %v not inside %v", c, l.Running, l.Interval)
		}
		prev = &l
	}
	if prev.Decision != RejectNull {
		t.Errorf("the stream at 0.5 should reject 0.3 by n = 280: p = %g", prev.PValue)
	}
	// exact false-rejection probability by recursion through Look itself
	// (horizon 150, small enough to enumerate every count) against
	// interval.SequenceErrorProb at the same settings
	p0 := 0.3
	alive := map[int64]float64{0: 1}
	miss := 0.0
	for n := int64(1); n <= 150; n++ {
		next := map[int64]float64{}
		for k, v := range alive {
			next[k] += v * (1 - p0)
			next[k+1] += v * p0
		}
		for k, v := range next {
			l, _ := s.Look(nil, k, n)
			if l.Decision == RejectNull {
				miss += v
				delete(next, k)
			}
		}
		alive = next
	}
	want, err := interval.SequenceErrorProb(context.Background(), p0, 150, 0.95, interval.SequenceOptions{PlannedN: 200})
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(want, miss, cmpopts.EquateApprox(1e-10, 0)); diff != "" {
		t.Errorf("false-rejection probability (-sequence +looks)\n%s", diff)
	}
	if miss > 0.05 {
		t.Errorf("false-rejection probability %g exceeds alpha", miss)
	}
}

func TestSequenceLookErrors(t *testing.T) {
	t.Parallel()
	s, _ := NewMixtureSequence(0.3, 0.05, interval.SequenceOptions{})
	l, _ := s.Look(nil, 5, 10)
	for _, c := range []struct {
		k, n int64
		arg  string
	}{{4, 12, "k"}, {5, 9, "n"}, {11, 11, "k"}, {-1, 3, "k"}} {
		_, err := s.Look(&l, c.k, c.n)
		var e *Error
		if !errors.As(err, &e) || e.Arg != c.arg {
			t.Errorf("Look(%d, %d) after 5/10: err = %v, want one naming %s", c.k, c.n, err, c.arg)
		}
	}
	if _, err := NewMixtureSequence(1, 0.05, interval.SequenceOptions{}); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("p0 = 1: %v", err)
	}
	if _, err := NewDifferenceSequence(1, 0.05, DifferenceSequenceOptions{}); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("delta0 = 1: %v", err)
	}
	if _, err := NewDifferenceSequence(0, 0.05, DifferenceSequenceOptions{Tau2: 1}); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("Tau2 with the product method: %v", err)
	}
	if _, err := NewDifferenceSequence(0, 0.05, DifferenceSequenceOptions{Method: 7}); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("method 7: %v", err)
	}
}

// The product method's p-value is the smallest alpha at which its
// sequence (with the same mixtures) excludes delta0: at alpha slightly above the look's p-value the
// interval excludes delta0, slightly below it does not.
func TestDifferenceProductPValueInverts(t *testing.T) {
	t.Parallel()
	for _, c := range [][4]int64{{300, 1000, 200, 1000}, {30, 1000, 5, 900}, {1000, 3000, 800, 3000}} {
		s, _ := NewDifferenceSequence(0, 0.05, DifferenceSequenceOptions{})
		l, err := s.Look(nil, c[0], c[1], c[2], c[3])
		if err != nil {
			t.Fatal(err)
		}
		p := l.PValue
		if !(p > 1e-6 && p < 0.5) {
			t.Fatalf("%v: p-value %g outside the range this check needs", c, p)
		}
		for _, f := range []float64{0.999, 1.001} {
			a := p * f
			sa := s // the same mixture at another alpha
			sa.Alpha = a
			lo, hi := sa.Limits(c[0], c[1], c[2], c[3])
			excl := lo > 0 || hi < 0
			if excl != (f > 1) {
				t.Errorf("%v: at alpha %g (p-value %g) the sequence [%g, %g] excludes 0: %v", c, a, p, lo, hi, excl)
			}
		}
	}
}

// The normal mixture's closed forms: at delta0 = d -+ half-width the
// statistic is exactly 1/Alpha (the sequence inverts the test).
func TestDifferenceNormalInverts(t *testing.T) {
	t.Parallel()
	for _, c := range [][4]int64{{60, 200, 35, 210}, {500, 1000, 440, 1000}} {
		s, _ := NewDifferenceSequence(0, 0.05, DifferenceSequenceOptions{Method: NormalMixtureSequence})
		lo, hi := s.Limits(c[0], c[1], c[2], c[3])
		for _, x := range []float64{lo, hi} {
			sx := s
			sx.Delta0 = x
			lg, _, _ := sx.normalEvidence(c[0], c[1], c[2], c[3])
			if math.Abs(lg-math.Log(20)) > 1e-9 {
				t.Errorf("%v: ln Lambda at limit %g = %g, want ln 20", c, x, lg)
			}
		}
	}
}

func TestSequentialJSONRoundTrip(t *testing.T) {
	t.Parallel()
	s, _ := NewSPRT(0.2, 0.5, 0.05, 0.1, SPRTOptions{MaxN: 30})
	sl, _ := s.Decide(3, 9)
	m, _ := NewMixtureSequence(0.3, 0.05, interval.SequenceOptions{})
	ml, _ := m.Look(nil, 0, 0) // estimate NaN
	d, _ := NewDifferenceSequence(0, 0.05, DifferenceSequenceOptions{Method: NormalMixtureSequence})
	dl, _ := d.Look(nil, 0, 5, 3, 5)
	for _, v := range []any{&s, &sl, &m, &ml, &d, &dl} {
		b, err := json.Marshal(v)
		if err != nil {
			t.Fatal(err)
		}
		back := newLike(v)
		if err := json.Unmarshal(b, back); err != nil {
			t.Fatalf("%s: %v", b, err)
		}
		if diff := cmp.Diff(v, back, cmpopts.EquateNaNs()); diff != "" {
			t.Errorf("round trip of %s (-want +got)\n%s", b, diff)
		}
	}
}

func newLike(v any) any {
	switch v.(type) {
	case *SPRT:
		return new(SPRT)
	case *SPRTLook:
		return new(SPRTLook)
	case *MixtureSequence:
		return new(MixtureSequence)
	case *MixtureLook:
		return new(MixtureLook)
	case *DifferenceSequence:
		return new(DifferenceSequence)
	case *DifferenceLook:
		return new(DifferenceLook)
	}
	panic("unknown type")
}

func FuzzSPRTDecide(f *testing.F) {
	f.Add(0.2, 0.5, 0.05, 0.1, int64(0), int64(3), int64(9))
	f.Add(0.9, 0.1, 0.3, 0.3, int64(5), int64(0), int64(0))
	f.Fuzz(func(t *testing.T, p0, p1, alpha, beta float64, maxN, k, n int64) {
		s, err := NewSPRT(p0, p1, alpha, beta, SPRTOptions{MaxN: maxN})
		if err != nil {
			return
		}
		l, err := s.Decide(k, n)
		if err != nil {
			var e *Error
			if !errors.As(err, &e) {
				t.Fatalf("untyped error %v", err)
			}
			return
		}
		if math.IsNaN(l.LogRatio) || l.Decision < Continue || l.Decision > AcceptNull {
			t.Fatalf("bad look %+v", l)
		}
	})
}

func BenchmarkSequentialLook(b *testing.B) {
	s, _ := NewSPRT(0.01, 0.02, 0.05, 0.1, SPRTOptions{})
	m, _ := NewMixtureSequence(0.01, 0.05, interval.SequenceOptions{})
	d, _ := NewDifferenceSequence(0, 0.05, DifferenceSequenceOptions{})
	dn, _ := NewDifferenceSequence(0, 0.05, DifferenceSequenceOptions{Method: NormalMixtureSequence})
	b.Run("sprt", func(b *testing.B) {
		for b.Loop() {
			s.Decide(123, 10000)
		}
	})
	b.Run("mixture", func(b *testing.B) {
		prev, _ := m.Look(nil, 100, 9000)
		for b.Loop() {
			m.Look(&prev, 123, 10000)
		}
	})
	b.Run("product", func(b *testing.B) {
		for b.Loop() {
			d.Look(nil, 123, 10000, 150, 10000)
		}
	})
	b.Run("normal", func(b *testing.B) {
		for b.Loop() {
			dn.Look(nil, 123, 10000, 150, 10000)
		}
	})
}

func FuzzDifferenceLook(f *testing.F) {
	f.Add(int64(3), int64(10), int64(5), int64(12), 0.0, false)
	f.Add(int64(0), int64(0), int64(7), int64(7), 0.3, true)
	f.Fuzz(func(t *testing.T, k1, n1, k2, n2 int64, delta float64, normal bool) {
		o := DifferenceSequenceOptions{}
		if normal {
			o.Method = NormalMixtureSequence
		}
		s, err := NewDifferenceSequence(delta, 0.05, o)
		if err != nil {
			return
		}
		l, err := s.Look(nil, k1, n1, k2, n2)
		if err != nil {
			var e *Error
			if !errors.As(err, &e) {
				t.Fatalf("untyped error %v", err)
			}
			return
		}
		if math.IsNaN(l.PValue) || l.PValue < 0 || l.PValue > 1 || math.IsNaN(l.Interval.Lower) || l.Interval.Lower > l.Interval.Upper ||
			l.Interval.Lower < -1 || l.Interval.Upper > 1 {
			t.Fatalf("bad look %+v", l)
		}
	})
}

package power

import (
	"context"
	"errors"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/test"
)

// bruteSPRT follows every one of the 2^maxN observation sequences through
// test.SPRT.Decide look by look (an oracle independent of the band
// recursion: no band, no limits, just the definition of the stopping rule).
func bruteSPRT(t *testing.T, s test.SPRT, p float64) (accept, reject, asn float64) {
	t.Helper()
	n := int(s.MaxN)
	for seq := 0; seq < 1<<n; seq++ {
		k, prob := int64(0), 1.0
		for i := 1; i <= n; i++ {
			if seq>>(i-1)&1 == 1 {
				k++
				prob *= p
			} else {
				prob *= 1 - p
			}
			l, err := s.Decide(k, int64(i))
			if err != nil {
				t.Fatal(err)
			}
			if l.Decision != test.Continue {
				// The remaining observations do not matter: each of the
				// 2^(n-i) sequences sharing this prefix adds its share.
				switch l.Decision {
				case test.AcceptNull:
					accept += prob / float64(int(1)<<(n-i))
				case test.RejectNull:
					reject += prob / float64(int(1)<<(n-i))
				}
				asn += float64(i) * prob / float64(int(1)<<(n-i))
				break
			}
		}
	}
	return
}

func TestSPRTOperatingBrute(t *testing.T) {
	t.Parallel()
	// Oracle: exhaustive enumeration of all observation sequences (above).
	designs := []struct{ p0, p1, alpha, beta float64 }{
		{0.2, 0.5, 0.05, 0.1},
		{0.5, 0.2, 0.1, 0.1},
		{0.3, 0.6, 0.2, 0.3},
		{0.05, 0.3, 0.05, 0.2},
	}
	for _, d := range designs {
		for _, maxN := range []int64{1, 2, 7, 13} {
			s, err := test.NewSPRT(d.p0, d.p1, d.alpha, d.beta, test.SPRTOptions{MaxN: maxN})
			if err != nil {
				t.Fatal(err)
			}
			for _, p := range []float64{0, 0.05, 0.2, 0.37, 0.5, 0.9, 1} {
				got, err := SPRTOperating(context.Background(), s, p)
				if err != nil {
					t.Fatal(err)
				}
				a, r, asn := bruteSPRT(t, s, p)
				want := []float64{a, r, asn}
				if diff := cmp.Diff(want, []float64{got.Accept, got.Reject, got.ASN}, cmpopts.EquateApprox(1e-12, 1e-300)); diff != "" {
					t.Errorf("%+v maxN %d p %g (-want +got)\n%s", d, maxN, p, diff)
				}
			}
		}
	}
}

func TestSPRTWaldInequalities(t *testing.T) {
	t.Parallel()
	// Wald (1947), section 3.2: for the untruncated test the achieved
	// rates satisfy alpha' <= alpha/(1-beta), beta' <= beta/(1-alpha) and
	// alpha' + beta' <= alpha + beta (exact theorem, checked on the exact
	// recursion followed until less than 1e-15 probability is running).
	for _, d := range []struct{ p0, p1, alpha, beta float64 }{
		{0.01, 0.03, 0.05, 0.1},
		{0.5, 0.6, 0.05, 0.05},
		{0.9, 0.8, 0.01, 0.2},
		{0.1, 0.2, 0.1, 0.1},
	} {
		s, err := test.NewSPRT(d.p0, d.p1, d.alpha, d.beta, test.SPRTOptions{})
		if err != nil {
			t.Fatal(err)
		}
		h0, err := SPRTOperating(context.Background(), s, d.p0)
		if err != nil {
			t.Fatal(err)
		}
		h1, err := SPRTOperating(context.Background(), s, d.p1)
		if err != nil {
			t.Fatal(err)
		}
		if h0.Undecided > 1e-15 || h1.Undecided > 1e-15 {
			t.Fatalf("%+v: recursion did not finish: %g %g", d, h0.Undecided, h1.Undecided)
		}
		a, b := h0.Reject, h1.Accept
		if a > d.alpha/(1-d.beta)*(1+1e-12) || b > d.beta/(1-d.alpha)*(1+1e-12) || a+b > (d.alpha+d.beta)*(1+1e-12) {
			t.Errorf("%+v: achieved alpha %g beta %g break Wald's inequalities", d, a, b)
		}
		// Wald's approximations ignore the overshoot; for these designs
		// they are within 35% of the exact values (observed, common
		// practice expects Wald's ASN to be somewhat low).
		for _, r := range []SPRTOperatingPoint{h0, h1} {
			if math.Abs(r.WaldASN/r.ASN-1) > 0.35 {
				t.Errorf("%+v p %g: Wald ASN %g vs exact %g", d, r.P, r.WaldASN, r.ASN)
			}
		}
		if math.Abs(h0.WaldAccept-(1-d.alpha)) > 1e-9 || math.Abs(h1.WaldAccept-d.beta) > 1e-9 {
			t.Errorf("%+v: Wald OC at p0 %g (want %g), at p1 %g (want %g)", d, h0.WaldAccept, 1-d.alpha, h1.WaldAccept, d.beta)
		}
	}
}

func TestSPRTOperatingErrors(t *testing.T) {
	t.Parallel()
	s, _ := test.NewSPRT(0.5, 0.5000001, 0.05, 0.05, test.SPRTOptions{})
	if _, err := SPRTOperating(context.Background(), s, 0.5); !errors.Is(err, ErrTooLarge) {
		t.Errorf("huge band: err = %v, want ErrTooLarge", err)
	}
	if _, err := SPRTOperating(context.Background(), test.SPRT{}, 0.5); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("zero SPRT: err = %v", err)
	}
	s, _ = test.NewSPRT(0.5, 0.6, 0.05, 0.05, test.SPRTOptions{MaxN: 100})
	if _, err := SPRTOperating(context.Background(), s, math.NaN()); !errors.Is(err, ErrInvalidArgument) {
		t.Errorf("NaN p: err = %v", err)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	s, _ = test.NewSPRT(0.5, 0.51, 0.05, 0.05, test.SPRTOptions{MaxN: 100000})
	if _, err := SPRTOperating(ctx, s, 0.5); !errors.Is(err, context.Canceled) {
		t.Errorf("cancelled: err = %v", err)
	}
}

func BenchmarkSPRTOperating(b *testing.B) {
	// The speed goal: exact OC and ASN within 100 ms for MaxN = 10000.
	for _, d := range []struct {
		name   string
		p0, p1 float64
	}{{"band36", 0.5, 0.55}, {"band364", 0.5, 0.505}, {"rare", 0.001, 0.003}} {
		s, _ := test.NewSPRT(d.p0, d.p1, 0.05, 0.1, test.SPRTOptions{MaxN: 10000})
		b.Run(d.name, func(b *testing.B) {
			for b.Loop() {
				if _, err := SPRTOperating(context.Background(), s, d.p0); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// When p1 = 1 - p0 a success and a failure move Z by +a and -a, and when
// both boundaries are whole multiples of a the walk stops exactly on them:
// the SPRT is the gambler's ruin, whose absorption probability and
// expected duration are classical closed forms (Feller W (1968), An
// Introduction to Probability Theory and Its Applications, vol. 1, 3rd
// ed., chapter XIV, sections 2 and 3), and Wald's approximations, which
// only neglect the overshoot, are exact.
func TestSPRTGamblersRuin(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		p0   float64
		m, l int // upper boundary m steps above the start, lower l steps below
	}{{0.4, 3, 2}, {0.3, 2, 2}, {0.45, 5, 4}} {
		p1 := 1 - c.p0
		a := math.Log(p1 / c.p0)
		A, B := math.Exp(float64(c.m)*a), math.Exp(-float64(c.l)*a)
		alpha := (1 - B) / (A - B)
		beta := B * (A - 1) / (A - B)
		s, err := test.NewSPRT(c.p0, p1, alpha, beta, test.SPRTOptions{})
		if err != nil {
			t.Fatal(err)
		}
		for _, p := range []float64{0.2, c.p0, 0.5 + 1e-3, p1, 0.8} {
			q := 1 - p
			r := q / p
			L := float64(c.l + c.m)
			up := -math.Expm1(float64(c.l)*math.Log(r)) / -math.Expm1(L*math.Log(r)) // (1 - r^l)/(1 - r^(l+m))
			dur := float64(c.l)/(q-p) - L/(q-p)*up
			got, err := SPRTOperating(context.Background(), s, p)
			if err != nil {
				t.Fatal(err)
			}
			want := []float64{1 - up, up, dur, 1 - up, dur}
			if diff := cmp.Diff(want, []float64{got.Accept, got.Reject, got.ASN, got.WaldAccept, got.WaldASN}, cmpopts.EquateApprox(1e-9, 0)); diff != "" {
				t.Errorf("p0 %g m %d l %d at p %g: accept, reject, ASN, Wald's (-Feller +got)\n%s", c.p0, c.m, c.l, p, diff)
			}
		}
	}
}

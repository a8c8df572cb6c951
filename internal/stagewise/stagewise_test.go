package stagewise

import (
	"context"
	"errors"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/internal/argerr"
)

// outcome is where one sequence of trials stops: look k, count s, and
// whether it stopped for efficacy.
type outcome struct {
	k    int
	s    int64
	high bool
}

// walk returns the outcome of the trial sequence bits (bit i = trial i
// succeeded) under the design.
func walk(looks []Look, bits uint32) (outcome, int64) {
	var s, prev int64
	for k, l := range looks {
		for i := prev; i < l.N; i++ {
			if bits&(1<<uint(i)) != 0 {
				s++
			}
		}
		prev = l.N
		if s >= l.Efficacy {
			return outcome{k, s, true}, l.N
		}
		if s <= l.Futility {
			return outcome{k, s, false}, l.N
		}
	}
	panic("design does not stop")
}

// above reports whether a ranks at or above b in the stage-wise ordering
// (Jennison and Turnbull 2000, section 8.4): same look and at least the
// count; or a stops for efficacy earlier; or b stops for futility earlier.
func above(a, b outcome) bool {
	switch {
	case a.k == b.k:
		return a.s >= b.s
	case a.k < b.k:
		return a.high
	default:
		return !b.high
	}
}

// TestAgainstEnumeration checks the recursion against an enumeration of
// every sequence of N <= 14 trials, each stopped by the design and its
// probability p^s (1-p)^(n-s) added up over the trials it used; the tails
// apply the stage-wise ordering outcome by outcome.
func TestAgainstEnumeration(t *testing.T) {
	t.Parallel()
	designs := [][]Look{
		{{N: 5, Futility: 0, Efficacy: 6}, {N: 12, Futility: 3, Efficacy: 4}},                                    // Simon-like
		{{N: 4, Futility: -1, Efficacy: 4}, {N: 8, Futility: 1, Efficacy: 6}, {N: 13, Futility: 6, Efficacy: 7}}, // both bounds
		{{N: 3, Futility: 0, Efficacy: 3}, {N: 7, Futility: 2, Efficacy: 6}, {N: 10, Futility: 3, Efficacy: 6}, {N: 14, Futility: 6, Efficacy: 7}},
		{{N: 9, Futility: 4, Efficacy: 5}}, // single stage
	}
	for di, looks := range designs {
		if err := Validate("test", looks); err != nil {
			t.Fatal(err)
		}
		nK := looks[len(looks)-1].N
		for _, p := range []float64{0.07, 0.3, 0.5, 0.81} {
			prob := map[outcome]float64{}
			var en float64
			for bits := uint32(0); bits < 1<<uint(nK); bits++ {
				o, used := walk(looks, bits)
				// only the first `used` trials matter: count each stopped
				// path once, through the sequences whose later bits are 0.
				if bits>>uint(used) != 0 {
					continue
				}
				var s int64
				for i := int64(0); i < used; i++ {
					if bits&(1<<uint(i)) != 0 {
						s++
					}
				}
				pr := math.Pow(p, float64(s)) * math.Pow(1-p, float64(used-s))
				prob[o] += pr
				en += float64(used) * pr
			}
			d, err := New(context.Background(), looks, p)
			if err != nil {
				t.Fatal(err)
			}
			low, high := make([]float64, len(looks)), make([]float64, len(looks))
			for o, pr := range prob {
				if o.high {
					high[o.k] += pr
				} else {
					low[o.k] += pr
				}
			}
			opt := cmpopts.EquateApprox(1e-11, 0)
			if diff := cmp.Diff([][]float64{low, high, {en}}, [][]float64{d.Low, d.High, {d.ExpectedN()}}, opt); diff != "" {
				t.Errorf("design %d p = %v: stop probabilities, expected n (-enumeration +recursion):\n%s", di, p, diff)
			}
			for obs := range prob {
				var up, lo float64
				for o, pr := range prob {
					if above(o, obs) {
						up += pr
					}
					if above(obs, o) {
						lo += pr
					}
				}
				gu, _ := LogTail(context.Background(), looks, obs.k, obs.s, p, UpperTail)
				gl, _ := LogTail(context.Background(), looks, obs.k, obs.s, p, LowerTail)
				if diff := cmp.Diff([]float64{up, lo}, []float64{math.Exp(gu), math.Exp(gl)}, opt); diff != "" {
					t.Errorf("design %d p = %v outcome %+v: tails (-enumeration +recursion):\n%s", di, p, obs, diff)
				}
			}
		}
	}
}

func TestLogSpaceTail(t *testing.T) {
	t.Parallel()
	// A tail far below 1e-280 takes the log-space path; it must agree with
	// the closed form for a single look, log P(X >= n) = n log p.
	looks := []Look{{N: 400, Futility: -1, Efficacy: 401}, {N: 800, Futility: 799, Efficacy: 800}}
	got, err := LogTail(context.Background(), looks, 1, 800, 0.1, UpperTail)
	if err != nil {
		t.Fatal(err)
	}
	want := 800 * math.Log(0.1)
	if d := cmp.Diff(want, got, cmpopts.EquateApprox(1e-12, 0)); d != "" {
		t.Errorf("log tail (-want +got):\n%s", d)
	}
}

func TestValidate(t *testing.T) {
	t.Parallel()
	for _, looks := range [][]Look{
		nil,
		{{N: 0, Futility: -1, Efficacy: 0}},
		{{N: 5, Futility: 1, Efficacy: 3}}, // final look continues
		{{N: 5, Futility: 1, Efficacy: 2}, {N: 9, Futility: 3, Efficacy: 4}}, // first look always stops
		{{N: 5, Futility: -2, Efficacy: 6}, {N: 9, Futility: 3, Efficacy: 4}},
		{{N: 5, Futility: 0, Efficacy: 7}, {N: 9, Futility: 3, Efficacy: 4}},
		{{N: 5, Futility: 0, Efficacy: 6}, {N: 5, Futility: 3, Efficacy: 4}},
	} {
		if err := Validate("f", looks); !errors.Is(err, argerr.ErrInvalidArgument) {
			t.Errorf("Validate(%+v) = %v, want ErrInvalidArgument", looks, err)
		}
	}
	if err := Validate("f", []Look{{N: MaxN + 1, Futility: 0, Efficacy: 1}}); !errors.Is(err, argerr.ErrTooLarge) {
		t.Errorf("Validate over MaxN = %v, want ErrTooLarge", err)
	}
	looks := []Look{{N: 5, Futility: 0, Efficacy: 6}, {N: 9, Futility: 3, Efficacy: 4}}
	for _, c := range []struct {
		k int
		s int64
	}{{-1, 0}, {2, 0}, {0, 1}, {0, 6}, {1, -1}} {
		if err := CheckOutcome("f", looks, c.k, c.s); !errors.Is(err, argerr.ErrInvalidArgument) {
			t.Errorf("CheckOutcome(%d, %d) = %v, want ErrInvalidArgument", c.k, c.s, err)
		}
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	big := []Look{{N: 10000, Futility: 2000, Efficacy: 10001}, {N: 20000, Futility: 4000, Efficacy: 4001}}
	if _, err := New(ctx, big, 0.3); !errors.Is(err, context.Canceled) {
		t.Errorf("New with a cancelled context = %v, want context.Canceled", err)
	}
}

// TestTailsMonotone checks, over random small designs and every stopping
// outcome, that the upper stage-wise tail rises and the lower tail falls
// with p (the property interval.StageWise's bisection relies on; the
// stage-wise ordering is stochastically monotone for the binomial).
func TestTailsMonotone(t *testing.T) {
	t.Parallel()
	rng := uint64(12345)
	next := func(n int64) int64 { // xorshift, deterministic
		rng ^= rng << 13
		rng ^= rng >> 7
		rng ^= rng << 17
		return int64(rng % uint64(n))
	}
	valid := 0
	for trial := 0; trial < 60; trial++ {
		K := 1 + int(next(4))
		var looks []Look
		var n int64
		for k := 0; k < K; k++ {
			n += 1 + next(12)
			fut := next(n+2) - 1
			eff := fut + 2 + next(n-fut+1)
			if eff > n+1 {
				eff = n + 1
			}
			if k == K-1 {
				eff = fut + 1
				if fut < 0 {
					fut, eff = 0, 1
				}
			}
			looks = append(looks, Look{N: n, Futility: fut, Efficacy: eff})
		}
		if Validate("test", looks) != nil {
			continue
		}
		valid++
		for k, l := range looks {
			for s := int64(0); s <= l.N; s++ {
				if s > l.Futility && s < l.Efficacy {
					continue
				}
				prevU, prevL := -1.0, 2.0
				for p := 0.02; p < 1; p += 0.04 {
					u, _ := LogTail(context.Background(), looks, k, s, p, UpperTail)
					lo, _ := LogTail(context.Background(), looks, k, s, p, LowerTail)
					if math.Exp(u) < prevU*(1-1e-12) || math.Exp(lo) > prevL*(1+1e-12) {
						t.Fatalf("design %+v outcome (%d, %d): tails not monotone at p = %.2f", looks, k+1, s, p)
					}
					prevU, prevL = math.Exp(u), math.Exp(lo)
				}
			}
		}
	}
	if valid < 20 {
		t.Fatalf("only %d of 60 random designs were valid", valid)
	}
}

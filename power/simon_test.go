package power

import (
	"context"
	"errors"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"github.com/kofnlab/kofn/binom"
)

// simonRow is one row of Simon's Table 1: the optimal and minimax designs
// with their expected size and early-stopping probability under p0.
type simonRow struct {
	p0, p1, alpha, beta float64
	opt, mm             TwoStage
	optEN, optPET       float64
	mmEN, mmPET         float64
}

// simonTable1 holds rows of Simon R (1989), Optimal two-stage designs for
// phase II clinical trials, Controlled Clinical Trials 10:1-10, Table 1
// (EN and PET printed to 0.1 and 0.01 there; the first row to the digits
// of REFERENCES.md). All rows are recalled; each is recomputed
// independently by TestSimonBruteForce (the small ones) or by
// EvaluateTwoStage below.
var simonTable1 = []simonRow{
	// REFERENCES.md (recalled; recomputed by exhaustive search).
	{0.05, 0.25, 0.05, 0.20, TwoStage{0, 9, 2, 17}, TwoStage{0, 12, 2, 16}, 11.96, 0.630, 13.84, 0.540},
	// Further rows, recalled.
	{0.05, 0.25, 0.05, 0.10, TwoStage{0, 9, 3, 30}, TwoStage{0, 15, 3, 25}, 16.8, 0.63, 20.4, 0.46},
	{0.10, 0.30, 0.05, 0.20, TwoStage{1, 10, 5, 29}, TwoStage{1, 15, 5, 25}, 15.0, 0.74, 19.5, 0.55},
	{0.10, 0.30, 0.05, 0.10, TwoStage{2, 18, 6, 35}, TwoStage{2, 22, 6, 33}, 22.5, 0.73, 26.2, 0.62},
	{0.20, 0.40, 0.05, 0.20, TwoStage{3, 13, 12, 43}, TwoStage{4, 18, 10, 33}, 20.6, 0.75, 22.3, 0.72},
	{0.20, 0.40, 0.05, 0.10, TwoStage{4, 19, 15, 54}, TwoStage{5, 24, 13, 45}, 30.4, 0.67, 31.2, 0.66},
	{0.30, 0.50, 0.05, 0.20, TwoStage{5, 15, 18, 46}, TwoStage{6, 19, 16, 39}, 23.6, 0.72, 25.7, 0.67},
	{0.40, 0.60, 0.05, 0.20, TwoStage{7, 16, 23, 46}, TwoStage{17, 34, 20, 39}, 24.5, 0.72, 34.4, 0.91},
	{0.70, 0.90, 0.05, 0.20, TwoStage{4, 6, 22, 27}, TwoStage{19, 23, 21, 26}, 14.8, 0.58, 23.2, 0.95},
}

func TestSimonTable1(t *testing.T) {
	t.Parallel()
	for _, row := range simonTable1 {
		r, err := Simon(context.Background(), row.p0, row.p1, row.alpha, row.beta, SimonOptions{})
		if err != nil {
			t.Fatalf("Simon(%v, %v, %v, %v): %v", row.p0, row.p1, row.alpha, row.beta, err)
		}
		if r.Optimal.TwoStage != row.opt || r.Minimax.TwoStage != row.mm {
			t.Errorf("Simon(%v, %v, %v, %v): optimal %+v minimax %+v, want %+v and %+v",
				row.p0, row.p1, row.alpha, row.beta, r.Optimal.TwoStage, r.Minimax.TwoStage, row.opt, row.mm)
			continue
		}
		// The table prints EN to 0.1 (0.01 in the first row) and PET to 0.01.
		tol := func(want float64, digits float64) float64 { return 0.5 * digits / want }
		optDig, petDig := 0.1, 0.01
		if row.optEN == 11.96 {
			optDig, petDig = 0.01, 0.001
		}
		for _, c := range []struct {
			name      string
			want, got float64
			dig       float64
		}{
			{"optimal EN0", row.optEN, r.Optimal.ExpectedN0, optDig},
			{"optimal PET", row.optPET, r.Optimal.EarlyStop0, petDig},
			{"minimax EN0", row.mmEN, r.Minimax.ExpectedN0, optDig},
			{"minimax PET", row.mmPET, r.Minimax.EarlyStop0, petDig},
		} {
			if d := cmp.Diff(c.want, c.got, cmpopts.EquateApprox(tol(c.want, c.dig)*1.0001, 0)); d != "" {
				t.Errorf("Simon(%v, %v, %v, %v) %s (-want +got):\n%s", row.p0, row.p1, row.alpha, row.beta, c.name, d)
			}
		}
		for _, d := range []SimonDesign{r.Optimal, r.Minimax} {
			if d.Alpha > row.alpha || d.Power < 1-row.beta {
				t.Errorf("Simon(%v, %v): design %+v attains alpha %v power %v", row.p0, row.p1, d.TwoStage, d.Alpha, d.Power)
			}
		}
	}
}

// bruteSimon is an independent exhaustive search over every design with n
// <= nMax, from binom.Dist.Prob directly (no tables shared with the
// library): it returns the minimum expected size under p0, the smallest
// feasible n with its minimum expected size, and every feasible design's
// (n, EN0) for the admissibility check.
func bruteSimon(p0, p1, alpha, beta float64, nMax int64) (optEN float64, mmN int64, mmEN float64, best map[int64]float64) {
	pmf := func(n int64, p float64) []float64 {
		w := make([]float64, n+1)
		d := binom.Dist{N: n, P: p}
		for k := range w {
			w[k] = d.Prob(int64(k))
		}
		return w
	}
	f0, f1 := make([][]float64, nMax+1), make([][]float64, nMax+1)
	for n := int64(0); n <= nMax; n++ {
		f0[n], f1[n] = pmf(n, p0), pmf(n, p1)
	}
	// sf[n][m] = P(X > m) for X ~ Binomial(n, p), summed from the pmf.
	tails := func(f [][]float64) [][]float64 {
		sf := make([][]float64, len(f))
		for n, row := range f {
			sf[n] = make([]float64, len(row))
			var acc float64
			for m := len(row) - 1; m >= 0; m-- {
				sf[n][m] = acc
				acc += row[m]
			}
		}
		return sf
	}
	s0, s1 := tails(f0), tails(f1)
	// reject(r1, n1, r, n) = sum_{x1 > r1} b(x1; n1) P(X2 > r - x1), X2 of size n - n1.
	reject := func(r1, n1, r, n int64, f, sf [][]float64) float64 {
		var s float64
		for x1 := r1 + 1; x1 <= n1; x1++ {
			switch m := r - x1; {
			case m < 0:
				s += f[n1][x1]
			case m < n-n1:
				s += f[n1][x1] * sf[n-n1][m]
			}
		}
		return s
	}
	optEN, mmEN = math.Inf(1), math.Inf(1)
	best = map[int64]float64{}
	for n := int64(2); n <= nMax; n++ {
		for n1 := int64(1); n1 < n; n1++ {
			for r1 := int64(0); r1 < n1; r1++ {
				var pet float64
				for x := int64(0); x <= r1; x++ {
					pet += f0[n1][x]
				}
				en := float64(n1) + (1-pet)*float64(n-n1)
				for r := r1; r < n; r++ {
					if reject(r1, n1, r, n, f0, s0) > alpha {
						continue
					}
					if reject(r1, n1, r, n, f1, s1) < 1-beta {
						break // power only falls as r grows
					}
					optEN = math.Min(optEN, en)
					if b, ok := best[n]; !ok || en < b {
						best[n] = en
					}
					if mmN == 0 || n == mmN {
						mmN = n
						mmEN = math.Min(mmEN, en)
					}
					break
				}
			}
		}
	}
	return optEN, mmN, mmEN, best
}

func TestSimonBruteForce(t *testing.T) {
	t.Parallel()
	// Independent exhaustive searches (bruteSimon) over every design with
	// n <= nMax, for the rows of simonTable1 (Simon 1989, Table 1,
	// recalled) whose designs have n <= 50, and one row not in the table;
	// nMax covers the optimal design of each.
	cases := []struct {
		p0, p1, alpha, beta float64
		nMax                int64
	}{
		{0.05, 0.25, 0.05, 0.20, 24},
		{0.10, 0.30, 0.05, 0.20, 34},
		{0.70, 0.90, 0.05, 0.20, 32},
		{0.05, 0.25, 0.05, 0.10, 36},
		{0.10, 0.30, 0.05, 0.10, 40},
		{0.20, 0.40, 0.05, 0.20, 48},
		{0.30, 0.50, 0.05, 0.20, 50},
		{0.40, 0.60, 0.05, 0.20, 50},
		{0.05, 0.25, 0.10, 0.10, 30},
	}
	for _, c := range cases {
		optEN, mmN, mmEN, best := bruteSimon(c.p0, c.p1, c.alpha, c.beta, c.nMax)
		r, err := Simon(context.Background(), c.p0, c.p1, c.alpha, c.beta, SimonOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if r.Optimal.N > c.nMax {
			t.Fatalf("case %+v: optimal n = %d beyond the brute-force range", c, r.Optimal.N)
		}
		want := []float64{optEN, float64(mmN), mmEN}
		got := []float64{r.Optimal.ExpectedN0, float64(r.Minimax.N), r.Minimax.ExpectedN0}
		if d := cmp.Diff(want, got, cmpopts.EquateApprox(1e-9, 0)); d != "" {
			t.Errorf("case %+v: optimal EN0, minimax n, minimax EN0 (-brute +Simon):\n%s", c, d)
		}
		// Admissibility (Jung, Lee, Kim and George 2004): for each weight
		// q the design of least loss q n + (1-q) EN0 among all brute-force
		// designs has the loss of the admissible design whose weight range
		// holds q.
		for q := 0.0; q <= 1; q += 0.05 {
			minLoss := math.Inf(1)
			for n, en := range best {
				minLoss = math.Min(minLoss, q*float64(n)+(1-q)*en)
			}
			found := false
			for _, d := range r.Admissible {
				if q >= d.WeightLow-1e-12 && q <= d.WeightHigh+1e-12 {
					found = true
					if l := q*float64(d.N) + (1-q)*d.ExpectedN0; math.Abs(l-minLoss) > 1e-9*minLoss {
						t.Errorf("case %+v q = %.2f: admissible %+v has loss %v, brute-force minimum %v", c, q, d.TwoStage, l, minLoss)
					}
				}
			}
			if !found {
				t.Errorf("case %+v: no admissible design covers q = %.2f", c, q)
			}
		}
	}
}

func TestEvaluateTwoStage(t *testing.T) {
	t.Parallel()
	// Direct sums from the definition in Simon (1989), computed here from
	// binom.Dist: PET = P(X1 <= r1), reject = sum_{x1>r1} b(x1) P(X2 > r - x1).
	for _, c := range []struct {
		d TwoStage
		p float64
	}{{TwoStage{0, 9, 2, 17}, 0.05}, {TwoStage{0, 9, 2, 17}, 0.25}, {TwoStage{3, 13, 12, 43}, 0.2}, {TwoStage{7, 16, 23, 46}, 0.6}} {
		e, err := EvaluateTwoStage(c.d, c.p)
		if err != nil {
			t.Fatal(err)
		}
		b1 := binom.Dist{N: c.d.N1, P: c.p}
		b2 := binom.Dist{N: c.d.N - c.d.N1, P: c.p}
		pet := b1.CDF(c.d.R1)
		var rej float64
		for x1 := c.d.R1 + 1; x1 <= c.d.N1; x1++ {
			rej += b1.Prob(x1) * b2.Survival(c.d.R-x1)
		}
		want := TwoStageEval{P: c.p, EarlyStop: pet, ExpectedN: float64(c.d.N1) + (1-pet)*float64(c.d.N-c.d.N1), Reject: rej}
		if d := cmp.Diff(want, e, cmpopts.EquateApprox(1e-12, 0)); d != "" {
			t.Errorf("EvaluateTwoStage(%+v, %v) (-want +got):\n%s", c.d, c.p, d)
		}
	}
}

func TestSimonErrors(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	for _, c := range []struct {
		p0, p1, a, b float64
		opt          SimonOptions
		want         error
	}{
		{0.3, 0.2, 0.05, 0.2, SimonOptions{}, ErrInvalidArgument},
		{0, 0.2, 0.05, 0.2, SimonOptions{}, ErrInvalidArgument},
		{0.1, 0.3, math.NaN(), 0.2, SimonOptions{}, ErrInvalidArgument},
		{0.1, 0.3, 0.6, 0.5, SimonOptions{}, ErrInvalidArgument},
		{0.1, 0.3, 0.05, 0.2, SimonOptions{MaxN: MaxSimonN + 1}, ErrTooLarge},
		{0.5, 0.51, 0.05, 0.2, SimonOptions{MaxN: 50}, ErrNoSolution},
	} {
		_, err := Simon(ctx, c.p0, c.p1, c.a, c.b, c.opt)
		if !errors.Is(err, c.want) {
			t.Errorf("Simon(%v, %v, %v, %v, %+v) = %v, want %v", c.p0, c.p1, c.a, c.b, c.opt, err, c.want)
		}
	}
	cctx, cancel := context.WithCancel(ctx)
	cancel()
	if _, err := Simon(cctx, 0.1, 0.3, 0.05, 0.2, SimonOptions{}); !errors.Is(err, context.Canceled) {
		t.Errorf("Simon with a cancelled context = %v, want context.Canceled", err)
	}
	for _, d := range []TwoStage{{0, 0, 1, 5}, {0, 5, 1, 5}, {5, 5, 6, 10}, {2, 5, 1, 10}, {0, 5, 10, 10}} {
		if _, err := EvaluateTwoStage(d, 0.2); !errors.Is(err, ErrInvalidArgument) {
			t.Errorf("EvaluateTwoStage(%+v) = %v, want ErrInvalidArgument", d, err)
		}
	}
}

func BenchmarkSimon(b *testing.B) {
	for _, c := range []struct {
		name   string
		p0, p1 float64
	}{{"p0=0.2,p1=0.4", 0.2, 0.4}, {"p0=0.5,p1=0.6", 0.5, 0.6}} {
		b.Run(c.name, func(b *testing.B) {
			for b.Loop() {
				if _, err := Simon(context.Background(), c.p0, c.p1, 0.05, 0.2, SimonOptions{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

// Package contract checks the library's promises to a caller who passes
// anything at all: every exported function and method of binom, interval,
// test and power, called over an adversarial grid of arguments, must not
// panic, must return within its time budget (context-taking calls soon
// after their deadline), and must return either a typed error or a result
// whose numbers are finite and in range, NaN appearing only beside a
// warning that says why (see DEVELOPERS.md, "Every call bounded and
// honest").
//
//	go test ./internal/contract                       # CI grid, under a minute
//	KOFN_CONTRACT_FULL=1 go test ./internal/contract  # the full grid
package contract

import (
	"context"
	"errors"
	"fmt"
	"hash/fnv"
	"math"
	"math/rand/v2"
	"os"
	"reflect"
	"sort"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/kofnlab/kofn/binom"
)

// full reports whether the full grid was asked for.
var full = os.Getenv("KOFN_CONTRACT_FULL") != ""

// The adversarial grids. Counts mix the ordinary with the hostile (negative,
// 0, 2^53 and just above it, 2^62, the int64 extremes); reals mix NaN, the
// infinities, -0, subnormals, values a rounding away from 0 and 1 (1 -
// 1e-17 rounds to 1), and values outside [0, 1].
var (
	countGrid = []int64{0, 1, 2, 3, 5, 10, 40, 100, 1000, 1 << 20, 1e9,
		-1, math.MinInt64, 1 << 53, 1<<53 + 1, 1 << 62, math.MaxInt64}
	realGrid = []float64{0.5, 0.3, 0.05, 0.95, 0.8, 0.01, 0.99, 0.1,
		math.NaN(), math.Inf(1), math.Inf(-1), math.Copysign(0, -1), 0, 5e-324, 2.2250738585072014e-308,
		1e-300, 1e-17, 1 - 1e-17, 1 - 1e-16, 1, -0.5, 1.5, 2, 1e300}
	enumGrid = []int{0, 1, 2, 3, 4, 5, -1, 99}
)

// args draws the arguments of one call from the grids. Each draw takes an
// ordinary value more often than a hostile one, so that calls get past
// validation often enough to exercise the computations.
// Every value drawn is logged, so that a failure can name the call.
type args struct {
	r   *rand.Rand
	mu  *sync.Mutex
	log *[]string
}

func newArgs(r *rand.Rand) args { return args{r: r, mu: new(sync.Mutex), log: new([]string)} }

func (a args) note(v any) {
	a.mu.Lock()
	*a.log = append(*a.log, fmt.Sprintf("%v", v))
	a.mu.Unlock()
}

// String lists the values drawn so far.
func (a args) String() string {
	a.mu.Lock()
	defer a.mu.Unlock()
	return "(" + strings.Join(*a.log, ", ") + ")"
}

func pick[T any](a args, g []T, ordinary int) T {
	var v T
	if a.r.IntN(3) > 0 {
		v = g[a.r.IntN(ordinary)]
	} else {
		v = g[a.r.IntN(len(g))]
	}
	a.note(v)
	return v
}

// C is a count, F a real (probability, level, margin), E an enum value, B a bool.
func (a args) C() int64   { return pick(a, countGrid, 9) }
func (a args) F() float64 { return pick(a, realGrid, 8) }
func (a args) E() int     { return pick(a, enumGrid, 6) }
func (a args) B() bool    { return pick(a, []bool{false, true}, 2) }

// Small is a count no larger than 60, for the exact computations whose
// cost grows with the counts (their limits are checked with C).
func (a args) Small() int64 {
	if a.r.IntN(4) == 0 {
		return a.C()
	}
	v := int64(a.r.IntN(61))
	a.note(v)
	return v
}

// Counts is a slice of 0 to 5 counts.
func (a args) Counts() []int64 {
	s := make([]int64, a.r.IntN(6))
	for i := range s {
		s[i] = a.Small()
	}
	return s
}

// Reals is a slice of 0 to 6 reals.
func (a args) Reals() []float64 {
	s := make([]float64, a.r.IntN(7))
	for i := range s {
		s[i] = a.F()
	}
	return s
}

// entry is one exported function or method under test. call makes one
// call with arguments drawn from a and returns its result and error; ctx
// is nil for functions without a context. check, when set, adds checks
// specific to the result (the generic ones run on every result).
type entry struct {
	name   string
	also   []string // further exported names this entry exercises
	hasCtx bool
	call   func(ctx context.Context, a args) (any, error)
	check  func(v any) string
}

// knownOpen lists failures found by the sweep in code still being written
// elsewhere, with what is wrong: the CI mode reports them in the log, the
// full mode fails on them. Remove a line when its function is fixed.
var knownOpen = map[string]string{
	"NewCUSUM":            "AdjustedP1 is NaN, without a warning, when no rate gives Ref/Unit exactly (the CUSUM result has no Warnings field)",
	"CUSUMForARL":         "AdjustedP1 NaN as NewCUSUM; SDRL NaN without a warning when the in-control ARL is infinite (p0 = 1e-17)",
	"Posterior.ProbAbove": "NaN probability for a posterior with a subnormal prior shape (interval.Prior accepts any positive shape)",
	"Posterior.ProbBelow": "as Posterior.ProbAbove",
	"latency power.Simon": "checks ctx once per total size n, which near MaxSimonN costs over 100 ms",
}

// Budgets. A call without a context must finish within slowLimit (the
// rule asks for 10 ms or a documented limit; the margin absorbs a loaded
// two-core machine); a context-taking call gets a context with deadline
// ctxDeadline and must return within ctxSlack after it.
const (
	slowLimit   = 5 * time.Second
	slowReport  = 50 * time.Millisecond
	ctxDeadline = 20 * time.Millisecond
	ctxSlack    = 2 * time.Second // a gross bound: parallel subtests load the machine; TestCancelLatency measures
	hangLimit   = 10 * time.Second
)

// outcome is what one call did.
type outcome struct {
	v      any
	err    error
	panicV any
	dur    time.Duration
	hung   bool
}

// run makes one call in its own goroutine, recovering a panic and giving
// up after hangLimit (the goroutine is then abandoned).
func run(e entry, a args) outcome {
	ctx := context.Background()
	var cancel context.CancelFunc = func() {}
	if e.hasCtx {
		ctx, cancel = context.WithTimeout(ctx, ctxDeadline)
	}
	defer cancel()
	done := make(chan outcome, 1)
	start := time.Now()
	go func() {
		var o outcome
		defer func() {
			if p := recover(); p != nil {
				o.panicV = p
			}
			o.dur = time.Since(start)
			done <- o
		}()
		o.v, o.err = e.call(ctx, a)
	}()
	select {
	case o := <-done:
		return o
	case <-time.After(hangLimit):
		return outcome{hung: true, dur: hangLimit}
	}
}

// checkErr reports what is wrong with a returned error: it must be the
// packages' typed *Error, name a library function, and wrap a sentinel or
// a context error.
func checkErr(err error) string {
	var e *binom.Error
	if !errors.As(err, &e) {
		return fmt.Sprintf("untyped error %T %v", err, err)
	}
	if !strings.Contains(e.Func, ".") {
		return "error without a qualified function name: " + err.Error()
	}
	for _, s := range []error{binom.ErrInvalidArgument, binom.ErrTooLarge, binom.ErrNoSolution, context.Canceled, context.DeadlineExceeded} {
		if errors.Is(err, s) {
			return ""
		}
	}
	return "error wrapping no sentinel: " + err.Error()
}

// Field names whose values are probabilities, and those that may be
// infinite (unbounded limits and estimates of ratios, statistics of a
// zero-variance table, log-probabilities of 0).
var (
	probName = map[string]bool{"PValue": true, "Power": true, "Size": true, "Coverage": true, "Prob": true,
		"FirstPower": true, "StablePower": true, "AchievedConfidence": true, "PreviousConfidence": true,
		"ProducerRisk": true, "ConsumerRisk": true, "AchievedProducerRisk": true, "AchievedConsumerRisk": true,
		"MinCoverage": true, "MeanCoverage": true, "Adjusted": true}
	infOK = map[string]bool{"Upper": true, "Lower": true, "Estimate": true, "Value": true, "Statistic": true,
		"Width": true, "ExpectedWidth": true, "MeanWidth": true, "Ratio": true, "OddsRatio": true,
		// Group-sequential boundaries: an unreachable bound is an infinite z;
		// the run length of a chart that cannot signal is infinite.
		"Z": true, "ZFutility": true, "ARL": true}
)

// walk checks every float in a result, recursively: NaN only inside a
// struct that carries a warning, infinities only in the fields that may
// be infinite or hold a logarithm, probabilities in [0, 1].
func walk(v reflect.Value, path string, warned bool, bad *[]string) {
	switch v.Kind() {
	case reflect.Pointer, reflect.Interface:
		if !v.IsNil() {
			walk(v.Elem(), path, warned, bad)
		}
	case reflect.Struct:
		if w := v.FieldByName("Warnings"); w.IsValid() && w.Kind() == reflect.Slice && w.Len() > 0 {
			warned = true
		}
		for i := range v.NumField() {
			if f := v.Type().Field(i); f.IsExported() {
				walk(v.Field(i), path+"."+f.Name, warned, bad)
			}
		}
	case reflect.Slice, reflect.Array:
		for i := range min(v.Len(), 64) {
			walk(v.Index(i), path, warned, bad)
		}
	case reflect.Float64, reflect.Float32:
		if path == "" {
			return // a plain float result: its entry's check says what it may be
		}
		x := v.Float()
		name := path[strings.LastIndex(path, ".")+1:]
		switch {
		case math.IsNaN(x):
			if !warned {
				*bad = append(*bad, path+" is NaN without a warning")
			}
		case math.IsInf(x, 0) && !infOK[name] && !strings.HasPrefix(name, "Log"):
			*bad = append(*bad, fmt.Sprintf("%s = %v", path, x))
		case probName[name] && !(x >= 0 && x <= 1):
			*bad = append(*bad, fmt.Sprintf("%s = %v is not a probability", path, x))
		case (name == "LogPValue" || strings.HasPrefix(name, "LogProb")) && x > 1e-12:
			*bad = append(*bad, fmt.Sprintf("%s = %v is a log-probability above 0", path, x))
		}
	}
}

// checkValue runs the generic checks on a result.
func checkValue(v any) string {
	if v == nil {
		return ""
	}
	var bad []string
	walk(reflect.ValueOf(v), "", false, &bad)
	return strings.Join(bad, "; ")
}

// slow records the slowest calls for the report.
type slowCall struct {
	name string
	dur  time.Duration
	args string
}

// TestContract sweeps every entry over its grid.
func TestContract(t *testing.T) {
	samples := 200
	if full {
		samples = 2000
	}
	var mu sync.Mutex
	var slow []slowCall
	for _, e := range entries() {
		t.Run(e.name, func(t *testing.T) {
			t.Parallel()
			errorf := t.Errorf
			if why, ok := knownOpen[e.name]; ok && !full {
				t.Logf("known open problem, reported not failed: %s", why)
				errorf = t.Logf
			}
			h := fnv.New64a()
			h.Write([]byte(e.name))
			n := samples
			if e.hasCtx {
				n = samples / 4 // each may run to its deadline
			}
			for i := range n {
				a := newArgs(rand.New(rand.NewPCG(h.Sum64(), uint64(i))))
				desc := func() string { return e.name + a.String() }
				o := run(e, a)
				switch {
				case o.hung:
					errorf("call %d did not return within %v: %s", i, hangLimit, desc())
					continue
				case o.panicV != nil:
					errorf("call %d panicked (%v): %s", i, o.panicV, desc())
					continue
				case e.hasCtx && o.dur > ctxDeadline+ctxSlack:
					errorf("call %d returned %v after its %v deadline: %s", i, o.dur-ctxDeadline, ctxDeadline, desc())
				case !e.hasCtx && o.dur > slowLimit:
					errorf("call %d took %v, over %v, without a context: %s", i, o.dur, slowLimit, desc())
				}
				if !e.hasCtx && o.dur > slowReport {
					mu.Lock()
					slow = append(slow, slowCall{e.name, o.dur, desc()})
					mu.Unlock()
				}
				if o.err != nil {
					if s := checkErr(o.err); s != "" {
						errorf("call %d: %s: %s", i, s, desc())
					}
					continue
				}
				if s := checkValue(o.v); s != "" {
					errorf("call %d: %s (result %+v): %s", i, s, short(o.v), desc())
				}
				if e.check != nil {
					if s := e.check(o.v); s != "" {
						errorf("call %d: %s (result %+v): %s", i, s, short(o.v), desc())
					}
				}
			}
		})
	}
	t.Cleanup(func() {
		sort.Slice(slow, func(i, j int) bool { return slow[i].dur > slow[j].dur })
		if len(slow) > 15 {
			slow = slow[:15]
		}
		for _, s := range slow {
			t.Logf("slow call without a context: %v %s", s.dur.Round(time.Millisecond), s.args)
		}
	})
}

// short trims a result for a message.
func short(v any) string {
	s := fmt.Sprintf("%+v", v)
	if len(s) > 300 {
		s = s[:300] + "..."
	}
	return s
}

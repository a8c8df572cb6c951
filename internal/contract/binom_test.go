package contract

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"reflect"
	"strings"

	"github.com/kofnlab/kofn/binom"
)

// distValue is one distribution method's answer, in unexported fields so
// that the generic float walk leaves it to checkDist.
type distValue struct {
	method string
	valid  bool  // the constructor accepted the parameters
	top    int64 // the largest value of the support (when valid)
	argOK  bool  // the method's real argument (a quantile level) is in its domain
	out    []any // the method's results
}

// dists lists the distribution types: a name, a constructor from drawn
// arguments (returning the value even when the constructor refused it,
// built by hand, and whether it was accepted), and the top of the support.
var dists = []struct {
	name string
	make func(a args) (any, bool, int64)
}{
	{"Dist", func(a args) (any, bool, int64) {
		n, p := a.C(), a.F()
		d, err := binom.New(n, p)
		if err != nil {
			return binom.Dist{N: n, P: p}, false, 0
		}
		return d, true, d.N
	}},
	{"Hyper", func(a args) (any, bool, int64) {
		N, K, n := a.C(), a.C(), a.C()
		h, err := binom.NewHyper(N, K, n)
		if err != nil {
			return binom.Hyper{Total: N, Successes: K, Draws: n}, false, 0
		}
		_, hi := h.Support()
		return h, true, hi
	}},
	{"NoncentralHyper", func(a args) (any, bool, int64) {
		N, K, n, psi := a.C(), a.C(), a.C(), a.F()*10
		h, err := binom.NewNoncentralHyper(N, K, n, psi)
		if err != nil {
			return binom.NoncentralHyper{Total: N, Successes: K, Draws: n, OddsRatio: psi}, false, 0
		}
		_, hi := h.Support()
		return h, true, hi
	}},
	{"FloatDist", func(a args) (any, bool, int64) {
		n, p := a.C(), a.F()
		var src rand.Source
		if a.B() {
			src = rand.NewPCG(3, 3)
		}
		d, err := binom.New(n, p)
		if err != nil {
			return binom.Dist{N: n, P: p}.Float(src), false, 0
		}
		return d.Float(src), true, d.N
	}},
	{"BetaBinom", func(a args) (any, bool, int64) {
		n, x, y := a.C(), a.F()*10, a.F()*10
		d, err := binom.NewBetaBinom(n, x, y)
		if err != nil {
			return binom.BetaBinom{N: n, A: x, B: y}, false, 0
		}
		return d, true, d.N
	}},
}

// distEntries makes one entry per exported method of each distribution
// type, called through reflection with arguments drawn by type: int64
// from the count grid, float64 from the real grid, a *rand.Rand seeded or
// nil.
func distEntries() []entry {
	// The constructors: a typed error, or a distribution whose mean is a
	// number (the generic walk checks its fields).
	out := []entry{
		{name: "New", call: func(_ context.Context, a args) (any, error) { return binom.New(a.C(), a.F()) },
			check: func(v any) string { return meanOK(v.(binom.Dist).Mean()) }},
		{name: "NewHyper", call: func(_ context.Context, a args) (any, error) { return binom.NewHyper(a.C(), a.C(), a.C()) },
			check: func(v any) string { return meanOK(v.(binom.Hyper).Mean()) }},
		{name: "NewNoncentralHyper", call: func(_ context.Context, a args) (any, error) {
			return binom.NewNoncentralHyper(a.C(), a.C(), a.C(), a.F()*10)
		}, check: func(v any) string { return meanOK(v.(binom.NoncentralHyper).Mean()) }},
		{name: "NewBetaBinom", call: func(_ context.Context, a args) (any, error) { return binom.NewBetaBinom(a.C(), a.F()*10, a.F()*10) },
			check: func(v any) string { return meanOK(v.(binom.BetaBinom).Mean()) }},
	}
	for _, d := range dists {
		sample, _, _ := d.make(newArgs(rand.New(rand.NewPCG(1, 1))))
		t := reflect.TypeOf(sample)
		for i := range t.NumMethod() {
			m := t.Method(i)
			if m.Name == "MarshalJSON" || m.Name == "UnmarshalJSON" {
				continue
			}
			mk := d.make
			out = append(out, entry{
				name: d.name + "." + m.Name,
				call: func(_ context.Context, a args) (any, error) {
					dv, valid, top := mk(a)
					fn := reflect.ValueOf(dv).MethodByName(m.Name)
					ft := fn.Type()
					in := make([]reflect.Value, ft.NumIn())
					argOK := true
					for j := range in {
						switch ft.In(j) {
						case reflect.TypeOf(int64(0)):
							in[j] = reflect.ValueOf(a.C())
						case reflect.TypeOf(0.0):
							x := a.F()
							if strings.HasPrefix(m.Name, "Log") {
								x = -x * 50 // log levels: 0 and below, and some above 0
							}
							in[j] = reflect.ValueOf(x)
							argOK = quantileArgOK(m.Name, x) && !math.IsNaN(x)
						case reflect.TypeOf((*rand.Source)(nil)).Elem():
							var src rand.Source
							if a.B() {
								src = rand.NewPCG(5, 5)
							}
							in[j] = reflect.ValueOf(&src).Elem()
						case reflect.TypeOf((*rand.Rand)(nil)):
							var r *rand.Rand
							if a.B() {
								r = rand.New(rand.NewPCG(7, 7))
							}
							in[j] = reflect.ValueOf(r)
						default:
							return nil, fmt.Errorf("contract: no generator for %v", ft.In(j))
						}
					}
					res := fn.Call(in)
					v := distValue{method: m.Name, valid: valid, top: top, argOK: argOK}
					for _, r := range res {
						v.out = append(v.out, r.Interface())
					}
					return v, nil
				},
				check: checkDist,
			})
		}
	}
	return out
}

// meanOK checks the mean of an accepted distribution.
func meanOK(m float64) string {
	if !(m >= 0) || math.IsInf(m, 0) {
		return fmt.Sprintf("accepted distribution with mean %v", m)
	}
	return ""
}

// quantileArgOK reports whether x is in the domain of a quantile-type
// method's level argument (other float arguments are always in domain).
func quantileArgOK(method string, x float64) bool {
	switch method {
	case "Quantile", "UpperQuantile":
		return x >= 0 && x <= 1
	case "LogQuantile", "LogUpperQuantile":
		return x <= 0
	}
	return true
}

// checkDist checks a distribution method's answer: outside the
// constructor's domain NaN (or -1); inside it, probabilities in [0, 1],
// log-probabilities at most 0 and not NaN, integer answers in the support
// (-1 only for a level outside its domain), moments finite (the skewness
// and kurtosis of a one-point law are 0/0, documented NaN).
func checkDist(x any) string {
	v := x.(distValue)
	for _, o := range v.out {
		switch r := o.(type) {
		case float64:
			if !v.valid {
				if !math.IsNaN(r) {
					return fmt.Sprintf("%s of a refused distribution = %v, want NaN", v.method, r)
				}
				continue
			}
			switch m := v.method; {
			case math.IsNaN(r) && !v.argOK:
				// A NaN or out-of-domain argument: the documented NaN.
			case m == "Quantile" || m == "Rand": // FloatDist's float-valued ones
				if !(r >= 0 && r <= float64(v.top)) {
					return fmt.Sprintf("%s = %v outside the support [0, %d]", m, r, v.top)
				}
			case m == "Skewness" || m == "ExKurtosis":
				// Documented: NaN for a point mass, and beyond the float
				// range (a subnormal P) an infinity.
			case math.IsNaN(r):
				// ProportionWithin's NaN half-width is its documented NaN.
				if m != "ProportionWithin" {
					return m + " = NaN for a valid distribution"
				}
			case strings.HasPrefix(m, "Log"):
				if r > 1e-12 {
					return fmt.Sprintf("%s = %v above 0", m, r)
				}
			case m == "Mean" || m == "Variance" || m == "StdDev" || m == "Entropy":
				if !(r >= 0) || math.IsInf(r, 0) {
					return fmt.Sprintf("%s = %v", m, r)
				}
			default:
				if !(r >= 0 && r <= 1) {
					return fmt.Sprintf("%s = %v is not a probability", m, r)
				}
			}
		case int64:
			switch {
			case !v.valid && (v.method == "Support" || v.method == "Mode"):
				// Documented to answer for any counts in the domain,
				// whatever the spread bound says of the other methods.
			case !v.valid:
				if r != -1 {
					return fmt.Sprintf("%s of a refused distribution = %d, want -1", v.method, r)
				}
			case r == -1 && !v.argOK:
			case r < 0 || r > v.top:
				return fmt.Sprintf("%s = %d outside the support [0, %d]", v.method, r, v.top)
			}
		}
	}
	return ""
}

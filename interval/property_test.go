package interval_test

import (
	"math"
	"testing"

	"github.com/kofnlab/kofn/interval"
)

var allMethods = []interval.Method{
	interval.Wilson, interval.Wald, interval.WaldCC, interval.WilsonCC, interval.AgrestiCoull,
	interval.Jeffreys, interval.ClopperPearson, interval.MidP, interval.Blaker,
	interval.LikelihoodRatio, interval.Arcsine, interval.Logit,
}

// TestProportionProperties sweeps every method over k = 0..n for several n
// and levels (common practice property checks): limits inside [0, 1],
// Lower <= Estimate <= Upper, symmetry under k -> n-k, nesting across
// levels, and monotonicity in k for the methods that guarantee it: not
// Wald and its continuity-corrected form, whose limits can fall as k grows
// near 0 and n, nor the logit interval, whose upper limit falls from k = 1
// to k = 2 at n = 63, level 0.99 (its standard error sqrt(1/k + 1/(n-k))
// shrinks faster than the log-odds grow there).
func TestProportionProperties(t *testing.T) {
	t.Parallel()
	ns := []int64{1, 2, 3, 7, 20, 63}
	if testing.Short() {
		ns = ns[:4]
	}
	for _, m := range allMethods {
		for _, n := range ns {
			if m == interval.Blaker && n > 20 {
				continue // each Blaker interval costs milliseconds
			}
			prev := map[float64][2]float64{}
			for k := int64(0); k <= n; k++ {
				var inner [2]float64
				for i, lev := range []float64{0.5, 0.9, 0.95, 0.99} {
					iv, err := interval.Proportion(k, n, interval.Options{Method: m, Level: lev})
					if err != nil {
						t.Fatal(err)
					}
					lo, hi := iv.Lower, iv.Upper
					if !(lo >= 0 && hi <= 1 && lo <= hi) {
						t.Errorf("%v %d/%d level %v: [%v, %v] not inside [0, 1]", m, k, n, lev, lo, hi)
					}
					if !(lo <= iv.Estimate+1e-15 && iv.Estimate <= hi+1e-15) {
						t.Errorf("%v %d/%d level %v: estimate %v outside [%v, %v]", m, k, n, lev, iv.Estimate, lo, hi)
					}
					mirror, _ := interval.Proportion(n-k, n, interval.Options{Method: m, Level: lev})
					if math.Abs(lo-(1-mirror.Upper)) > 1e-13 || math.Abs(hi-(1-mirror.Lower)) > 1e-13 {
						t.Errorf("%v %d/%d level %v: [%v, %v] not symmetric with %d/%d [%v, %v]", m, k, n, lev, lo, hi, n-k, n, mirror.Lower, mirror.Upper)
					}
					if i > 0 && (lo > inner[0]+1e-15 || hi < inner[1]-1e-15) {
						t.Errorf("%v %d/%d: level %v [%v, %v] does not contain the lower level's %v", m, k, n, lev, lo, hi, inner)
					}
					inner = [2]float64{lo, hi}
					if p, ok := prev[lev]; ok && m != interval.Wald && m != interval.WaldCC && m != interval.Logit {
						if lo < p[0]-1e-15 || hi < p[1]-1e-15 {
							t.Errorf("%v n = %d level %v: limits fall from k = %d %v to k = %d [%v, %v]", m, n, lev, k-1, p, k, lo, hi)
						}
					}
					prev[lev] = [2]float64{lo, hi}
				}
			}
		}
	}
}

func TestBoundaryConventions(t *testing.T) {
	t.Parallel()
	// k = 0 gives lower 0 and k = n upper 1 for every method; Wald gives a
	// zero-width interval there and says so; one-sided exact bounds at the
	// ends are 1 - a^(1/n) and a^(1/n) (Clopper and Pearson 1934), mid-p
	// 1 - (2a)^(1/n).
	for _, m := range allMethods {
		lo, _ := interval.Proportion(0, 25, interval.Options{Method: m})
		hi, _ := interval.Proportion(25, 25, interval.Options{Method: m})
		if lo.Lower != 0 || hi.Upper != 1 {
			t.Errorf("%v: lower at k = 0 is %v, upper at k = n is %v", m, lo.Lower, hi.Upper)
		}
	}
	w, _ := interval.Proportion(0, 25, interval.Options{Method: interval.Wald})
	if w.Upper != 0 || len(w.Warnings) != 1 {
		t.Errorf("Wald at k = 0: %+v", w)
	}
	cases := []struct {
		m    interval.Method
		k    int64
		side interval.Side
		want float64
	}{
		{interval.ClopperPearson, 0, interval.UpperBound, -math.Expm1(math.Log(0.05) / 25)},
		{interval.ClopperPearson, 25, interval.LowerBound, math.Exp(math.Log(0.05) / 25)},
		{interval.ClopperPearson, 0, interval.TwoSided, -math.Expm1(math.Log(0.025) / 25)},
		{interval.MidP, 0, interval.UpperBound, -math.Expm1(math.Log(0.1) / 25)},
	}
	for _, c := range cases {
		iv, _ := interval.Proportion(c.k, 25, interval.Options{Method: c.m, Side: c.side})
		got := iv.Upper
		if c.side == interval.LowerBound {
			got = iv.Lower
		}
		if relErr(got, c.want) > 1e-15 {
			t.Errorf("%v k = %d %v: %.17g, want %.17g", c.m, c.k, c.side, got, c.want)
		}
	}
	// Clipping: Wald at 1/10 falls below 0.
	c, _ := interval.Proportion(1, 10, interval.Options{Method: interval.Wald})
	if c.Lower != 0 || !c.Clipped || len(c.Warnings) != 1 {
		t.Errorf("Wald 1/10: %+v", c)
	}
	// Logit at k = 0 borrows the Clopper-Pearson limit, with a warning.
	l, _ := interval.Proportion(0, 10, interval.Options{Method: interval.Logit})
	cp, _ := interval.Proportion(0, 10, interval.Options{Method: interval.ClopperPearson})
	if l.Upper != cp.Upper || len(l.Warnings) != 1 {
		t.Errorf("logit 0/10: %+v", l)
	}
}

func TestParse(t *testing.T) {
	t.Parallel()
	for _, m := range allMethods {
		got, err := interval.ParseMethod(" " + m.String() + " ")
		if err != nil || got != m {
			t.Errorf("ParseMethod(%q) = %v, %v", m.String(), got, err)
		}
	}
	if m, err := interval.ParseMethod("CLOPPER-PEARSON"); err != nil || m != interval.ClopperPearson {
		t.Errorf("case-insensitive parse: %v %v", m, err)
	}
	if _, err := interval.ParseMethod("bogus"); err == nil {
		t.Error("ParseMethod(bogus): no error")
	}
	for _, m := range []interval.DiffMethod{interval.DiffNewcombe, interval.DiffWald, interval.DiffWaldCC, interval.DiffAgrestiCaffo, interval.DiffNewcombeCC, interval.DiffMee, interval.DiffMiettinenNurminen} {
		if got, err := interval.ParseDiffMethod(m.String()); err != nil || got != m {
			t.Errorf("ParseDiffMethod(%q) = %v, %v", m.String(), got, err)
		}
	}
	for _, m := range []interval.RatioMethod{interval.RatioKoopman, interval.RatioKatz, interval.RatioAdjustedLog, interval.RatioMiettinenNurminen} {
		if got, err := interval.ParseRatioMethod(m.String()); err != nil || got != m {
			t.Errorf("ParseRatioMethod(%q) = %v, %v", m.String(), got, err)
		}
	}
	for _, m := range []interval.OddsMethod{interval.OddsMiettinenNurminen, interval.OddsWoolf, interval.OddsCornfield, interval.OddsCornfieldMidP} {
		if got, err := interval.ParseOddsMethod(m.String()); err != nil || got != m {
			t.Errorf("ParseOddsMethod(%q) = %v, %v", m.String(), got, err)
		}
	}
	for _, m := range []interval.PairedMethod{interval.PairedNewcombe, interval.PairedWald, interval.PairedTango} {
		if got, err := interval.ParsePairedMethod(m.String()); err != nil || got != m {
			t.Errorf("ParsePairedMethod(%q) = %v, %v", m.String(), got, err)
		}
	}
	for _, s := range []interval.Side{interval.TwoSided, interval.LowerBound, interval.UpperBound} {
		if got, err := interval.ParseSide(s.String()); err != nil || got != s {
			t.Errorf("ParseSide(%q) = %v, %v", s.String(), got, err)
		}
	}
	if got := interval.Method(99).String(); got != "interval.Method(99)" {
		t.Errorf("Method(99).String() = %q", got)
	}
}

func TestJSON(t *testing.T) {
	t.Parallel()
	iv, err := interval.Ratio(3, 10, 0, 10, interval.RatioOptions{})
	if err != nil {
		t.Fatal(err)
	}
	b, err := iv.MarshalJSON()
	if err != nil {
		t.Fatal(err)
	}
	want := `"upper":"+Inf","estimate":"+Inf","level":0.95,"side":"two-sided","method":"Koopman","parameter":"p1 / p2","clipped":false}`
	if s := string(b); len(s) < len(want) || s[len(s)-len(want):] != want {
		t.Errorf("JSON = %s, want suffix %s", s, want)
	}
}

package main

import (
	"math"
	"math/big"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
	"gonum.org/v1/gonum/stat/distuv"

	"github.com/kofnlab/kofn/examples/internal/check"
)

// rat is the exact binomial arithmetic of the tests: the rates 0.70 and
// 0.90 are 7/10 and 9/10.
type rat = big.Rat

func frac(a, b int64) *rat { return big.NewRat(a, b) }

// pmf returns b(x; m, p) exactly.
func pmf(x, m int64, p *rat) *rat {
	if x < 0 || x > m {
		return new(rat)
	}
	c := new(big.Int).Binomial(m, x)
	r := new(rat).SetInt(c)
	q := new(rat).Sub(frac(1, 1), p)
	for range x {
		r.Mul(r, p)
	}
	for range m - x {
		r.Mul(r, q)
	}
	return r
}

// upper returns P(X >= x) for X ~ Binomial(m, p), exactly.
func upper(x, m int64, p *rat) *rat {
	s := new(rat)
	for j := max(x, 0); j <= m; j++ {
		s.Add(s, pmf(j, m, p))
	}
	return s
}

func f(r *rat) float64 { v, _ := r.Float64(); return v }

// twoStage returns the early-stopping chance, expected size, and rejection
// chance of r1/n1, r/n at p, exactly (Simon 1989).
func twoStage(r1, n1, r, n int64, p *rat) (pet, en, rej float64) {
	pe := new(rat)
	for x := int64(0); x <= r1; x++ {
		pe.Add(pe, pmf(x, n1, p))
	}
	rj := new(rat)
	for x1 := r1 + 1; x1 <= n1; x1++ {
		rj.Add(rj, new(rat).Mul(pmf(x1, n1, p), upper(r+1-x1, n-n1, p)))
	}
	return f(pe), float64(n1) + (1-f(pe))*float64(n-n1), f(rj)
}

// look is one look of the group-sequential design as printed.
type look struct{ n, eff, fut int64 }

// walk returns the exact cumulative rejection chance by each look, the
// cumulative futility-stop chance by each look, and the expected size, by
// enumerating every count at every look.
func walk(ls []look, p *rat) (rej, fut []float64, en float64) {
	dens := map[int64]*rat{0: frac(1, 1)}
	var prev int64
	cr, cf, e := new(rat), new(rat), new(rat)
	for k, l := range ls {
		next := map[int64]*rat{}
		for s, pr := range dens {
			for x := int64(0); x <= l.n-prev; x++ {
				v := new(rat).Mul(pr, pmf(x, l.n-prev, p))
				t := s + x
				switch {
				case t >= l.eff:
					cr.Add(cr, v)
					e.Add(e, new(rat).Mul(v, frac(l.n, 1)))
				case t <= l.fut || k == len(ls)-1:
					cf.Add(cf, v)
					e.Add(e, new(rat).Mul(v, frac(l.n, 1)))
				default:
					if next[t] == nil {
						next[t] = new(rat)
					}
					next[t].Add(next[t], v)
				}
			}
		}
		rej, fut = append(rej, f(cr)), append(fut, f(cf))
		dens, prev = next, l.n
	}
	return rej, fut, f(e)
}

// obf is the O'Brien-Fleming type spending function 2 - 2 Phi(z_{1-a/2}/sqrt t)
// (Lan and DeMets 1983), from gonum's normal distribution.
func obf(a, t float64) float64 {
	nd := distuv.UnitNormal
	return 2 * nd.Survival(nd.Quantile(1-a/2)/math.Sqrt(t))
}

// TestRun checks every printed number against independent exact rational
// computations: the two Simon designs against Simon R (1989), Controlled
// Clinical Trials 10:1-10, Table 1 (row p0 0.70, p1 0.90, alpha 0.05, beta
// 0.20; recalled: optimal 4/6, 22/27, EN0 14.8, PET 0.58; minimax 19/23,
// 21/26, EN0 23.2, PET 0.95) and their exact operating characteristics; the
// group-sequential counts against the spending rule they must satisfy; the
// stage-wise p-value against Koyama and Chen's (2008) formula, and the
// interval limits by inversion.
func TestRun(t *testing.T) {
	t.Parallel()
	out := check.Output(t, run)
	if !strings.Contains(out, "review that the") || strings.Count(out, "processes require") != 2 {
		t.Errorf("output lacks the caution, at the start and the end:\n%s", out)
	}
	printed := func(digits float64) cmp.Option { return cmpopts.EquateApprox(0, 0.5001*digits) }
	p0, p1 := frac(7, 10), frac(9, 10)

	for _, c := range []struct {
		label         string
		r1, n1, r, n  int64
		tableEN, tPET float64
	}{{"optimal ", 4, 6, 22, 27, 14.8, 0.58}, {"minimax ", 19, 23, 21, 26, 23.2, 0.95}} {
		got := check.Values(t, out, c.label)
		pet, en, size := twoStage(c.r1, c.n1, c.r, c.n, p0)
		_, _, pw := twoStage(c.r1, c.n1, c.r, c.n, p1)
		if diff := cmp.Diff([]float64{float64(c.r1), float64(c.n1), float64(c.r), float64(c.n)}, got[:4]); diff != "" {
			t.Errorf("%s design (-Simon 1989 +printed):\n%s", c.label, diff)
		}
		if diff := cmp.Diff([]float64{pet, size, pw}, []float64{got[4], got[6], got[7]}, printed(1e-4)); diff != "" {
			t.Errorf("%s early stop, size, power (-exact +printed):\n%s", c.label, diff)
		}
		if diff := cmp.Diff(en, got[5], printed(1e-2)); diff != "" {
			t.Errorf("%s expected drills (-exact +printed):\n%s", c.label, diff)
		}
		if diff := cmp.Diff([]float64{c.tableEN, c.tPET}, []float64{en, pet}, printed(1e-1)); diff != "" {
			t.Errorf("%s EN0, PET (-Simon 1989 Table 1 +exact):\n%s", c.label, diff)
		}
		if size > alpha || pw < 1-beta {
			t.Errorf("%s: size %v, power %v miss the goals", c.label, size, pw)
		}
	}

	// Group-sequential design: read the printed counts ("-" is no efficacy stop).
	var ls []look
	for k, row := range check.Rows(t, out, "look ") {
		if k == 0 {
			continue // header
		}
		l := look{n: int64(row[1]), eff: int64(row[1]) + 1}
		if len(row) == 6 {
			l.eff, l.fut = int64(row[2]), int64(row[3])
		} else {
			l.fut = int64(row[2])
		}
		ls = append(ls, l)
	}
	if len(ls) != 3 {
		t.Fatalf("read %d looks: %+v", len(ls), ls)
	}
	// Non-binding: the efficacy counts are set as if no futility stop
	// happened; each is the smallest whose cumulative chance under p0 stays
	// within the alpha spent (Lan and DeMets 1983; Jennison and Turnbull
	// 2000, section 7.2).
	effOnly := func(ls []look) []look {
		e := append([]look(nil), ls...)
		for i := range e {
			e[i].fut = -1
		}
		e[len(e)-1].fut = e[len(e)-1].eff - 1
		return e
	}
	nb := effOnly(ls)
	rejNB, _, _ := walk(nb, p0)
	for k, l := range ls {
		spent := obf(alpha, float64(l.n)/30)
		if rejNB[k] > spent {
			t.Errorf("look %d: %v above the alpha spent %v", k+1, rejNB[k], spent)
		}
		if l.eff <= l.n && l.eff-1 > l.fut+1 {
			lower := effOnly(ls)
			lower[k].eff--
			if k == len(ls)-1 {
				lower[k].fut--
			}
			if r, _, _ := walk(lower, p0); r[k] <= spent {
				t.Errorf("look %d: efficacy count %d is not the smallest allowed", k+1, l.eff)
			}
		}
	}
	rej0, _, en0 := walk(ls, p0)
	rej1, fut1, en1 := walk(ls, p1)
	// Futility counts: the largest whose futility chance under p1 stays
	// within the beta spent.
	for k, l := range ls[:len(ls)-1] {
		bs := obf(beta, float64(l.n)/30)
		if fut1[k] > bs {
			t.Errorf("look %d: futility chance %v above the beta spent %v", k+1, fut1[k], bs)
		}
		higher := append([]look(nil), ls...)
		higher[k].fut++
		if higher[k].fut+1 < higher[k].eff {
			if _, fh, _ := walk(higher, p1); fh[k] <= bs {
				t.Errorf("look %d: futility count %d is not the largest allowed", k+1, l.fut)
			}
		}
	}
	var attained []float64
	for _, row := range check.Rows(t, out, "look ")[1:] {
		attained = append(attained, row[len(row)-1])
	}
	if diff := cmp.Diff(rej0, attained, printed(1e-6)); diff != "" {
		t.Errorf("attained alpha per look (-exact +printed):\n%s", diff)
	}
	if diff := cmp.Diff([]float64{rej0[2], rejNB[2]}, check.Values(t, out, "size "), printed(1e-4)); diff != "" {
		t.Errorf("size (-exact +printed):\n%s", diff)
	}
	if diff := cmp.Diff(rej1[2], check.Values(t, out, "power ")[0], printed(1e-4)); diff != "" {
		t.Errorf("power (-exact +printed):\n%s", diff)
	}
	got := check.Values(t, out, "expected drills ")
	if diff := cmp.Diff([]float64{en0, en1}, []float64{got[0], got[2]}, printed(1e-2)); diff != "" {
		t.Errorf("expected drills (-exact +printed):\n%s", diff)
	}

	// Step 3. Koyama T, Chen H (2008), Statistics in Medicine 27:3145-3154
	// (formula recalled): after stage two with x in all,
	// p = sum_{x1 > r1} b(x1; n1, p0) P(X2 >= x - x1).
	tail := func(p *rat, lowerTail bool) *rat {
		s := new(rat)
		for x1 := int64(5); x1 <= 6; x1++ {
			var t2 *rat
			if lowerTail {
				t2 = new(rat).Sub(frac(1, 1), upper(total-x1+1, 21, p))
			} else {
				t2 = upper(total-x1, 21, p)
			}
			s.Add(s, new(rat).Mul(pmf(x1, 6, p), t2))
		}
		if lowerTail { // outcomes below: every stage-one stop, too
			for x1 := int64(0); x1 <= 4; x1++ {
				s.Add(s, pmf(x1, 6, p))
			}
		}
		return s
	}
	if diff := cmp.Diff(f(tail(p0, false)), check.Values(t, out, "stage-wise p-value")[0], printed(1e-5)); diff != "" {
		t.Errorf("p-value (-Koyama-Chen +printed):\n%s", diff)
	}
	iv := check.Values(t, out, "stage-wise 90% interval")
	ratOf := func(x float64) *rat { r := new(rat); r.SetFloat64(x); return r }
	// At the printed limits (4 decimals) the tails straddle 0.05: the
	// upper tail at the lower limit, the lower tail at the upper limit.
	lo1, lo2 := f(tail(ratOf(iv[0]-5e-5), false)), f(tail(ratOf(iv[0]+5e-5), false))
	hi1, hi2 := f(tail(ratOf(iv[1]-5e-5), true)), f(tail(ratOf(iv[1]+5e-5), true))
	if !(lo1 < 0.05 && lo2 > 0.05) || !(hi1 > 0.05 && hi2 < 0.05) {
		t.Errorf("interval %v does not invert the stage-wise tails: lower %v %v, upper %v %v", iv, lo1, lo2, hi1, hi2)
	}
	// Clopper-Pearson limits from gonum's beta quantiles.
	cp := check.Values(t, out, "naive Clopper-Pearson 90%")
	want := []float64{
		distuv.Beta{Alpha: total, Beta: 27 - total + 1}.Quantile(0.05),
		distuv.Beta{Alpha: total + 1, Beta: 27 - total}.Quantile(0.95),
	}
	if diff := cmp.Diff(want, cp[:2], printed(1e-4)); diff != "" {
		t.Errorf("Clopper-Pearson (-gonum +printed):\n%s", diff)
	}
}

func TestRunWriteError(t *testing.T) {
	t.Parallel()
	if err := run(check.FailWriter{}); err == nil {
		t.Error("run into a failing writer returned no error")
	}
}

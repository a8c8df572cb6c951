package test

import (
	"context"
	"errors"
	"math/big"
	"strings"
	"testing"

	"github.com/kofnlab/kofn/internal/golden"
)

// TestSampleRatioGoldenR compares with the "gof" rows of
// testdata/test_karms_r.tsv (R 4.2.2 stats: the chi-square goodness-of-fit
// test of counts against given probabilities).
func TestSampleRatioGoldenR(t *testing.T) {
	t.Parallel()
	n := 0
	for _, r := range golden.Read(t, "../testdata/test_karms_r.tsv") {
		if r.Str(0) != "gof" {
			continue
		}
		n++
		got, err := SampleRatio(context.Background(), ints(t, r.Str(1)), floatList(t, r.Str(2)), SampleRatioOptions{})
		if err != nil || !relClose(got.Statistic.Value, r.Float(3), 1e-12) || !relClose(got.PValue, r.Float(4), 1e-12) {
			t.Errorf("%s: X2 %v p %v (%v)", r.Pos(), got.Statistic.Value, got.PValue, err)
		}
	}
	if n < 5 {
		t.Errorf("only %d rows", n)
	}
}

// TestSampleRatioPublished: Kohavi, Tang and Xu (2020), Trustworthy Online
// Controlled Experiments, chapter 21: a 50/50 design with 821,588 users in
// control and 815,482 in treatment (ratio 0.5018) has p-value 1.8e-6
// (recalled; recomputed: X2 = 2 (3053^2)/818535 = 22.774369, p = 1.82e-6, SciPy 1.10 chisquare agrees).
func TestSampleRatioPublished(t *testing.T) {
	t.Parallel()
	r, err := SampleRatio(context.Background(), []int64{821588, 815482}, []float64{1, 1}, SampleRatioOptions{})
	if err != nil || !relClose(r.Statistic.Value, 22.774368841894, 1e-9) || r.PValue < 1.75e-6 || r.PValue > 1.85e-6 || !r.Mismatch {
		t.Fatalf("%+v %v", r, err)
	}
	if !relClose(r.Arms[0].Share, 0.50186491, 1e-7) || !strings.Contains(strings.Join(r.Warnings, " "), "not trustworthy") {
		t.Errorf("arms %+v warnings %v", r.Arms, r.Warnings)
	}
	e, err := SampleRatio(context.Background(), []int64{821588, 815482}, []float64{1, 1}, SampleRatioOptions{Method: FitExact})
	if err != nil || e.PValue < 1.7e-6 || e.PValue > 1.9e-6 {
		t.Errorf("exact: %v %v", e.PValue, err)
	}
}

// TestExactMultinomialEnumeration: the exact multinomial p-value against
// a listing of all outcomes in exact rational arithmetic (shares given as
// rationals), for small totals and 3 or 4 arms.
func TestExactMultinomialEnumeration(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		w []int64
		N int64
	}{{[]int64{1, 1, 1}, 7}, {[]int64{1, 2, 5}, 9}, {[]int64{2, 1, 1, 1}, 6}, {[]int64{3, 7}, 12}} {
		var ws int64
		for _, v := range c.w {
			ws += v
		}
		wf := make([]float64, len(c.w))
		for j, v := range c.w {
			wf[j] = float64(v)
		}
		// prob returns the exact probability of outcome y.
		prob := func(y []int64) *big.Rat {
			p := new(big.Rat).SetInt(new(big.Int).MulRange(1, c.N))
			for j, v := range y {
				p.Mul(p, new(big.Rat).SetFrac(new(big.Int).Exp(big.NewInt(c.w[j]), big.NewInt(v), nil), new(big.Int).MulRange(1, v)))
				p.Mul(p, new(big.Rat).SetFrac(big.NewInt(1), new(big.Int).Exp(big.NewInt(ws), big.NewInt(v), nil)))
			}
			return p
		}
		var outs [][]int64
		var rec func(j int, left int64, y []int64)
		rec = func(j int, left int64, y []int64) {
			if j == len(c.w)-1 {
				outs = append(outs, append(append([]int64(nil), y...), left))
				return
			}
			for v := int64(0); v <= left; v++ {
				rec(j+1, left-v, append(y, v))
			}
		}
		rec(0, c.N, nil)
		for _, y := range outs {
			hi := new(big.Rat).Mul(prob(y), big.NewRat(10000001, 10000000))
			sum := new(big.Rat)
			for _, z := range outs {
				if pz := prob(z); pz.Cmp(hi) <= 0 {
					sum.Add(sum, pz)
				}
			}
			want, _ := sum.Float64()
			got, err := SampleRatio(context.Background(), y, wf, SampleRatioOptions{Method: FitExact})
			if err != nil || !relClose(got.PValue, want, 1e-11) {
				t.Errorf("%v weights %v: p %.17g (%v), want %.17g", y, c.w, got.PValue, err, want)
			}
		}
	}
}

func TestSampleRatioErrors(t *testing.T) {
	t.Parallel()
	ctx := context.Background()
	for _, c := range []struct {
		c    []int64
		w    []float64
		opt  SampleRatioOptions
		want error
		msg  string
	}{
		{[]int64{5}, []float64{1}, SampleRatioOptions{}, ErrInvalidArgument, "at least 2"},
		{[]int64{5, 5}, []float64{1}, SampleRatioOptions{}, ErrInvalidArgument, "one per arm"},
		{[]int64{5, -1}, []float64{1, 1}, SampleRatioOptions{}, ErrInvalidArgument, "counts[1] = -1"},
		{[]int64{5, 5}, []float64{1, 0}, SampleRatioOptions{}, ErrInvalidArgument, "weights[1] = 0"},
		{[]int64{0, 0}, []float64{1, 1}, SampleRatioOptions{}, ErrInvalidArgument, "at least one"},
		{[]int64{5, 5}, []float64{1, 1}, SampleRatioOptions{Alpha: 2}, ErrInvalidArgument, "alpha = 2"},
		{[]int64{5000, 5000, 5000}, []float64{1, 1, 1}, SampleRatioOptions{Method: FitExact}, ErrTooLarge, "MaxExactFitOutcomes"},
	} {
		_, err := SampleRatio(ctx, c.c, c.w, c.opt)
		if !errors.Is(err, c.want) || !strings.Contains(err.Error(), c.msg) {
			t.Errorf("%v %v: %v, want %q", c.c, c.w, err, c.msg)
		}
	}
}

// TestExactMultinomialSize: the exact size of the exact multinomial test
// over every outcome of small totals: the probability (exact rationals) of
// the outcomes whose p-value is at most alpha never exceeds alpha.
func TestExactMultinomialSize(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		w []int64
		N int64
	}{{[]int64{1, 1, 1}, 9}, {[]int64{2, 3, 5}, 8}, {[]int64{1, 1, 2, 4}, 6}} {
		var ws int64
		wf := make([]float64, len(c.w))
		for j, v := range c.w {
			ws += v
			wf[j] = float64(v)
		}
		rej := map[float64]*big.Rat{0.01: new(big.Rat), 0.05: new(big.Rat), 0.1: new(big.Rat)}
		var rec func(j int, left int64, y []int64)
		rec = func(j int, left int64, y []int64) {
			if j == len(c.w)-1 {
				y = append(y, left)
				p := new(big.Rat).SetInt(new(big.Int).MulRange(1, c.N))
				for i, v := range y {
					p.Mul(p, new(big.Rat).SetFrac(new(big.Int).Exp(big.NewInt(c.w[i]), big.NewInt(v), nil),
						new(big.Int).Mul(new(big.Int).MulRange(1, v), new(big.Int).Exp(big.NewInt(ws), big.NewInt(v), nil))))
				}
				r, err := SampleRatio(context.Background(), y, wf, SampleRatioOptions{Method: FitExact})
				if err != nil {
					t.Fatal(err)
				}
				for a, acc := range rej {
					if r.PValue <= a {
						acc.Add(acc, p)
					}
				}
				return
			}
			for v := int64(0); v <= left; v++ {
				rec(j+1, left-v, append(append([]int64(nil), y...), v))
			}
		}
		rec(0, c.N, nil)
		for a, acc := range rej {
			if size, _ := acc.Float64(); size > a*(1+1e-12) {
				t.Errorf("weights %v N=%d alpha %v: size %v", c.w, c.N, a, size)
			}
		}
	}
}

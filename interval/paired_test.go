package interval_test

import (
	"errors"
	"fmt"
	"math"
	"strings"
	"testing"

	"github.com/kofnlab/kofn/binom"
	"github.com/kofnlab/kofn/interval"
)

// tango recomputes Tango's (1998) statistic from its published formula
// (Statistics in Medicine 17:891-908, equations for q21 and T), for the
// inversion check.
func tango(b, c, n, d float64) float64 {
	w := -b - c + (2*n-b+c)*d
	q := (math.Sqrt(math.Max(0, w*w+8*n*c*d*(1-d))) - w) / (4 * n)
	q = math.Max(q, math.Max(0, -d))
	return (b - c - n*d) / math.Sqrt(n*(2*q+d*(1-d)))
}

func TestTangoInversion(t *testing.T) {
	t.Parallel()
	// At Tango's limits the score statistic equals +-z: the normal tail
	// beyond it equals the tail probability to 1e-10. Tables: the airway
	// data of Fagerland, Lydersen and Laake (2013/2014), n11 = 1, n12 = 1,
	// n21 = 7, n22 = 12 (read in REFERENCES.md), and invented ones.
	for _, c := range [][4]int64{{1, 1, 7, 12}, {43, 8, 1, 48}, {10, 4, 12, 30}, {0, 3, 0, 17}, {500, 60, 40, 400}} {
		n := float64(c[0] + c[1] + c[2] + c[3])
		for _, lev := range []float64{0.9, 0.95, 0.99} {
			for _, side := range []interval.Side{interval.TwoSided, interval.LowerBound, interval.UpperBound} {
				iv, err := interval.PairedDifference(c[0], c[1], c[2], c[3], interval.PairedOptions{Method: interval.PairedTango, Level: lev, Side: side})
				if err != nil {
					t.Fatal(err)
				}
				a := 1 - lev
				if side == interval.TwoSided {
					a /= 2
				}
				what := fmt.Sprint(c, lev, side)
				if side != interval.UpperBound && iv.Lower > -1 {
					inverts(t, what+" lower", math.Log(normalUpper(tango(float64(c[1]), float64(c[2]), n, iv.Lower))), a)
				}
				if side != interval.LowerBound && iv.Upper < 1 {
					inverts(t, what+" upper", math.Log(normalUpper(-tango(float64(c[1]), float64(c[2]), n, iv.Upper))), a)
				}
			}
		}
	}
}

func TestPairedEdges(t *testing.T) {
	t.Parallel()
	// No discordant pairs: the difference is 0 and every interval contains
	// it; Wald collapses to [0, 0].
	for _, m := range []interval.PairedMethod{interval.PairedNewcombe, interval.PairedWald, interval.PairedTango} {
		iv, err := interval.PairedDifference(5, 0, 0, 5, interval.PairedOptions{Method: m})
		if err != nil {
			t.Fatal(err)
		}
		if !(iv.Lower <= 0 && iv.Upper >= 0) || iv.Estimate != 0 {
			t.Errorf("%v on a concordant table: %+v", m, iv)
		}
	}
	if _, err := interval.PairedDifference(0, 0, 0, 0, interval.PairedOptions{}); err == nil || err.Error() != "interval.PairedDifference: n11 + n12 + n21 + n22 = 0 is 0; the table needs at least one pair" {
		t.Errorf("empty table: %v", err)
	}
	if _, err := interval.PairedDifference(1, -2, 0, 0, interval.PairedOptions{}); err == nil || err.Error() != "interval.PairedDifference: n12 = -2 is negative; counts are 0 or more" {
		t.Errorf("negative cell: %v", err)
	}
	if _, err := interval.DiscordantRatio(0, 0, interval.Options{}); err == nil {
		t.Error("DiscordantRatio(0, 0): no error")
	}
	r, err := interval.DiscordantRatio(4, 0, interval.Options{Method: interval.ClopperPearson})
	if err != nil {
		t.Fatal(err)
	}
	if !math.IsInf(r.Upper, 1) || !math.IsInf(r.Estimate, 1) || !(r.Lower > 0) {
		t.Errorf("DiscordantRatio(4, 0): %+v", r)
	}
}

func TestDiscordantRatioExact(t *testing.T) {
	t.Parallel()
	// The exact conditional limits psi = theta/(1-theta) from the
	// Clopper-Pearson limits of theta (n12 of n12 + n21): at them the
	// binomial tails equal the tail probability (checked with binom).
	for _, c := range [][2]int64{{1, 7}, {7, 1}, {3, 3}, {12, 40}} {
		m := c[0] + c[1]
		iv, err := interval.DiscordantRatio(c[0], c[1], interval.Options{Method: interval.ClopperPearson})
		if err != nil {
			t.Fatal(err)
		}
		th := iv.Lower / (1 + iv.Lower)
		d, _ := binom.New(m, th)
		inverts(t, fmt.Sprint(c, " lower"), d.LogSurvival(c[0]-1), 0.025)
		th = iv.Upper / (1 + iv.Upper)
		d, _ = binom.New(m, th)
		inverts(t, fmt.Sprint(c, " upper"), d.LogCDF(c[0]), 0.025)
	}
}

func TestCornfieldInversion(t *testing.T) {
	t.Parallel()
	// At Cornfield's (1956) limits the noncentral hypergeometric tails of
	// the observed count equal the tail probability, and the conditional
	// MLE makes the conditional mean equal the observed count.
	for _, c := range [][4]int64{{56, 70, 48, 80}, {7, 15, 12, 15}, {3, 12, 1, 14}, {2600, 500000, 2400, 500000}, {0, 10, 4, 10}} {
		for _, mid := range []bool{false, true} {
			m := interval.OddsCornfield
			if mid {
				m = interval.OddsCornfieldMidP
			}
			iv, err := interval.OddsRatio(c[0], c[1], c[2], c[3], interval.OddsOptions{Method: m})
			if err != nil {
				t.Fatal(err)
			}
			dist := func(psi float64) binom.NoncentralHyper {
				d, err := binom.NewNoncentralHyper(c[1]+c[3], c[0]+c[2], c[1], psi)
				if err != nil {
					t.Fatal(err)
				}
				return d
			}
			k := c[0]
			if iv.Lower > 0 {
				d := dist(iv.Lower)
				ge := d.LogSurvival(k - 1)
				if mid {
					ge = logAdd(d.LogSurvival(k), d.LogProb(k)-math.Ln2)
				}
				inverts(t, fmt.Sprint(c, m, " lower"), ge, 0.025)
			}
			if !math.IsInf(iv.Upper, 1) {
				d := dist(iv.Upper)
				le := d.LogCDF(k)
				if mid {
					le = logAdd(d.LogCDF(k-1), d.LogProb(k)-math.Ln2)
				}
				inverts(t, fmt.Sprint(c, m, " upper"), le, 0.025)
			}
			if iv.Estimate > 0 && !math.IsInf(iv.Estimate, 1) {
				if mean := dist(iv.Estimate).Mean(); math.Abs(mean-float64(k)) > 1e-9*float64(k) {
					t.Errorf("%v CMLE %v: conditional mean %v, want %d", c, iv.Estimate, mean, k)
				}
			}
		}
	}
}

// TestPairedOverflow checks that cells whose sum overflows int64 are
// refused with ErrTooLarge naming the caller's cell, not a wrapped sum.
func TestPairedOverflow(t *testing.T) {
	t.Parallel()
	for _, c := range [][4]int64{{math.MaxInt64, math.MaxInt64, 40, 2}, {1 << 62, 1 << 62, 1 << 62, 1 << 62}, {1 << 52, 1 << 52, 1 << 52, 1}} {
		_, err := interval.PairedDifference(c[0], c[1], c[2], c[3], interval.PairedOptions{})
		if !errors.Is(err, interval.ErrTooLarge) {
			t.Errorf("PairedDifference(%v) error = %v, want ErrTooLarge", c, err)
			continue
		}
		if strings.Contains(err.Error(), "= -") {
			t.Errorf("PairedDifference(%v) error %q prints a negative (overflowed) value", c, err)
		}
		if c[0] <= binom.MaxN-c[1] {
			continue // n12 + n21 within 2^53: a valid discordant ratio
		}
		_, err = interval.DiscordantRatio(c[0], c[1], interval.Options{})
		if !errors.Is(err, interval.ErrTooLarge) || strings.Contains(err.Error(), "= -") {
			t.Errorf("DiscordantRatio(%d, %d) error = %v, want ErrTooLarge with the caller's values", c[0], c[1], err)
		}
	}
}

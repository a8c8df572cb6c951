package repl

import (
	"math"

	"github.com/kofnlab/kofn/binom"
)

func urnCommand() *command {
	return &command{
		Name:    "urn",
		Group:   "distribution",
		Summary: "drawing without replacement: the hypergeometric distribution, with tails at k",
		Usage:   "urn total=N marked=M draws=D [k=K] [odds=PSI]",
		Options: []opt{
			{Name: "total", Doc: "items in the population (a lot, a deck, a panel)"},
			{Name: "marked", Doc: "how many of them are successes (defective, eligible, ...)"},
			{Name: "draws", Doc: "items drawn without replacement"},
			{Name: "k", Doc: "a count of marked items in the draw: print its point and tail probabilities"},
			{Name: "odds", Doc: "an odds ratio psi: Fisher's noncentral hypergeometric (biased drawing; 1 is the plain urn)"},
		},
		Help: helpText{
			Computes: "The hypergeometric distribution of the number of marked items among draws items taken " +
				"without replacement from total items of which marked are marked: mean, standard deviation, the " +
				"possible range, the most likely count and a plot; with k=, P(X = k), P(X <= k) and P(X >= k). It " +
				"is the exact model for inspecting a sample from a finite lot, and the distribution behind " +
				"Fisher's exact test for a 2x2 table with fixed margins. odds=PSI gives Fisher's noncentral " +
				"hypergeometric distribution instead: the same table when its odds ratio is PSI, the distribution " +
				"behind the exact conditional (Cornfield) interval for an odds ratio.",
			Assumptions: "Every subset of draws items is equally likely to be drawn.",
			Examples:    []string{"urn total=500 marked=25 draws=50", "urn total=500 marked=25 draws=50 k=0", "urn total=30 marked=19 draws=15 odds=2 k=12"},
			Sources:     "Johnson NL, Kemp AW, Kotz S (2005), Univariate Discrete Distributions, 3rd ed., chapter 6 (section 6.11 for the noncentral form); Fisher RA (1935), J. Roy. Statist. Soc. 98:39-82.",
		},
		Run: runUrn,
	}
}

type urnResult struct {
	Total       int64     `json:"total"`
	Marked      int64     `json:"marked"`
	Draws       int64     `json:"draws"`
	Mean        float64   `json:"mean"`
	StdDev      float64   `json:"std_dev"`
	SupportFrom int64     `json:"support_from"`
	SupportTo   int64     `json:"support_to"`
	Mode        int64     `json:"mode"`
	Odds        *float64  `json:"odds_ratio,omitempty"`
	K           *int64    `json:"k,omitempty"`
	Equal       *float64  `json:"p_equal,omitempty"`
	AtMost      *float64  `json:"p_at_most,omitempty"`
	AtLeast     *float64  `json:"p_at_least,omitempty"`
	Mass        []massBin `json:"mass"`
}

// urnDist is what urn needs of the central and the noncentral
// hypergeometric distributions.
type urnDist interface {
	Mean() float64
	Variance() float64
	Support() (int64, int64)
	Mode() int64
	LogProb(int64) float64
	LogCDF(int64) float64
	LogSurvival(int64) float64
	ProbRange(a, b int64) float64
}

// urnArgs reads total=, marked= and draws=, checking that neither count
// exceeds the total.
func urnArgs(a *argSet) (total, marked, draws int64, err error) {
	v, err := a.Counts("total", "marked", "draws")
	if err != nil {
		return 0, 0, 0, err
	}
	total, marked, draws = v[0], v[1], v[2]
	for i, name := range []string{"marked", "draws"} {
		if v[i+1] > total {
			return 0, 0, 0, inputErr(name+"="+a.Str(name, ""), "exceeds total = "+count(total))
		}
	}
	return total, marked, draws, nil
}

func runUrn(c *call) error {
	a := c.Args
	if err := a.Want(0, 0); err != nil {
		return err
	}
	total, marked, draws, err := urnArgs(a)
	if err != nil {
		return err
	}
	var h urnDist
	var odds *float64
	title := "hypergeometric: " + count(draws) + " drawn from " + count(total) + " of which " + count(marked) + " marked"
	if a.Has("odds") {
		psi, err := a.Float("odds", 1)
		if err != nil {
			return err
		}
		if !(psi >= 0) {
			return inputErr("odds="+a.Str("odds", ""), "is negative; an odds ratio is 0 or more")
		}
		nh, err := binom.NewNoncentralHyper(total, marked, draws, psi)
		if err != nil {
			return err
		}
		h = nh
		title = "Fisher's noncentral hypergeometric, odds ratio " + in(psi) + ": " + count(draws) + " drawn from " + count(total) + " of which " + count(marked) + " marked"
		odds = &psi
	} else {
		ch, err := binom.NewHyper(total, marked, draws)
		if err != nil {
			return err
		}
		h = ch
	}
	lo, hi := h.Support()
	r := urnResult{Total: total, Marked: marked, Draws: draws, Mean: h.Mean(), StdDev: math.Sqrt(h.Variance()),
		SupportFrom: lo, SupportTo: hi, Mode: h.Mode(), Odds: odds}
	s := c.S
	b := c.Block(title)
	b.Row("mean", s.num(r.Mean))
	b.Row("std deviation", s.num(r.StdDev))
	b.Row("possible k", count(lo)+" to "+count(hi))
	b.Row("most likely k", count(r.Mode))
	if a.Has("k") {
		k, err := a.Count("k", 0)
		if err != nil {
			return err
		}
		eq, le, ge := h.LogProb(k), h.LogCDF(k), h.LogSurvival(k-1)
		r.K = &k
		ve, vl, vg := math.Exp(eq), math.Exp(le), math.Exp(ge)
		r.Equal, r.AtMost, r.AtLeast = &ve, &vl, &vg
		ks := count(k)
		b.Row("P(X = "+ks+")", s.logNum(eq))
		b.Row("P(X "+s.le()+" "+ks+")", s.logNum(le), "lower tail")
		b.Row("P(X "+s.ge()+" "+ks+")", s.logNum(ge), "upper tail")
	}
	// Plot where all but about 1e-4 of the probability lies.
	plo, phi := lo, hi
	if q, ok := h.(binom.Hyper); ok {
		plo, phi = max(lo, q.Quantile(5e-5)), min(hi, q.UpperQuantile(5e-5))
	} else {
		for plo < phi && h.LogCDF(plo) < math.Log(5e-5) {
			plo += max(1, (phi-plo)/64)
		}
		for phi > plo && h.LogSurvival(phi-1) < math.Log(5e-5) {
			phi -= max(1, (phi-plo)/64)
		}
	}
	var plot string
	r.Mass, plot = massPlot(s, plo, phi, h.ProbRange)
	c.Data(r)
	c.Plot(plot)
	return nil
}

package repl

import (
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"time"

	"github.com/kofnlab/kofn/binom"
)

func rollCommand() *command {
	return &command{
		Name:    "roll",
		Group:   "distribution",
		Summary: "simulate: draw random counts from a binomial (or an urn) to see the chance variation",
		Usage:   "roll n=N p=P [times=T] [seed=S]   or   roll total=N marked=M draws=D [times=T] [seed=S]",
		Options: []opt{optN, optP,
			{Name: "total", Doc: "urn: items in the population"}, {Name: "marked", Doc: "urn: marked items"},
			{Name: "draws", Doc: "urn: items drawn without replacement"},
			{Name: "times", Doc: "how many random counts to draw (default 20, at most 1000000)"},
			{Name: "seed", Doc: "a whole number that makes the draws repeatable (default: from the clock, and printed)"}},
		Help: helpText{
			Computes: "Random counts k from the binomial with n trials and success probability p (or from the " +
				"hypergeometric urn), as many as times=, with their average and spread beside the exact mean and " +
				"standard deviation. Useful to see how much k/n moves by chance alone. The draws come from a PCG " +
				"generator seeded by seed=; the same seed gives the same draws.",
			Assumptions: "Independent trials with one common success probability (or a random draw from the urn).",
			Examples:    []string{"roll n=40 p=0.3 seed=7", "roll n=1000000 p=0.001 times=5 seed=1", "roll total=500 marked=25 draws=50 times=10 seed=3"},
			Sources: "Hörmann W (1993), The generation of binomial random variates, J. Statist. Comput. Simul. " +
				"46:101-110; Kachitvichyanukul V, Schmeiser BW (1985), J. Statist. Comput. Simul. 22:127-145.",
		},
		Run: runRoll,
	}
}

type rollResult struct {
	Seed   uint64  `json:"seed"`
	Draws  []int64 `json:"draws"`
	Mean   float64 `json:"mean"`
	StdDev float64 `json:"std_dev"`
	// ExactMean and ExactStdDev are the distribution's.
	ExactMean   float64 `json:"exact_mean"`
	ExactStdDev float64 `json:"exact_std_dev"`
}

func runRoll(c *call) error {
	a := c.Args
	if err := a.Want(0, 0); err != nil {
		return err
	}
	times, err := a.Count("times", 20)
	if err != nil {
		return err
	}
	if times < 1 || times > 1000000 {
		return inputErr("times="+a.Str("times", ""), "is outside 1 to 1000000")
	}
	seed := uint64(time.Now().UnixNano())
	if a.Has("seed") {
		v, err := a.Count("seed", 0)
		if err != nil {
			return err
		}
		seed = uint64(v)
	}
	rng := rand.New(rand.NewPCG(seed, 0x6b6f666e)) // second word: "kofn"
	var draw func() int64
	var mean, sd float64
	var title string
	if a.Has("total") || a.Has("marked") || a.Has("draws") {
		total, marked, draws, err := urnArgs(a)
		if err != nil {
			return err
		}
		h, err := binom.NewHyper(total, marked, draws)
		if err != nil {
			return err
		}
		draw, mean, sd = func() int64 { return h.Rand(rng) }, h.Mean(), h.StdDev()
		title = "random draws of " + count(draws) + " from an urn of " + count(total) + " with " + count(marked) + " marked"
	} else {
		d, err := distArgs(a)
		if err != nil {
			return err
		}
		draw, mean, sd = func() int64 { return d.Rand(rng) }, d.Mean(), d.StdDev()
		title = "random counts k from the binomial, n = " + count(d.N) + ", p = " + in(d.P)
	}
	r := rollResult{Seed: seed, Draws: make([]int64, times), ExactMean: mean, ExactStdDev: sd}
	var sum, sum2 float64
	for i := range r.Draws {
		if i%4096 == 0 && c.Ctx.Err() != nil {
			return c.Ctx.Err()
		}
		k := draw()
		r.Draws[i] = k
		sum += float64(k)
	}
	r.Mean = sum / float64(times)
	for _, k := range r.Draws {
		d := float64(k) - r.Mean
		sum2 += d * d
	}
	if times > 1 {
		r.StdDev = math.Sqrt(sum2 / float64(times-1))
	}
	c.Data(r)
	s := c.S
	b := c.Block(title + " (simulated, seed " + strconv.FormatUint(seed, 10) + ")")
	// As many counts as fit the width; the JSON has them all.
	var words []string
	used := 12
	for i, k := range r.Draws {
		w := count(k)
		if used+len(w)+1 > s.Set.Width-14 && i < len(r.Draws)-1 {
			words = append(words, "... ("+count(int64(len(r.Draws)-i))+" more)")
			break
		}
		words = append(words, w)
		used += len(w) + 1
	}
	b.Row("counts", strings.Join(words, " "))
	b.Row("average", s.num(r.Mean), "exact mean "+s.num(mean))
	if times > 1 {
		b.Row("spread", s.num(r.StdDev), "sample standard deviation; exact "+s.num(sd))
	}
	return nil
}

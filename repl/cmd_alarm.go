package repl

import (
	"strconv"
	"strings"

	"github.com/kofnlab/kofn/power"
)

func alarmCommand() *command {
	return &command{
		Name:    "alarm",
		Group:   "planning",
		Summary: "Bernoulli CUSUM chart for a rate that rises (or falls): design by in-control run length, and the chart over a stream",
		Usage: "alarm p0=P0 p1=P1 [shift=increase|decrease] (h=H | arl0=A) [unit=M] " +
			"[items=0110..|looks=K/N,..|from=FILE|-]",
		Options: []opt{
			{Name: "p0", Doc: "the in-control rate (the objective)"},
			{Name: "p1", Doc: "the out-of-control rate to detect quickly"},
			{Name: "shift", Doc: "increase (default) or decrease", Values: []string{"increase", "decrease"}},
			{Name: "h", Doc: "the signal limit on the chart's scale"},
			{Name: "arl0", Doc: "choose the limit: the smallest whose mean run to a false alarm is at least this many items"},
			{Name: "unit", Doc: "denominator of the reference value (default: the smallest within 0.1% of the exact value)"},
			{Name: "items", Doc: "the stream item by item: 1 for a success (defect, error), 0 otherwise, like 0010001"},
			{Name: "looks", Doc: "cumulative counts at each look, K/N,K/N,.. (items added since the previous look)"},
			{Name: "from", Doc: "read cumulative counts from a CSV file, or - for standard input (columns k,n)"},
		},
		Help: helpText{
			Computes: "A Bernoulli CUSUM chart for watching a rate item by item: B = max(0, B + x - gamma) for an increase " +
				"(max(0, B + gamma - x) for a decrease), with x = 1 for a success and the reference value gamma from p0 and p1, " +
				"signalling when B reaches h. Shows the design: the reference value the chart runs on, the limit, and the exact " +
				"average run length (mean items to a signal) and its standard deviation in control (p0) and out of control (p1), " +
				"by the Markov chain method. With arl0= it finds the smallest limit whose in-control run length reaches the " +
				"target. With data, one line per look with the chart statistic and any signal (the chart restarts at 0 after a " +
				"signal), and a plot of the path against the limit.",
			Methods: "Reynolds and Stoumbos's Bernoulli CUSUM (the likelihood-ratio CUSUM of Page, scaled); exact run lengths " +
				"by the Markov chain of Brook and Evans on the chart's integer scale. When to use it rather than watch: for a rate " +
				"that should stay at p0 indefinitely (an error budget, a defect rate on a line), where the question is when it " +
				"moved, not whether one hypothesis or another is true.",
			Assumptions: "Independent items with a constant rate until the change. A look that adds several items is updated " +
				"as one group (the binomial CUSUM step, exact when the items that raise the statistic come first); the run lengths shown count single " +
				"items, so with grouped looks they describe the item-by-item chart, not the grouped one. p0 and p1 are fixed " +
				"before watching.",
			Examples: []string{"alarm p0=0.01 p1=0.02 arl0=20000", "alarm p0=0.1 p1=0.2 h=2 unit=20 items=0110111011",
				"alarm p0=0.2 p1=0.1 shift=decrease arl0=500 looks=10/40,15/80,18/120,19/160"},
			Sources: "Reynolds MR Jr, Stoumbos ZG (1999), A CUSUM chart for monitoring a proportion when inspecting " +
				"continuously, Journal of Quality Technology 31:87-108; Page ES (1954), Biometrika 41:100-115; Brook D, Evans DA " +
				"(1972), Biometrika 59:539-549.",
			Caution: true,
		},
		Run: runAlarm,
	}
}

func runAlarm(c *call) error {
	a := c.Args
	if err := a.Want(0, 0); err != nil {
		return err
	}
	if err := a.Need("p0", "p1"); err != nil {
		return err
	}
	p0, err := a.OpenProb("p0", 0)
	if err != nil {
		return err
	}
	p1, err := a.OpenProb("p1", 0)
	if err != nil {
		return err
	}
	sh, err := a.Choice("shift", "increase", "increase", "decrease")
	if err != nil {
		return err
	}
	opt := power.CUSUMOptions{}
	if sh == "decrease" {
		opt.Shift = power.Decrease
	}
	if opt.Unit, err = a.Count("unit", 0); err != nil {
		return err
	}
	if a.Has("h") == a.Has("arl0") {
		return inputErr("alarm", "needs exactly one of h= (the limit) and arl0= (the in-control run length to reach)")
	}
	var ch power.CUSUM
	var in0 power.RunLength
	if a.Has("h") {
		h, err := a.Float("h", 0)
		if err != nil {
			return err
		}
		if ch, err = power.NewCUSUM(p0, p1, h, opt); err != nil {
			return err
		}
		if in0, err = power.CUSUMRunLength(c.Ctx, ch, p0); err != nil {
			return err
		}
	} else {
		arl0, err := a.Float("arl0", 0)
		if err != nil {
			return err
		}
		if ch, in0, err = power.CUSUMForARL(c.Ctx, p0, p1, arl0, opt); err != nil {
			return err
		}
	}
	out1, err := power.CUSUMRunLength(c.Ctx, ch, p1)
	if err != nil {
		return err
	}
	// the data, as groups of (items, successes)
	type group struct {
		label string
		m, k  int64
		item  bool
	}
	var groups []group
	io, lo, fr := a.lookup("items"), a.lookup("looks"), a.lookup("from")
	if io != nil && (lo != nil || fr != nil) {
		return inputErr(io.word, "cannot be combined with looks= or from=; give the stream one way")
	}
	if io != nil {
		for i, r := range io.value {
			if r != '0' && r != '1' {
				return inputErr(io.word, "has "+strconv.QuoteRune(r)+" at item "+strconv.Itoa(i+1)+"; write 1 for a success and 0 otherwise")
			}
			groups = append(groups, group{label: strconv.Itoa(i + 1), m: 1, k: int64(r - '0'), item: true})
			if len(groups) > maxLooks {
				return inputErr(io.word, "holds more than 1000000 items")
			}
		}
	} else {
		looks, labels, err := lookSource(c, []string{"k", "n"}, oneLook)
		if err != nil {
			return err
		}
		var pk, pn int64
		for i, v := range looks {
			k, n := v[0], v[1]
			if k > n {
				return lookInputErr(c, labels[i], kn(k, n)+" has more successes than trials")
			}
			if n < pn || k < pk || n-k < pn-pk {
				return lookInputErr(c, labels[i], kn(k, n)+" is below the previous look; the counts are cumulative")
			}
			groups = append(groups, group{label: labels[i], m: n - pn, k: k - pk, item: n-pn == 1})
			pk, pn = k, n
		}
	}
	if err := a.Check(); err != nil {
		return err
	}
	dir := "rise"
	if ch.Shift == power.Decrease {
		dir = "fall"
	}
	b := c.Block("Bernoulli CUSUM for a " + dir + " of the rate from " + in(p0) + " to " + in(p1))
	b.Row("reference", count(ch.Ref)+"/"+count(ch.Unit)+" = "+c.S.num(float64(ch.Ref)/float64(ch.Unit)),
		"exact value "+c.S.num(ch.Gamma)+"; the chart is exactly the likelihood-ratio CUSUM for p1 = "+c.S.num(ch.AdjustedP1))
	b.Row("limit", "h = "+c.S.num(ch.H), "signal when the statistic reaches "+count(ch.Threshold)+"/"+count(ch.Unit))
	b.Row("in control", "ARL "+c.S.num(in0.ARL)+", SD "+c.S.num(in0.SDRL), "items to a false alarm at p = "+in(p0)+" (exact)")
	b.Row("out of control", "ARL "+c.S.num(out1.ARL)+", SD "+c.S.num(out1.SDRL), "items to the alarm at p = "+in(p1)+" (exact)")
	res := alarmResult{Chart: ch, InControl: in0, OutOfControl: out1}
	if len(groups) == 0 {
		c.Data(res)
		return nil
	}
	lb := c.Block("stream (statistic on the chart's scale; restart at 0 after a signal)")
	var s int64
	var xs []int64
	var ys []float64
	var total int64
	grouped := false
	for _, g := range groups {
		var sig bool
		if g.item {
			s, sig = ch.Step(s, g.k == 1)
		} else {
			var err error
			if s, sig, err = ch.Batch(s, g.k, g.m); err != nil {
				return err
			}
			grouped = grouped || g.m > 1
		}
		total += g.m
		v := float64(s) / float64(ch.Unit)
		res.Looks = append(res.Looks, alarmLook{Items: total, Added: g.m, Successes: g.k, Statistic: v, Signal: sig})
		note := ""
		if sig {
			note = "SIGNAL"
		}
		label := "item " + g.label
		what := strconv.FormatInt(g.k, 10)
		if !g.item || io == nil {
			label = "look " + g.label
			what = count(g.k) + " of " + count(g.m) + " new items"
		}
		if len(groups) <= 200 || sig {
			lb.Row(label, what, strings.TrimSpace("B "+c.S.num(v)+"  "+note))
		}
		xs, ys = append(xs, total), append(ys, v)
		if sig {
			s = 0
		}
	}
	if len(groups) > 200 {
		lb.Warn("more than 200 looks: only the signals are listed (all are in the JSON)")
	}
	if grouped {
		lb.Warn("some looks add several items: they are updated as one group (as if the items that raise the statistic came first), and the run lengths above count single items")
	}
	c.Data(res)
	c.Plot(pathPlot(c.S, "chart statistic at each look; line at the limit h", xs, []series{{"B", ys}}, nil, ch.H))
	return nil
}

type alarmResult struct {
	Chart        power.CUSUM     `json:"chart"`
	InControl    power.RunLength `json:"in_control"`
	OutOfControl power.RunLength `json:"out_of_control"`
	Looks        []alarmLook     `json:"looks,omitempty"`
}

type alarmLook struct {
	Items     int64   `json:"items"`     // items so far
	Added     int64   `json:"added"`     // items added at this look
	Successes int64   `json:"successes"` // successes among them
	Statistic float64 `json:"statistic"` // B after the look (before a restart)
	Signal    bool    `json:"signal"`
}

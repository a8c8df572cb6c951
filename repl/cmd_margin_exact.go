package repl

import (
	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/power"
)

// addExactMargin adds the exact precision plans to margin:
// by=chance|width|assurance (run by marginExact).
func addExactMargin(marginCmd *command) {
	marginCmd.Usage = "margin d=D [p=P] [level=L] [by=formula|chance|width|assurance] [method=M] [want=W]"
	marginCmd.Options = append(marginCmd.Options,
		opt{Name: "by", Doc: "formula (default): z^2 p(1-p)/d^2; chance: exact chance that k/n lands within d; width: expected half-width of an interval; assurance: chance the half-width is at most d", Values: []string{"formula", "chance", "width", "assurance"}},
		opt{Name: "method", Doc: "by=width or assurance: the interval method (as bounds)", Values: boundsMethods},
		opt{Name: "want", Doc: "by=chance: the chance wanted (default: the level); by=assurance: the assurance wanted (default 0.8)"},
		opt{Name: "upto", Doc: "largest n searched"})
	marginCmd.Help.Computes += " by=chance finds the n for which k/n lands within d of p with at least the " +
		"wanted chance, computed exactly (a sawtooth in n: the first and the safe n are given); without p= " +
		"the worst case over every p. by=width finds the n whose interval (method=, level=) has expected " +
		"half-width at most d at p; by=assurance the n for which that half-width is at most d with chance want=."
	marginCmd.Help.Examples = append(marginCmd.Help.Examples, "margin d=0.05 p=0.3 by=chance", "margin d=0.1 by=chance",
		"margin d=0.05 p=0.2 by=width method=clopper-pearson", "margin d=0.05 p=0.2 by=assurance")
	marginCmd.Help.Sources += " Exact precision: binom.ProportionWithin; interval widths from package interval."
}

// marginExact runs the exact forms of margin (by=...) and reports whether
// it did.
func marginExact(c *call, d, p, level float64) (bool, error) {
	a := c.Args
	by, err := a.Choice("by", "formula", "formula", "chance", "width", "assurance")
	if err != nil || by == "formula" {
		return false, err
	}
	upto, err := a.Count("upto", 0)
	if err != nil {
		return true, err
	}
	s := c.S
	switch by {
	case "chance":
		want, err := a.OpenProb("want", level)
		if err != nil {
			return true, err
		}
		o := power.PrecisionOptions{Level: want, MaxN: upto}
		var r power.ExactSize
		title := "trials for k/n within " + fmtIn(d) + " of p = " + fmtIn(p) + " with chance " + fmtIn(want)
		if a.Has("p") {
			r, err = power.PrecisionN(c.Ctx, p, d, o)
		} else {
			title = "trials for k/n within " + fmtIn(d) + " of the truth with chance " + fmtIn(want) + ", whatever p"
			r, err = power.WorstPrecisionN(c.Ctx, d, o)
		}
		if err != nil {
			return true, err
		}
		exactSizeRows(c, c.Block(title), r, want, "chance")
		return true, nil
	}
	m, err := a.Choice("method", boundsMethods[0], boundsMethods...)
	if err != nil {
		return true, err
	}
	o := power.WidthOptions{Interval: interval.Options{Level: level, Method: enumValue[interval.Method](boundsMethods, m)}, MaxN: upto}
	var r power.WidthPlan
	var what string
	if by == "width" {
		r, err = power.ExpectedWidthN(c.Ctx, p, d, o)
		what = "expected half-width"
	} else {
		if o.Assurance, err = a.OpenProb("want", 0.8); err != nil {
			return true, err
		}
		r, err = power.AssuranceN(c.Ctx, p, d, o)
		what = "chance the half-width is at most " + fmtIn(d)
	}
	if err != nil {
		return true, err
	}
	c.Data(r)
	b := c.Block("trials for a " + pct(level) + " " + r.Method + " interval of half-width " + fmtIn(d) + " at p = " + fmtIn(p) + " (" + by + ")")
	b.Row("trials", count(r.N), what+" "+s.num(r.Value))
	b.Row("one fewer", count(r.N-1), what+" "+s.num(r.Previous))
	b.Warn(r.Warnings...)
	return true, nil
}

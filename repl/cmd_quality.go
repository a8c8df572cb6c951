package repl

import (
	"math"
	"strings"

	"github.com/kofnlab/kofn/power"
)

func marginCommand() *command {
	cmd := &command{
		Name:    "margin",
		Group:   "planning",
		Summary: "trials needed for a margin of error d on a proportion (precision planning)",
		Usage:   "margin d=D [p=P] [level=L]",
		Options: []opt{{Name: "d", Doc: "margin of error: the half-width wanted, like 0.03"},
			{Name: "p", Doc: "the proportion expected (default 0.5, the worst case)"}, optLevel},
		Help: helpText{
			Computes: "The number of trials n for which the normal-approximation interval around k/n has " +
				"half-width d at the level: n = z^2 p (1-p) / d^2, rounded up. It is a planning formula (common " +
				"practice); near 0 or 1 or at small n the actual interval differs, so check the plan with bounds.",
			Assumptions: "Simple random sampling from a large population; p is a guess (0.5 is the safe choice).",
			Examples:    []string{"margin d=0.03", "margin d=0.02 p=0.1 level=99%"},
			Sources:     "Textbook margin-of-error formula (common practice), e.g. Cochran WG (1977), Sampling Techniques, 3rd ed., section 4.4.",
		},
		Run: runMargin,
	}
	addExactMargin(cmd)
	return cmd
}

type marginResult struct {
	N     int64   `json:"n"`
	D     float64 `json:"d"`
	P     float64 `json:"p"`
	Level float64 `json:"level"`
}

func runMargin(c *call) error {
	a := c.Args
	if err := a.Want(0, 0); err != nil {
		return err
	}
	if err := a.Need("d"); err != nil {
		return err
	}
	d, err := a.OpenProb("d", 0)
	if err != nil {
		return err
	}
	p, err := a.OpenProb("p", 0.5)
	if err != nil {
		return err
	}
	level, err := c.Level()
	if err != nil {
		return err
	}
	if done, err := marginExact(c, d, p, level); done || err != nil {
		return err
	}
	n, err := power.MarginOfErrorN(p, d, level)
	if err != nil {
		return err
	}
	c.Data(marginResult{n, d, p, level})
	b := c.Block("margin of error " + fmtIn(d) + " at " + pct(level) + ", expected proportion " + fmtIn(p))
	b.Row("trials", count(n), "z^2 p (1-p) / d^2, rounded up (common practice)")
	return nil
}

func proveCommand() *command {
	return &command{
		Name:    "prove",
		Group:   "planning",
		Summary: "reliability demonstration: trials needed, or reliability shown by a test",
		Usage:   "prove rel=R [level=L] [fails=F]   or   prove n=N [level=L] [fails=F]",
		Options: []opt{{Name: "rel", Doc: "reliability to demonstrate (chance a unit works), like 0.99"},
			{Name: "level", Doc: "confidence level of the demonstration, like 0.95 or 95% (default: the session level)"},
			{Name: "fails", Doc: "failures allowed (default 0)"},
			{Name: "n", Doc: "trials run (to find the reliability they demonstrate)"}},
		Help: helpText{
			Computes: "With rel=: the smallest number of trials n such that seeing at most fails failures " +
				"demonstrates reliability rel at confidence level L: P(X <= fails; n, 1 - rel) <= 1 - L (with no " +
				"failures this is the success-run formula n = ln(1 - L)/ln(rel)). With n=: the reliability a " +
				"test of n trials with fails failures demonstrates, the one-sided exact (Clopper-Pearson) lower " +
				"bound; with no failures (1 - L)^(1/n), which the rule of three approximates.",
			Assumptions: "Independent trials of identical units under representative conditions.",
			Examples:    []string{"prove rel=0.99 level=0.95", "prove rel=0.95 level=0.9 fails=2", "prove n=30 level=0.9"},
			Sources: "Success-run formula (common practice); Hanley JA, Lippman-Hand A (1983), If nothing goes " +
				"wrong, is everything all right? JAMA 249:1743-1745; Clopper CJ, Pearson ES (1934), Biometrika 26:404-413.",
		},
		Run: runProve,
	}
}

type proveResult struct {
	N           int64   `json:"n"`
	Failures    int64   `json:"failures"`
	Level       float64 `json:"level"`
	Reliability float64 `json:"reliability"`
}

func runProve(c *call) error {
	a := c.Args
	if err := a.Want(0, 0); err != nil {
		return err
	}
	conf, err := c.Level()
	if err != nil {
		return err
	}
	fails, err := a.Count("fails", 0)
	if err != nil {
		return err
	}
	s := c.S
	if a.Has("n") {
		n, err := a.Count("n", 0)
		if err != nil {
			return err
		}
		if n < 1 {
			return inputErr("n="+a.Str("n", ""), "must be at least 1")
		}
		if fails > n {
			return inputErr("fails="+a.Str("fails", ""), "exceeds n = "+count(n))
		}
		r, err := power.DemonstratedReliability(n, fails, conf)
		if err != nil {
			return err
		}
		c.Data(proveResult{n, fails, conf, r})
		b := c.Block("reliability demonstrated by " + count(n) + " trials with " + count(fails) + " failures, " + pct(conf) + " confidence")
		b.Row("reliability", s.num(r), "one-sided exact lower bound")
		b.Row("failure rate", "at most "+s.num(1-r))
		if fails == 0 {
			b.Row("rule of three", s.num(3/float64(n)), "3/n, the rough 95% upper bound on the failure rate")
		}
		return nil
	}
	if err := a.Need("rel"); err != nil {
		return err
	}
	rel, err := a.OpenProb("rel", 0)
	if err != nil {
		return err
	}
	r, err := power.DemonstrationTrials(fails, rel, conf)
	if err != nil {
		return err
	}
	c.Data(r)
	b := c.Block("demonstrate reliability " + fmtIn(rel) + " at " + pct(conf) + " confidence, " + count(fails) + " failures allowed")
	b.Row("trials", count(r.Trials))
	b.Row("achieved confidence", s.numApart(r.AchievedLevel, conf), "at least "+fmtIn(conf))
	b.Row("with one trial fewer", s.numApart(r.PreviousLevel, conf), "falls short of "+fmtIn(conf))
	return nil
}

func acceptCommand() *command {
	return &command{
		Name:    "accept",
		Group:   "planning",
		Summary: "acceptance sampling by attributes: a plan's OC curve, AOQ and ATI, or design a plan",
		Usage:   "accept n=N c=C [at=P,...] [lot=L] [show=S]   or   accept aql=P1 rql=P2 [producer=A] [consumer=B] [show=S]",
		Options: []opt{
			{Name: "n", Doc: "items inspected from each lot"},
			{Name: "c", Doc: "acceptance number: the lot is accepted with at most c defectives"},
			{Name: "at", Doc: "defect rates at which to report the acceptance probability, like 0.01 or 0.01,0.02,0.05"},
			{Name: "lot", Doc: "lot size, for rectifying inspection (AOQ, ATI, AOQL)"},
			{Name: "defectives", Doc: "with lot=: defectives in the lot, for the exact finite-lot (hypergeometric) acceptance chance"},
			{Name: "aql", Doc: "design: acceptable quality level (defect rate that should pass)"},
			{Name: "rql", Doc: "design: rejectable quality level (defect rate that should fail)"},
			{Name: "producer", Doc: "design: largest chance of rejecting a lot at the AQL (default 0.05)"},
			{Name: "consumer", Doc: "design: largest chance of accepting a lot at the RQL (default 0.10)"},
			{Name: "upto", Doc: "design: largest n searched"},
			{Name: "show", Doc: "plot (default): the OC curve; table: its values as an aligned table (at the at= rates when given); csv: the same as CSV; both: plot and table", Values: optShow.Values},
		},
		Help: helpText{
			Computes: "For a single sampling plan (inspect n items, accept the lot with at most c defectives): " +
				"the operating characteristic, the chance of accepting a lot against its defect rate (binomial, " +
				"for large lots), drawn as a curve with the AQL and RQL marked when given; show=table or show=csv " +
				"lists its values; at= gives its value at one rate or a list of rates; lot= adds rectifying " +
				"inspection: average outgoing quality (AOQ) and average total inspection (ATI) at the rate, and the " +
				"average outgoing quality limit (AOQL); lot= with defectives= gives the exact acceptance chance for " +
				"that finite lot (hypergeometric, type A). With aql= and rql=: the plan with the smallest n that " +
				"meets both risks, found by an exact search; adding lot= designs for isolated lots of that size " +
				"(hypergeometric, type A) instead of a process.",
			Assumptions: "Lots much larger than the sample (binomial model); items defective independently.",
			Examples: []string{"accept n=89 c=2", "accept n=89 c=2 at=0.01 lot=10000", "accept aql=0.01 rql=0.05",
				"accept n=89 c=2 at=0.01,0.02,0.05 show=table", "accept aql=0.01 rql=0.05 show=csv"},
			Sources: "Montgomery DC, Introduction to Statistical Quality Control, chapter on single sampling " +
				"plans for attributes (n = 89, c = 2); Schilling EG, Neubauer DV (2009), Acceptance Sampling in Quality Control, 2nd ed.",
		},
		Run: runAccept,
	}
}

// acceptResult is accept's JSON: the plan, its design when aql= and rql=
// were given, the acceptance chance at each at= rate (with rectifying
// inspection when lot= is given), the finite-lot chance, the AOQL and the
// OC curve.
type acceptResult struct {
	Plan       power.Plan         `json:"plan"`
	Design     *power.PlanDesign  `json:"design,omitempty"`
	At         []power.Point      `json:"at,omitempty"`
	Rectifying []power.Rectifying `json:"rectifying,omitempty"`
	// LotDefectives and LotAcceptProb: the finite-lot acceptance chance.
	LotDefectives *int64          `json:"lot_defectives,omitempty"`
	LotAcceptProb *float64        `json:"lot_accept_prob,omitempty"`
	AOQL          *power.AOQLimit `json:"aoql,omitempty"`
	OC            []power.Point   `json:"oc"`
}

func runAccept(c *call) error {
	a := c.Args
	if err := a.Want(0, 0); err != nil {
		return err
	}
	s := c.S
	var r acceptResult
	var b *block
	if a.Has("aql") || a.Has("rql") {
		if err := a.Need("aql", "rql"); err != nil {
			return err
		}
		aql, err := a.OpenProb("aql", 0)
		if err != nil {
			return err
		}
		rql, err := a.OpenProb("rql", 0)
		if err != nil {
			return err
		}
		if rql <= aql {
			return inputErr("rql="+a.Str("rql", ""), "must exceed aql = "+fmtIn(aql))
		}
		var o power.DesignOptions
		if o.ProducerRisk, err = a.OpenProb("producer", 0.05); err != nil {
			return err
		}
		if o.ConsumerRisk, err = a.OpenProb("consumer", 0.10); err != nil {
			return err
		}
		if o.MaxN, err = a.Count("upto", 0); err != nil {
			return err
		}
		if o.Lot, err = a.Count("lot", 0); err != nil {
			return err
		}
		d, err := power.DesignPlan(c.Ctx, aql, rql, o)
		if err != nil {
			return err
		}
		r.Design, r.Plan = &d, d.Plan
		b = c.Block("sampling plan for AQL " + fmtIn(aql) + " (producer's risk " + fmtIn(o.ProducerRisk) + ") and RQL " + fmtIn(rql) + " (consumer's risk " + fmtIn(o.ConsumerRisk) + ")")
		if o.Lot > 0 {
			b.Title += ", isolated lots of " + count(o.Lot)
		}
		b.Row("plan", "inspect n = "+count(d.Plan.SampleSize)+", accept with at most c = "+count(d.Plan.AcceptNumber)+" defective")
		b.Row("producer's risk", s.num(d.AchievedProducerRisk), "chance of rejecting a lot at the AQL")
		b.Row("consumer's risk", s.num(d.AchievedConsumerRisk), "chance of accepting a lot at the RQL")
	} else {
		if err := a.Need("n", "c"); err != nil {
			return err
		}
		n, err := a.Count("n", 0)
		if err != nil {
			return err
		}
		cc, err := a.Count("c", 0)
		if err != nil {
			return err
		}
		r.Plan = power.Plan{SampleSize: n, AcceptNumber: cc}
		b = c.Block("sampling plan: inspect n = " + count(n) + ", accept with at most c = " + count(cc) + " defective")
	}
	var at []float64
	if a.Has("at") {
		raw := a.Str("at", "")
		for _, f := range strings.Split(raw, ",") {
			p, err := parseProb(f)
			if err != nil {
				return inputErr("at="+raw, "has "+shortToken(f)+", which "+reasonOf(err))
			}
			at = append(at, p)
		}
		if len(at) > 10000 {
			return inputErr("at="+shortToken(raw), "lists more than 10000 rates")
		}
		for _, p := range at {
			pa, err := power.AcceptProb(r.Plan, p)
			if err != nil {
				return err
			}
			r.At = append(r.At, power.Point{X: p, Y: pa})
			if len(at) <= 20 {
				b.Row("P(accept) at "+fmtIn(p), s.num(pa))
			}
		}
	}
	if a.Has("lot") {
		lot, err := a.Count("lot", 0)
		if err != nil {
			return err
		}
		if lot < r.Plan.SampleSize {
			return inputErr("lot="+a.Str("lot", ""), "is smaller than the sample size n = "+count(r.Plan.SampleSize))
		}
		for _, p := range at {
			rect, err := power.Rectify(r.Plan, lot, p)
			if err != nil {
				return err
			}
			r.Rectifying = append(r.Rectifying, rect)
			if len(at) <= 20 {
				b.Row("AOQ at "+fmtIn(p), s.num(rect.AOQ), "average outgoing quality, lots of "+count(lot))
				b.Row("ATI at "+fmtIn(p), s.num(rect.ATI), "average total inspection per lot")
			}
		}
		if a.Has("defectives") {
			dv, err := a.Count("defectives", 0)
			if err != nil {
				return err
			}
			pa, err := power.AcceptProbLot(r.Plan, lot, dv)
			if err != nil {
				return err
			}
			r.LotDefectives, r.LotAcceptProb = &dv, &pa
			b.Row("P(accept), this lot", s.num(pa), count(dv)+" defective in "+count(lot)+" (hypergeometric)")
		}
		q, err := power.AOQL(r.Plan, lot)
		if err != nil {
			return err
		}
		r.AOQL = &q
		b.Row("AOQL", s.num(q.AOQL), "worst average outgoing quality, at defect rate "+s.num(q.P))
	}
	// The OC curve over the rates where the plan's acceptance falls from
	// near 1 to about 1%.
	pMax, err := ocRange(r.Plan)
	if err != nil {
		return err
	}
	cols := s.plotColumns(6)
	oc, err := power.OCCurve(r.Plan, pMax, cols-1)
	if err != nil {
		return err
	}
	r.OC = oc
	c.Data(r)
	t := valueTable{cols: []string{"defect_rate", "p_accept"}}
	rows := r.At
	if len(rows) == 0 {
		rows = oc
	}
	for _, pt := range rows {
		t.add(pt.X, pt.Y)
	}
	if len(r.Rectifying) == len(rows) && len(rows) > 0 {
		t.cols = append(t.cols, "aoq", "ati")
		for i, rect := range r.Rectifying {
			t.rows[i] = append(t.rows[i], rect.AOQ, rect.ATI)
		}
	}
	return c.showCurve(t, func() string {
		xs, ys := make([]float64, len(oc)), make([]float64, len(oc))
		for i, pt := range oc {
			xs[i], ys[i] = pt.X, pt.Y
		}
		ch := chart{xs: xs, series: []series{{"P(accept)", ys}}, yLo: 0, yHi: 1, ref: math.NaN(), height: 10,
			ascii: s.Set.ASCII, width: s.Set.Width, digits: 3, xLabel: "defect rate"}
		if r.Design != nil {
			ch.marks = []float64{r.Design.AQL, r.Design.RQL}
			ch.markNote = "AQL " + fmtIn(r.Design.AQL) + " and RQL " + fmtIn(r.Design.RQL)
		} else if len(at) > 0 && len(at) <= 5 {
			ch.marks = at
			ch.markNote = "at= rates"
		}
		return "operating characteristic: P(accept) against the defect rate (binomial: large lots or a process)\n" + ch.render()
	})
}

// ocRange returns the right end of the OC plot: the defect rate where the
// acceptance probability falls to about 1%, found by bisection on
// power.AcceptProb (which falls as the rate grows).
func ocRange(pl power.Plan) (float64, error) {
	lo, hi := 0.0, 1.0
	if _, err := power.AcceptProb(pl, 0.5); err != nil {
		return 0, err
	}
	for i := 0; i < 60; i++ {
		mid := (lo + hi) / 2
		pa, _ := power.AcceptProb(pl, mid)
		if pa > 0.01 {
			lo = mid
		} else {
			hi = mid
		}
	}
	return math.Min(1, hi*1.05), nil
}

package repl

import (
	"math"
	"strings"

	"github.com/kofnlab/kofn/interval"
)

func coverCommand() *command {
	return &command{
		Name:    "cover",
		Group:   "intervals",
		Summary: "exact coverage of interval methods against p (or against n), with a plot",
		Usage:   "cover n=N|LO..HI [p=P] [method=M1,M2,...] [level=L] [bound=two|lower|upper] [points=G] [show=S]",
		Options: []opt{
			{Name: "n", Doc: "trials; LO..HI with p= plots coverage against n"},
			{Name: "p", Doc: "a true proportion: coverage at that p (or against n)"},
			{Name: "method", Doc: "one or more bounds methods, separated by commas (default: the bounds default)", Values: boundsMethods},
			optLevel, optBound,
			{Name: "points", Doc: "grid points over p in (0, 1) for the sweep (default 1000)"},
			optShow,
		},
		Help: helpText{
			Computes: "The exact coverage probability of one-proportion interval methods: the chance, summed over " +
				"every possible count k weighted by its binomial probability, that the interval from k contains " +
				"the true p; and the expected width. Without p= it sweeps p over a grid in (0, 1) and reports the " +
				"lowest and the mean coverage, plotting the lowest coverage in each column against p; with p= " +
				"and n=LO..HI it plots coverage against n, the sawtooth Brown, Cai and DasGupta (2001) describe. " +
				"Exact methods never fall below the level; approximate ones dip below it at some p. show=table " +
				"or show=csv lists every grid point (or n) with each method's coverage.",
			Methods:     "Any bounds method; several can be compared, e.g. method=wald,wilson,clopper-pearson.",
			Assumptions: "Closed intervals; coverage is computed, not simulated.",
			Examples: []string{"cover n=30 method=wald,wilson,clopper-pearson", "cover n=30 p=0.2 method=wald",
				"cover n=20..120 p=0.005 method=wald", "cover n=50 method=jeffreys level=90%", "cover n=30 method=wald,wilson points=9 show=table"},
			Sources: "Brown LD, Cai TT, DasGupta A (2001), Interval estimation for a binomial proportion, Statistical " +
				"Science 16:101-133 (Wald coverage 0.946 at p = 0.2, n = 30; 0.945 at n = 591 and 0.792 at n = 592 " +
				"for p = 0.005); Newcombe RG (1998), Statistics in Medicine 17:857-872.",
		},
		Run: runCover,
	}
}

type coverResult struct {
	Methods []coverMethod `json:"methods"`
}

type coverMethod struct {
	Method  string                    `json:"method"`
	Summary *interval.CoverageSummary `json:"summary,omitempty"`
	Points  []interval.Performance    `json:"points"`
}

func runCover(c *call) error {
	a := c.Args
	if err := a.Want(0, 0); err != nil {
		return err
	}
	if err := a.Need("n"); err != nil {
		return err
	}
	lo, hi, err := a.Range("n", 0)
	if err != nil {
		return err
	}
	words, err := methodList(c)
	if err != nil {
		return err
	}
	level, err := c.Level()
	if err != nil {
		return err
	}
	side, err := boundSide(a)
	if err != nil {
		return err
	}
	points, err := a.Count("points", 1000)
	if err != nil {
		return err
	}
	if points < 2 || points > interval.MaxCurvePoints {
		return inputErr("points="+a.Str("points", ""), "is outside 2 to 1000000")
	}
	s := c.S
	var out []coverMethod
	var xs []float64
	var curves []series
	yMin := 1.0
	switch {
	case a.Has("p") && lo == hi:
		p, err := a.Prob("p", 0)
		if err != nil {
			return err
		}
		b := c.Block("exact coverage at n = " + count(lo) + ", p = " + in(p) + ", " + pct(level) + " " + side.String())
		for _, w := range words {
			pf, err := interval.Coverage(c.Ctx, lo, p, interval.Options{Level: level, Side: side, Method: enumValue[interval.Method](boundsMethods, w)})
			if err != nil {
				return err
			}
			out = append(out, coverMethod{Method: pf.Method, Points: []interval.Performance{pf}})
			b.Row(pf.Method, s.num(pf.Coverage), "expected width "+s.num(pf.ExpectedWidth)+belowLevel(pf.Coverage, level))
		}
		c.Data(coverResult{out})
		return nil
	case a.Has("p"):
		p, err := a.Prob("p", 0)
		if err != nil {
			return err
		}
		if hi-lo+1 > interval.MaxCurvePoints {
			return inputErr("n="+a.Str("n", ""), "spans more than 1000000 sizes")
		}
		b := c.Block("exact coverage against n = " + count(lo) + " to " + count(hi) + " at p = " + in(p) + ", " + pct(level) + " " + side.String())
		for _, w := range words {
			pts, sum, err := interval.CoverageOverN(c.Ctx, lo, hi, p, interval.Options{Level: level, Side: side, Method: enumValue[interval.Method](boundsMethods, w)})
			if err != nil {
				return err
			}
			out = append(out, coverMethod{Method: pts[0].Method, Summary: &sum, Points: pts})
			b.Row(pts[0].Method, "lowest "+s.num(sum.MinCoverage)+" at n = "+count(sum.MinAtN), "mean "+s.num(sum.MeanCoverage)+belowLevel(sum.MinCoverage, level))
			xs, curves, yMin = binCurve(s, pts, pts[0].Method, func(pf interval.Performance) float64 { return float64(pf.N) }, curves, yMin)
		}
		c.Data(coverResult{out})
		return c.showCurve(coverTable("n", out, func(pf interval.Performance) float64 { return float64(pf.N) }),
			func() string { return coverPlot(s, xs, curves, yMin, level, "n (lowest coverage in each column)") })
	default:
		if lo != hi {
			return inputErr("n="+a.Str("n", ""), "is a range; a range of n needs p=")
		}
		ps := make([]float64, points)
		for i := range ps {
			ps[i] = float64(i+1) / float64(points+1)
		}
		b := c.Block("exact coverage over p in (0, 1), n = " + count(lo) + ", " + pct(level) + " " + side.String() + ", " + count(points) + " grid points")
		for _, w := range words {
			pts, sum, err := interval.CoverageCurve(c.Ctx, lo, ps, interval.Options{Level: level, Side: side, Method: enumValue[interval.Method](boundsMethods, w)})
			if err != nil {
				return err
			}
			out = append(out, coverMethod{Method: pts[0].Method, Summary: &sum, Points: pts})
			b.Row(pts[0].Method, "lowest "+s.num(sum.MinCoverage)+" at p = "+s.num(sum.MinAtP), "mean "+s.num(sum.MeanCoverage)+", mean width "+s.num(sum.MeanWidth)+belowLevel(sum.MinCoverage, level))
			xs, curves, yMin = binCurve(s, pts, pts[0].Method, func(pf interval.Performance) float64 { return pf.P }, curves, yMin)
		}
		c.Data(coverResult{out})
		return c.showCurve(coverTable("p", out, func(pf interval.Performance) float64 { return pf.P }),
			func() string { return coverPlot(s, xs, curves, yMin, level, "p (lowest coverage in each column)") })
	}
}

// coverTable lists the coverage curves point by point: the x column,
// then one coverage column per method.
func coverTable(x string, curves []coverMethod, xOf func(interval.Performance) float64) valueTable {
	t := valueTable{cols: []string{x}}
	for _, m := range curves {
		t.cols = append(t.cols, methodWord(m.Method))
	}
	for i, pf := range curves[0].Points {
		row := []float64{xOf(pf)}
		for _, m := range curves {
			row = append(row, m.Points[i].Coverage)
		}
		t.add(row...)
	}
	return t
}

// belowLevel notes a coverage under the nominal level.
func belowLevel(cov, level float64) string {
	if cov < level {
		return "; below the level"
	}
	return ""
}

// methodList reads method= as a comma-separated list of bounds methods
// (default: the session's bounds method).
func methodList(c *call) ([]string, error) {
	def := c.S.Set.Methods["bounds"]
	if def == "" {
		def = boundsMethods[0]
	}
	raw := c.Args.Str("method", def)
	var out []string
	for _, w := range strings.Split(strings.ToLower(raw), ",") {
		found := false
		for _, m := range boundsMethods {
			found = found || m == w
		}
		if !found {
			return nil, inputErr("method="+raw, "names "+strconvQuote(w)+", not a bounds method"+unknownHint(w, boundsMethods))
		}
		out = append(out, w)
	}
	return out, nil
}

func strconvQuote(s string) string { return `"` + s + `"` }

// binCurve reduces a performance sweep to one value per plot column (the
// lowest coverage in the column) and adds it as a series.
func binCurve(s *Session, pts []interval.Performance, name string, x func(interval.Performance) float64, curves []series, yMin float64) ([]float64, []series, float64) {
	cols := s.plotColumns(6)
	per := (len(pts) + cols - 1) / cols
	var xs, ys []float64
	for i := 0; i < len(pts); i += per {
		m := math.Inf(1)
		for _, pf := range pts[i:min(i+per, len(pts))] {
			m = math.Min(m, pf.Coverage)
		}
		xs = append(xs, x(pts[i]))
		ys = append(ys, m)
		yMin = math.Min(yMin, m)
	}
	return xs, append(curves, series{name, ys}), yMin
}

// coverPlot draws the coverage curves with a line at the level.
func coverPlot(s *Session, xs []float64, curves []series, yMin, level float64, xLabel string) string {
	floor := math.Max(0, math.Floor((level-0.25)/0.05)*0.05)
	lo, hi := niceRange(math.Max(floor, math.Min(yMin, level)), 1, 0.05, 0, 1)
	note := ""
	if yMin < lo {
		note = "; lower values drawn on the bottom row"
	}
	ch := chart{xs: xs, series: curves, yLo: lo, yHi: hi, ref: level, height: 12, ascii: s.Set.ASCII, width: s.Set.Width, digits: 3, xLabel: xLabel}
	return "coverage (line at the level " + pct(level) + note + ")\n" + ch.render()
}

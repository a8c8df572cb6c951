package repl

import (
	"context"
	"errors"
	"io"
	"os"
	"strconv"
	"strings"

	"github.com/kofnlab/kofn/interval"
	"github.com/kofnlab/kofn/test"
)

var strataMethods = []string{"cmh", "cmh-cc", "exact"}

var strataEffects = []string{"odds", "odds-score", "ratio", "ratio-score", "difference", "difference-score"}

func strataCommand() *command {
	return &command{
		Name:    "strata",
		Group:   "tests",
		Summary: "two groups compared within strata (sites, weeks, devices): Cochran-Mantel-Haenszel, common effect, homogeneity",
		Usage:   "strata K1/N1:K2/N2 [K1/N1:K2/N2 ...] | strata file=F [by=COLUMN] [method=M] [effect=E] [weights=W] [homogeneity=H] [alt=A] [rule=R] [midp=on] [level=L]",
		Methods: strataMethods,
		Options: []opt{optMethod("test", strataMethods),
			{Name: "effect", Doc: "the common effect shown: odds (odds ratio, default), odds-score (odds ratio, stratified Miettinen-Nurminen score interval), ratio (risk ratio p1/p2, Mantel-Haenszel with the Greenland-Robins variance), ratio-score (p1/p2, stratified Miettinen-Nurminen score interval), difference (p1 - p2, Mantel-Haenszel with Sato's variance), difference-score (p1 - p2, stratified Miettinen-Nurminen score interval)", Values: strataEffects},
			{Name: "weights", Doc: "the stratum weights of effect=difference-score, ratio-score and odds-score: mh (default), the Mantel-Haenszel weights n1 n2 / (n1 + n2); ivs, inverse-variance score weights recomputed at every value tried (for the difference, a stratum with no successes, or only successes, in both groups then keeps 0 inside the interval)", Values: strataWeights},
			{Name: "homogeneity", Doc: "the test that the strata share one odds ratio: breslow-day (default; with Tarone's correction) or zelen (Zelen's exact test given every stratum's margins; refused with a message when too large, then use breslow-day)", Values: strataHomogeneity},
			{Name: "file", Doc: "a CSV file with one stratum per row in columns k1, n1, k2, n2 (a header row names them)"},
			{Name: "by", Doc: "with file=: a column whose values group the rows into separate analyses"},
			optAlt("two-sided (default); higher: group 1's odds are higher in every stratum; lower: lower"),
			optRule, optMidP, optLevel},
		Help: helpText{
			Computes: "One answer for a comparison of group 1 (K1 of N1) with group 2 (K2 of N2) split into strata, " +
				"each written K1/N1:K2/N2: the p-value for H0 the odds ratio is 1 in every stratum, the common " +
				"effect across the strata with its interval, and the Breslow-Day test (with Tarone's correction) of " +
				"whether the strata share one odds ratio; a warning says when they do not, since a common effect " +
				"then summarises strata that differ. With file= the strata are rows of a CSV file; by= runs one " +
				"analysis per value of a key column; each FILE strata by=COLUMN writes the same analyses as CSV, " +
				"one row per key. " + cautionSides,
			Methods: "cmh (default): the Cochran-Mantel-Haenszel chi-square; cmh-cc: with continuity correction; " +
				"exact: the exact conditional test (the sum of the strata's first cells given every stratum's " +
				"margins, by convolution), with rule= and midp=, and the exact conditional interval and estimate of " +
				"the common odds ratio. Common effects by Mantel-Haenszel: odds ratio with the Robins-Breslow-" +
				"Greenland variance, risk ratio with the Greenland-Robins variance, risk difference with Sato's. " +
				"difference-score, ratio-score and odds-score: the stratified Miettinen-Nurminen score intervals, with weights=mh " +
				"(Mantel-Haenszel weights, default) or weights=ivs (inverse-variance score weights recomputed at every " +
				"value tried, one of the weightings Tang 2020 studies, as recalled). Homogeneity: homogeneity=breslow-day " +
				"(default) or homogeneity=zelen, Zelen's exact test given every stratum's margins and the total of the " +
				"first cells, feasible to about a dozen strata of moderate size.",
			Assumptions: "Independent trials within each stratum; the strata defined before seeing the outcome. The " +
				"asymptotic test needs a total variance of about 5 or more (common practice); the exact test has no " +
				"such need.",
			Examples: []string{"strata 12/30:6/28 8/25:5/27 15/40:9/38", "strata 12/30:6/28 8/25:5/27 15/40:9/38 method=exact",
				"strata 12/30:6/28 8/25:5/27 15/40:9/38 effect=difference",
				"strata 9/12:4/10 40/150:22/160 3/30:1/25 70/90:55/95 effect=difference-score weights=ivs",
				"strata 6/10:2/10 5/9:1/8 1/8:6/9 homogeneity=zelen"},
			Sources: "Cochran WG (1954), Biometrics 10:417-451; Mantel N, Haenszel W (1959), JNCI 22:719-748; Robins J, " +
				"Breslow N, Greenland S (1986), Biometrics 42:311-323; Greenland S, Robins JM (1985), Biometrics " +
				"41:55-68; Sato T (1989), Biometrics 45:1323-1324; Breslow NE, Day NE (1980), Statistical Methods in " +
				"Cancer Research I; Tarone RE (1985), Biometrika 72:91-95; Miettinen O, Nurminen M (1985), Statistics in Medicine 4:213-226; " +
				"Tang Y (2020), Statistics in Medicine 39:3427-3457 (recalled); Zelen M (1971), Biometrika 58:129-137.",
			Caution: true,
		},
		Run:     runStrata,
		Grouped: strataGroups,
	}
}

// strataResult is what strata reports for one group of strata.
type strataResult struct {
	Group       string            `json:"group,omitempty"`
	Strata      int               `json:"strata"`
	Test        test.Result       `json:"test"`
	Common      interval.Interval `json:"common"`
	Homogeneity *test.Result      `json:"homogeneity,omitempty"`
}

// parseStratum reads K1/N1:K2/N2.
func parseStratum(tok string) (interval.Stratum, error) {
	a, b, ok := strings.Cut(tok, ":")
	if !ok {
		return interval.Stratum{}, inputErr(tok, "is not a stratum; write K1/N1:K2/N2, like 12/30:6/28")
	}
	k1, n1, err := parseKN(a)
	if err != nil {
		return interval.Stratum{}, inputErr(tok, "has group 1 "+strconv.Quote(a)+", which "+reasonOf(err))
	}
	k2, n2, err := parseKN(b)
	if err != nil {
		return interval.Stratum{}, inputErr(tok, "has group 2 "+strconv.Quote(b)+", which "+reasonOf(err))
	}
	return interval.Stratum{K1: k1, N1: n1, K2: k2, N2: n2}, nil
}

// readStrataFile reads strata from a CSV file with columns k1, n1, k2, n2
// and, with by, a key column; it returns the groups in order of first
// appearance.
func readStrataFile(path, by string) (keys []string, groups map[string][]interval.Stratum, err error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, nil, inputErr("file="+path, "cannot be read: "+errors.Unwrap(err).Error())
	}
	defer f.Close()
	r := newCSVReader(f)
	head, err := r.next()
	if err != nil || head.err != nil {
		return nil, nil, inputErr("file="+path, "has no header row naming k1, n1, k2, n2")
	}
	col := map[string]int{}
	for i, h := range head.fields {
		col[strings.ToLower(strings.TrimSpace(h))] = i
	}
	need := []string{"k1", "n1", "k2", "n2"}
	if by != "" {
		need = append(need, strings.ToLower(by))
	}
	var missing []string
	for _, c := range need {
		if _, ok := col[c]; !ok {
			missing = append(missing, c)
		}
	}
	if len(missing) > 0 {
		return nil, nil, inputErr("file="+path, "lacks the column(s) "+strings.Join(missing, ", ")+" in its header row")
	}
	groups = map[string][]interval.Stratum{}
	for {
		rec, err := r.next()
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, nil, inputErr("file="+path, "cannot be read: "+err.Error())
		}
		line := "file " + path + " line " + strconv.Itoa(rec.line)
		if rec.err != nil {
			return nil, nil, inputErr(line, rec.err.Error())
		}
		var v [4]int64
		for i, c := range need[:4] {
			j := col[c]
			if j >= len(rec.fields) {
				return nil, nil, inputErr(line, "has no "+c+" field")
			}
			n, err := parseCount(strings.TrimSpace(rec.fields[j]))
			if err != nil {
				return nil, nil, inputErr(line, "column "+c+": "+err.Error())
			}
			v[i] = n
		}
		key := ""
		if by != "" {
			if j := col[strings.ToLower(by)]; j < len(rec.fields) {
				key = strings.TrimSpace(rec.fields[j])
			}
		}
		if _, seen := groups[key]; !seen {
			keys = append(keys, key)
		}
		groups[key] = append(groups[key], interval.Stratum{K1: v[0], N1: v[1], K2: v[2], N2: v[3]})
	}
	if len(keys) == 0 {
		return nil, nil, inputErr("file="+path, "has no data rows")
	}
	return keys, groups, nil
}

// strataSettings are the options of strata, read once and applied to
// every group of strata.
type strataSettings struct {
	cmh         test.CMHOptions
	effect      string
	weights     interval.ScoreWeights
	homogeneity string // "breslow-day" or "zelen"
	sideText    string
}

var strataWeights = []string{"mh", "ivs"}

var strataHomogeneity = []string{"breslow-day", "zelen"}

// readStrataSettings reads the options of strata (and of each ... strata).
func readStrataSettings(c *call) (strataSettings, error) {
	a := c.Args
	var st strataSettings
	m, err := c.Method()
	if err != nil {
		return st, err
	}
	if st.effect, err = a.Choice("effect", "odds", strataEffects...); err != nil {
		return st, err
	}
	w, err := a.Choice("weights", "mh", strataWeights...)
	if err != nil {
		return st, err
	}
	if w == "ivs" {
		if !strings.HasSuffix(st.effect, "-score") {
			return st, inputErr("weights="+w, "applies to effect=difference-score, effect=ratio-score or effect=odds-score")
		}
		st.weights = interval.WeightsInverseVariance
	}
	if st.homogeneity, err = a.Choice("homogeneity", "breslow-day", strataHomogeneity...); err != nil {
		return st, err
	}
	alt, sideText, err := readAlt(a, test.TwoSided)
	if err != nil {
		return st, err
	}
	rule, midp, err := readExact(a)
	if err != nil {
		return st, err
	}
	if m != "exact" && (a.Has("rule") || midp) {
		return st, inputErr("method="+m, "takes no rule= or midp=; those apply to method=exact")
	}
	level, err := c.Level()
	if err != nil {
		return st, err
	}
	st.cmh = test.CMHOptions{Alternative: alt, Exact: m == "exact", Correction: m == "cmh-cc", Rule: rule, MidP: midp, Level: level}
	st.sideText = sideText
	return st, nil
}

// analyse runs the test, the common effect and (with two strata or more)
// the homogeneity test on one group of strata.
func (st strataSettings) analyse(ctx context.Context, key string, ts []interval.Stratum) (strataResult, error) {
	r, err := test.CMH(ctx, ts, st.cmh)
	if err != nil {
		return strataResult{}, err
	}
	co := interval.CommonOptions{Level: st.cmh.Level}
	var common interval.Interval
	switch st.effect {
	case "ratio":
		common, err = interval.CommonRiskRatio(ctx, ts, co)
	case "difference":
		common, err = interval.CommonRiskDifference(ctx, ts, co)
	case "ratio-score":
		co.Method, co.Weights = interval.CommonStratifiedScore, st.weights
		common, err = interval.CommonRiskRatio(ctx, ts, co)
	case "difference-score":
		co.Method, co.Weights = interval.CommonStratifiedScore, st.weights
		common, err = interval.CommonRiskDifference(ctx, ts, co)
	case "odds-score":
		co.Method, co.Weights = interval.CommonStratifiedScore, st.weights
		common, err = interval.CommonOddsRatio(ctx, ts, co)
	default:
		if st.cmh.Exact && r.Interval != nil {
			common = *r.Interval
		} else {
			common, err = interval.CommonOddsRatio(ctx, ts, co)
		}
	}
	if err != nil {
		return strataResult{}, err
	}
	res := strataResult{Group: key, Strata: len(ts), Test: r, Common: common}
	if len(ts) > 1 {
		var h test.Result
		if st.homogeneity == "zelen" {
			h, err = test.ZelenExact(ctx, ts)
		} else {
			h, err = test.BreslowDay(ts, test.BreslowDayOptions{})
		}
		if err != nil {
			return strataResult{}, err
		}
		res.Homogeneity = &h
	}
	return res, nil
}

func runStrata(c *call) error {
	a, s := c.Args, c.S
	var keys []string
	groups := map[string][]interval.Stratum{}
	if a.Has("file") {
		if a.Len() > 0 {
			return inputErr(a.Pos(0), "does not go with file=; give the strata inline or in the file")
		}
		var err error
		if keys, groups, err = readStrataFile(a.Str("file", ""), a.Str("by", "")); err != nil {
			return err
		}
	} else {
		if a.Has("by") {
			return inputErr("by="+a.Str("by", ""), "needs file=")
		}
		if a.Len() < 1 {
			return &InputError{Token: "strata", Reason: "needs one or more strata K1/N1:K2/N2; usage: " + a.cmd.Usage}
		}
		keys = []string{""}
		for i := range a.Len() {
			st, err := parseStratum(a.Pos(i))
			if err != nil {
				return err
			}
			groups[""] = append(groups[""], st)
		}
	}
	st, err := readStrataSettings(c)
	if err != nil {
		return err
	}
	var results []strataResult
	for _, key := range keys {
		ts := groups[key]
		res, err := st.analyse(c.Ctx, key, ts)
		if err != nil {
			return err
		}
		r, common := res.Test, res.Common
		title := r.Method + " test of a common odds ratio 1 across " + strataWord(len(ts)) + ", " + st.sideText
		if key != "" {
			title = a.Str("by", "") + " = " + key + ": " + title
		}
		b := c.Block(title)
		b.Row("p-value", s.logNum(r.LogPValue))
		b.Row("statistic", r.Statistic.Name+" = "+s.stat(r.Statistic.Value))
		b.Row(common.Parameter, s.num(common.Estimate), common.Method)
		b.Row(pct(common.Level)+" interval", s.num(common.Lower)+" to "+s.num(common.Upper))
		if h := res.Homogeneity; h != nil {
			b.Row("homogeneity", "p = "+s.num(h.PValue), h.Method+" test that the strata share one odds ratio")
		}
		b.Warn(r.Warnings...)
		b.Warn(common.Warnings...)
		if h := res.Homogeneity; h != nil {
			b.Warn(h.Warnings...)
		}
		results = append(results, res)
	}
	if len(results) == 1 {
		c.Data(results[0])
	} else {
		c.Data(results)
	}
	return a.Check()
}

var trendMethods = []string{"asymptotic", "exact"}

func trendCommand() *command {
	return &command{
		Name:    "trend",
		Group:   "tests",
		Summary: "trend in proportions across ordered groups (doses, levels): Cochran-Armitage",
		Usage:   "trend K1/N1 K2/N2 [K3/N3 ...] [scores=S1,S2,...] [method=M] [alt=A] [midp=on]",
		Methods: trendMethods,
		Options: []opt{optMethod("test", trendMethods),
			{Name: "scores", Doc: "the groups' scores in order (doses, levels), like 0,1,2,4; default 0, 1, 2, ..."},
			optAlt("two-sided (default); higher: the proportion rises with the score; lower: it falls"), optMidP},
		Help: helpText{
			Computes: "Whether the success proportion rises or falls with an ordered score across groups, each " +
				"K/N in score order: the Cochran-Armitage statistic z, its p-value, and the slope of the " +
				"proportion against the score. More powerful than a test of equal proportions when the " +
				"groups are ordered. " + cautionSides,
			Methods: "asymptotic (default): z against the normal; exact: the exact conditional test given the total " +
				"number of successes (whole-number scores), with midp= for its mid-p version.",
			Assumptions: "Independent trials; scores fixed before seeing the data (the p-value depends on them).",
			Examples:    []string{"trend 2/40 5/40 9/40 14/40", "trend 10/50 12/45 20/60 18/40 30/55 scores=0,1,2,4,8", "trend 0/10 1/10 4/10 method=exact alt=higher"},
			Sources:     "Cochran WG (1954), Biometrics 10:417-451; Armitage P (1955), Biometrics 11:375-386; Agresti A (2002), Categorical Data Analysis, 2nd ed., section 5.3.5.",
		},
		Run: runTrend,
	}
}

func runTrend(c *call) error {
	a, s := c.Args, c.S
	x, n, err := armCounts(a)
	if err != nil {
		return err
	}
	m, err := c.Method()
	if err != nil {
		return err
	}
	alt, sideText, err := readAlt(a, test.TwoSided)
	if err != nil {
		return err
	}
	midp, err := a.Choice("midp", "off", onOffWords...)
	if err != nil {
		return err
	}
	if midp == "on" && m != "exact" {
		return inputErr("midp=on", "applies to method=exact")
	}
	var scores []float64
	if a.Has("scores") {
		for _, w := range strings.Split(a.Str("scores", ""), ",") {
			v, err := parseFloat(strings.TrimSpace(w))
			if err != nil {
				return inputErr("scores="+a.Str("scores", ""), "has "+strconv.Quote(w)+", which is not a number")
			}
			scores = append(scores, v)
		}
		if len(scores) != len(x) {
			return inputErr("scores="+a.Str("scores", ""), "gives "+strconv.Itoa(len(scores))+" scores for "+strconv.Itoa(len(x))+" groups")
		}
	}
	r, err := test.CochranArmitage(c.Ctx, x, n, test.TrendOptions{Scores: scores, Alternative: alt, Exact: m == "exact", MidP: midp == "on"})
	if err != nil {
		var e *test.Error
		if errors.As(err, &e) && strings.HasPrefix(e.Arg, "Scores") {
			return inputErr("scores="+a.Str("scores", ""), e.Reason)
		}
		return err
	}
	b := c.Block(r.Method + " test, " + sideText)
	for i := range x {
		sc := float64(i)
		if scores != nil {
			sc = scores[i]
		}
		b.Row("group "+strconv.Itoa(i+1), kn(x[i], n[i]), "score "+strconv.FormatFloat(sc, 'g', -1, 64)+", k/n = "+s.num(float64(x[i])/float64(max(n[i], 1))))
	}
	b.Row("p-value", s.logNum(r.LogPValue))
	b.Row("statistic", r.Statistic.Name+" = "+s.stat(r.Statistic.Value))
	b.Row("slope", s.num(r.Estimate), "change of the proportion per unit of score (least squares)")
	b.Warn(r.Warnings...)
	c.Data(r)
	return a.Check()
}

// strataWord returns "1 stratum" or "n strata".
func strataWord(n int) string {
	if n == 1 {
		return "1 stratum"
	}
	return strconv.Itoa(n) + " strata"
}

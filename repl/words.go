package repl

import (
	"context"
	"errors"
	"regexp"
	"strconv"
	"strings"

	"github.com/kofnlab/kofn/internal/argerr"
)

// goWords maps the argument and option-field names that the packages'
// errors use to the words a shell user typed. A command's own entry in
// commandWords wins over this common list. Names the shell has no option
// for (an internal limit, say) become a plain description.
var goWords = map[string]string{
	"Level": "level", "level": "level", "conf": "level", "Confidence": "level",
	"Alpha": "alpha", "alpha": "alpha",
	"Power": "power", "power": "power",
	"Alternative": "alt", "alternative": "alt",
	"MaxN": "upto", "nMax": "upto", "maxN": "upto",
	"MaxSearchN": "the search limit", "MaxTables": "the limit of tables", "MaxWorstN": "the limit",
	"MaxTablesSum": "the limit of tables", "MaxTwoSampleTotal": "the limit", "MaxUnconditionalTotal": "the limit",
	"eps": "d", "halfWidth": "d", "HalfWidth": "d",
	"BergerBoos": "berger-boos", "Method": "method", "method": "method",
	"Correction": "correction", "Variance": "variance", "Hypothesis": "hypothesis", "Margin": "margin",
	"Ratio": "ratio", "Rule": "rule", "Side": "bound", "Interval.Side": "bound",
	"Lot": "lot", "lot": "lot", "SampleSize": "n", "AcceptNumber": "c",
	"ProducerRisk": "producer", "ConsumerRisk": "consumer",
	"reliability": "rel", "r": "rel", "failures": "fails",
	"p10": "yn", "p01": "ny", "p12": "yn", "p21": "ny",
	"p0": "p", "oddsRatio": "odds",
}

// commandWords holds the words of commands whose options differ from
// the common list.
var commandWords = map[string]map[string]string{
	"detect":  {"p1": "truth", "n": "n"},
	"size":    {"p1": "truth"},
	"urn":     {"total": "total", "marked": "marked", "draws": "draws", "psi": "odds"},
	"cut":     {"q": "q"},
	"simon":   {"p0": "p0", "p1": "p1", "MaxN": "upto"},
	"interim": {"p0": "p0", "p1": "p1", "p2": "p2", "maxN": "upto", "looks": "looks"},
	"watch": {"p0": "p0", "p1": "p1", "theta1": "theta", "MaxN": "max", "PlannedN": "planned", "PlannedP": "guess",
		"delta0": "delta", "beta": "beta", "Tau2": "tau2"},
	"alarm": {"p0": "p0", "p1": "p1", "h": "h", "arl0": "arl0", "Unit": "unit", "Shift": "shift", "Threshold": "the limit"},
	"strata": {"BreslowDay": "homogeneity=breslow-day (the Breslow-Day-Tarone test)", "MaxZelenCells": "the exact test's table limit",
		"MaxZelenWork": "the exact test's work limit", "MaxScoreStrata": "the score method's limit",
		"CommonMantelHaenszel": "effect=difference or effect=ratio (Mantel-Haenszel)"},
}

// shellWord returns the shell's word for the Go name name in verb.
func shellWord(verb, name string) (string, bool) {
	if w, ok := commandWords[verb][name]; ok {
		return w, true
	}
	w, ok := goWords[name]
	return w, ok
}

// identRE matches identifier-like words (and a dotted pair such as
// Interval.Side) inside a package's message.
var identRE = regexp.MustCompile(`[A-Za-z_][A-Za-z0-9_]*(\.[A-Z][A-Za-z0-9_]*)?`)

// noisyRE matches decimals with more digits than a user typed, such as
// 0.9999989999999999 or -0.011999999999999997, left by float arithmetic.
var noisyRE = regexp.MustCompile(`-?[0-9]*\.[0-9]{12,}(e[+-]?[0-9]+)?`)

// shellError is the text of err for a shell user: an error of the kofn
// packages loses its Go function name, and its Go argument and field
// names become the shell's option words, written as the user types them
// ("c=11 is not below n=10", "raise upto="); float noise is rounded to 12
// significant digits. Other errors keep their text.
func shellError(t *table, verb string, err error) string {
	verb = strings.ToLower(verb)
	if errors.Is(err, context.Canceled) {
		return "stopped (interrupted); nothing was lost, the session continues"
	}
	var ae *argerr.Error
	if !errors.As(err, &ae) {
		return strings.ReplaceAll(err.Error(), "\n", " ")
	}
	msg := ae.Reason
	if ae.Arg != "" {
		// "n = 0 is 0; a proportion needs ..." reads "n = 0: a proportion needs ...".
		reason := ae.Reason
		if r, ok := strings.CutPrefix(reason, "is "+ae.Value+"; "); ok {
			reason = ": " + r
		} else {
			reason = " " + reason
		}
		msg = ae.Arg + " = " + ae.Value + reason
	}
	return denoise(translate(verb, msg))
}

// assignRE matches "Name = value" in a package's message.
var assignRE = regexp.MustCompile(`\b([A-Za-z_][A-Za-z0-9_]*(?:\.[A-Z][A-Za-z0-9_]*)?) = (-?[0-9][0-9.e+-]*|"[^"]*")`)

// translate replaces the Go names in msg by shell words: "Name = v"
// becomes "word=v" when the shell has an option for it, a bare Go-only
// name becomes "word=", and every other word stays as it is.
func translate(verb, msg string) string {
	msg = strings.ReplaceAll(msg, "up to MaxN = ", "up to the search limit MaxN = ")
	msg = assignRE.ReplaceAllStringFunc(msg, func(m string) string {
		sub := assignRE.FindStringSubmatch(m)
		w, ok := shellWord(verb, sub[1])
		switch {
		case !ok:
			return m
		case strings.Contains(w, " "):
			return w + " " + sub[2]
		}
		return w + "=" + sub[2]
	})
	return identRE.ReplaceAllStringFunc(msg, func(id string) string {
		w, ok := shellWord(verb, id)
		if !ok || w == id || id == strings.ToLower(id) && !isGoOnly(id) {
			return id // not a Go name, or already the shell's word
		}
		if strings.Contains(w, " ") {
			return w
		}
		return w + "="
	})
}

// denoise rounds every over-long decimal in msg to 12 significant digits.
func denoise(msg string) string {
	return noisyRE.ReplaceAllStringFunc(msg, func(num string) string {
		v, err := strconv.ParseFloat(num, 64)
		if err != nil {
			return num
		}
		return strconv.FormatFloat(v, 'g', 12, 64)
	})
}

// isGoOnly reports whether a lowercase name can only be a Go identifier
// (so replacing it inside prose is safe).
func isGoOnly(id string) bool {
	switch id {
	case "eps", "nMax", "maxN", "halfWidth", "oddsRatio", "p10", "p01", "p12", "p21", "p0":
		return true
	}
	return false
}

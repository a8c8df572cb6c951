package repl

import (
	"math"
	"regexp"
	"strconv"
	"strings"
)

// decimalRE is the only number shape the shell accepts: an optional sign,
// decimal digits with an optional fraction, and an optional decimal
// exponent. It excludes nan, inf, hexadecimal floats and digit separators,
// all of which strconv.ParseFloat would otherwise accept or misread.
var decimalRE = regexp.MustCompile(`^[+-]?([0-9]+(\.[0-9]*)?|\.[0-9]+)([eE][+-]?[0-9]+)?$`)

// numberProblem explains why tok is not a plain decimal number, naming the
// rule it breaks.
func numberProblem(tok string) string {
	low := strings.ToLower(strings.TrimLeft(tok, "+-"))
	switch {
	case tok == "":
		return "is empty; write a number"
	case strings.HasPrefix(low, "nan"):
		return "is not a number; NaN is not accepted"
	case strings.HasPrefix(low, "inf"):
		return "is infinite; write a finite number"
	case strings.HasPrefix(low, "0x") || strings.HasPrefix(low, "0b") || strings.HasPrefix(low, "0o"):
		return "is not decimal; hexadecimal, binary and octal numbers are not accepted"
	case strings.ContainsAny(tok, "_,'") && decimalRE.MatchString(strings.NewReplacer("_", "", ",", "", "'", "").Replace(tok)):
		return "contains a digit separator; write the digits without _ , or '"
	}
	return "is not a number; write a plain decimal like 0.3 or 1e-6"
}

// parseFloat reads a finite decimal number, rejecting every other spelling.
func parseFloat(tok string) (float64, error) {
	if !decimalRE.MatchString(tok) {
		return 0, inputErr(tok, numberProblem(tok))
	}
	v, err := strconv.ParseFloat(tok, 64)
	if err != nil || math.IsInf(v, 0) {
		return 0, inputErr(tok, "is too large to represent")
	}
	return v, nil
}

// parseProb reads a probability in [0, 1], written as a decimal or as a
// percentage ("2.5%").
func parseProb(tok string) (float64, error) {
	v, pct, err := parsePercent(tok)
	if err != nil {
		return 0, err
	}
	if !(v >= 0 && v <= 1) {
		if !pct && v >= 10 && v <= 100 {
			return 0, inputErr(tok, "is not a probability in [0, 1]; for a percentage write "+tok+"%")
		}
		return 0, inputErr(tok, "is not a probability in [0, 1]")
	}
	return v, nil
}

// parseOpenProb reads a probability strictly inside (0, 1); used for
// confidence levels, targets of power and similar.
func parseOpenProb(tok string) (float64, error) {
	v, pct, err := parsePercent(tok)
	if err != nil {
		return 0, err
	}
	if !(v > 0 && v < 1) {
		if !pct && v >= 10 && v < 100 {
			return 0, inputErr(tok, "must lie strictly between 0 and 1; for a percentage write "+tok+"%")
		}
		return 0, inputErr(tok, "must lie strictly between 0 and 1 (or 0% and 100%)")
	}
	return v, nil
}

// parsePercent reads a decimal with an optional trailing %, returning the
// value as a fraction and whether it was written as a percentage.
func parsePercent(tok string) (float64, bool, error) {
	body, pct := strings.CutSuffix(tok, "%")
	v, err := parseFloat(body)
	if err != nil {
		return 0, false, inputErr(tok, reasonOf(err))
	}
	if pct {
		v /= 100
	}
	return v, pct, nil
}

// parseCount reads a non-negative whole number. Integer-valued decimals
// such as 1e6 are accepted; fractions and values beyond 2^53 are not.
func parseCount(tok string) (int64, error) {
	if tok != "" && strings.Trim(tok, "0123456789") == "" {
		v, err := strconv.ParseInt(tok, 10, 64)
		if err != nil || v > 1<<53 {
			return 0, inputErr(tok, "is too large; counts go up to 2^53 = 9007199254740992")
		}
		return v, nil
	}
	v, err := parseFloat(tok)
	if err != nil {
		return 0, err
	}
	switch {
	case v < 0:
		return 0, inputErr(tok, "is negative; counts are 0 or more")
	case v != math.Trunc(v):
		return 0, inputErr(tok, "is not a whole number; counts are whole numbers")
	case v > 1<<53:
		return 0, inputErr(tok, "is too large; counts go up to 2^53 = 9007199254740992")
	}
	return int64(v), nil
}

// parseKN reads a count pair "k/n": k successes in n trials, 0 <= k <= n.
func parseKN(tok string) (k, n int64, err error) {
	ks, ns, ok := strings.Cut(tok, "/")
	switch {
	case !ok:
		return 0, 0, inputErr(tok, "is not a count; write successes/trials, like 17/40")
	case ks == "":
		return 0, 0, inputErr(tok, "lacks the number of successes before /")
	case ns == "":
		return 0, 0, inputErr(tok, "lacks the number of trials after /")
	case strings.Contains(ns, "/"):
		return 0, 0, inputErr(tok, "has more than one /; write successes/trials, like 17/40")
	}
	if k, err = parseCount(ks); err != nil {
		return 0, 0, inputErr(tok, "has successes "+ks+", which "+reasonOf(err))
	}
	if n, err = parseCount(ns); err != nil {
		return 0, 0, inputErr(tok, "has trials "+ns+", which "+reasonOf(err))
	}
	if k > n {
		return 0, 0, inputErr(tok, "has more successes than trials ("+ks+" > "+ns+")")
	}
	return k, n, nil
}

// parseRange reads "lo..hi" (both whole numbers, lo <= hi) or a single
// whole number (lo = hi).
func parseRange(tok string) (lo, hi int64, err error) {
	a, b, ok := strings.Cut(tok, "..")
	if !ok {
		v, err := parseCount(tok)
		return v, v, err
	}
	if lo, err = parseCount(a); err != nil {
		return 0, 0, inputErr(tok, "starts with "+a+", which "+reasonOf(err))
	}
	if hi, err = parseCount(b); err != nil {
		return 0, 0, inputErr(tok, "ends with "+b+", which "+reasonOf(err))
	}
	if lo > hi {
		return 0, 0, inputErr(tok, "is an empty range; write low..high")
	}
	return lo, hi, nil
}

// reasonOf returns the reason of an input error (the part after the token).
func reasonOf(err error) string {
	if ie, ok := err.(*InputError); ok {
		return ie.Reason
	}
	return err.Error()
}

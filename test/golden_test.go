package test

import (
	"math"
	"testing"

	"github.com/kofnlab/kofn/interval"
)

// alt reads an alternative written in a golden file, whose generators use
// the reference libraries' words "less" and "greater" for Lower and Higher.
func alt(t *testing.T, s string) Alternative {
	t.Helper()
	switch s {
	case "less":
		return Lower
	case "greater":
		return Higher
	}
	a, err := ParseAlternative(s)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

// relClose reports |got - want| <= rel |want| (margin 0), or both zero.
func relClose(got, want, rel float64) bool {
	return got == want || math.Abs(got-want) <= rel*math.Abs(want)
}

// checkInterval compares an attached interval with a reference one, to
// abs (the references print interval ends at about 1e-15 absolute).
func checkInterval(t *testing.T, what string, iv *interval.Interval, lo, hi, abs float64) {
	t.Helper()
	if iv == nil || math.Abs(iv.Lower-lo) > abs || math.Abs(iv.Upper-hi) > abs {
		t.Errorf("%s: interval %+v, want [%v, %v]", what, iv, lo, hi)
	}
}

package repl

import (
	"context"
	"strings"
	"testing"

	"github.com/kofnlab/kofn/interval"
)

func TestSettingsPersist(t *testing.T) {
	t.Parallel()
	s, out, errw := testSession()
	ctx := context.Background()
	for _, line := range []string{"set level=90% digits=3 bounds=jeffreys", "bounds 17/40"} {
		if err := s.Run(ctx, line); err != nil {
			t.Fatalf("%s: %v %s", line, err, errw.String())
		}
	}
	want, _ := interval.Proportion(17, 40, interval.Options{Level: 0.9, Method: interval.Jeffreys})
	text := out.String()
	for _, frag := range []string{"Jeffreys interval for p, 90% two-sided", formatNum(want.Lower, 3) + " to " + formatNum(want.Upper, 3)} {
		if !strings.Contains(text, frag) {
			t.Errorf("output lacks %q:\n%s", frag, text)
		}
	}
	// A bad setting changes nothing.
	if err := s.Run(ctx, "set digits=5 level=2"); err == nil || s.Set.Digits != 3 || s.Set.Level != 0.9 {
		t.Errorf("bad set: err %v, digits %d, level %v", err, s.Set.Digits, s.Set.Level)
	}
	out.Reset()
	if err := s.Run(ctx, "set"); err != nil || !strings.Contains(out.String(), "bounds  jeffreys") {
		t.Errorf("set listing:\n%s", out.String())
	}
}

func TestPairsMatchPackage(t *testing.T) {
	t.Parallel()
	d, _ := interval.PairedDifference(1, 1, 7, 12, interval.PairedOptions{Method: interval.PairedTango})
	obj := runJSON(t, "pairs 1 1 7 12 method=tango")
	if got := num(t, obj, "lower"); got != d.Lower {
		t.Errorf("Tango lower %v, package %v", got, d.Lower)
	}
	r, _ := interval.DiscordantRatio(12, 4, interval.Options{Method: interval.ClopperPearson})
	if got := num(t, runJSON(t, "pairs 30 12 4 54 measure=ratio method=clopper-pearson"), "upper"); got != r.Upper {
		t.Errorf("discordant ratio upper %v, package %v", got, r.Upper)
	}
}

func TestTourRunsEveryStep(t *testing.T) {
	t.Parallel()
	out, stderr, failed := runScript(t, "tour")
	if failed != 0 || stderr != "" {
		t.Fatalf("tour failed: %s", stderr)
	}
	for _, st := range tourSteps(tbl) {
		if !strings.Contains(out, "kofn> "+st.line) {
			t.Errorf("tour output lacks step %q", st.line)
		}
	}
	for _, verb := range []string{"spread", "bounds", "gap", "versus", "size"} {
		if !strings.Contains(out, "kofn> "+verb) {
			t.Errorf("tour does not show %s", verb)
		}
	}
	if !strings.Contains(out, "invented") {
		t.Error("tour does not say its data are invented")
	}
}

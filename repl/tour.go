package repl

import (
	"io"
	"strings"
)

func tourCommand() *command {
	return &command{
		Name:    "tour",
		Group:   "session",
		Summary: "a walk-through of one invented study, from the spread of k/n to a sample-size plan",
		Usage:   "tour",
		Help: helpText{
			Computes: "Runs one invented scenario end to end, printing each command before its result so it " +
				"can be retyped with other numbers: the sampling distribution of k/n, an interval for one " +
				"proportion, a comparison of two groups, and a sample-size plan with its sawtooth.",
			Examples: []string{"tour"},
		},
		Run: runTour,
	}
}

// tourStep is one step of the walk-through: a note for the reader, then a
// command line run through the session.
type tourStep struct{ note, line string }

// tourSteps is the invented scenario. Its steps use only the table's
// commands; each is run exactly as a user would type it.
func tourSteps(t *table) []tourStep {
	steps := []tourStep{
		{"Invented scenario. A bakery's web shop tries a new checkout page: of 40 visitors who saw it,\n" +
			"17 ordered. Last week's page had 9 orders from 38 visitors.\n\n" +
			"1. Before looking at the data: if the true order rate were 30%, how much would the count of\n" +
			"   orders in 40 visits vary by chance alone?", "spread n=40 p=0.3"},
	}
	if t.get("bounds") != nil {
		steps = append(steps, tourStep{"2. What order rate do 17 of 40 support? A 95% interval (Wilson, the default):", "bounds 17/40"})
	} else {
		steps = append(steps, tourStep{"2. What order rate do 17 of 40 support? The interval that inverts the exact test:", "check 17/40 p=0.3"})
	}
	if t.get("gap") != nil {
		steps = append(steps, tourStep{"3. Is the new page better than last week's 9 of 38? The difference of the rates:", "gap 17/40 9/38"})
	}
	versusNote := "   And an exact test of equal rates (Boschloo's unconditional test):"
	if t.get("gap") == nil {
		versusNote = "3. Is the new page better than last week's 9 of 38? An exact test of equal rates (Boschloo's):"
	}
	steps = append(steps,
		tourStep{versusNote, "versus 17/40 9/38 method=boschloo"},
		tourStep{"4. The comparison is inconclusive at this size. How many visitors per page would give an 80%\n" +
			"   chance of detecting 42% against 24%, at the 5% level?", "size p1=0.42 p2=0.24"},
		tourStep{"5. For one page against a fixed 24% benchmark, exact power jumps up and down as n grows\n" +
			"   (the sawtooth), so the first n that reaches 80% is not always safe:", "size p=0.24 truth=0.42"},
	)
	return steps
}

func runTour(c *call) error {
	if err := c.Args.Want(0, 0); err != nil {
		return err
	}
	s := c.S
	for i, st := range tourSteps(s.cmds) {
		if !s.jsonOut() {
			if i > 0 {
				io.WriteString(s.Out, "\n")
			}
			io.WriteString(s.Out, st.note+"\n\n  kofn> "+st.line+"\n\n")
		}
		if err := s.Run(c.Ctx, st.line); err != nil {
			return err
		}
	}
	if !s.jsonOut() {
		io.WriteString(s.Out, "\n"+strings.TrimSpace(wrapText("That is the whole job: distribution, interval, comparison, plan. "+
			"The data were invented. help NAME explains any command. "+caution, max(50, s.Set.Width), ""))+"\n")
	}
	return nil
}

package repl_test

import (
	"context"
	"os"

	"github.com/kofnlab/kofn/repl"
)

// An embedder runs shell lines through a Session of its own; the counts
// are invented.
func ExampleSession_Run() {
	s := repl.NewSession(os.Stdout, os.Stdout)
	s.Set.Digits = 3
	s.Run(context.Background(), "bounds 17/40 method=clopper-pearson")
	// Output:
	// Clopper-Pearson interval for p, 95% two-sided
	//   observed  17/40  k/n = 0.425
	//   interval  0.270 to 0.591
	//   width     0.321
}

// Command kofn is the kofn shell: binomial inference from k successes in n
// trials at a prompt, in scripts (standard input) and in CSV batches. Run
// it and type help, or tour for a walk-through of an invented example.
//
//	kofn                       interactive on a terminal
//	kofn < commands.txt        run a script; exit status 1 if a line failed
//	kofn -c 'bounds 17/40'     run one command
package main

import (
	"os"

	"github.com/kofnlab/kofn/repl"
)

func main() { os.Exit(repl.Main(os.Args[1:], os.Stdin, os.Stdout, os.Stderr)) }

//go:build !unix

package repl

import "time"

// cpuTime is not measured here; the benchmarks then report 0 CPU time.
func cpuTime() time.Duration { return 0 }

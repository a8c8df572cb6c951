//go:build unix

package power

import (
	"syscall"
	"time"
)

// cpuTime returns the CPU time the process has used, for benchmarks that
// report cpu-ns/op beside the wall clock (on a shared machine the wall
// clock also counts the time spent waiting for a core).
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

//go:build !unix

package power

import "time"

// cpuTime is unavailable here; the cpu-ns/op metric reads 0.
func cpuTime() time.Duration { return 0 }

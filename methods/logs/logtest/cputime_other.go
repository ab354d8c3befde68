//go:build !unix

package logtest

import "time"

// CPUTime is 0 where getrusage(2) is missing: the benchmarks' cpu-ns/op
// then reads 0.
func CPUTime() time.Duration { return 0 }

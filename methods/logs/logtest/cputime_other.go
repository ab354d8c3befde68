//go:build !unix

package logtest

import "time"

// CPUTime is −1 where getrusage(2) is missing: no CPU time is reported.
func CPUTime() time.Duration { return -1 }

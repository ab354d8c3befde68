//go:build unix

package logtest

import (
	"syscall"
	"time"
)

// CPUTime is the process's user and system CPU time so far, all threads
// (getrusage(2)), or −1 where it cannot be read: a benchmark reports it
// per operation (cpu-ns/op), a steadier figure than wall time on a machine
// shared with other work.
func CPUTime() time.Duration {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return -1
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

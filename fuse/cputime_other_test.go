//go:build !unix

package fuse_test

import (
	"testing"
	"time"
)

// cpuTime is −1 where getrusage(2) is not available: no CPU time is
// reported.
func cpuTime(testing.TB) time.Duration { return -1 }

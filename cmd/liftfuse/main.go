// Command liftfuse reconciles on-road evidence of a car's aerodynamic lift
// from several measurement methods. See README.md.
package main

import (
	"os"
	"runtime/debug"
)

// memoryLimit is a soft limit for the Go heap: log reduction streams
// through a few blocks, and collecting garbage before the heap doubles keeps
// the whole process small however long the log (GOMEMLIMIT overrides it).
const memoryLimit = 24 << 20

func main() {
	if os.Getenv("GOMEMLIMIT") == "" {
		debug.SetMemoryLimit(memoryLimit)
	}
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

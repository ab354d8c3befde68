// Command liftfuse reconciles on-road evidence of a car's aerodynamic lift
// from several measurement methods. See README.md.
package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"os/signal"
	"runtime/debug"
	"syscall"

	"liftfuse/report"
)

// readingLimit is a soft limit for the Go heap while logs are read and
// reduced: reduction streams through a few blocks, and collecting garbage
// before the heap doubles keeps the whole process small however long the
// log. fusionLimit replaces it when the fusion starts, whose working set
// grows with the configurations: under the reading limit the collector
// would run almost without pause there (24 configurations: 3.9 s against
// 2.9 s at 64 MiB; measured with GOMEMLIMIT, /usr/bin/time). At 48
// configurations the fusion holds about 55 MB live: 64 MiB left the
// collector little room (user + system 5.3 s, peak RSS 98 MiB), 96 MiB
// takes 4.0 s at 106 MiB (/usr/bin/time -v liftfuse fuse on the campaign
// of sim.ScaleSpec, two runs each). GOMEMLIMIT overrides both.
const (
	readingLimit = 24 << 20
	fusionLimit  = 96 << 20
)

// phasedLimits is true when the command sets the heap limits itself (not
// under GOMEMLIMIT, nor in tests that call run).
var phasedLimits bool

// fusionStarts raises the heap limit to fusionLimit (see readingLimit).
func fusionStarts() {
	if phasedLimits {
		debug.SetMemoryLimit(fusionLimit)
	}
}

func main() {
	if os.Getenv("GOMEMLIMIT") == "" {
		phasedLimits = true
		debug.SetMemoryLimit(readingLimit)
	}
	ctx := onSignal(context.Background(), os.Stderr)
	os.Exit(run(ctx, os.Args[1:], os.Stdout, os.Stderr))
}

// onSignal returns a context done on SIGINT or SIGTERM. On either, it
// removes the temporary files of writes in progress (the outputs already
// in place stay as they were) and exits with exitInterrupted: the work
// under way (reading logs, fusion) does not watch the context, and a
// second Ctrl-C must not be needed.
func onSignal(parent context.Context, stderr io.Writer) context.Context {
	ctx, _ := signal.NotifyContext(parent, os.Interrupt, syscall.SIGTERM)
	go func() {
		<-ctx.Done()
		report.AbortWrites()
		fmt.Fprintf(stderr, "liftfuse: %v: stopped; temporary files removed\n", context.Cause(ctx))
		os.Exit(exitInterrupted)
	}()
	return ctx
}

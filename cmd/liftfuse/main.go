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

// memoryLimit is a soft limit for the Go heap: log reduction streams
// through a few blocks, and collecting garbage before the heap doubles keeps
// the whole process small however long the log (GOMEMLIMIT overrides it).
const memoryLimit = 24 << 20

func main() {
	if os.Getenv("GOMEMLIMIT") == "" {
		debug.SetMemoryLimit(memoryLimit)
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

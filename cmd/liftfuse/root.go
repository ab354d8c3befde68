package main

import (
	"errors"
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"liftfuse/methods/campaign"
)

// Version is the tool's version, printed by --version and written into
// result documents.
const Version = "0.1.0"

// Exit codes, documented in README.md and in `liftfuse --help`.
const (
	exitOK      = 0
	exitFailure = 1 // the run failed: a file could not be written, …
	exitInput   = 2 // bad input: an invalid campaign, bad flags or arguments
)

// inputError marks an error as the user's input (exit 2).
type inputError struct{ err error }

func (e inputError) Error() string { return e.err.Error() }
func (e inputError) Unwrap() error { return e.err }

func badInput(format string, args ...any) error {
	return inputError{fmt.Errorf(format, args...)}
}

// exitCode maps an error to its documented exit code.
func exitCode(err error) int {
	var probs campaign.Problems
	var in inputError
	switch {
	case err == nil:
		return exitOK
	case errors.As(err, &probs), errors.As(err, &in):
		return exitInput
	}
	return exitFailure
}

func newRoot(stdout, stderr io.Writer) *cobra.Command {
	root := &cobra.Command{
		Use:   "liftfuse",
		Short: "Front and rear lift from on-road aero measurements, with honest intervals",
		Long: `liftfuse reconciles on-road evidence of a car's aerodynamic lift or downforce
from ride-height sensors, pressure taps and trailing-vortex sense into front and
rear lift with credible intervals, shows what each method says and where they
disagree, and tells you which measurement to repeat.

Exit codes: 0 ok, 1 the run failed, 2 bad input (invalid campaign, flags or
arguments). Errors name file:line:column.`,
		Version:       Version,
		SilenceUsage:  true,
		SilenceErrors: true,
	}
	root.SetOut(stdout)
	root.SetErr(stderr)
	root.SetFlagErrorFunc(func(_ *cobra.Command, err error) error { return inputError{err} })
	root.AddCommand(newValidateCmd(), newAirCmd(), newInitCmd(), newReduceCmd(), newFuseCmd(), newSimulateCmd(), newPlanCmd(), newCrosscheckCmd(), newReportCmd())
	return root
}

// run executes the command line and returns the exit code; tests call it
// directly.
func run(args []string, stdout, stderr io.Writer) int {
	root := newRoot(stdout, stderr)
	root.SetArgs(args)
	err := root.Execute()
	if err != nil {
		if strings.HasPrefix(err.Error(), "unknown command") || strings.Contains(err.Error(), "arg(s)") {
			err = inputError{err}
		}
		fmt.Fprintln(stderr, "liftfuse:", strings.ReplaceAll(err.Error(), "\n", "\nliftfuse: "))
	}
	return exitCode(err)
}

// argsExactly is cobra.ExactArgs with an input-error type.
func argsExactly(n int, what string) cobra.PositionalArgs {
	return func(_ *cobra.Command, args []string) error {
		if len(args) != n {
			return badInput("want %s, got %d argument(s)", what, len(args))
		}
		return nil
	}
}

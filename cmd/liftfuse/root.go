package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"strings"

	"github.com/spf13/cobra"

	"liftfuse/methods/campaign"
	"liftfuse/report"
)

// Version is the tool's version, printed by --version and written into
// result documents.
const Version = "0.1.0"

// Exit codes, documented in README.md and in `liftfuse --help`.
const (
	exitOK          = 0
	exitFailure     = 1   // the run failed: a file could not be written, an internal error, …
	exitInput       = 2   // bad input: an invalid campaign, bad flags or arguments
	exitInterrupted = 130 // SIGINT or SIGTERM: temporary files removed, old outputs intact
)

// inputError marks an error as the user's input (exit 2).
type inputError struct{ err error }

func (e inputError) Error() string { return e.err.Error() }
func (e inputError) Unwrap() error { return e.err }

func badInput(format string, args ...any) error {
	return inputError{fmt.Errorf(format, args...)}
}

// exitCode maps an error to its documented exit code, by type: campaign
// Problems and inputError are bad input, an interrupted write is
// exitInterrupted; everything else is a failed run.
func exitCode(err error) int {
	var probs campaign.Problems
	var in inputError
	switch {
	case err == nil:
		return exitOK
	case errors.Is(err, report.ErrInterrupted):
		return exitInterrupted
	case errors.As(err, &probs), errors.As(err, &in):
		return exitInput
	}
	return exitFailure
}

// commands is every subcommand; tests replace one with a copy whose runF
// records its options instead of running.
func commands() []*cobra.Command {
	return []*cobra.Command{newValidateCmd(nil), newAirCmd(nil), newInitCmd(nil), newReduceCmd(nil), newFuseCmd(nil),
		newSimulateCmd(nil), newPlanCmd(nil), newCrosscheckCmd(nil), newReportCmd(nil)}
}

func newRoot(stdout, stderr io.Writer, cmds ...*cobra.Command) *cobra.Command {
	root := &cobra.Command{
		Use:   "liftfuse",
		Short: "Front and rear lift from on-road aero measurements, with honest intervals",
		Long: `liftfuse reconciles on-road evidence of a car's aerodynamic lift or downforce
from ride-height sensors, pressure taps and trailing-vortex sense into front and
rear lift with credible intervals, shows what each method says and where they
disagree, and tells you which measurement to repeat.

Exit codes: 0 ok, 1 the run failed (a file could not be written, or an
internal error), 2 bad input (invalid campaign, flags or arguments), 130
interrupted (SIGINT or SIGTERM; no output replaced, no temporary file left).
Errors name file:line:column. Flags taking a word (--paper, --axle, --unit, …)
accept it in any case; --json prints the command's result document on stdout.`,
		Version:       Version,
		SilenceUsage:  true,
		SilenceErrors: true,
		// Unknown commands reach RunE as arguments, so that they are an
		// inputError by type rather than recognised by cobra's message.
		Args: cobra.ArbitraryArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			if len(args) == 0 {
				return cmd.Help()
			}
			return unknownCommand(cmd, args[0])
		},
	}
	root.SetOut(stdout)
	root.SetErr(stderr)
	root.SetFlagErrorFunc(func(_ *cobra.Command, err error) error { return inputError{err} })
	root.AddCommand(cmds...)
	return root
}

// unknownCommand is the error for a first argument that names no command,
// with cobra's suggestions.
func unknownCommand(root *cobra.Command, name string) error {
	msg := fmt.Sprintf("unknown command %q", name)
	if s := root.SuggestionsFor(name); len(s) > 0 {
		msg += "; did you mean " + words(s, "or") + "?"
	}
	return inputError{errors.New(msg + " (see liftfuse --help)")}
}

// run executes the command line and returns the exit code; tests call it
// directly.
func run(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	return execute(ctx, newRoot(stdout, stderr, commands()...), args, stderr)
}

// execute runs root on args. A panic does not reach the user: it becomes
// "internal error, please report" with the input's hash, exit 1.
func execute(ctx context.Context, root *cobra.Command, args []string, stderr io.Writer) (code int) {
	input := "" // the command's file argument, for the hash of a bug report
	root.PersistentPreRun = func(_ *cobra.Command, args []string) {
		if len(args) > 0 {
			input = args[0]
		}
	}
	defer func() {
		if p := recover(); p != nil {
			code = internalError(stderr, p, input)
		}
	}()
	root.SetArgs(args)
	err := root.ExecuteContext(ctx)
	if err != nil {
		fmt.Fprintln(stderr, "liftfuse:", strings.ReplaceAll(err.Error(), "\n", "\nliftfuse: "))
	}
	return exitCode(err)
}

// argsExactly is cobra.ExactArgs with an input-error type.
func argsExactly(n int, what string) cobra.PositionalArgs {
	return func(_ *cobra.Command, args []string) error {
		if len(args) != n {
			return badInput("want %s, got %s", what, report.Count(len(args), "argument"))
		}
		return nil
	}
}

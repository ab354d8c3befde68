package main

import (
	"bufio"
	"io"

	"github.com/spf13/cobra"

	"liftfuse/fuse"
	"liftfuse/methods/checks"
	"liftfuse/report"
)

type reduceOptions struct {
	file  string
	json  bool
	quiet bool
}

func newReduceCmd(runF func(*reduceOptions) error) *cobra.Command {
	var o reduceOptions
	cmd := &cobra.Command{
		Use:   "reduce FILE",
		Short: "Run the method adapters: what each method says on its own",
		Long: `reduce runs every method adapter on its raw data — steady windows of the
ride-height logs, integrated pressure readings, vortex senses — and prints what
each entry says on its own. --json prints a result document with only
"methods" and "warnings" filled.`,
		Example: "  liftfuse reduce examples/ducktail-fastback/campaign.yaml",
		Args:    argsExactly(1, "one campaign file"),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.file = args[0]
			if runF != nil {
				return runF(&o)
			}
			return runReduce(o, cmd.OutOrStdout(), cmd.ErrOrStderr())
		},
	}
	cmd.Flags().BoolVar(&o.json, "json", false, "print the result document (methods and warnings only) as JSON on stdout")
	cmd.Flags().BoolVarP(&o.quiet, "quiet", "q", false, "no progress bar")
	return cmd
}

func runReduce(o reduceOptions, out, stderr io.Writer) error {
	c, r, err := reduce(o.file, o.json, false, o.quiet, stderr, nil)
	if err != nil {
		return err
	}
	res, err := fuse.Standalone(r.Evidence(), settings(c))
	if err != nil {
		return err
	}
	res.Warnings = append(r.Warnings, res.Warnings...)
	res.AddChecks(checks.Run(c, r))
	// One write for the whole text (it is written a cell at a time).
	w := bufio.NewWriter(out)
	if o.json {
		if err := stamp(res, c); err != nil {
			return err
		}
		err = report.WriteJSON(w, res)
	} else { // the text carries no campaign stamp: no input hash to compute
		err = report.ReduceText(w, r, res, c.Report.ForceUnit)
	}
	if ferr := w.Flush(); err == nil {
		err = ferr
	}
	return err
}

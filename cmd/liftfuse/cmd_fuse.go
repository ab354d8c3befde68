package main

import (
	"io"

	"github.com/spf13/cobra"

	"liftfuse/report"
)

type fuseOptions struct {
	file  string
	json  bool
	quiet bool
}

func newFuseCmd(runF func(*fuseOptions) error) *cobra.Command {
	var o fuseOptions
	cmd := &cobra.Command{
		Use:   "fuse FILE",
		Short: "Fused front and rear lift with intervals, deltas, and where methods disagree",
		Long: `fuse runs every method adapter, then computes the joint posterior of every
configuration's front and rear C_L·A together with every nuisance, what each
entry says on its own, and whether it agrees with the others. --json prints the
result document (format liftfuse.result/1).`,
		Example: "  liftfuse fuse examples/ducktail-fastback/campaign.yaml\n  liftfuse fuse examples/ducktail-fastback/campaign.yaml --json > result.json",
		Args:    argsExactly(1, "one campaign file"),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.file = args[0]
			if runF != nil {
				return runF(&o)
			}
			return runFuse(o, cmd.OutOrStdout(), cmd.ErrOrStderr())
		},
	}
	cmd.Flags().BoolVar(&o.json, "json", false, "print the result document as JSON on stdout")
	cmd.Flags().BoolVarP(&o.quiet, "quiet", "q", false, "no progress bar")
	return cmd
}

func runFuse(o fuseOptions, out, stderr io.Writer) error {
	a, err := analyse(o.file, o.quiet, stderr)
	if err != nil {
		return err
	}
	if o.json {
		return report.WriteJSON(out, a.fused.Result)
	}
	return report.FuseText(out, a.fused.Result, a.campaign.Report.ForceUnit)
}

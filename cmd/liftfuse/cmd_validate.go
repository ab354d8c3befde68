package main

import (
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"liftfuse/methods"
	"liftfuse/report"
)

type validateOptions struct {
	file string
}

func newValidateCmd(runF func(*validateOptions) error) *cobra.Command {
	var o validateOptions
	return &cobra.Command{
		Use:   "validate FILE",
		Short: "Load and check a campaign; list every problem with file:line:column",
		Long: `validate loads a campaign file strictly (unknown keys are errors), reads its
logs and tables, checks every rule of campaign format 1, and runs the method
adapters (steady windows, stiffness, tap integration) to catch what only the
data shows. It prints all errors at once, each as file:line:column: path:
message, and exits 2 if there are any; warnings (things to look at, such as a
sensor that scatters ±3 mm) are printed but do not fail.`,
		Example: "  liftfuse validate examples/ducktail-fastback/campaign.yaml",
		Args:    argsExactly(1, "one campaign file"),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.file = args[0]
			if runF != nil {
				return runF(&o)
			}
			return runValidate(o, cmd.OutOrStdout())
		},
	}
}

func runValidate(o validateOptions, out io.Writer) error {
	c, err := load(o.file, false)
	if err != nil {
		return err
	}
	r, err := reduceLoaded(c, methods.Options{})
	if err != nil {
		return err
	}
	for _, w := range r.Warnings {
		fmt.Fprintf(out, "warning: %s\n", w)
	}
	for _, d := range c.DetectedFormats() {
		fmt.Fprintf(out, "read %s\n", d)
	}
	n := len(c.Evidence.RideHeight) + len(c.Evidence.Pressure) + len(c.Evidence.Vortex)
	fmt.Fprintf(out, "%s: valid campaign %q: %s, %s, %s read, %s\n", o.file, c.Campaign.Title,
		report.Count(len(c.Configurations), "configuration"), report.Count(n, "evidence entry"),
		report.Count(len(c.Files), "file"), report.Count(len(r.Warnings), "warning"))
	return nil
}

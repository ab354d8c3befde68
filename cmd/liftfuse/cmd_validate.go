package main

import (
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"liftfuse/methods"
)

type validateOptions struct {
	file string
}

func newValidateCmd() *cobra.Command {
	var o validateOptions
	return &cobra.Command{
		Use:   "validate FILE",
		Short: "Load and check a campaign; list every problem with file:line:column",
		Long: `validate loads a campaign file strictly (unknown keys are errors), reads its
logs and tables, and checks every rule of campaign format 1. It prints all
errors at once, each as file:line:column: path: message, and exits 2 if there
are any; warnings (things to look at) are printed but do not fail.`,
		Example: "  liftfuse validate examples/ducktail-fastback/campaign.yaml",
		Args:    argsExactly(1, "one campaign file"),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.file = args[0]
			return runValidate(o, cmd.OutOrStdout())
		},
	}
}

func runValidate(o validateOptions, out io.Writer) error {
	c, err := methods.Load(o.file, methods.Options{})
	if err != nil {
		return err
	}
	printWarnings(out, c)
	n := len(c.Evidence.RideHeight) + len(c.Evidence.Pressure) + len(c.Evidence.Vortex)
	fmt.Fprintf(out, "%s: valid campaign %q: %d configurations, %d evidence entries, %d files read, %d warnings\n",
		o.file, c.Campaign.Title, len(c.Configurations), n, len(c.Files), len(c.Warnings))
	return nil
}

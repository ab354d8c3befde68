package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"

	"github.com/spf13/cobra"

	"liftfuse/methods/campaign"
	"liftfuse/methods/sim"
	"liftfuse/report"
)

type simulateOptions struct {
	spec  string
	out   string
	force bool
}

func newSimulateCmd(runF func(*simulateOptions) error) *cobra.Command {
	var o simulateOptions
	cmd := &cobra.Command{
		Use:   "simulate SPEC -o DIR",
		Short: "Write a synthetic campaign (logs included) from a stated truth",
		Long: `simulate drives a simulated car through a test plan and writes what the
sensors would have logged: DIR/campaign.yaml, its log and tap readings, and
DIR/truth.json with the true C_L·A of every configuration. Use it to plan a test
day before driving it (run plan on the result), or to see how a planted error
shows up. The spec format is in examples/ducktail-fastback/spec.yaml.`,
		Example: "  liftfuse simulate examples/ducktail-fastback/spec.yaml -o /tmp/trial && liftfuse plan /tmp/trial/campaign.yaml",
		Args:    argsExactly(1, "one spec file"),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.spec = args[0]
			if err := requireFlags(cmd, "out"); err != nil {
				return err
			}
			if runF != nil {
				return runF(&o)
			}
			return runSimulate(o, cmd.OutOrStdout())
		},
	}
	cmd.Flags().StringVarP(&o.out, "out", "o", "", "`DIR` to write the campaign into (required)")
	cmd.Flags().BoolVar(&o.force, "force", false, "write into a folder that already exists, replacing the campaign's files")
	return cmd
}

// runSimulate writes through a temporary folder and moves the files into
// place only once everything has been written and the campaign validates.
func runSimulate(o simulateOptions, out io.Writer) error {
	if err := regularFile(o.spec); err != nil {
		return inputError{err}
	}
	s, err := sim.Load(o.spec)
	if err != nil {
		return err
	}
	if _, err := os.Stat(o.out); err == nil && !o.force {
		return badInput("%s already exists (use --force to write into it)", o.out)
	} else if err != nil && !errors.Is(err, fs.ErrNotExist) {
		return err
	}
	err = report.WriteFolder(o.out, func(tmp string) error {
		if _, err := sim.Generate(s, tmp); err != nil {
			return fmt.Errorf("simulate: %w", err)
		}
		if _, err := campaign.Load(filepath.Join(tmp, "campaign.yaml"), campaign.Options{}); err != nil {
			return fmt.Errorf("the simulated campaign does not validate (a bug, or a spec the campaign format cannot express): %w", err)
		}
		return nil
	})
	if err != nil {
		return err
	}
	fmt.Fprintf(out, "wrote a simulated campaign to %s (truth in %s)\n", filepath.Join(o.out, "campaign.yaml"), filepath.Join(o.out, "truth.json"))
	return nil
}

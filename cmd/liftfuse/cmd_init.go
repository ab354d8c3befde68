package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"

	"github.com/spf13/cobra"

	"liftfuse/examples"
	"liftfuse/report"
)

type initOptions struct {
	dir string
}

func newInitCmd(runF func(*initOptions) error) *cobra.Command {
	var o initOptions
	return &cobra.Command{
		Use:   "init DIR",
		Short: "Write the demo campaign into DIR, as a starting point to edit",
		Long: `init writes the bundled demo campaign (an invented scenario: a ducktail
trial on a customer fastback) with its logs and tap readings into DIR. It
refuses to write into a folder that already exists.`,
		Example: "  liftfuse init my-test-day && liftfuse validate my-test-day/campaign.yaml",
		Args:    argsExactly(1, "one folder"),
		RunE: func(cmd *cobra.Command, args []string) error {
			o.dir = args[0]
			if runF != nil {
				return runF(&o)
			}
			return runInit(o, cmd.OutOrStdout())
		},
	}
}

// runInit writes the demo through a temporary folder, so a failed run
// leaves nothing behind.
func runInit(o initOptions, out io.Writer) error {
	if _, err := os.Stat(o.dir); err == nil {
		return badInput("%s already exists: init writes only a new folder", o.dir)
	} else if !errors.Is(err, fs.ErrNotExist) {
		return err
	}
	demo, err := fs.Sub(examples.Demo(), examples.DemoName)
	if err != nil {
		return err
	}
	if err := report.WriteFolder(o.dir, func(tmp string) error { return os.CopyFS(tmp, demo) }); err != nil {
		return err
	}
	fmt.Fprintf(out, "wrote the demo campaign to %s; next: liftfuse validate %s\n", o.dir, filepath.Join(o.dir, "campaign.yaml"))
	return nil
}

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
)

type initOptions struct {
	dir string
}

func newInitCmd() *cobra.Command {
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
			return runInit(o, cmd.OutOrStdout())
		},
	}
}

// runInit writes the demo into a temporary sibling folder and renames it to
// DIR, so a failed run leaves nothing behind.
func runInit(o initOptions, out io.Writer) error {
	if _, err := os.Stat(o.dir); err == nil {
		return badInput("%s already exists: init writes only a new folder", o.dir)
	} else if !errors.Is(err, fs.ErrNotExist) {
		return err
	}
	parent := filepath.Dir(filepath.Clean(o.dir))
	tmp, err := os.MkdirTemp(parent, "."+filepath.Base(o.dir)+".tmp-*")
	if err != nil {
		return fmt.Errorf("cannot create %s: %w", o.dir, err)
	}
	defer os.RemoveAll(tmp) // a no-op once renamed
	demo, err := fs.Sub(examples.Demo(), examples.DemoName)
	if err != nil {
		return err
	}
	if err := os.CopyFS(tmp, demo); err != nil {
		return fmt.Errorf("cannot write %s: %w", o.dir, err)
	}
	if err := os.Chmod(tmp, 0o755); err != nil {
		return err
	}
	if err := os.Rename(tmp, o.dir); err != nil {
		return fmt.Errorf("cannot create %s: %w", o.dir, err)
	}
	fmt.Fprintf(out, "wrote the demo campaign to %s; next: liftfuse validate %s\n", o.dir, filepath.Join(o.dir, "campaign.yaml"))
	return nil
}

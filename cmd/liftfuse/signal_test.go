//go:build unix

package main

import (
	"context"
	"errors"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
	"time"

	"liftfuse/report"
)

// signalChildEnv makes the test binary act as an interrupted liftfuse.
const signalChildEnv = "LIFTFUSE_SIGNAL_CHILD_DIR"

// TestSignalChild is not a test of its own: run by TestSignals in a child
// process, it installs liftfuse's signal handling and starts writing
// DIR/r.pdf and DIR/r.json, blocking in the JSON's write until killed.
func TestSignalChild(t *testing.T) {
	dir := os.Getenv(signalChildEnv)
	if dir == "" {
		t.Skip("run by TestSignals")
	}
	ctx := onSignal(context.Background(), os.Stderr)
	report.WriteFiles(ctx, report.Bytes(filepath.Join(dir, "r.pdf"), []byte("new pdf")), report.Output{Name: filepath.Join(dir, "r.json"),
		Write: func(w io.Writer) error {
			w.Write([]byte("new json"))
			os.WriteFile(filepath.Join(dir, "ready"), nil, 0o644)
			select {} // until the signal
		}})
	t.Fatal("the write returned instead of blocking")
}

// TestSignals: SIGINT or SIGTERM while the outputs are being written
// leaves the previous outputs intact and no temporary file, and exits 130.
func TestSignals(t *testing.T) {
	if testing.Short() {
		t.Skip("starts a child process")
	}
	tests := []struct {
		name string
		sig  syscall.Signal
	}{
		{"SIGINT", syscall.SIGINT},
		{"SIGTERM", syscall.SIGTERM},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			dir := t.TempDir()
			must(t, os.WriteFile(filepath.Join(dir, "r.pdf"), []byte("old pdf"), 0o644))
			must(t, os.WriteFile(filepath.Join(dir, "r.json"), []byte("old json"), 0o644))
			cmd := exec.Command(os.Args[0], "-test.run=^TestSignalChild$")
			cmd.Env = append(os.Environ(), signalChildEnv+"="+dir)
			var stderr strings.Builder
			cmd.Stderr = &stderr
			must(t, cmd.Start())
			if !waitFor(filepath.Join(dir, "ready")) {
				cmd.Process.Kill()
				t.Fatalf("the child never started writing: %s", stderr.String())
			}
			if left, _ := filepath.Glob(filepath.Join(dir, ".*.tmp-*")); len(left) != 2 {
				t.Errorf("while writing: temporary files %v, want two", left)
			}
			must(t, cmd.Process.Signal(tt.sig))
			err := cmd.Wait()
			var ee *exec.ExitError
			if !errors.As(err, &ee) || ee.ExitCode() != exitInterrupted {
				t.Errorf("child ended with %v, want exit %d; stderr %s", err, exitInterrupted, stderr.String())
			}
			if !strings.Contains(stderr.String(), "temporary files removed") {
				t.Errorf("stderr %q", stderr.String())
			}
			if got := snapshot(t, filepath.Join(dir, "r.pdf"), filepath.Join(dir, "r.json")); got != "old pdfold json" {
				t.Errorf("outputs now %q, want the old ones", got)
			}
			if left, _ := filepath.Glob(filepath.Join(dir, ".*.tmp-*")); len(left) > 0 {
				t.Errorf("temporary files left: %v", left)
			}
		})
	}
}

// waitFor polls for a file; a generous bound, not a timing assertion.
func waitFor(name string) bool {
	for range 3000 {
		if _, err := os.Stat(name); err == nil {
			return true
		}
		time.Sleep(10 * time.Millisecond)
	}
	return false
}

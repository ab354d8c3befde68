package main

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/spf13/cobra"

	"liftfuse/methods"
	"liftfuse/methods/campaign"
	"liftfuse/methods/height"
	"liftfuse/report"
)

// TestPanicIsInternalError: a panic in a command never reaches the user as
// a crash: it exits 1 (not 2, which is bad input) with "internal error,
// please report" and the SHA-256 of the input file.
func TestPanicIsInternalError(t *testing.T) {
	raw, err := os.ReadFile(demo)
	if err != nil {
		t.Fatal(err)
	}
	sum := sha256.Sum256(raw) // FIPS 180-4 via crypto/sha256, independent of fileSHA256's streaming
	tests := []struct {
		name  string
		input string
		want  []string
	}{
		{"readable input", demo, []string{"internal error, please report: boom", "sha256 " + hex.EncodeToString(sum[:]), "version " + Version}},
		{"missing input", "nope.yaml", []string{"internal error, please report: boom", "input nope.yaml (no hash"}},
		{"folder as input", t.TempDir(), []string{"internal error, please report: boom", "not a regular file"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			_, _, code, stderr := parse(t, func(func(*fuseOptions) error) *cobra.Command {
				return newFuseCmd(func(*fuseOptions) error { panic("boom") })
			}, tt.input)
			if code != exitFailure {
				t.Errorf("exit %d, want %d", code, exitFailure)
			}
			for _, w := range tt.want {
				if !strings.Contains(stderr, w) {
					t.Errorf("stderr lacks %q:\n%s", w, stderr)
				}
			}
		})
	}
}

// TestExitCodeByType: errors are classified by their type, wrapped or not,
// never by their message.
func TestExitCodeByType(t *testing.T) {
	tests := []struct {
		name string
		err  error
		code int
	}{
		{"none", nil, exitOK},
		{"input error", badInput("x"), exitInput},
		{"wrapped input error", fmt.Errorf("while reading: %w", badInput("x")), exitInput},
		{"campaign problems", campaign.Problems{campaign.Errorf(campaign.Where{File: "c.yaml", Line: 3}, "a", campaign.ErrRange, "bad")}, exitInput},
		{"wrapped campaign problems", fmt.Errorf("loading: %w", campaign.Problems{}), exitInput},
		{"interrupted write", fmt.Errorf("cannot write r.pdf: %w", report.ErrInterrupted), exitInterrupted},
		{"a message that looks like input is not", errors.New(`unknown command "x" for "liftfuse": want one campaign file, got 2 arg(s)`), exitFailure},
		{"plain failure", errors.New("disk full"), exitFailure},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := exitCode(tt.err); got != tt.code {
				t.Errorf("exitCode(%v) = %d, want %d", tt.err, got, tt.code)
			}
		})
	}
}

// TestCommandLineErrors: cobra's own errors reach the user as bad input,
// by type.
func TestCommandLineErrors(t *testing.T) {
	tests := []struct {
		name     string
		args     []string
		code     int
		inStderr string
	}{
		{"unknown command", []string{"frobnicate"}, 2, `unknown command "frobnicate"`},
		{"a typo gets a suggestion", []string{"validat", "x.yaml"}, 2, "did you mean validate?"},
		{"unknown flag", []string{"fuse", "x.yaml", "--jsn"}, 2, "unknown flag: --jsn"},
		{"bad number", []string{"air", "--temperature-c", "warm"}, 2, "invalid argument"},
		{"no command shows help", nil, 0, ""},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			code, _, stderr := liftfuse(t, tt.args...)
			if code != tt.code || !strings.Contains(stderr, tt.inStderr) {
				t.Errorf("exit %d, stderr %q; want exit %d with %q", code, stderr, tt.code, tt.inStderr)
			}
		})
	}
}

// TestInputsMustBeRegular: a FIFO, a device or a folder given as the
// campaign (or spec) is refused by name instead of blocking the run.
func TestInputsMustBeRegular(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "campaign.yaml")
	if err := mkfifo(fifo); err != nil {
		t.Skipf("no FIFOs here: %v", err)
	}
	tests := []struct {
		name     string
		args     []string
		inStderr string
	}{
		{"validate a FIFO", []string{"validate", fifo}, "is a FIFO, not a regular file"},
		{"fuse a FIFO", []string{"fuse", fifo, "-q"}, "is a FIFO"},
		{"reduce a device", []string{"reduce", "/dev/zero", "-q"}, "is a device"},
		{"report a folder", []string{"report", dir, "-o", filepath.Join(dir, "r.pdf"), "-q"}, "is a folder"},
		{"simulate a FIFO spec", []string{"simulate", fifo, "-o", filepath.Join(dir, "day")}, "is a FIFO"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			code, _, stderr := liftfuse(t, tt.args...)
			if code != exitInput || !strings.Contains(stderr, tt.inStderr) {
				t.Errorf("exit %d, stderr %q; want exit 2 with %q", code, stderr, tt.inStderr)
			}
		})
	}
}

// TestOnlyTheReportKeepsTraces: the report's analysis keeps each
// ride-height log's trace, which it plots; fuse's (and plan's,
// crosscheck's) leaves the filters out (height.Options.Trace).
func TestOnlyTheReportKeepsTraces(t *testing.T) {
	points := func(a *analysis) (n int) {
		for _, r := range methods.Details[*height.Result](a.reduced) {
			for _, tr := range r.Traces {
				n += len(tr)
			}
		}
		return n
	}
	a, err := reportAnalysis(demo, true, io.Discard, []output{{"-o", filepath.Join(t.TempDir(), "r.pdf")}})
	if err != nil {
		t.Fatal(err)
	}
	if points(a) == 0 {
		t.Error("the report's analysis kept no trace point")
	}
	if a, err = analyse(demo, true, io.Discard); err != nil {
		t.Fatal(err)
	}
	if n := points(a); n != 0 {
		t.Errorf("fuse's analysis kept %d trace points", n)
	}
}

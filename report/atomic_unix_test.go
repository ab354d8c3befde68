//go:build unix

package report

import (
	"context"
	"errors"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

// TestWriteFilesRefusesFIFO: a FIFO named as an output is refused by name
// instead of being replaced (or, opened, blocking the run).
func TestWriteFilesRefusesFIFO(t *testing.T) {
	tests := []struct {
		name  string
		fixed string // a fixed path instead of a new one
		make  func(name string) error
		want  string
	}{
		{"FIFO", "", func(n string) error { return syscall.Mkfifo(n, 0o644) }, "a FIFO"},
		{"device", "/dev/null", nil, "a device"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			freshTemps(t)
			name := tt.fixed
			if name == "" {
				name = filepath.Join(t.TempDir(), "out.pdf")
				if err := tt.make(name); err != nil {
					t.Skip(err)
				}
			}
			err := WriteFiles(context.Background(), Bytes(name, []byte("x")))
			if !errors.Is(err, ErrNotFile) || !strings.Contains(err.Error(), tt.want) {
				t.Errorf("error %v, want ErrNotFile naming %s", err, tt.want)
			}
		})
	}
}

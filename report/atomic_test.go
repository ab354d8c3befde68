package report

import (
	"context"
	"errors"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// freshTemps gives a test its own set of temporary files (AbortWrites
// closes the process's set for good).
func freshTemps(t *testing.T) {
	old := temps
	temps = &tempSet{names: map[string]bool{}}
	t.Cleanup(func() { temps = old })
}

// leftovers lists temporary files left in dir.
func leftovers(t *testing.T, dir string) []string {
	t.Helper()
	left, err := filepath.Glob(filepath.Join(dir, ".*.tmp-*"))
	if err != nil {
		t.Fatal(err)
	}
	return left
}

func failing(name string, err error) Output {
	return Output{Name: name, Write: func(w io.Writer) error {
		w.Write([]byte("partial"))
		return err
	}}
}

// TestWriteFiles: all of a set of outputs replace the old files, or none
// does; modes, links and messages. Common practice (no source): the
// write-temp, fsync, rename(2) pattern, rename being atomic within a file
// system (POSIX rename()).
func TestWriteFiles(t *testing.T) {
	tests := []struct {
		name  string
		setup func(t *testing.T, dir string) // old files, links, modes
		outs  func(dir string) []Output
		ctx   func() context.Context
		err   error  // errors.Is; nil: success
		inMsg string // the message names this
		want  map[string]string
		modes map[string]os.FileMode
	}{
		{
			name: "new files get 0644",
			outs: func(d string) []Output {
				return []Output{Bytes(filepath.Join(d, "r.pdf"), []byte("pdf")), Bytes(filepath.Join(d, "r.json"), []byte("{}"))}
			},
			want:  map[string]string{"r.pdf": "pdf", "r.json": "{}"},
			modes: map[string]os.FileMode{"r.pdf": 0o644, "r.json": 0o644},
		},
		{
			name: "an existing file keeps its mode",
			setup: func(t *testing.T, d string) {
				write(t, filepath.Join(d, "r.pdf"), "old", 0o600)
				write(t, filepath.Join(d, "r.json"), "old", 0o664)
			},
			outs: func(d string) []Output {
				return []Output{Bytes(filepath.Join(d, "r.pdf"), []byte("new")), Bytes(filepath.Join(d, "r.json"), []byte("new"))}
			},
			want:  map[string]string{"r.pdf": "new", "r.json": "new"},
			modes: map[string]os.FileMode{"r.pdf": 0o600, "r.json": 0o664},
		},
		{
			name: "the second output fails: neither is replaced",
			setup: func(t *testing.T, d string) {
				write(t, filepath.Join(d, "r.pdf"), "old pdf", 0o644)
				write(t, filepath.Join(d, "r.json"), "old json", 0o644)
			},
			outs: func(d string) []Output {
				return []Output{Bytes(filepath.Join(d, "r.pdf"), []byte("new")), failing(filepath.Join(d, "r.json"), errors.New("disk on fire"))}
			},
			err: errAny, inMsg: "r.json: disk on fire",
			want: map[string]string{"r.pdf": "old pdf", "r.json": "old json"},
		},
		{
			name: "a missing folder is named",
			outs: func(d string) []Output { return []Output{Bytes(filepath.Join(d, "nope", "r.pdf"), []byte("x"))} },
			err:  ErrNoFolder, inMsg: "folder " + "DIR/nope does not exist",
		},
		{
			name:  "a folder is not an output",
			setup: func(t *testing.T, d string) { os.Mkdir(filepath.Join(d, "r.pdf"), 0o755) },
			outs:  func(d string) []Output { return []Output{Bytes(filepath.Join(d, "r.pdf"), []byte("x"))} },
			err:   ErrNotFile, inMsg: "it is a folder",
		},
		{
			name: "a symbolic link is kept and its target replaced",
			setup: func(t *testing.T, d string) {
				os.Mkdir(filepath.Join(d, "real"), 0o755)
				write(t, filepath.Join(d, "real", "r.pdf"), "old", 0o640)
				symlink(t, filepath.Join("real", "r.pdf"), filepath.Join(d, "link.pdf"))
			},
			outs:  func(d string) []Output { return []Output{Bytes(filepath.Join(d, "link.pdf"), []byte("new"))} },
			want:  map[string]string{"real/r.pdf": "new", "link.pdf": "new"},
			modes: map[string]os.FileMode{"real/r.pdf": 0o640, "link.pdf": fs.ModeSymlink},
		},
		{
			name:  "a dangling link creates its target",
			setup: func(t *testing.T, d string) { symlink(t, "made.pdf", filepath.Join(d, "link.pdf")) },
			outs:  func(d string) []Output { return []Output{Bytes(filepath.Join(d, "link.pdf"), []byte("new"))} },
			want:  map[string]string{"made.pdf": "new"},
			modes: map[string]os.FileMode{"made.pdf": 0o644, "link.pdf": fs.ModeSymlink},
		},
		{
			name: "a loop of links is refused",
			setup: func(t *testing.T, d string) {
				symlink(t, "b", filepath.Join(d, "a"))
				symlink(t, "a", filepath.Join(d, "b"))
			},
			outs: func(d string) []Output { return []Output{Bytes(filepath.Join(d, "a"), []byte("x"))} },
			err:  errAny, inMsg: "symbolic links",
		},
		{
			name: "a write error never shows the temporary name",
			outs: func(d string) []Output {
				return []Output{failing(filepath.Join(d, "r.pdf"), &fs.PathError{Op: "write", Path: filepath.Join(d, ".r.pdf.tmp-123"), Err: errors.New("no space left on device")})}
			},
			err: errAny, inMsg: "cannot write DIR/r.pdf: no space left on device",
		},
		{
			name:  "interrupted before the rename: old files stay",
			setup: func(t *testing.T, d string) { write(t, filepath.Join(d, "r.pdf"), "old", 0o644) },
			outs:  func(d string) []Output { return []Output{Bytes(filepath.Join(d, "r.pdf"), []byte("new"))} },
			ctx: func() context.Context {
				ctx, cancel := context.WithCancel(context.Background())
				cancel()
				return ctx
			},
			err: ErrInterrupted, want: map[string]string{"r.pdf": "old"},
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			freshTemps(t)
			dir := t.TempDir()
			if tt.setup != nil {
				tt.setup(t, dir)
			}
			ctx := context.Background()
			if tt.ctx != nil {
				ctx = tt.ctx()
			}
			err := WriteFiles(ctx, tt.outs(dir)...)
			switch {
			case tt.err == nil && err != nil:
				t.Fatalf("unexpected error %v", err)
			case tt.err != nil && err == nil:
				t.Fatalf("no error, want %v", tt.err)
			case tt.err != nil && tt.err != errAny && !errors.Is(err, tt.err):
				t.Errorf("error %v, want %v", err, tt.err)
			}
			if err != nil {
				msg := strings.ReplaceAll(err.Error(), dir, "DIR")
				if !strings.Contains(msg, tt.inMsg) || strings.Contains(msg, ".tmp-") {
					t.Errorf("message %q, want it to contain %q and no temporary name", msg, tt.inMsg)
				}
			}
			for name, content := range tt.want {
				if b, err := os.ReadFile(filepath.Join(dir, name)); err != nil || string(b) != content {
					t.Errorf("%s holds %q (%v), want %q", name, b, err, content)
				}
			}
			for name, mode := range tt.modes {
				st, err := os.Lstat(filepath.Join(dir, name))
				if err != nil {
					t.Fatal(err)
				}
				got := st.Mode().Perm()
				if mode&fs.ModeSymlink != 0 {
					got, mode = st.Mode().Type(), fs.ModeSymlink
				}
				if got != mode {
					t.Errorf("%s has mode %v, want %v", name, got, mode)
				}
			}
			if left := leftovers(t, dir); len(left) > 0 {
				t.Errorf("temporary files left: %v", left)
			}
		})
	}
}

// errAny stands for "some error" in the tables.
var errAny = errors.New("any error")

// TestAbortWrites: an interruption while a file is being written removes
// its temporary file and the write fails; the old file stays.
func TestAbortWrites(t *testing.T) {
	tests := []struct {
		name string
		old  bool
	}{
		{"over an existing file", true},
		{"a new file", false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			freshTemps(t)
			dir := t.TempDir()
			name := filepath.Join(dir, "r.pdf")
			if tt.old {
				write(t, name, "old", 0o644)
			}
			var seen []string
			err := WriteFiles(context.Background(), Output{Name: name, Write: func(w io.Writer) error {
				w.Write([]byte("new"))
				seen = leftovers(t, dir)
				AbortWrites() // what the signal handler does
				return nil
			}})
			if !errors.Is(err, ErrInterrupted) {
				t.Errorf("error %v, want ErrInterrupted", err)
			}
			if len(seen) != 1 {
				t.Errorf("while writing, temporary files %v, want one", seen)
			}
			if left := leftovers(t, dir); len(left) > 0 {
				t.Errorf("temporary files left: %v", left)
			}
			b, err := os.ReadFile(name)
			if tt.old && string(b) != "old" || !tt.old && err == nil {
				t.Errorf("output holds %q (%v) after an interruption", b, err)
			}
		})
	}
}

func write(t *testing.T, name, content string, mode os.FileMode) {
	t.Helper()
	if err := os.WriteFile(name, []byte(content), mode); err != nil {
		t.Fatal(err)
	}
	if err := os.Chmod(name, mode); err != nil { // not masked by the umask
		t.Fatal(err)
	}
}

func symlink(t *testing.T, to, name string) {
	t.Helper()
	if err := os.Symlink(to, name); err != nil {
		t.Skipf("no symbolic links here: %v", err)
	}
}

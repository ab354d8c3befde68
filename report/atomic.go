package report

import (
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sync"
)

// Output errors, for errors.Is.
var (
	// ErrNoFolder: the folder an output goes into does not exist.
	ErrNoFolder = errors.New("output folder does not exist")
	// ErrNotFile: an output names a folder, a device, a FIFO or a socket.
	ErrNotFile = errors.New("output is not a regular file")
	// ErrInterrupted: the run was interrupted before the outputs were
	// moved into place; every temporary file has been removed.
	ErrInterrupted = errors.New("interrupted")
)

// newFileMode is the mode of an output that does not exist yet; an
// existing output keeps its own.
const newFileMode os.FileMode = 0o644

// maxLinks bounds the chain of symbolic links an output name may follow
// (Linux's own limit for path resolution is 40).
const maxLinks = 40

// Output is one file of a set written together.
type Output struct {
	// Name is the path as the user gave it; messages use it, never the
	// name of a temporary file.
	Name string
	// Write writes the file's content.
	Write func(io.Writer) error
}

// Bytes is an Output whose content is data.
func Bytes(name string, data []byte) Output {
	return Output{Name: name, Write: func(w io.Writer) error { _, err := w.Write(data); return err }}
}

// Target returns the file a write of name replaces: name itself or, when
// name is a symbolic link, the file at the end of its chain of links (which
// need not exist yet). Writing through a link keeps the link.
func Target(name string) (string, error) {
	p := name
	for range maxLinks {
		st, err := os.Lstat(p)
		if errors.Is(err, fs.ErrNotExist) || (err == nil && st.Mode()&fs.ModeSymlink == 0) {
			return p, nil
		}
		if err != nil {
			return "", fmt.Errorf("cannot write %s: %w", name, pathless(err))
		}
		to, err := os.Readlink(p)
		if err != nil {
			return "", fmt.Errorf("cannot write %s: %w", name, pathless(err))
		}
		if !filepath.IsAbs(to) {
			to = filepath.Join(filepath.Dir(p), to)
		}
		p = to
	}
	return "", fmt.Errorf("cannot write %s: more than %d symbolic links", name, maxLinks)
}

// CheckOutput says whether name can be written, before a long run: its
// folder must exist and it must be a regular file or not exist yet.
func CheckOutput(name string) error {
	_, _, err := prepare(name)
	return err
}

// prepare resolves name's target and returns it with the mode to give the
// new file.
func prepare(name string) (target string, mode os.FileMode, err error) {
	target, err = Target(name)
	if err != nil {
		return "", 0, err
	}
	dir := filepath.Dir(target)
	if st, err := os.Stat(dir); errors.Is(err, fs.ErrNotExist) {
		return "", 0, kindErr(ErrNoFolder, "cannot write %s: folder %s does not exist", name, dir)
	} else if err != nil {
		return "", 0, fmt.Errorf("cannot write %s: %w", name, pathless(err))
	} else if !st.IsDir() {
		return "", 0, kindErr(ErrNoFolder, "cannot write %s: %s is not a folder", name, dir)
	}
	st, err := os.Stat(target)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return target, newFileMode, nil
	case err != nil:
		return "", 0, fmt.Errorf("cannot write %s: %w", name, pathless(err))
	case st.IsDir():
		return "", 0, kindErr(ErrNotFile, "cannot write %s: it is a folder", name)
	case !st.Mode().IsRegular():
		return "", 0, kindErr(ErrNotFile, "cannot write %s: it is not a regular file (%s)", name, kindOf(st.Mode()))
	}
	return target, st.Mode().Perm(), nil
}

// kindError is a message that errors.Is matches to its kind, a sentinel
// whose own text it does not repeat.
type kindError struct {
	msg  string
	kind error
}

func (e *kindError) Error() string { return e.msg }
func (e *kindError) Unwrap() error { return e.kind }

func kindErr(kind error, format string, args ...any) error {
	return &kindError{fmt.Sprintf(format, args...), kind}
}

func kindOf(m fs.FileMode) string {
	switch {
	case m&fs.ModeNamedPipe != 0:
		return "a FIFO"
	case m&fs.ModeDevice != 0, m&fs.ModeCharDevice != 0:
		return "a device"
	case m&fs.ModeSocket != 0:
		return "a socket"
	}
	return "not a file"
}

// pending is one output written to its temporary file.
type pending struct {
	out    Output
	target string
	tmp    string
}

// WriteFiles writes a set of files so that either all of them or none
// replace what was there: each is written to a temporary file in its
// target's folder, synced, and given the mode of the file it replaces
// (0644 for a new one); only when every one was written are they renamed
// into place. A failure, or ctx done, before that removes every temporary
// file and leaves the old files as they were. A symbolic link named as an
// output is kept and the file it points to is replaced (see Target). Errors
// name the outputs as given, never a temporary file.
func WriteFiles(ctx context.Context, outs ...Output) (err error) {
	ps := make([]pending, 0, len(outs))
	defer func() {
		if err != nil {
			for _, p := range ps {
				temps.discard(p.tmp)
			}
		}
	}()
	for _, o := range outs {
		target, mode, err := prepare(o.Name)
		if err != nil {
			return err
		}
		tmp, err := writeTemp(o, target, mode)
		if tmp != "" {
			ps = append(ps, pending{out: o, target: target, tmp: tmp})
		}
		if err != nil {
			return err
		}
		if err := ctx.Err(); err != nil {
			return ErrInterrupted
		}
	}
	return temps.commit(ctx, ps)
}

// writeTemp writes o to a new temporary file beside target and returns its
// name (also when writing failed, so that it is removed).
func writeTemp(o Output, target string, mode os.FileMode) (string, error) {
	f, err := temps.create(filepath.Dir(target), "."+filepath.Base(target)+".tmp-*")
	if err != nil {
		return "", fmt.Errorf("cannot write %s: %w", o.Name, pathless(err))
	}
	fail := func(err error) (string, error) {
		f.Close()
		return f.Name(), fmt.Errorf("cannot write %s: %w", o.Name, pathless(err))
	}
	if err := o.Write(plainWriter{f}); err != nil {
		return fail(err)
	}
	if err := f.Chmod(mode); err != nil {
		return fail(err)
	}
	if err := f.Sync(); err != nil {
		return fail(err)
	}
	if err := f.Close(); err != nil {
		return f.Name(), fmt.Errorf("cannot write %s: %w", o.Name, pathless(err))
	}
	return f.Name(), nil
}

// plainWriter hides the temporary file's name from write errors.
type plainWriter struct{ f *os.File }

func (w plainWriter) Write(p []byte) (int, error) {
	n, err := w.f.Write(p)
	return n, pathless(err)
}

// pathless strips the path from a file-system error, so that a message never
// shows a temporary name; errors.Is still sees the cause.
func pathless(err error) error {
	var pe *fs.PathError
	var le *os.LinkError
	switch {
	case errors.As(err, &pe):
		return pe.Err
	case errors.As(err, &le):
		return le.Err
	}
	return err
}

// temps is the process's set of temporary files and folders not yet moved
// into place, so that an interrupted run can remove them (Abort).
var temps = &tempSet{names: map[string]bool{}}

type tempSet struct {
	mu      sync.Mutex
	names   map[string]bool // name → is a folder
	aborted bool
}

func (s *tempSet) create(dir, pattern string) (*os.File, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.aborted {
		return nil, ErrInterrupted
	}
	f, err := os.CreateTemp(dir, pattern)
	if err == nil {
		s.names[f.Name()] = false
	}
	return f, err
}

func (s *tempSet) mkdir(dir, pattern string) (string, error) {
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.aborted {
		return "", ErrInterrupted
	}
	d, err := os.MkdirTemp(dir, pattern)
	if err == nil {
		s.names[d] = true
	}
	return d, err
}

func (s *tempSet) discard(name string) {
	s.mu.Lock()
	defer s.mu.Unlock()
	os.RemoveAll(name)
	delete(s.names, name)
}

// commit renames every pending file into place under the lock, so that an
// interruption sees either all temporary files or none.
func (s *tempSet) commit(ctx context.Context, ps []pending) error {
	s.mu.Lock()
	defer s.mu.Unlock()
	if s.aborted || ctx.Err() != nil {
		return ErrInterrupted
	}
	for i, p := range ps {
		if err := os.Rename(p.tmp, p.target); err != nil {
			for _, q := range ps[i:] {
				os.Remove(q.tmp)
				delete(s.names, q.tmp)
			}
			return fmt.Errorf("cannot write %s: %w", p.out.Name, pathless(err))
		}
		delete(s.names, p.tmp)
	}
	return nil
}

// AbortWrites removes every temporary file and folder of writes in
// progress and makes later writes fail with ErrInterrupted. The command
// calls it on SIGINT or SIGTERM, before exiting; files already in place
// stay as they are.
func AbortWrites() {
	temps.mu.Lock()
	defer temps.mu.Unlock()
	temps.aborted = true
	for name := range temps.names {
		os.RemoveAll(name)
		delete(temps.names, name)
	}
}

// WriteFolder fills a temporary folder beside dir with fill, and only when
// that succeeds moves each file it wrote into dir (created if need be,
// files of the same name replaced). A failed fill leaves dir untouched; an
// interruption (AbortWrites) removes the temporary folder.
func WriteFolder(dir string, fill func(tmp string) error) error {
	parent := filepath.Dir(filepath.Clean(dir))
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return fmt.Errorf("cannot create %s: %w", dir, pathless(err))
	}
	tmp, err := temps.mkdir(parent, "."+filepath.Base(dir)+".tmp-*")
	if err != nil {
		return fmt.Errorf("cannot create %s: %w", dir, pathless(err))
	}
	defer temps.discard(tmp)
	if err := fill(tmp); err != nil {
		return err
	}
	return filepath.WalkDir(tmp, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		rel, err := filepath.Rel(tmp, p)
		if err != nil {
			return err
		}
		dst := filepath.Join(dir, rel)
		if err := os.MkdirAll(filepath.Dir(dst), 0o755); err != nil {
			return fmt.Errorf("cannot write %s: %w", dst, pathless(err))
		}
		if err := os.Rename(p, dst); err != nil {
			return fmt.Errorf("cannot write %s: %w", dst, pathless(err))
		}
		return nil
	})
}

package report

import (
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
)

// WriteFile writes data to name atomically: it writes a temporary file in
// the same folder, syncs it and renames it over name, so a failed run never
// leaves a partial or corrupted file behind.
func WriteFile(name string, data []byte, perm os.FileMode) error {
	dir := filepath.Dir(name)
	tmp, err := os.CreateTemp(dir, "."+filepath.Base(name)+".tmp-*")
	if err != nil {
		return fmt.Errorf("cannot write %s: %w", name, err)
	}
	done := false
	defer func() {
		if !done {
			tmp.Close()
			os.Remove(tmp.Name())
		}
	}()
	if _, err := tmp.Write(data); err != nil {
		return fmt.Errorf("cannot write %s: %w", name, err)
	}
	if err := tmp.Chmod(perm); err != nil {
		return fmt.Errorf("cannot write %s: %w", name, err)
	}
	if err := tmp.Sync(); err != nil {
		return fmt.Errorf("cannot write %s: %w", name, err)
	}
	if err := tmp.Close(); err != nil {
		return fmt.Errorf("cannot write %s: %w", name, err)
	}
	if err := os.Rename(tmp.Name(), name); err != nil {
		return fmt.Errorf("cannot write %s: %w", name, err)
	}
	done = true
	return nil
}

// WriteFolder fills a temporary folder beside dir with fill, and only when
// that succeeds moves each file it wrote into dir (created if need be,
// files of the same name replaced). A failed fill leaves dir untouched.
func WriteFolder(dir string, fill func(tmp string) error) error {
	parent := filepath.Dir(filepath.Clean(dir))
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return fmt.Errorf("cannot create %s: %w", dir, err)
	}
	tmp, err := os.MkdirTemp(parent, "."+filepath.Base(dir)+".tmp-*")
	if err != nil {
		return fmt.Errorf("cannot create %s: %w", dir, err)
	}
	defer os.RemoveAll(tmp)
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
			return fmt.Errorf("cannot write %s: %w", dst, err)
		}
		if err := os.Rename(p, dst); err != nil {
			return fmt.Errorf("cannot write %s: %w", dst, err)
		}
		return nil
	})
}

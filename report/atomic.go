package report

import (
	"fmt"
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

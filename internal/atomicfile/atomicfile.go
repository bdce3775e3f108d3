// Package atomicfile writes a file so that a reader never sees it half
// written: the content goes to a temporary file in the target's directory
// (the same file system, so the final rename is atomic), is synced, and is
// renamed over the target only when complete. On any error the temporary
// file is removed and the target is left as it was.
//
// It is the one atomic writer of the module: every Save of a description,
// table, figure or layout uses it.
package atomicfile

import (
	"fmt"
	"os"
	"path/filepath"
)

// Write creates or replaces the file at path with what write writes to
// it, with permission bits perm (set explicitly: os.CreateTemp makes the
// temporary file private).
func Write(path string, perm os.FileMode, write func(f *os.File) error) (err error) {
	f, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".tmp*")
	if err != nil {
		return err
	}
	defer func() {
		if err != nil {
			f.Close()
			os.Remove(f.Name())
		}
	}()
	if err = f.Chmod(perm); err != nil {
		return err
	}
	if err = write(f); err != nil {
		return err
	}
	if err = f.Sync(); err != nil {
		return fmt.Errorf("atomicfile: sync %s: %w", f.Name(), err)
	}
	if err = f.Close(); err != nil {
		return err
	}
	return os.Rename(f.Name(), path)
}

// Package safefile writes a file atomically beside its target: the content
// goes to a temporary file in the target's directory, which is flushed to
// disk and renamed over the target only when complete, so a reader sees
// either the old file or the whole new one, never a partial file, and a
// failed write leaves nothing behind. Write takes the content from a
// function; Reserve and Temp serve writers that open the file by name.
//
// It is the one such writer of the module: sensor layouts, detector
// descriptions, fitter tables, figures and baselines all use it. It lives
// under geom, the package every other imports, because the module's top
// level is fixed; it imports nothing of the module.
package safefile

import (
	"fmt"
	"io"
	"os"
	"path/filepath"
)

// Write creates or replaces the file at path with what write writes, with
// permissions 0644 (a written file is a source or result file, not a
// secret). On any error, including one returned by write, the target is
// unchanged and the temporary file removed.
func Write(path string, write func(w io.Writer) error) (err error) {
	f, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".tmp*")
	if err != nil {
		return fmt.Errorf("safefile: %w", err)
	}
	defer func() {
		if err != nil {
			f.Close() // a second Close after finish's is harmless
			os.Remove(f.Name())
		}
	}()
	if err = f.Chmod(0o644); err != nil {
		return fmt.Errorf("safefile: %w", err)
	}
	if err = write(f); err != nil {
		return err
	}
	return finish(f, path)
}

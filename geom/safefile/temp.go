package safefile

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
)

// Temp is the temporary file of a target, for writers that must create
// the file by name themselves (a library that opens its own file, like
// the ROOT writer of the event files). Its name follows from the
// target's, .NAME.tmp in the target's directory, so that a file that
// stores its own name (ROOT files do) holds nothing random, and two runs
// give the same bytes.
//
// Because the name is fixed, Reserve refuses one that exists: it belongs
// to another writer of the same target, or to one that was killed, and is
// removed by hand once no writer is running.
type Temp struct {
	target, name string
	done         bool
}

// Reserve creates the empty temporary file of path, beside it. The
// caller writes it by Name and ends with Commit or Abort.
func Reserve(path string) (*Temp, error) {
	name := filepath.Join(filepath.Dir(path), "."+filepath.Base(path)+".tmp")
	f, err := os.OpenFile(name, os.O_RDWR|os.O_CREATE|os.O_EXCL, 0o644)
	if errors.Is(err, os.ErrExist) {
		return nil, fmt.Errorf("safefile: temporary file %s exists: another writer of %s is running, or one was killed (remove it then)", name, path)
	}
	if err != nil {
		return nil, fmt.Errorf("safefile: %w", err)
	}
	if err := f.Close(); err != nil {
		os.Remove(name)
		return nil, fmt.Errorf("safefile: %w", err)
	}
	return &Temp{target: path, name: name}, nil
}

// Name is the temporary file's path.
func (t *Temp) Name() string { return t.name }

// Commit flushes the temporary file to disk, gives it permissions 0644
// and renames it over the target. On failure the temporary file is
// removed and the target unchanged. The writer must have closed it.
func (t *Temp) Commit() (err error) {
	if t.done {
		return fmt.Errorf("safefile: %s already committed or aborted", t.target)
	}
	t.done = true
	defer func() {
		if err != nil {
			os.Remove(t.name)
		}
	}()
	f, err := os.OpenFile(t.name, os.O_RDWR, 0)
	if err != nil {
		return fmt.Errorf("safefile: %w", err)
	}
	if err := f.Chmod(0o644); err != nil {
		f.Close()
		return fmt.Errorf("safefile: %w", err)
	}
	return finish(f, t.target)
}

// Abort removes the temporary file; after Commit or Abort it does
// nothing, so `defer t.Abort()` is a safe cleanup.
func (t *Temp) Abort() error {
	if t.done {
		return nil
	}
	t.done = true
	if err := os.Remove(t.name); err != nil && !errors.Is(err, os.ErrNotExist) {
		return fmt.Errorf("safefile: %w", err)
	}
	return nil
}

// finish flushes f to disk, closes it and renames it to target, then
// makes the rename durable where the file system allows (some cannot sync
// a directory; the file is complete either way).
func finish(f *os.File, target string) error {
	if err := f.Sync(); err != nil {
		f.Close()
		return fmt.Errorf("safefile: %w", err)
	}
	if err := f.Close(); err != nil {
		return fmt.Errorf("safefile: %w", err)
	}
	if err := os.Rename(f.Name(), target); err != nil {
		return fmt.Errorf("safefile: %w", err)
	}
	if d, err := os.Open(filepath.Dir(target)); err == nil {
		d.Sync()
		d.Close()
	}
	return nil
}

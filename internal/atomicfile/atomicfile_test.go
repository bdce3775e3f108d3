package atomicfile

import (
	"errors"
	"os"
	"path/filepath"
	"testing"
)

func TestWriteReplaces(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "a.txt")
	if err := os.WriteFile(path, []byte("old"), 0o600); err != nil {
		t.Fatal(err)
	}
	err := Write(path, 0o644, func(f *os.File) error { _, err := f.WriteString("new"); return err })
	if err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(path)
	if err != nil || string(b) != "new" {
		t.Fatalf("content %q, %v; want \"new\"", b, err)
	}
	if fi, _ := os.Stat(path); fi.Mode().Perm() != 0o644 {
		t.Errorf("mode %v, want 0644", fi.Mode().Perm())
	}
	assertOnly(t, dir, "a.txt")
}

func TestWriteErrorKeepsTarget(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "a.txt")
	if err := os.WriteFile(path, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	bad := errors.New("writer failed")
	err := Write(path, 0o644, func(f *os.File) error { f.WriteString("partial"); return bad })
	if !errors.Is(err, bad) {
		t.Fatalf("error %v, want %v", err, bad)
	}
	if b, _ := os.ReadFile(path); string(b) != "old" {
		t.Errorf("target now %q, want it untouched", b)
	}
	assertOnly(t, dir, "a.txt")
}

func TestWriteMissingDirectory(t *testing.T) {
	err := Write(filepath.Join(t.TempDir(), "missing", "a.txt"), 0o644, func(*os.File) error { return nil })
	if err == nil {
		t.Error("write into a missing directory: no error")
	}
}

// assertOnly fails unless dir holds exactly the named file (no temporary
// left behind).
func assertOnly(t *testing.T, dir, name string) {
	t.Helper()
	ents, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(ents) != 1 || ents[0].Name() != name {
		var names []string
		for _, e := range ents {
			names = append(names, e.Name())
		}
		t.Errorf("directory holds %v, want only %s", names, name)
	}
}

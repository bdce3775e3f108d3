package safefile

import (
	"errors"
	"io"
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
	if err := Write(path, func(w io.Writer) error { _, err := io.WriteString(w, "new"); return err }); err != nil {
		t.Fatal(err)
	}
	b, _ := os.ReadFile(path)
	st, _ := os.Stat(path)
	if string(b) != "new" || st.Mode().Perm() != 0o644 {
		t.Errorf("got %q mode %v, want \"new\" 0644", b, st.Mode().Perm())
	}
	assertOnlyFile(t, dir, "a.txt")
}

func TestFailedWriteLeavesTarget(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "a.txt")
	if err := os.WriteFile(path, []byte("old"), 0o644); err != nil {
		t.Fatal(err)
	}
	boom := errors.New("boom")
	err := Write(path, func(w io.Writer) error { io.WriteString(w, "partial"); return boom })
	if !errors.Is(err, boom) {
		t.Fatalf("got %v, want the writer's error", err)
	}
	b, _ := os.ReadFile(path)
	if string(b) != "old" {
		t.Errorf("target changed to %q after a failed write", b)
	}
	assertOnlyFile(t, dir, "a.txt")
}

func TestMissingDirectory(t *testing.T) {
	err := Write(filepath.Join(t.TempDir(), "no", "such", "a.txt"), func(io.Writer) error { return nil })
	if err == nil {
		t.Fatal("no error for a missing directory")
	}
}

func assertOnlyFile(t *testing.T, dir, name string) {
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

package safefile

import (
	"errors"
	"io"
	"os"
	"path/filepath"
	"strings"
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

func TestTemp(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "a.root")
	tmp, err := Reserve(path)
	if err != nil {
		t.Fatal(err)
	}
	if want := filepath.Join(dir, ".a.root.tmp"); tmp.Name() != want {
		t.Errorf("Name() = %s, want %s", tmp.Name(), want)
	}
	if _, err := Reserve(path); err == nil || !strings.Contains(err.Error(), ".a.root.tmp exists") {
		t.Errorf("second Reserve of a reserved name: %v", err)
	}
	if err := os.WriteFile(tmp.Name(), []byte("data"), 0o600); err != nil {
		t.Fatal(err)
	}
	if err := tmp.Commit(); err != nil {
		t.Fatal(err)
	}
	b, _ := os.ReadFile(path)
	st, _ := os.Stat(path)
	if string(b) != "data" || st.Mode().Perm() != 0o644 {
		t.Errorf("got %q mode %v, want \"data\" 0644", b, st.Mode().Perm())
	}
	if err := tmp.Abort(); err != nil {
		t.Errorf("Abort after Commit: %v", err)
	}
	assertOnlyFile(t, dir, "a.root")

	tmp, err = Reserve(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := tmp.Abort(); err != nil {
		t.Fatal(err)
	}
	assertOnlyFile(t, dir, "a.root")
}

func TestTempBareName(t *testing.T) {
	// A bare file name puts the temporary file in the working directory,
	// not in $TMPDIR (which may be another file system).
	dir := t.TempDir()
	t.Chdir(dir)
	t.Setenv("TMPDIR", t.TempDir())
	tmp, err := Reserve("part.root")
	if err != nil {
		t.Fatal(err)
	}
	defer tmp.Abort()
	if tmp.Name() != ".part.root.tmp" {
		t.Errorf("Name() = %s, want .part.root.tmp", tmp.Name())
	}
	if _, err := os.Stat(filepath.Join(dir, ".part.root.tmp")); err != nil {
		t.Error(err)
	}
}

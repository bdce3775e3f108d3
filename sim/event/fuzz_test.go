package event

import (
	"bytes"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"
)

// FuzzOpen writes arbitrary bytes to a file and reads it as an event file
// with Open and Events. Nothing may panic; an error names the file; the
// reader's allocations stay bounded by the file size (no length field read
// from the file may drive an allocation); a file that reads gives events
// that pass Validate against its own detector.
func FuzzOpen(f *testing.F) {
	s := smallSetup(f)
	path := filepath.Join(f.TempDir(), "seed.root")
	writeFileChunked(f, path, s, testRun(0, 3), randomEvents(5, 0, 3, s.det.NumSensors(), 6), 1000)
	good, err := os.ReadFile(path)
	if err != nil {
		f.Fatal(err)
	}
	f.Add(good)
	for _, n := range []int{0, 4, 64, 100, len(good) / 4, len(good) / 2, len(good) - 700, len(good) - 1} {
		f.Add(good[:n])
	}
	damaged := append([]byte(nil), good...)
	damaged[len(damaged)/2] ^= 0x55
	f.Add(damaged)
	dir := f.TempDir()
	var ms runtime.MemStats

	f.Fuzz(func(t *testing.T, data []byte) {
		name := filepath.Join(dir, "fuzz.root")
		if err := os.WriteFile(name, data, 0o644); err != nil {
			t.Fatal(err)
		}
		runtime.ReadMemStats(&ms)
		before := ms.TotalAlloc
		n, err := readEventFile(name)
		runtime.ReadMemStats(&ms)
		// The 24 kB seed file reads with under 1 MB of allocations; 64 MB
		// plus 1000 bytes per byte of file leaves well over an order of
		// magnitude of headroom (common practice) yet catches a length
		// field from the file driving an allocation.
		if alloc := ms.TotalAlloc - before; alloc > 64<<20+1000*uint64(len(data)) {
			t.Fatalf("reading %d bytes allocated %d bytes", len(data), alloc)
		}
		if bytes.Equal(data, good) && (err != nil || n != 3) {
			t.Fatalf("the intact seed file: %d events, error %v", n, err)
		}
		if err != nil {
			if !strings.Contains(err.Error(), "fuzz.root") {
				t.Fatalf("error %q does not name the file", err)
			}
			return
		}
		if n > 3 && len(data) < len(good) {
			t.Fatalf("%d events from %d bytes", n, len(data))
		}
	})
}

// readEventFile opens path, reads every event and closes it, returning
// the number of events read and the first error.
func readEventFile(path string) (int, error) {
	r, err := Open(path)
	if err != nil {
		return 0, err
	}
	defer r.Close()
	n := 0
	for e, err := range r.Events() {
		if err != nil {
			return n, err
		}
		if err := e.Validate(r.Detector().NumSensors()); err != nil {
			return n, err
		}
		n++
	}
	return n, nil
}

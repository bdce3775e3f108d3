package event

import (
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"
)

// damageFixture is a small valid file and what it holds. Its integrity
// chunks are 1000 bytes, so that damage is found chunk by chunk.
func damageFixture(t *testing.T) (data []byte, s setup, run RunInfo, events []Event) {
	t.Helper()
	s = smallSetup(t)
	run = testRun(0, 20)
	events = randomEvents(11, 0, 20, s.det.NumSensors(), 30)
	path := tempPath(t, "good.root")
	writeFileChunked(t, path, s, run, events, 1000)
	return readFileBytes(t, path), s, run, events
}

// damagePositions lists every third byte outside the checksummed region
// (the header, top directory, key list, streamer information and
// integrity record, which groot decodes itself and preflight guards) and
// every 101st byte inside it (which the chunk checksums cover uniformly).
func damagePositions(t *testing.T, data []byte) []int {
	r, _, err := readBytes(data)
	if err != nil {
		t.Fatal(err)
	}
	obj, err := r.file.Get(integrityKey)
	if err != nil {
		t.Fatal(err)
	}
	in, err := parseIntegrity(obj.(interface{ String() string }).String())
	if err != nil {
		t.Fatal(err)
	}
	var pos []int
	for i := range data {
		inside := int64(i) >= in.begin && int64(i) < in.end
		if (!inside && i%3 == 0) || (inside && i%101 == 0) {
			pos = append(pos, i)
		}
	}
	return pos
}

// TestTruncatedFiles: a file cut short anywhere gives an error naming the
// file, never a panic and never a silent partial read.
func TestTruncatedFiles(t *testing.T) {
	data, _, _, _ := damageFixture(t)
	if _, _, err := readBytes(data); err != nil {
		t.Fatalf("intact file: %v", err)
	}
	// Every byte offset in the header and the last kilobyte (where the
	// directory, keys and streamer records live), and a stride through
	// the rest.
	var cuts []int
	for n := 0; n < len(data); n++ {
		if n < 128 || n > len(data)-1024 || n%61 == 0 {
			cuts = append(cuts, n)
		}
	}
	for _, n := range cuts {
		_, _, err := readBytes(data[:n])
		if err == nil {
			t.Fatalf("file cut to %d of %d bytes read without error", n, len(data))
		}
		if !strings.Contains(err.Error(), "damaged.root") {
			t.Fatalf("cut at %d: error %q does not name the file", n, err)
		}
	}
	t.Logf("%d truncation points of a %d-byte file", len(cuts), len(data))
}

// TestCorruptedBytes: a flipped byte anywhere either gives an error naming
// the file or leaves what is read exactly as written (bytes the reader does
// not depend on, such as timestamps and titles). Never a panic and never
// silently wrong data: the per-entry checksum catches what the ROOT
// container does not.
func TestCorruptedBytes(t *testing.T) {
	data, s, run, events := damageFixture(t)
	rng := rand.New(rand.NewPCG(3, 4))
	damaged := make([]byte, len(data))
	errs, harmless := 0, 0
	positions := damagePositions(t, data)
	for _, pos := range positions {
		copy(damaged, data)
		damaged[pos] ^= byte(1 + rng.IntN(255))
		r, got, err := readBytes(damaged)
		if err != nil {
			if !strings.Contains(err.Error(), "damaged.root") {
				t.Fatalf("byte %d: error %q does not name the file", pos, err)
			}
			errs++
			continue
		}
		harmless++
		if !reflect.DeepEqual(got, events) || !reflect.DeepEqual(r.Run(), run) ||
			!reflect.DeepEqual(r.Detector().Sensors(), s.det.Sensors()) || modelDifference(r.Sensor(), s.model) != "" {
			t.Fatalf("byte %d flipped: file read without error but its content changed", pos)
		}
	}
	t.Logf("%d of %d bytes flipped: %d errors, %d harmless", len(positions), len(data), errs, harmless)
}

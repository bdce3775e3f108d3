package event

import (
	"os"
	"path/filepath"
	"reflect"
	"slices"
	"strings"
	"testing"

	"github.com/conelight/conelight/geom"
)

// shard writes shard i of n of a run whose shards hold the event ranges
// given by firsts and counts, and returns its path and events.
func writeShard(t *testing.T, dir string, s setup, i, n int, first, count uint64, seed uint64) (string, []Event) {
	t.Helper()
	run := testRun(first, count)
	run.ShardIndex, run.ShardCount = i, n
	// Store only some of the numbers, as a trigger would.
	all := randomEvents(seed, first, int(count), s.det.NumSensors(), 40)
	var kept []Event
	for j := range all {
		if j%3 != 1 {
			kept = append(kept, all[j])
		}
	}
	path := filepath.Join(dir, "shard"+string(rune('0'+i))+".root")
	writeFile(t, path, s, run, kept)
	return path, kept
}

func TestMerge(t *testing.T) {
	s := smallSetup(t)
	dir := t.TempDir()
	p0, e0 := writeShard(t, dir, s, 0, 3, 100, 20, 1)
	p1, e1 := writeShard(t, dir, s, 1, 3, 120, 15, 2)
	p2, e2 := writeShard(t, dir, s, 2, 3, 135, 30, 3)
	dst := filepath.Join(dir, "all.root")
	if err := Merge(dst, p2, p0, p1); err != nil { // any order of sources
		t.Fatal(err)
	}
	r, got := readAll(t, dst)
	want := slices.Concat(e0, e1, e2)
	if !reflect.DeepEqual(got, want) {
		t.Fatalf("merged file holds %d events; want the %d shard events in FirstEvent order", len(got), len(want))
	}
	run := testRun(100, 65)
	if !reflect.DeepEqual(r.Run(), run) {
		t.Errorf("merged Run() = %+v, want %+v", r.Run(), run)
	}
	if !reflect.DeepEqual(r.Detector().Sensors(), s.det.Sensors()) || modelDifference(r.Sensor(), s.model) != "" {
		t.Errorf("merged file's detector or sensor model differs from the shards'")
	}
	if names := dirEntries(t, dir); len(names) != 4 {
		t.Errorf("directory holds %v, want the three shards and the merged file", names)
	}

	// Merging into one of the sources replaces it.
	if err := Merge(p0, p0, p1); err != nil {
		t.Fatal(err)
	}
	if _, got := readAll(t, p0); !reflect.DeepEqual(got, slices.Concat(e0, e1)) {
		t.Errorf("merge into a source: got %d events, want %d", len(got), len(e0)+len(e1))
	}
}

func TestMergeRejects(t *testing.T) {
	s := smallSetup(t)
	dir := t.TempDir()
	p0, _ := writeShard(t, dir, s, 0, 2, 0, 10, 1)
	p1, _ := writeShard(t, dir, s, 1, 2, 10, 10, 2)

	sub := func(name string) string {
		d := filepath.Join(dir, name)
		if err := os.Mkdir(d, 0o755); err != nil {
			t.Fatal(err)
		}
		return d
	}
	// Shards that differ from p0 in one respect each.
	otherModel := s
	otherModel.model.TTS *= 2
	pModel, _ := writeShard(t, sub("model"), otherModel, 1, 2, 10, 10, 2)

	demo := demoSetup(t)
	denser, err := geom.Layout(geom.DemoTank(), demo.model.CathodeDiameter, 0.3)
	if err != nil {
		t.Fatal(err)
	}
	pa, _ := writeShard(t, sub("layoutA"), demo, 0, 2, 0, 10, 1)
	pb, _ := writeShard(t, sub("layoutB"), setup{denser, demo.model}, 1, 2, 10, 10, 2)

	pSeed := filepath.Join(sub("seed"), "s.root")
	run := testRun(10, 10)
	run.Seed++
	writeFile(t, pSeed, s, run, nil)

	pOverlap, _ := writeShard(t, sub("overlap"), s, 1, 2, 5, 10, 2)
	pGap, _ := writeShard(t, sub("gap"), s, 1, 2, 12, 10, 2)

	dst := filepath.Join(dir, "merged.root")
	for _, tc := range []struct {
		srcs []string
		want []string
	}{
		{[]string{p0, pModel}, []string{"sensor model", "tts: 0.7 vs 1.4"}},
		{[]string{p0, p1, pSeed}, []string{"run settings", p0, pSeed}},
		{[]string{pa, pb}, []string{"detector", "n_sensor: 477 vs "}},
		{[]string{p0, pSeed}, []string{"run settings", "seed: 12345 vs 12346"}},
		{[]string{p0, pOverlap}, []string{"overlap", "[0, 9]", "[5, 14]"}},
		{[]string{pGap, p0}, []string{"events 10 to 11 missing"}},
		{[]string{p0, p0}, []string{"overlap"}},
		{[]string{p0, filepath.Join(dir, "missing.root")}, []string{"missing.root"}},
		{nil, []string{"no source files"}},
	} {
		err := Merge(dst, tc.srcs...)
		if err == nil {
			t.Errorf("Merge(%v): no error", tc.srcs)
			continue
		}
		for _, w := range tc.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("Merge(%v): error %q does not contain %q", tc.srcs, err, w)
			}
		}
	}
	if _, err := os.Stat(dst); !os.IsNotExist(err) {
		t.Errorf("failed merges left %s behind", dst)
	}
	if names := dirEntries(t, dir); !slices.Equal(names, []string{"gap", "layoutA", "layoutB", "model", "overlap", "seed", "shard0.root", "shard1.root"}) {
		t.Errorf("directory holds %v after failed merges", names)
	}
}

// TestMergeCorruptSource: a damaged shard stops the merge with an error
// naming it, and nothing is written.
func TestMergeCorruptSource(t *testing.T) {
	s := smallSetup(t)
	dir := t.TempDir()
	p0, _ := writeShard(t, dir, s, 0, 2, 0, 10, 1)
	p1, _ := writeShard(t, dir, s, 1, 2, 10, 10, 2)
	data := readFileBytes(t, p1)
	data[len(data)/2] ^= 0x40
	if err := writeBytes(p1, data); err != nil {
		t.Fatal(err)
	}
	dst := filepath.Join(dir, "merged.root")
	err := Merge(dst, p0, p1)
	if err == nil || !strings.Contains(err.Error(), p1) {
		t.Fatalf("merge with a corrupt shard: error %v, want one naming %s", err, p1)
	}
	if names := dirEntries(t, dir); len(names) != 2 {
		t.Errorf("directory holds %v, want only the two shards", names)
	}
}

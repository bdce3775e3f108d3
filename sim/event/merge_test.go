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

// writeShard writes shard i of n, holding events first .. first+count-1,
// of a run of the events in whole, and returns its path and events.
func writeShard(t *testing.T, dir string, s setup, whole Span, i, n int, first, count uint64, seed uint64) (string, []Event) {
	t.Helper()
	run := testRun(first, count)
	run.ShardIndex, run.ShardCount, run.Run = i, n, whole
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
	whole := Span{First: 100, N: 65}
	p0, e0 := writeShard(t, dir, s, whole, 0, 3, 100, 20, 1)
	p1, e1 := writeShard(t, dir, s, whole, 1, 3, 120, 15, 2)
	p2, e2 := writeShard(t, dir, s, whole, 2, 3, 135, 30, 3)
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

	// A partial merge into one of the sources replaces it and records
	// the absent last shard.
	if err := MergeWith(p0, MergeOptions{Partial: true}, p0, p1); err != nil {
		t.Fatal(err)
	}
	r, got = readAll(t, p0)
	if !reflect.DeepEqual(got, slices.Concat(e0, e1)) {
		t.Errorf("merge into a source: got %d events, want %d", len(got), len(e0)+len(e1))
	}
	if m := r.Run().Missing; !reflect.DeepEqual(m, []Span{{First: 135, N: 30}}) || r.Run().Interrupted || r.Run().Complete() {
		t.Errorf("partial merge records Missing = %v, Interrupted = %v", m, r.Run().Interrupted)
	}
}

// TestMergeIncomplete: a set missing its first, a middle or its last
// shard, or holding an interrupted shard, is refused with the shard and
// the event numbers named; with Partial it merges and records them.
func TestMergeIncomplete(t *testing.T) {
	s := smallSetup(t)
	dir := t.TempDir()
	whole := Span{First: 0, N: 40}
	var p [4]string
	for i := range p {
		p[i], _ = writeShard(t, dir, s, whole, i, 4, uint64(10*i), 10, uint64(i+1))
	}
	// Shard 2 interrupted after 4 of its 10 events.
	pInt := filepath.Join(dir, "interrupted.root")
	run := testRun(20, 10)
	run.ShardIndex, run.ShardCount, run.Run = 2, 4, whole
	w, err := Create(pInt, s.det, s.model, run)
	if err != nil {
		t.Fatal(err)
	}
	evs := randomEvents(9, 20, 4, s.det.NumSensors(), 5)
	for i := range evs {
		if err := w.Write(&evs[i]); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Interrupt(3); err == nil {
		t.Error("Interrupt(3) accepted after event 23 was written")
	}
	if err := w.Interrupt(4); err != nil {
		t.Fatal(err)
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	r, err := Open(pInt)
	if err != nil {
		t.Fatal(err)
	}
	if ri := r.Run(); !ri.Interrupted || !reflect.DeepEqual(ri.Missing, []Span{{First: 24, N: 6}}) || r.Len() != 4 {
		t.Errorf("interrupted shard: Interrupted %v, Missing %v, %d events", ri.Interrupted, ri.Missing, r.Len())
	}
	r.Close()

	for _, tc := range []struct {
		name    string
		srcs    []string
		want    []string
		missing []Span
		intr    bool
	}{
		{"first absent", []string{p[1], p[2], p[3]}, []string{"shards 0 of 4 are absent", "events 0 to 9 missing at the start of the run, before " + p[1]}, []Span{{0, 10}}, false},
		{"middle absent", []string{p[0], p[1], p[3]}, []string{"shards 2 of 4 are absent", "events 20 to 29 missing after " + p[1]}, []Span{{20, 10}}, false},
		{"last absent", []string{p[0], p[1], p[2]}, []string{"shards 3 of 4 are absent", "events 30 to 39 missing at the end of the run, after " + p[2]}, []Span{{30, 10}}, false},
		{"two absent", []string{p[0], p[3]}, []string{"shards 1, 2 of 4 are absent", "events 10 to 29 missing"}, []Span{{10, 20}}, false},
		{"interrupted", []string{p[0], p[1], pInt, p[3]}, []string{pInt + " (shard 2 of 4) misses events 24 to 29", pInt + " (shard 2 of 4) was interrupted"}, []Span{{24, 6}}, true},
	} {
		dst := filepath.Join(dir, "merged.root")
		err := Merge(dst, tc.srcs...)
		if err == nil {
			t.Errorf("%s: no error", tc.name)
		} else {
			for _, w := range tc.want {
				if !strings.Contains(err.Error(), w) {
					t.Errorf("%s: error %q does not contain %q", tc.name, err, w)
				}
			}
		}
		if _, err := os.Stat(dst); !os.IsNotExist(err) {
			t.Errorf("%s: refused merge left %s", tc.name, dst)
		}
		if err := MergeWith(dst, MergeOptions{Partial: true}, tc.srcs...); err != nil {
			t.Errorf("%s: partial merge: %v", tc.name, err)
			continue
		}
		r, _ := readAll(t, dst)
		ri := r.Run()
		if !reflect.DeepEqual(ri.Missing, tc.missing) || ri.Interrupted != tc.intr || ri.Run != whole || ri.FirstEvent != 0 || ri.Events != 40 {
			t.Errorf("%s: partial merge records Missing %v, Interrupted %v, Run %v, range %d+%d", tc.name, ri.Missing, ri.Interrupted, ri.Run, ri.FirstEvent, ri.Events)
		}
		r.Close()
		os.Remove(dst)
	}
}

func TestMergeRejects(t *testing.T) {
	s := smallSetup(t)
	dir := t.TempDir()
	whole := Span{First: 0, N: 20}
	p0, _ := writeShard(t, dir, s, whole, 0, 2, 0, 10, 1)
	p1, _ := writeShard(t, dir, s, whole, 1, 2, 10, 10, 2)

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
	pModel, _ := writeShard(t, sub("model"), otherModel, whole, 1, 2, 10, 10, 2)

	demo := demoSetup(t)
	denser, err := geom.Layout(geom.DemoTank(), demo.model.CathodeDiameter, 0.3)
	if err != nil {
		t.Fatal(err)
	}
	pa, _ := writeShard(t, sub("layoutA"), demo, whole, 0, 2, 0, 10, 1)
	pb, _ := writeShard(t, sub("layoutB"), setup{denser, demo.model}, whole, 1, 2, 10, 10, 2)

	pSeed := filepath.Join(sub("seed"), "s.root")
	run := testRun(10, 10)
	run.Seed++
	writeFile(t, pSeed, s, run, nil)

	pOverlap, _ := writeShard(t, sub("overlap"), s, whole, 1, 2, 5, 10, 2)
	pGap, _ := writeShard(t, sub("gap"), s, whole, 1, 2, 12, 8, 2)
	pDup, _ := writeShard(t, sub("dup"), s, whole, 0, 2, 10, 10, 2)
	pCount, _ := writeShard(t, sub("count"), s, whole, 1, 3, 10, 10, 2)

	dst := filepath.Join(dir, "merged.root")
	for _, tc := range []struct {
		srcs []string
		want []string
	}{
		{[]string{p0, pModel}, []string{"sensor model", "tts: 0.7 vs 1.4"}},
		{[]string{p0, p1, pSeed}, []string{"run settings", p0, pSeed}},
		{[]string{pa, pb}, []string{"detector", "n_sensor: 477 vs "}},
		{[]string{p0, pSeed}, []string{"run settings", "seed: 12345 vs 12346"}},
		{[]string{p0, pOverlap}, []string{"overlap", "events 0 to 9", "events 5 to 14"}},
		{[]string{pGap, p0}, []string{"events 10 to 11 missing after " + p0}},
		{[]string{p0, p0}, []string{"are both shard 0 of 2"}},
		{[]string{p0, pDup}, []string{p0 + " and " + pDup + " are both shard 0 of 2"}},
		{[]string{p0, pCount}, []string{"run settings", "shard_count: 2 vs 3"}},
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
	if names := dirEntries(t, dir); !slices.Equal(names, []string{"count", "dup", "gap", "layoutA", "layoutB", "model", "overlap", "seed", "shard0.root", "shard1.root"}) {
		t.Errorf("directory holds %v after failed merges", names)
	}
}

// TestMergeCorruptSource: a damaged shard stops the merge with an error
// naming it, and nothing is written.
func TestMergeCorruptSource(t *testing.T) {
	s := smallSetup(t)
	dir := t.TempDir()
	whole := Span{First: 0, N: 20}
	p0, _ := writeShard(t, dir, s, whole, 0, 2, 0, 10, 1)
	p1, _ := writeShard(t, dir, s, whole, 1, 2, 10, 10, 2)
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

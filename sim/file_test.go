package sim

import (
	"bytes"
	"context"
	"errors"
	"math/rand/v2"
	"os"
	"path/filepath"
	"reflect"
	"testing"

	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
)

func readAll(t *testing.T, path string) (*event.Reader, []event.Event) {
	t.Helper()
	r, err := event.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { r.Close() })
	var evs []event.Event
	for ev, err := range r.Events() {
		if err != nil {
			t.Fatal(err)
		}
		evs = append(evs, ev)
	}
	return r, evs
}

func TestShardRange(t *testing.T) {
	// The blocks of every split cover the range once, in order.
	for _, count := range []uint64{0, 1, 7, 10, 100} {
		for shards := 1; shards <= 12; shards++ {
			next := uint64(5)
			for k := 0; k < shards; k++ {
				first, n, err := RunOptions{First: 5, Count: count, Shard: k, Shards: shards}.ShardRange()
				if err != nil {
					t.Fatal(err)
				}
				if first != next {
					t.Fatalf("count %d, shard %d/%d starts at %d, want %d", count, k, shards, first, next)
				}
				next += n
			}
			if next != 5+count {
				t.Fatalf("count %d in %d shards ends at %d", count, shards, next)
			}
		}
	}
}

func TestShardFilesMergeToTheRun(t *testing.T) {
	// Three shard files merged equal the file of the unsplit run: the same
	// events bit for bit, the same detector, sensor and run description.
	dir := t.TempDir()
	s := demoSim(t, 2, nil)
	g := isoElectrons{8}
	whole := filepath.Join(dir, "whole.root")
	if _, err := s.WriteRun(context.Background(), g, RunOptions{Count: 14}, whole); err != nil {
		t.Fatal(err)
	}
	var shards []string
	for k := 0; k < 3; k++ {
		p := filepath.Join(dir, "shard"+string(rune('0'+k))+".root")
		if _, err := s.WriteRun(context.Background(), g, RunOptions{Count: 14, Shard: k, Shards: 3}, p); err != nil {
			t.Fatal(err)
		}
		shards = append(shards, p)
	}
	merged := filepath.Join(dir, "merged.root")
	if err := event.Merge(merged, shards...); err != nil {
		t.Fatal(err)
	}
	ra, a := readAll(t, whole)
	rb, b := readAll(t, merged)
	if len(a) == 0 || !reflect.DeepEqual(a, b) {
		t.Fatalf("merged shards differ from the run (%d vs %d events)", len(a), len(b))
	}
	if !reflect.DeepEqual(ra.Run(), rb.Run()) {
		t.Errorf("run info differs:\n%+v\n%+v", ra.Run(), rb.Run())
	}
	if !reflect.DeepEqual(ra.Detector().Sensors(), s.Config().Detector.Sensors()) || !reflect.DeepEqual(ra.Sensor(), s.Config().Sensor) {
		t.Error("the file does not give back the detector and sensor it was simulated with")
	}
	// Merged under the same name, the shards give the unsplit run's bytes.
	wholeBytes, err := os.ReadFile(whole)
	if err != nil {
		t.Fatal(err)
	}
	if err := event.Merge(whole, shards...); err != nil {
		t.Fatal(err)
	}
	if b, err := os.ReadFile(whole); err != nil || !bytes.Equal(b, wholeBytes) {
		t.Errorf("shards merged into %s differ in bytes from the unsplit run (%v)", whole, err)
	}
}

func TestWriteRunCancelled(t *testing.T) {
	// A cancelled run leaves a complete, readable file of the events done.
	dir := t.TempDir()
	s := demoSim(t, 2, func(c *Config) { c.KeepUntriggered = true })
	path := filepath.Join(dir, "cut.root")
	ctx, cancel := context.WithCancel(context.Background())
	g := isoElectrons{5}
	opt := RunOptions{Count: 100000, Progress: func(p Progress) {
		if p.Done >= 10 {
			cancel()
		}
	}, ProgressEvery: 1}
	n, err := s.WriteRun(ctx, g, opt, path)
	if !errors.Is(err, context.Canceled) {
		t.Fatalf("cancelled WriteRun returned %v", err)
	}
	_, evs := readAll(t, path)
	if len(evs) != n || n == 0 || n >= 100000 {
		t.Fatalf("file holds %d events, WriteRun said %d", len(evs), n)
	}
	for i, ev := range evs {
		if ev.Number != uint64(i) {
			t.Fatalf("event %d at position %d", ev.Number, i)
		}
	}
	// It says so: interrupted, the rest of the range missing.
	r, _ := readAll(t, path)
	if ri := r.Run(); !ri.Interrupted || !reflect.DeepEqual(ri.Missing, []event.Span{{First: uint64(n), N: 100000 - uint64(n)}}) {
		t.Errorf("cancelled run records Interrupted %v, Missing %v after %d events", ri.Interrupted, ri.Missing, n)
	}
	// A failing run leaves nothing under the final name.
	bad := filepath.Join(dir, "bad.root")
	if _, err := s.WriteRun(context.Background(), g, RunOptions{Count: 0}, bad); err == nil {
		t.Error("a run of no events accepted")
	}
	if _, err := os.Stat(bad); !os.IsNotExist(err) {
		t.Errorf("failed run left %s: %v", bad, err)
	}
}

// failingGen fails at event 5.
type failingGen struct{ isoElectrons }

func (g failingGen) Generate(number uint64, rng *rand.Rand, dst []phys.Particle) ([]phys.Particle, gen.Info, error) {
	if number == 5 {
		return dst, gen.Info{}, errors.New("generator broke")
	}
	return g.isoElectrons.Generate(number, rng, dst)
}

func TestWriteRunFailureLeavesNoFile(t *testing.T) {
	s := demoSim(t, 2, nil)
	path := filepath.Join(t.TempDir(), "broken.root")
	if _, err := s.WriteRun(context.Background(), failingGen{isoElectrons{5}}, RunOptions{Count: 20}, path); err == nil {
		t.Fatal("failing generator: no error")
	}
	entries, _ := os.ReadDir(filepath.Dir(path))
	if len(entries) != 0 {
		t.Errorf("failed run left files: %v", entries)
	}
}

func TestWriteRunBytesIndependentOfWorkers(t *testing.T) {
	// The same seed and settings give the same bytes with 1 and 3
	// workers (and at different times: the file's dates are fixed).
	path := filepath.Join(t.TempDir(), "run.root")
	var files [][]byte
	for _, workers := range []int{1, 3} {
		s := demoSim(t, workers, nil)
		if _, err := s.WriteRun(context.Background(), isoElectrons{6}, RunOptions{Count: 6}, path); err != nil {
			t.Fatal(err)
		}
		b, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		files = append(files, b)
	}
	if !bytes.Equal(files[0], files[1]) {
		t.Error("files of 1 and 3 workers differ in bytes")
	}
}

// fileGen stands for a generator that reads a file: it numbers its
// events from 1000, and event 2 has nothing to track.
type fileGen struct{ isoElectrons }

func (g fileGen) Generate(number uint64, rng *rand.Rand, dst []phys.Particle) ([]phys.Particle, gen.Info, error) {
	p, info, err := g.isoElectrons.Generate(number, rng, dst)
	info.SourceEvent = 1000 + int(number)
	if number == 2 {
		p, info.Skipped = p[:0], 3
	}
	return p, info, err
}

func (g fileGen) SourceFile() string { return "file.hepmc3" }

func TestWriteRunSourceGenerator(t *testing.T) {
	// Events of a file generator keep their number in the file, and the
	// run record keeps the run's accounting of the file: 4 events read,
	// the empty one left out with its reason.
	s := demoSim(t, 2, func(c *Config) { c.KeepUntriggered = true })
	path := filepath.Join(t.TempDir(), "file.root")
	if _, err := s.WriteRun(context.Background(), fileGen{isoElectrons{6}}, RunOptions{Count: 4}, path); err != nil {
		t.Fatal(err)
	}
	r, evs := readAll(t, path)
	for _, ev := range evs {
		in := ev.Truth.Interaction
		if !in.FromFile || in.SourceEvent != 1000+int64(ev.Number) || in.PDG != 0 || in.Weight != 1 {
			t.Errorf("event %d: interaction %+v", ev.Number, in)
		}
	}
	want := event.SourceStats{Read: 4, Skipped: 1, Reasons: []string{
		"sim: event 2 (test electrons, number 1002 in the file): nothing to track: 3 final-state particles not tracked (0 neutrinos)"}}
	if got := r.Run().Source; !reflect.DeepEqual(got, want) || len(evs) != 3 {
		t.Errorf("run record Source = %+v, want %+v; %d events", got, want, len(evs))
	}
}

package sim

import (
	"bytes"
	"context"
	"os"
	"path/filepath"
	"reflect"
	"testing"

	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
)

// reproGun makes an electron of 5-15 MeV and a 120 MeV muon per event,
// isotropic, anywhere in the fiducial volume, so that the test covers the
// generator, EM and muon transport, light, sensors, dark noise and
// trigger.
func reproGun(t *testing.T, s *Simulator) gen.Generator {
	t.Helper()
	g, err := gen.NewGun(gen.GunConfig{
		Particles: []gen.GunParticle{
			{PDG: phys.Electron, Ekin: gen.UniformEnergy(5, 15), Direction: gen.Isotropic()},
			{PDG: phys.MuonMinus, Ekin: gen.FixedEnergy(120), Direction: gen.Isotropic()},
		},
		Vertex: gen.InFiducial(s.Config().Detector.Tank(), 100),
	})
	if err != nil {
		t.Fatal(err)
	}
	return g
}

func runEvents(t *testing.T, s *Simulator, g gen.Generator, opt RunOptions) []*event.Event {
	t.Helper()
	var evs []*event.Event
	if err := s.Run(context.Background(), g, opt, func(e *event.Event) error { evs = append(evs, e); return nil }); err != nil {
		t.Fatal(err)
	}
	return evs
}

// TestReproducible: the same seed and configuration give bit-identical
// events from separate Simulator instances, from repeated runs of one
// instance, for 1, 2 and 3 workers and for a split into shards; and the
// ROOT files written by two instances decode to identical events.
//
// The file bytes are not compared for equality, and they differ: ROOT
// records the file's name in its header, top directory and keys, and that
// name is the temporary one the writer renames at the end
// (.NAME.tmp-<random>), with its full path; the same records carry
// creation and modification times (TDatime, one-second resolution). As
// checked when this test was written, those are the only differing bytes
// for two files written to the same name in different directories within
// one second. The test logs whether the bytes agree.
func TestReproducible(t *testing.T) {
	mod := func(c *Config) { c.KeepUntriggered = true }
	opt := RunOptions{First: 1000, Count: 9}
	ref := demoSim(t, 1, mod)
	g := reproGun(t, ref)
	want := runEvents(t, ref, g, opt)
	if len(want) != int(opt.Count) {
		t.Fatalf("%d events kept of %d", len(want), opt.Count)
	}
	hits := 0
	for _, e := range want {
		hits += len(e.Hits)
	}
	if hits == 0 {
		t.Fatal("no hits at all: nothing is compared")
	}
	if again := runEvents(t, ref, g, opt); !reflect.DeepEqual(again, want) {
		t.Error("a second run of the same Simulator differs")
	}
	for _, workers := range []int{1, 2, 3} {
		s := demoSim(t, workers, mod)
		if got := runEvents(t, s, reproGun(t, s), opt); !reflect.DeepEqual(got, want) {
			t.Errorf("a new Simulator with %d workers differs", workers)
		}
	}
	// Shards: the concatenated blocks equal the whole run.
	var joined []*event.Event
	s3 := demoSim(t, 2, mod)
	for k := range 3 {
		joined = append(joined, runEvents(t, s3, g, RunOptions{First: opt.First, Count: opt.Count, Shard: k, Shards: 3})...)
	}
	if !reflect.DeepEqual(joined, want) {
		t.Error("three shards joined differ from the whole run")
	}
	// Event called directly with the primaries the generator made reuses
	// pooled scratch: the same primaries give the same event whether the
	// scratch is fresh or used, and from either instance.
	prims, _, err := g.Generate(opt.First, EventStream(ref.Config().Seed, opt.First), nil)
	if err != nil {
		t.Fatal(err)
	}
	a, err := ref.Event(7, prims)
	if err != nil {
		t.Fatal(err)
	}
	b, err := demoSim(t, 1, mod).Event(7, prims)
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(a, b) {
		t.Error("Simulator.Event differs between a used and a fresh Simulator")
	}

	// Files: two instances, two files, the same decoded content.
	dir := t.TempDir()
	var decoded [2][]event.Event
	var runs [2]event.RunInfo
	var raw [2][]byte
	for i, workers := range []int{1, 3} {
		s := demoSim(t, workers, mod)
		path := filepath.Join(dir, []string{"a.root", "b.root"}[i])
		if _, err := s.WriteRun(context.Background(), reproGun(t, s), opt, path); err != nil {
			t.Fatal(err)
		}
		var r *event.Reader
		r, decoded[i] = readAll(t, path)
		runs[i] = r.Run()
		if raw[i], err = os.ReadFile(path); err != nil {
			t.Fatal(err)
		}
	}
	if !reflect.DeepEqual(decoded[0], decoded[1]) || !reflect.DeepEqual(runs[0], runs[1]) {
		t.Error("the two files decode to different events or run descriptions")
	}
	for i, e := range decoded[0] {
		if !reflect.DeepEqual(&e, want[i]) {
			t.Fatalf("file event %d differs from the run's event", i)
		}
	}
	t.Logf("files of %d and %d bytes; bytes identical: %v", len(raw[0]), len(raw[1]), bytes.Equal(raw[0], raw[1]))
}

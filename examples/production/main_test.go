package main

import (
	"context"
	"path/filepath"
	"reflect"
	"testing"

	"github.com/conelight/conelight/examples/internal/detflag"
	"github.com/conelight/conelight/sim/event"
)

func TestShardsAndMerge(t *testing.T) {
	// The batch recipe at a tiny size: two shards merged hold the events of
	// the unsplit run.
	dir := t.TempDir()
	base := options{particle: "e-", emin: 8, emax: 12, count: 6, seed: 9, shards: 1, wall: 100}
	whole := base
	whole.out = filepath.Join(dir, "whole.root")
	if _, err := run(context.Background(), whole); err != nil {
		t.Fatal(err)
	}
	var parts []string
	for k := 0; k < 2; k++ {
		o := base
		o.shard, o.shards = k, 2
		o.out = filepath.Join(dir, "part"+string(rune('0'+k))+".root")
		if _, err := run(context.Background(), o); err != nil {
			t.Fatal(err)
		}
		parts = append(parts, o.out)
	}
	merged := filepath.Join(dir, "merged.root")
	if err := event.Merge(merged, parts...); err != nil {
		t.Fatal(err)
	}
	read := func(p string) []event.Event {
		r, err := event.Open(p)
		if err != nil {
			t.Fatal(err)
		}
		defer r.Close()
		var evs []event.Event
		for ev, err := range r.Events() {
			if err != nil {
				t.Fatal(err)
			}
			evs = append(evs, ev)
		}
		return evs
	}
	if a, b := read(whole.out), read(merged); len(a) == 0 || !reflect.DeepEqual(a, b) {
		t.Fatalf("merged shards differ from the run: %d vs %d events", len(a), len(b))
	}
	if _, err := run(context.Background(), options{particle: "kaon"}); err == nil {
		t.Error("unknown particle accepted")
	}
}

// -detector: a production of a described tank writes that tank's
// detector, and the event file reproduces it through -detector again
// (all but the dead sensors, which event files do not record).
func TestDetectorFile(t *testing.T) {
	example := filepath.Join("..", "..", "testdata", "setup", "example.toml")
	want, err := detflag.Load(example)
	if err != nil {
		t.Fatal(err)
	}
	out := filepath.Join(t.TempDir(), "pool.root")
	o := options{particle: "e-", emin: 15, emax: 15, count: 2, seed: 3, shards: 1, wall: 100, detector: example, out: out}
	if _, err := run(context.Background(), o); err != nil {
		t.Fatal(err)
	}
	got, err := detflag.Load(out)
	if err != nil {
		t.Fatal(err)
	}
	if got.Detector.NumSensors() != want.Detector.NumSensors() || got.Sensor.Name != want.Sensor.Name ||
		got.Water.Config() != want.Water.Config() || got.Liner != want.Liner || got.Trigger != want.Trigger {
		t.Errorf("event file gives %d sensors of %q, water %+v, liner %+v, trigger %+v; want %d of %q, %+v, %+v, %+v",
			got.Detector.NumSensors(), got.Sensor.Name, got.Water.Config(), got.Liner, got.Trigger,
			want.Detector.NumSensors(), want.Sensor.Name, want.Water.Config(), want.Liner, want.Trigger)
	}
}

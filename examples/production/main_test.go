package main

import (
	"context"
	"path/filepath"
	"reflect"
	"testing"

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

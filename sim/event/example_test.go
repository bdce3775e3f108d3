package event_test

import (
	"fmt"
	"log"
	"os"
	"path/filepath"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/phys"
)

// Write two events to a file and read them back.
func Example() {
	dir, err := os.MkdirTemp("", "event-example")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	path := filepath.Join(dir, "run.root")

	sensor := pmt.Large()
	det, err := geom.Layout(geom.DemoTank(), sensor.CathodeDiameter, 0.2)
	if err != nil {
		log.Fatal(err)
	}
	run := event.RunInfo{
		Seed: 1, Generator: "muon, 1 GeV, downward", Version: "example",
		ShardCount: 1, FirstEvent: 0, Events: 2,
		Trigger: pmt.Trigger{Threshold: 20, Window: 200, PreTrigger: 400, PostTrigger: 800},
	}

	w, err := event.Create(path, det, sensor, run)
	if err != nil {
		log.Fatal(err)
	}
	defer w.Abort() // does nothing after a successful Close
	muon := phys.Particle{PDG: phys.MuonMinus, Pos: r3.Vector{Z: 400}, Dir: r3.Vector{Z: -1}, Ekin: 1000}
	events := []event.Event{
		{
			Number: 0,
			Truth: event.Truth{
				Primaries:      []phys.Particle{muon},
				Tracks:         []event.Track{{PDG: phys.MuonMinus, Length: 452, Range: 449, Fate: phys.StoppedDecayed, DecayTime: 2100}},
				Photoelectrons: 3, PEDirect: 2, PEScattered: 1,
				Triggered: true, TriggerTime: 12.5,
			},
			Hits: []pmt.Hit{{Sensor: 3, Time: 10.2, Charge: 1.1}, {Sensor: 40, Time: 12.5, Charge: 2.3}},
		},
		{Number: 1}, // nothing seen
	}
	for i := range events {
		if err := w.Write(&events[i]); err != nil {
			log.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		log.Fatal(err)
	}

	r, err := event.Open(path)
	if err != nil {
		log.Fatal(err)
	}
	defer r.Close()
	fmt.Printf("%d events, %d sensors, sensor %s, seed %d\n", r.Len(), r.Detector().NumSensors(), r.Sensor().Name, r.Run().Seed)
	for e, err := range r.Events() {
		if err != nil {
			log.Fatal(err)
		}
		fmt.Printf("event %d: %d primaries, %d hits, %d pe, triggered %v\n",
			e.Number, len(e.Truth.Primaries), len(e.Hits), e.Truth.Photoelectrons, e.Truth.Triggered)
		for _, tr := range e.Truth.Tracks {
			fmt.Printf("  track PDG %d: %.0f cm, %v\n", tr.PDG, tr.Length, tr.Fate)
		}
	}
	// Output:
	// 2 events, 477 sensors, sensor Large, seed 1
	// event 0: 1 primaries, 2 hits, 3 pe, triggered true
	//   track PDG 13: 452 cm, stopped-decayed
	// event 1: 0 primaries, 0 hits, 0 pe, triggered false
}

// A run of 30 events in three shards, of which one was interrupted after
// 4 events and one never ran: Merge refuses the set, MergeWith with
// Partial merges it and records what is missing.
func ExampleMergeWith() {
	dir, err := os.MkdirTemp("", "event-example")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	sensor := pmt.Large()
	det, err := geom.Layout(geom.DemoTank(), sensor.CathodeDiameter, 0.2)
	if err != nil {
		log.Fatal(err)
	}
	write := func(name string, shard int, done uint64) string {
		path := filepath.Join(dir, name)
		run := event.RunInfo{
			Seed: 1, Generator: "nothing", Version: "example",
			ShardIndex: shard, ShardCount: 3, FirstEvent: uint64(10 * shard), Events: 10,
			Run: event.Span{First: 0, N: 30},
		}
		w, err := event.Create(path, det, sensor, run)
		if err != nil {
			log.Fatal(err)
		}
		defer w.Abort()
		for n := run.FirstEvent; n < run.FirstEvent+done; n++ {
			if err := w.Write(&event.Event{Number: n}); err != nil {
				log.Fatal(err)
			}
		}
		if done < run.Events {
			if err := w.Interrupt(done); err != nil { // e.g. at a batch time limit
				log.Fatal(err)
			}
		}
		if err := w.Close(); err != nil {
			log.Fatal(err)
		}
		return path
	}
	a := write("part-0.root", 0, 10)
	b := write("part-1.root", 1, 4)
	out := filepath.Join(dir, "all.root")

	err = event.Merge(out, a, b)
	fmt.Println(err != nil)
	if err := event.MergeWith(out, event.MergeOptions{Partial: true}, a, b); err != nil {
		log.Fatal(err)
	}
	r, err := event.Open(out)
	if err != nil {
		log.Fatal(err)
	}
	defer r.Close()
	run := r.Run()
	fmt.Printf("%d events stored, complete %v, interrupted %v, missing %v\n", r.Len(), run.Complete(), run.Interrupted, run.Missing)
	// Output:
	// true
	// 14 events stored, complete false, interrupted true, missing [events 14 to 29]
}

package event

import (
	"math/rand/v2"
	"os"
	"path/filepath"
	"testing"

	"github.com/conelight/conelight/pmt"
)

// benchEvents returns n events of about 500 hits each with two primaries
// and tracks, the size of a GeV-scale event in the demo detector.
func benchEvents(s setup, n int) []Event {
	rng := rand.New(rand.NewPCG(9, 9))
	events := make([]Event, n)
	for i := range events {
		e := randomEvent(rng, uint64(i), s.det.NumSensors(), 2)
		e.Hits = make([]pmt.Hit, 450+rng.IntN(100))
		for j := range e.Hits {
			e.Hits[j] = pmt.Hit{Sensor: rng.IntN(s.det.NumSensors()), Time: 100 + 20*rng.NormFloat64(), Charge: rng.ExpFloat64()}
		}
		events[i] = e
	}
	return events
}

// BenchmarkWrite measures streaming events of ~500 hits to a file,
// including Close (integrity checksums, sync, rename).
func BenchmarkWrite(b *testing.B) {
	s := demoSetup(b)
	events := benchEvents(s, 256)
	path := filepath.Join(b.TempDir(), "bench.root")
	run := testRun(0, uint64(max(b.N, 1)))
	b.ReportAllocs()
	b.ResetTimer()
	w, err := Create(path, s.det, s.model, run)
	if err != nil {
		b.Fatal(err)
	}
	for i := range b.N {
		e := events[i%len(events)]
		e.Number = uint64(i)
		if err := w.Write(&e); err != nil {
			b.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		b.Fatal(err)
	}
	b.StopTimer()
	b.ReportMetric(float64(b.N)/b.Elapsed().Seconds(), "events/s")
	if fi, err := os.Stat(path); err == nil {
		b.ReportMetric(float64(fi.Size())/float64(b.N), "bytes/event")
	}
}

// BenchmarkRead measures reading events of ~500 hits, with checksum and
// validation of each.
func BenchmarkRead(b *testing.B) {
	s := demoSetup(b)
	const n = 2000
	events := benchEvents(s, n)
	path := filepath.Join(b.TempDir(), "bench.root")
	writeFile(b, path, s, testRun(0, n), events)
	r, err := Open(path)
	if err != nil {
		b.Fatal(err)
	}
	defer r.Close()
	b.ReportAllocs()
	b.ResetTimer()
	read := 0
	for read < b.N {
		for _, err := range r.Range(0, min(n, b.N-read)) {
			if err != nil {
				b.Fatal(err)
			}
			read++
		}
	}
	b.ReportMetric(float64(b.N)/b.Elapsed().Seconds(), "events/s")
}

// BenchmarkOpen measures opening a file: the preflight checks, the
// description trees and the detector rebuild.
func BenchmarkOpen(b *testing.B) {
	s := demoSetup(b)
	path := filepath.Join(b.TempDir(), "bench.root")
	writeFile(b, path, s, testRun(0, 10), benchEvents(s, 10))
	b.ReportAllocs()
	for b.Loop() {
		r, err := Open(path)
		if err != nil {
			b.Fatal(err)
		}
		r.Close()
	}
}

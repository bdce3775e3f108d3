package lowenergy_test

import (
	"testing"

	"github.com/conelight/conelight/pmt"
)

// BenchmarkFitLarge10MeV fits 10 MeV electrons in the large reference
// tank (uniform 2 m inside the sensor surface): ns/op and allocations per
// full fit (vertex, time, direction, energy, uncertainties, bound).
func BenchmarkFitLarge10MeV(b *testing.B) {
	cfg, f := largeFitter(b, 11)
	evs := study(b, cfg, f, 10, 200, 0, 50)
	hits := make([][]pmt.Hit, len(evs))
	for i, ev := range evs {
		hits[i] = ev.hits
	}
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; b.Loop(); i++ {
		if _, err := f.Fit(hits[i%len(hits)]); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkFitDemo10MeV is the same in the demo tank.
func BenchmarkFitDemo10MeV(b *testing.B) {
	cfg, f := demoFitter(b)
	evs := study(b, cfg, f, 10, 100, 0, 50)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; b.Loop(); i++ {
		if _, err := f.Fit(evs[i%len(evs)].hits); err != nil {
			b.Fatal(err)
		}
	}
}

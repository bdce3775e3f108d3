package photon

import (
	"math/rand/v2"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/cherenkov"
	"github.com/conelight/conelight/sim/internal/floor"
	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/phys"
)

// largeSetup is the large reference tank at 40% coverage with the large
// sensor class and pure water.
func largeSetup(b *testing.B) (*Tracer, *cherenkov.Emitter) {
	b.Helper()
	m := pmt.Large()
	det, err := geom.Layout(geom.LargeTank(), m.CathodeDiameter, 0.40)
	if err != nil {
		b.Fatal(err)
	}
	w, err := optics.NewWater(optics.DefaultWaterConfig())
	if err != nil {
		b.Fatal(err)
	}
	tr, err := NewTracer(det, &m, w, Config{Liner: optics.DefaultLiner(), Prescale: m.MaxEfficiency()})
	if err != nil {
		b.Fatal(err)
	}
	lo, hi := m.QE.Range()
	em, err := cherenkov.NewEmitter(w, lo, hi, m.MaxEfficiency())
	if err != nil {
		b.Fatal(err)
	}
	return tr, em
}

// BenchmarkPhotonLife is the whole life of a photon in the large tank:
// Cherenkov emission along a beta = 1 step near the centre (pre-scaled by
// the sensors' maximum efficiency), then transport, wall lookup and the
// detection decision. The ns/photon metric is comparable with
// BenchmarkPhotonFloor.
func BenchmarkPhotonLife(b *testing.B) {
	tr, em := largeSetup(b)
	rng := rand.New(rand.NewPCG(1, 2))
	seg := phys.Segment{Start: r3.Vector{X: 10, Y: -20, Z: 30}, End: r3.Vector{X: 10, Y: -20, Z: 40},
		T1: 10 / phys.SpeedOfLight, Beta0: 1, Beta1: 1, Charge: -1, PDG: phys.MuonMinus}
	var photons []cherenkov.Photon
	var pes []pmt.Photoelectron
	total := 0
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		var err error
		photons, err = em.Emit(seg, rng, photons[:0])
		if err != nil {
			b.Fatal(err)
		}
		pes = tr.TraceAll(photons, rng, pes[:0], nil)
		total += len(photons)
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(total), "ns/photon")
	b.ReportMetric(float64(total)/float64(b.N), "photons/op")
}

// BenchmarkPhotonFloor is the least any photon life can cost
// (sim/internal/floor): the random draws of an isotropic direction, one
// exponential free path and a bare ray-cylinder intersection from near the
// centre of the large tank, with no wall classification, lookup, optics
// tables or detection.
func BenchmarkPhotonFloor(b *testing.B) {
	t := geom.LargeTank()
	rng := rand.New(rand.NewPCG(3, 4))
	b.ResetTimer()
	if floor.Photons(b.N, rng, r3.Vector{X: 10, Y: -20, Z: 30}, t.SensorRadius(), t.SensorHalfHeight()) == 0 && b.N > 0 {
		b.Fatal("no distance")
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N), "ns/photon")
}

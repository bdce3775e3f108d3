package transport

import (
	"math/rand/v2"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/sim/cherenkov"
	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/phys"
)

// counter counts reports without keeping them.
type counter struct{ segs, secs int }

func (c *counter) Segment(phys.Segment)                     { c.segs++ }
func (c *counter) Secondary(phys.Particle)                  { c.secs++ }
func (c *counter) Deposit(r3.Vector, float64, float64, int) {}

// emitting emits (but does not trace) the photons of every segment.
type emitting struct {
	em      *cherenkov.Emitter
	rng     *rand.Rand
	buf     []cherenkov.Photon
	photons int
}

func (e *emitting) Segment(s phys.Segment) {
	e.buf, _ = e.em.Emit(s, e.rng, e.buf[:0])
	e.photons += len(e.buf)
}
func (e *emitting) Secondary(phys.Particle)                  {}
func (e *emitting) Deposit(r3.Vector, float64, float64, int) {}

var benchCases = []struct {
	name string
	pdg  int
	ekin float64
}{
	{"e-10MeV", phys.Electron, 10},
	{"e-1GeV", phys.Electron, 1000},
	{"mu-1GeV", phys.MuonMinus, 1000},
}

// BenchmarkTransport is the transport alone (no photons) of one primary
// and all its descendants in the large tank; ns/GeV divides by the energy.
func BenchmarkTransport(b *testing.B) {
	tr, err := NewTracker(newPhysics(b))
	if err != nil {
		b.Fatal(err)
	}
	vol := geom.LargeTank()
	for _, c := range benchCases {
		b.Run(c.name, func(b *testing.B) {
			rng := rand.New(rand.NewPCG(1, 2))
			prims := []phys.Particle{{PDG: c.pdg, Dir: r3.Vector{X: 1}, Ekin: c.ekin}}
			var cnt counter
			b.ReportAllocs()
			for i := 0; i < b.N; i++ {
				if _, err := tr.Run(prims, vol, rng, &cnt); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/(c.ekin/1000), "ns/GeV")
			b.ReportMetric(float64(cnt.segs)/float64(b.N), "segments/op")
		})
	}
}

// BenchmarkTransportEmit adds Cherenkov emission (pre-scaled by the
// large sensor class's maximum efficiency, 0.154) of every segment, without
// tracing the photons; compare ns/photon with sim/photon's
// BenchmarkPhotonFloor.
func BenchmarkTransportEmit(b *testing.B) {
	tr, err := NewTracker(newPhysics(b))
	if err != nil {
		b.Fatal(err)
	}
	w, err := optics.NewWater(optics.DefaultWaterConfig())
	if err != nil {
		b.Fatal(err)
	}
	em, err := cherenkov.NewEmitter(w, 280, 660, 0.154)
	if err != nil {
		b.Fatal(err)
	}
	vol := geom.LargeTank()
	for _, c := range benchCases {
		b.Run(c.name, func(b *testing.B) {
			rng := rand.New(rand.NewPCG(1, 2))
			sink := &emitting{em: em, rng: rng}
			prims := []phys.Particle{{PDG: c.pdg, Dir: r3.Vector{X: 1}, Ekin: c.ekin}}
			b.ReportAllocs()
			for i := 0; i < b.N; i++ {
				if _, err := tr.Run(prims, vol, rng, sink); err != nil {
					b.Fatal(err)
				}
			}
			ns := float64(b.Elapsed().Nanoseconds())
			b.ReportMetric(ns/float64(b.N)/(c.ekin/1000), "ns/GeV")
			b.ReportMetric(float64(sink.photons)/float64(b.N), "photons/op")
			b.ReportMetric(ns/float64(sink.photons), "ns/photon")
		})
	}
}

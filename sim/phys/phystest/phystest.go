// Package phystest holds the volumes and sinks that the tests of the
// transport packages (sim/em, sim/heavy, sim/muon, sim/hadron,
// sim/neutron) give to a particle's transport: simple regions of water
// and sinks that count or keep what the transport reports. Like the
// standard library's httptest, it is for tests and examples only.
package phystest

import (
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/phys"
)

// Ball is the sphere of radius R (cm) about the origin.
type Ball struct{ R float64 }

// Contains reports whether p lies inside the sphere.
func (b Ball) Contains(p r3.Vector) bool { return p.Norm2() < b.R*b.R }

// Slab is the region 0 <= z < Thick (cm), unbounded sideways.
type Slab struct{ Thick float64 }

// Contains reports whether p lies inside the slab.
func (s Slab) Contains(p r3.Vector) bool { return p.Z >= 0 && p.Z < s.Thick }

// CountSink counts what a transport reports and sums the energies (MeV).
type CountSink struct {
	Segments, Secondaries, Deposits int
	SecondaryEkin, Deposited        float64
}

// Segment counts a charged step.
func (c *CountSink) Segment(phys.Segment) { c.Segments++ }

// Secondary counts a secondary particle and sums its kinetic energy.
func (c *CountSink) Secondary(p phys.Particle) {
	c.Secondaries++
	c.SecondaryEkin += p.Ekin
}

// Deposit counts a local energy deposit and sums its energy.
func (c *CountSink) Deposit(_ r3.Vector, _, e float64, _ int) {
	c.Deposits++
	c.Deposited += e
}

// RecordSink counts like CountSink and keeps the segments and secondaries.
type RecordSink struct {
	CountSink
	Segs []phys.Segment
	Secs []phys.Particle
}

// Segment counts and keeps a charged step.
func (r *RecordSink) Segment(s phys.Segment) {
	r.CountSink.Segment(s)
	r.Segs = append(r.Segs, s)
}

// Secondary counts and keeps a secondary particle.
func (r *RecordSink) Secondary(p phys.Particle) {
	r.CountSink.Secondary(p)
	r.Secs = append(r.Secs, p)
}

// NewRNG returns a PCG source with the given seeds.
func NewRNG(a, b uint64) *rand.Rand { return rand.New(rand.NewPCG(a, b)) }

package heavy

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/phys"
)

// ball is a sphere of radius r about the origin.
type ball struct{ r float64 }

func (b ball) Contains(p r3.Vector) bool { return p.Norm() < b.r }

// slab is the region 0 <= z < thick, unbounded sideways.
type slab struct{ thick float64 }

func (s slab) Contains(p r3.Vector) bool { return p.Z >= 0 && p.Z < s.thick }

// countSink counts what it is given and sums the energies.
type countSink struct {
	segments, secondaries, deposits int
	secondaryEkin, deposited        float64
}

func (c *countSink) Segment(phys.Segment) { c.segments++ }
func (c *countSink) Secondary(p phys.Particle) {
	c.secondaries++
	c.secondaryEkin += p.Ekin
}
func (c *countSink) Deposit(_ r3.Vector, _, e float64, _ int) {
	c.deposits++
	c.deposited += e
}

// recordSink keeps the segments and secondaries.
type recordSink struct {
	countSink
	segs []phys.Segment
	secs []phys.Particle
}

func (r *recordSink) Segment(s phys.Segment) {
	r.countSink.Segment(s)
	r.segs = append(r.segs, s)
}
func (r *recordSink) Secondary(p phys.Particle) {
	r.countSink.Secondary(p)
	r.secs = append(r.secs, p)
}

func newWater(t testing.TB, cfg Config) *Physics {
	t.Helper()
	p, err := New(material.Water(), Muon(), cfg)
	if err != nil {
		t.Fatal(err)
	}
	return p
}

func muonAlongZ(pdg int, ekin float64) phys.Particle {
	return phys.Particle{PDG: pdg, Dir: r3.Vector{Z: 1}, Ekin: ekin, Track: 1}
}

func newRNG(a, b uint64) *rand.Rand { return rand.New(rand.NewPCG(a, b)) }

// meanSD returns the sample mean and standard deviation.
func meanSD(x []float64) (mean, sd float64) {
	for _, v := range x {
		mean += v
	}
	mean /= float64(len(x))
	for _, v := range x {
		sd += (v - mean) * (v - mean)
	}
	return mean, math.Sqrt(sd / float64(len(x)-1))
}

package em

import (
	"math"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/phys/phystest"
)

// everywhere is an unbounded volume.
type everywhere struct{}

func (everywhere) Contains(r3.Vector) bool { return true }

// ball is a sphere of radius r about the origin.
type ball = phystest.Ball // the test volume of phystest

// tally is a test sink: it sums what a shower reports and, when the
// profile fields are set, histograms the Cherenkov-weighted track length
// in depth along +z and deposits in radius from the z axis.
type tally struct {
	n                  float64 // refractive index for the light weight
	light, length, dep float64
	segments, deposits int
	secondaries        []phys.Particle
	keepSecondaries    bool
	badTime            int
	depthBin           float64   // cm; 0: no depth profile
	depth              []float64 // Cherenkov-weighted length per depth bin
	radial             []float64 // deposits by radius bin of radialBin
	radialBin          float64
}

// lightWeight is 1 - 1/(n beta)^2, the Frank-Tamm factor, averaged over
// the ends of a segment.
func lightWeight(n, b0, b1 float64) float64 {
	w := func(b float64) float64 { return math.Max(0, 1-1/(n*n*b*b)) }
	return (w(b0) + w(b1)) / 2
}

func (s *tally) Segment(seg phys.Segment) {
	s.segments++
	l := seg.Length()
	w := lightWeight(s.n, seg.Beta0, seg.Beta1)
	s.length += l
	s.light += l * w
	if !(seg.T1 >= seg.T0) {
		s.badTime++
	}
	if s.depthBin > 0 {
		z := (seg.Start.Z + seg.End.Z) / 2
		if i := int(z / s.depthBin); i >= 0 && i < len(s.depth) {
			s.depth[i] += l * w
		}
	}
}

func (s *tally) Secondary(p phys.Particle) {
	if s.keepSecondaries {
		s.secondaries = append(s.secondaries, p)
	}
}

func (s *tally) Deposit(pos r3.Vector, t, e float64, track int) {
	s.deposits++
	s.dep += e
	if s.radialBin > 0 {
		r := math.Hypot(pos.X, pos.Y)
		if i := int(r / s.radialBin); i < len(s.radial) {
			s.radial[i] += e
		} else {
			s.radial[len(s.radial)-1] += e
		}
	}
}

func newPhysics(t testing.TB, cfg Config) *Physics {
	t.Helper()
	p, err := New(material.Water(), cfg)
	if err != nil {
		t.Fatal(err)
	}
	return p
}

func primary(pdg int, ekin float64) phys.Particle {
	return phys.Particle{PDG: pdg, Dir: r3.Vector{Z: 1}, Ekin: ekin, Track: 1}
}

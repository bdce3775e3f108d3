package heavy

import (
	"math"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/phys/phystest"
)

// The test volumes and sinks are those of phystest.
type (
	ball       = phystest.Ball
	slab       = phystest.Slab
	countSink  = phystest.CountSink
	recordSink = phystest.RecordSink
)

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

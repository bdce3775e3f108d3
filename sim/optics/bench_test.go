package optics

import (
	"math/rand/v2"
	"testing"

	"github.com/golang/geo/r3"
)

var benchSink float64

func benchWater(b *testing.B) *Water {
	cfg := DefaultWaterConfig()
	cfg.MieLength = 20000
	return newTestWater(b, cfg)
}

// BenchmarkFloorUniform is the floor: one uniform draw.
func BenchmarkFloorUniform(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 2))
	for b.Loop() {
		benchSink += rng.Float64()
	}
}

// benchLookup sweeps a table lookup across the band.
func benchLookup(b *testing.B, lookup func(float64) float64) {
	l := 250.0
	for b.Loop() {
		benchSink += lookup(l)
		l += 0.37
		if l > 700 {
			l = 250
		}
	}
}

func BenchmarkIndexLookup(b *testing.B)      { benchLookup(b, benchWater(b).Index) }
func BenchmarkAbsorptionLength(b *testing.B) { benchLookup(b, benchWater(b).AbsorptionLength) }

func BenchmarkRefractiveIndexFormula(b *testing.B) {
	for b.Loop() {
		n, _ := RefractiveIndex(432.1, 20)
		benchSink += n
	}
}

func BenchmarkSampleRayleighCos(b *testing.B) {
	w := benchWater(b)
	rng := rand.New(rand.NewPCG(1, 2))
	for b.Loop() {
		benchSink += w.SampleRayleighCos(rng)
	}
}

func BenchmarkSampleMieCos(b *testing.B) {
	w := benchWater(b)
	rng := rand.New(rand.NewPCG(1, 2))
	for b.Loop() {
		benchSink += w.SampleMieCos(rng)
	}
}

func BenchmarkSampleScatterCos(b *testing.B) {
	w := benchWater(b)
	rng := rand.New(rand.NewPCG(1, 2))
	for b.Loop() {
		benchSink += w.SampleScatterCos(400, rng)
	}
}

func BenchmarkLinerReflect(b *testing.B) {
	l := Liner{Reflectivity: 1, DiffuseFraction: 0.5}
	rng := rand.New(rand.NewPCG(1, 2))
	n := r3.Vector{X: 0, Y: 0, Z: 1}
	in := r3.Vector{X: 0.6, Y: 0, Z: -0.8}
	for b.Loop() {
		out, _ := l.Reflect(in, n, rng)
		benchSink += out.Z
	}
}

func BenchmarkNewWater(b *testing.B) {
	cfg := DefaultWaterConfig()
	for b.Loop() {
		if _, err := NewWater(cfg); err != nil {
			b.Fatal(err)
		}
	}
}

package cherenkov

import (
	"math/rand/v2"
	"testing"
)

var benchSink float64

// BenchmarkEmit reports the cost per photon of a 1 cm, beta = 1 step over
// 250-700 nm (about 370 photons, no prescale).
func BenchmarkEmit(b *testing.B) {
	e := testEmitter(b, testWater(b), 250, 700, 1)
	rng := rand.New(rand.NewPCG(1, 2))
	seg := step(1, 1, 1, 1)
	dst := make([]Photon, 0, 1024)
	photons := 0
	for b.Loop() {
		dst, _ = e.Emit(seg, rng, dst[:0])
		photons += len(dst)
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(photons), "ns/photon")
}

// BenchmarkEmitFloor is the floor under BenchmarkEmit: the four bare
// uniform draws one accepted photon needs (position, wavelength,
// acceptance, azimuth), per photon.
func BenchmarkEmitFloor(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 2))
	for b.Loop() {
		benchSink += rng.Float64() + rng.Float64() + rng.Float64() + rng.Float64()
	}
}

func BenchmarkYieldPerCm(b *testing.B) {
	e := testEmitter(b, testWater(b), 250, 700, 1)
	beta := 0.8
	for b.Loop() {
		benchSink += e.YieldPerCm(beta)
		beta += 1e-5
		if beta > 1 {
			beta = 0.8
		}
	}
}

func BenchmarkMeanPhotons(b *testing.B) {
	e := testEmitter(b, testWater(b), 250, 700, 1)
	seg := step(1, 0.95, 0.9, 1)
	for b.Loop() {
		m, _ := e.MeanPhotons(seg)
		benchSink += m
	}
}

func BenchmarkPoisson100(b *testing.B) {
	rng := rand.New(rand.NewPCG(1, 2))
	for b.Loop() {
		benchSink += float64(poisson(rng, 100))
	}
}

func BenchmarkNewEmitter(b *testing.B) {
	w := testWater(b)
	for b.Loop() {
		if _, err := NewEmitter(w, 250, 700, 1); err != nil {
			b.Fatal(err)
		}
	}
}

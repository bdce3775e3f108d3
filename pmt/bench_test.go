package pmt

import (
	"math/rand/v2"
	"testing"
)

func BenchmarkEfficiency(b *testing.B) {
	m := Large()
	rng := rand.New(rand.NewPCG(1, 2))
	const n = 1024
	var lambda, cos [n]float64
	for i := range lambda {
		lambda[i] = 280 + 380*rng.Float64()
		cos[i] = rng.Float64()
	}
	var sum float64
	b.ReportAllocs()
	for i := 0; b.Loop(); i++ {
		sum += m.Efficiency(lambda[i%n], cos[i%n])
	}
	if sum < 0 {
		b.Fatal(sum)
	}
}

func BenchmarkCurveAt(b *testing.B) {
	c := BialkaliQE(0.25)
	var sum float64
	x := 280.0
	b.ReportAllocs()
	for b.Loop() {
		sum += c.At(x)
		x += 0.37
		if x > 660 {
			x -= 380
		}
	}
	if sum < 0 {
		b.Fatal(sum)
	}
}

// BenchmarkDigitize digitizes 10,000 photoelectrons over 1,000 sensors
// with a reused Digitizer and hit buffer: zero allocations after warm-up.
func BenchmarkDigitize(b *testing.B) {
	m := Large()
	d, err := NewDigitizer(&m)
	if err != nil {
		b.Fatal(err)
	}
	pes := benchPhotoelectrons(10000, 1000)
	rng := rand.New(rand.NewPCG(3, 4))
	hits, _ := d.Digitize(pes, 1000, rng, nil)
	b.ReportAllocs()
	for b.Loop() {
		hits, err = d.Digitize(pes, 1000, rng, hits[:0])
		if err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkAddDark fills a 1.5 us readout of 10,000 Large sensors
// (about 60 dark pulses per call).
func BenchmarkAddDark(b *testing.B) {
	m := Large()
	rng := rand.New(rand.NewPCG(5, 6))
	var buf []Photoelectron
	b.ReportAllocs()
	for b.Loop() {
		buf, _ = m.AddDark(buf[:0], 10000, -500, 1000, rng)
	}
}

package em

import (
	"math"
	"math/rand/v2"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/scatter"
)

func benchShower(b *testing.B, e float64) {
	p := newPhysics(b, DefaultConfig())
	rng := rand.New(rand.NewPCG(1, 2))
	sink := &discard{}
	part := primary(phys.Electron, e)
	b.ReportAllocs()
	b.ResetTimer()
	for b.Loop() {
		if err := p.Shower(part, everywhere{}, rng, sink); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/(e/1000), "ns/GeV")
	b.ReportMetric(float64(sink.n)/float64(b.N), "reports/op")
}

func BenchmarkShower10MeV(b *testing.B) { benchShower(b, 10) }
func BenchmarkShower1GeV(b *testing.B)  { benchShower(b, 1000) }

// BenchmarkStepFloor is the irreducible work of one charged step: a table
// lookup (one log), an exponential draw, the Highland width and the
// scattering sample; compare its ns/op with the ns per reported segment of
// BenchmarkShower1GeV.
func BenchmarkStepFloor(b *testing.B) {
	p := newPhysics(b, DefaultConfig())
	rng := rand.New(rand.NewPCG(3, 4))
	u := r3.Vector{Z: 1}
	var acc float64
	e := 50.0
	b.ReportAllocs()
	for b.Loop() {
		i, f := p.locate(e)
		s := math.Min(rng.ExpFloat64()/lerp(p.eminus.total, i, f), 0.1)
		th := scatter.Theta0(s, p.x0, 50, 0.99995, -1)
		d, disp := scatter.Sample(u, s, th, rng)
		acc += d.Z + disp.X
	}
	if acc == 0 {
		b.Fatal("no work")
	}
}

// BenchmarkShower5GeVLight is the heavy version of the light-yield check:
// it reports the Cherenkov-weighted track length per MeV of 5 GeV
// electron showers.
func BenchmarkShower5GeVLight(b *testing.B) {
	p := newPhysics(b, DefaultConfig())
	rng := rand.New(rand.NewPCG(5, 6))
	s := &tally{n: 1.34}
	for b.Loop() {
		if err := p.Shower(primary(phys.Electron, 5000), everywhere{}, rng, s); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(s.light/5000/float64(b.N), "cm/MeV")
}

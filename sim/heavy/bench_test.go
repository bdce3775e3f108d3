package heavy

import (
	"testing"

	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/phys/phystest"
)

// benchTrack transports muons of kinetic energy ekin (MeV) stopping in a
// large sphere into a counting sink and reports ns per GeV.
func benchTrack(b *testing.B, ekin float64) {
	p := newWater(b, Config{})
	rng := phystest.NewRNG(51, 52)
	var sink countSink
	part := muonAlongZ(phys.MuonMinus, ekin)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := p.Track(part, ball{R: 1e6}, rng, &sink); err != nil {
			b.Fatal(err)
		}
	}
	b.StopTimer()
	b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/(ekin/1000), "ns/GeV")
	b.ReportMetric(float64(sink.Segments)/float64(b.N), "segments/op")
}

func BenchmarkTrack1GeV(b *testing.B)  { benchTrack(b, 1000) }
func BenchmarkTrack10GeV(b *testing.B) { benchTrack(b, 10000) }

// BenchmarkStoppingPower is the cost of one evaluation of the formula.
func BenchmarkStoppingPower(b *testing.B) {
	p := newWater(b, Config{})
	b.ReportAllocs()
	for i := 0; i < b.N; i++ {
		_, _ = p.StoppingPower(1000 + float64(i%100))
	}
}

package gen

import (
	"math/rand/v2"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/sim/phys"
)

func benchGenerate(b *testing.B, g Generator) {
	rng := rand.New(rand.NewPCG(1, 2))
	dst := make([]phys.Particle, 0, 4)
	b.ReportAllocs()
	for i := 0; b.Loop(); i++ {
		var err error
		if dst, _, err = g.Generate(uint64(i), rng, dst); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkGun(b *testing.B) {
	g, _ := NewGun(GunConfig{Particles: []GunParticle{{PDG: phys.Electron, Ekin: UniformEnergy(5, 50), Direction: Isotropic()}},
		Vertex: InFiducial(geom.DemoTank(), 200)})
	benchGenerate(b, g)
}

func benchQE(b *testing.B, nu int, e Spectrum, tg Target, flux bool) {
	q, err := NewQE(QEConfig{Neutrino: nu, Etot: e, Target: tg, FluxWeighted: flux, Beam: r3.Vector{Z: 1}, Vertex: AtPoint(r3.Vector{})})
	if err != nil {
		b.Fatal(err)
	}
	benchGenerate(b, q)
}

func BenchmarkQEFreeFixed(b *testing.B) {
	benchQE(b, phys.AntiMuonNeu, FixedEnergy(1000), FreeNucleon, false)
}
func BenchmarkQEOxygenFixed(b *testing.B) { benchQE(b, phys.MuonNeu, FixedEnergy(1000), Oxygen, false) }
func BenchmarkQEOxygenSpectrum(b *testing.B) {
	benchQE(b, phys.MuonNeu, UniformEnergy(300, 3000), Oxygen, false)
}
func BenchmarkQEWaterFluxWeighted(b *testing.B) {
	benchQE(b, phys.AntiMuonNeu, PowerLaw(1, 300, 10000), Water, true)
}

func BenchmarkHepMC(b *testing.B) {
	h, err := OpenHepMC(hepmcFile, HepMCOptions{})
	if err != nil {
		b.Fatal(err)
	}
	defer h.Close()
	rng := rand.New(rand.NewPCG(1, 2))
	b.ReportAllocs()
	for i := 0; b.Loop(); i++ {
		if _, _, err := h.Generate(uint64(i%2), rng, nil); err != nil {
			b.Fatal(err)
		}
	}
}

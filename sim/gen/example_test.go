package gen_test

import (
	"fmt"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/sim/gen"
	"github.com/conelight/conelight/sim/phys"
)

// A particle gun: a muon and a photon from one vertex in the fiducial
// volume of the demonstration tank.
func ExampleGun() {
	g, err := gen.NewGun(gen.GunConfig{
		Particles: []gen.GunParticle{
			{PDG: phys.MuonMinus, Ekin: gen.UniformEnergy(200, 1000), Direction: gen.InCone(r3.Vector{Z: 1}, 0.2)},
			{PDG: phys.Gamma, Ekin: gen.FixedEnergy(15), Direction: gen.Isotropic()},
		},
		Vertex: gen.InFiducial(geom.DemoTank(), 200),
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	rng := rand.New(rand.NewPCG(1, 2)) // the simulator derives it from (seed, event number)
	ps, _, err := g.Generate(0, rng, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, p := range ps {
		fmt.Printf("%4d  Ekin %6.1f MeV  pos (%6.1f, %6.1f, %6.1f) cm  dir (%5.2f, %5.2f, %5.2f)\n",
			p.PDG, p.Ekin, p.Pos.X, p.Pos.Y, p.Pos.Z, p.Dir.X, p.Dir.Y, p.Dir.Z)
	}
	// Output:
	//   13  Ekin  543.8 MeV  pos (-239.5,   59.3,    5.5) cm  dir (-0.07,  0.06,  1.00)
	//   22  Ekin   15.0 MeV  pos (-239.5,   59.3,    5.5) cm  dir (-0.40,  0.65,  0.64)
}

// A quasi-elastic nu_mu event on the oxygen of water: the muon is the
// primary, the proton and the nuclear truth are in Info.
func ExampleQE() {
	q, err := gen.NewQE(gen.QEConfig{
		Neutrino: phys.MuonNeu,
		Etot:     gen.FixedEnergy(800),
		Beam:     r3.Vector{X: 1},
		Vertex:   gen.AtPoint(r3.Vector{}),
		Target:   gen.Water,
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	rng := rand.New(rand.NewPCG(3, 4))
	ps, info, err := q.Generate(0, rng, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	mu := ps[0]
	fmt.Printf("%v on %d: Q2 = %.3f GeV^2, |p_F| = %.0f MeV/c\n", info.Reaction, info.Target, info.Q2/1e6, info.FermiMomentum.Norm())
	fmt.Printf("mu-: Ekin %.1f MeV, cos theta %.3f; p: Ekin %.1f MeV\n", mu.Ekin, mu.Dir.X, info.FinalNucleon.Ekin)
	eqe, _ := phys.QuasiElasticEnergyOf(mu.PDG, mu.Ekin, mu.Dir.X, phys.OxygenBindingEnergy)
	fmt.Printf("quasi-elastic energy %.0f MeV (true %.0f MeV)\n", eqe, info.NeutrinoEtot)
	// Output:
	// CCQE on 1000080160: Q2 = 0.269 GeV^2, |p_F| = 167 MeV/c
	// mu-: Ekin 417.1 MeV, cos theta 0.679; p: Ekin 266.2 MeV
	// quasi-elastic energy 672 MeV (true 800 MeV)
}

func ExampleOpenHepMC() {
	// A NuHepMC file written by the HepMC3 library (GeV, mm): the primaries
	// are the final-state particles the simulator tracks; the neutrino
	// truth comes from the NuHepMC conventions.
	h, err := gen.OpenHepMC("../../testdata/gen/hepmc3/nuhepmc_v1_gev_mm.hepmc3", gen.HepMCOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	defer h.Close()
	ps, info, err := h.Generate(0, nil, nil)
	if err != nil {
		fmt.Println(err)
		return
	}
	fmt.Println(h)
	fmt.Printf("event %d: process %d, weight %g, nu %d of %.0f MeV on %d, Q2 %.0f MeV^2\n",
		info.SourceEvent, info.Process, info.EventWeight(), info.Neutrino, info.NeutrinoEtot, info.Target, info.Q2)
	for _, p := range ps {
		fmt.Printf("primary %d: Ekin %.1f MeV at (%.1f, %.1f, %.1f) cm\n", p.PDG, p.Ekin, p.Pos.X, p.Pos.Y, p.Pos.Z)
	}
	fmt.Printf("nucleon %d: Ekin %.1f MeV; %d particles not tracked\n", info.FinalNucleon.PDG, info.FinalNucleon.Ekin, info.Skipped)
	// Output:
	// HepMC3 file ../../testdata/gen/hepmc3/nuhepmc_v1_gev_mm.hepmc3 (5 events)
	// event 101: process 200, weight 1.25, nu 14 of 800 MeV on 1000080160, Q2 81349 MeV^2
	// primary 13: Ekin 452.2 MeV at (10.0, -5.0, 2.5) cm
	// nucleon 2212: Ekin 39.2 MeV; 2 particles not tracked
}

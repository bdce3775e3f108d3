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

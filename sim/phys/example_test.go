package phys_test

import (
	"fmt"

	"github.com/conelight/conelight/sim/phys"
)

// The neutrino energy from the lepton alone, for a free-nucleon event (exact)
// and with the oxygen binding energy.
func ExampleQuasiElasticEnergy() {
	// A 500 MeV (kinetic) mu- at 30 degrees to the beam.
	ekin, cos := 500.0, 0.8660254037844386
	m := phys.MuonMass
	free, _ := phys.QuasiElasticEnergy(ekin+m, cos, m, phys.NeutronMass, 0, phys.ProtonMass)
	bound, _ := phys.QuasiElasticEnergy(ekin+m, cos, m, phys.NeutronMass, phys.OxygenBindingEnergy, phys.ProtonMass)
	fmt.Printf("E_nu = %.1f MeV (free), %.1f MeV (E_b = 27 MeV)\n", free, bound)
	// Output:
	// E_nu = 661.2 MeV (free), 693.4 MeV (E_b = 27 MeV)
}

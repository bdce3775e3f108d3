package ring

import (
	"fmt"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/fit"
	"github.com/conelight/conelight/sim/phys"
)

// NeutrinoEnergy returns the parent neutrino energy (MeV) of a
// charged-current quasi-elastic interaction on a bound neutron,
// reconstructed from the fitted lepton of r and the beam direction with the
// two-body formula of phys.QuasiElasticEnergyOf (struck nucleon at rest,
// its mass less phys.OxygenBindingEnergy). beam
// need not be normalized. An unconverged result, a zero beam or an
// unphysical combination gives an error.
func NeutrinoEnergy(r *Result, beam r3.Vector) (float64, error) {
	if r.Status != fit.Converged {
		return 0, fmt.Errorf("ring: NeutrinoEnergy: the %v fit did not converge (%s)", r.Hypothesis, r.Reason)
	}
	n := beam.Norm()
	if !(n > 0) || !finite(n) {
		return 0, fmt.Errorf("ring: NeutrinoEnergy: beam direction %v must be finite and non-zero", beam)
	}
	cos := r.Track.Dir.Dot(beam) / (n * r.Track.Dir.Norm())
	cos = min(max(cos, -1), 1)
	e, err := phys.QuasiElasticEnergyOf(r.Hypothesis.PDG(), r.Track.Ekin, cos, phys.OxygenBindingEnergy)
	if err != nil {
		return 0, fmt.Errorf("ring: NeutrinoEnergy: %w", err)
	}
	return e, nil
}

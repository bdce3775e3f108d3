// Package muon transports muons (PDG 13 and -13) through water in a
// condensed-history Monte Carlo and reports what the Cherenkov simulation
// needs: straight segments while the muon is above threshold, delta-ray
// electrons, energy deposits, and the decay electron or nuclear capture at
// the end. The water is the medium of sim/material.Water (for energy loss
// and scattering), not its optics (optics.Water).
//
// # Physics
//
// Energy loss, delta rays, straggling, multiple scattering and stepping
// are those of any heavy charged particle and live in sim/heavy (the muon
// is heavy.Muon(): Bethe with the density effect and spin-1/2 term, the
// radiative correction to ionization, and the muon radiative losses
// b(E) E from the Groom-Mokhov-Striganov tables). This package adds what
// is the muon's own: the decay electron and the capture at rest.
//
// Decay and capture. The free decay time is drawn from the PDG mean life
// (phys.MuonLifetime) in the muon's proper time along its path; if it comes
// before the stop, the muon decays in flight and the electron is boosted.
// A stopped mu+ decays with the remaining (exponential) proper time. A
// stopped mu- ends bound to oxygen and disappears with the total mean life
// 1795.4 ns (Suzuki, Measday and Roalsvig, Phys. Rev. C 35 (1987) 2212); it
// is captured with probability 1 - Q tau_O/tau_free = 18.4% (Huff factor
// Q = 0.998) and then makes no decay electron: the nuclear products
// (neutrons, de-excitation gammas of a few MeV) are left out and the fate
// is StoppedCaptured. Decay electrons follow the Michel spectrum
// x^2 (3 - 2x) up to W = (m_mu^2 + m_e^2)/(2 m_mu) = 52.83 MeV with an
// isotropic direction; radiative corrections, muon polarization and
// bound-state effects on the mu- decay spectrum are neglected. Neutrinos
// are not reported.
//
// Units: cm, ns, MeV; mass stopping powers in MeV cm^2/g and ranges in
// g/cm^2.
package muon

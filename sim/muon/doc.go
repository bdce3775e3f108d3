// Package muon transports muons (PDG 13 and -13) through water in a
// condensed-history Monte Carlo and reports what the Cherenkov simulation
// needs: straight segments while the muon is above threshold, delta-ray
// electrons, energy deposits, and the decay electron or nuclear capture at
// the end. The water is the medium of sim/material.Water (for energy loss
// and scattering), not its optics (optics.Water).
//
// # Physics
//
// Energy loss. The mean collision loss is the Bethe formula with the
// Sternheimer density-effect correction and W_max including the m_e/M
// terms (PDG Review, "Passage of particles through matter"), with the
// spin-1/2 term W^2/(8E^2) and the radiative correction to ionization
// (bremsstrahlung off the struck electrons, Kelner-Kokoulin-Petrukhin form
// as given in the PDG Review). Transfers above Config.DeltaCut are explicit
// delta rays; below it the PDG restricted loss is applied continuously.
// Radiative losses (bremsstrahlung, pair production, photonuclear) are a
// continuous b(E) E term with b(E) for water from the Groom-Mokhov-Striganov
// tables (Atomic Data and Nuclear Data Tables 78 (2001) 183; values from
// memory, see radiativeB); they are below 1% of the loss up to 10 GeV.
// Their stochastic nature (catastrophic losses above ~100 GeV) is not
// modelled.
//
// Delta rays are sampled exactly from the spin-1/2 cross-section
// d sigma/dT ~ 1/(beta^2 T^2) [1 - beta^2 T/W_max + T^2/(2E^2)], emitted as
// electrons at the two-body angle cos theta = (T/p_e)(p_max/T_max), and the
// muon's momentum is reduced by the electron's. The distance to the next
// delta ray uses the cross-section's maximum over the step and a rejection
// at the step end (thinning), which is exact for the energy-dependent rate.
//
// Straggling of the restricted loss: a Gamma distribution with the
// restricted mean and the restricted Bohr variance (Bohr 1915; PDG Review,
// fluctuations in energy loss). Because large transfers are explicit, only
// the first two moments of the small ones matter for range and light; the
// Gamma keeps the per-step loss positive and skewed for short steps.
//
// Multiple Coulomb scattering uses sim/scatter (Highland width, correlated
// lateral displacement). The variance given to a step is the growth of the
// Highland variance of the path travelled so far, so the width after any
// path is the Highland width of that path, independent of the step size.
//
// Stepping: each step is limited by a maximum mean fractional energy loss,
// a maximum length, the low-energy cut, the next delta-ray candidate, the
// decay point in flight and the volume boundary (found along the line by
// bisection with phys.Volume.Contains; a muon that leaves is stopped with
// fate Exited). Mean energy after a step comes from the range table (exact
// for the mean, whatever the step). Below Cherenkov threshold (beta below
// 1/Config.ThresholdIndex) the muon keeps ranging out but reports no
// segments. The continuous loss of each step is reported through
// Sink.Deposit at the step's midpoint. Below Config.LowCut the muon stops
// and the rest is deposited where it stops.
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

// Package heavy transports heavy charged particles (muons, charged pions,
// protons: any mass from 50 MeV to 10 GeV, charge +-1) through a medium in
// a condensed-history Monte Carlo and reports what the Cherenkov
// simulation needs: straight segments while the particle is above
// threshold, delta-ray electrons and energy deposits. It ends a track where
// the particle stops, leaves the volume, decays in flight or has a
// hadronic interaction, and reports which; decay and interaction products
// belong to the caller (sim/muon, sim/hadron).
//
// # Why one code serves every mass
//
// The collision stopping power of the Bethe formula depends on the
// particle only through its speed, beta gamma, and (weakly) through W_max
// and the spin term; the mass enters W_max as m_e/M and the spin-1/2 term
// as T^2/E^2. So dE/dx(beta gamma) is nearly universal, and the range
// R = int dT/S scales as R_M(beta gamma) = (M/m_mu) R_mu(beta gamma) (PDG
// Review, "Passage of particles through matter": "R/M is a function of
// beta gamma only"), up to the small W_max and radiative differences. The
// tables here are computed for the species' mass, not scaled.
//
// # Physics
//
// Energy loss. The mean collision loss is the Bethe formula with the
// Sternheimer density-effect correction and W_max including the m_e/M
// terms (PDG Review, "Passage of particles through matter"), with the
// spin-1/2 term W^2/(8E^2) and the radiative correction to ionization
// (bremsstrahlung off the struck electrons, Kelner-Kokoulin-Petrukhin form
// as given in the PDG Review). The spin-1/2 term is used for the spin-0
// pion as well: it is below 0.1% of the loss under 10 GeV. Shell, Barkas
// and Bloch corrections are left out: they matter below beta gamma ~ 0.1
// (a proton below ~5 MeV), where the tables start (1 MeV for every
// species) and the uncorrected formula is a few per cent high. Transfers
// above Config.DeltaCut are explicit delta rays; below it the PDG
// restricted loss is applied continuously. Radiative losses (muon
// species only, Species.Radiative) are a continuous b(E) E term with b(E)
// for water from the Groom-Mokhov-Striganov tables (Atomic Data and
// Nuclear Data Tables 78 (2001) 183; values from memory); they are below
// 1% of the loss up to 10 GeV.
//
// Delta rays are sampled exactly from the spin-1/2 cross-section
// d sigma/dT ~ 1/(beta^2 T^2) [1 - beta^2 T/W_max + T^2/(2E^2)], emitted as
// electrons at the two-body angle cos theta = (T/p_e)(p_max/T_max), and the
// particle's momentum is reduced by the electron's. The distance to the
// next delta ray uses the cross-section's maximum over the step and a
// rejection at the step end (thinning), exact for the energy-dependent
// rate.
//
// Straggling of the restricted loss: a Gamma distribution with the
// restricted mean and the restricted Bohr variance (Bohr 1915; PDG Review,
// fluctuations in energy loss).
//
// Multiple Coulomb scattering uses sim/scatter (Highland width, correlated
// lateral displacement). The variance given to a step is the growth of the
// Highland variance of the path travelled so far, so the width after any
// path is the Highland width of that path, independent of the step size.
//
// Decay in flight: the decay proper time is drawn from Species.Lifetime
// at the start and compared with the proper time along the path.
//
// Hadronic interactions: Species.Interaction gives the macroscopic
// cross-section (1/cm), tabulated against kinetic energy. The optical
// depth to the interaction is drawn from an exponential at the start; each
// step is cut where the depth accumulated at the step-start cross-section
// reaches it, and the accumulated depth grows by the mean of the
// cross-sections at the two ends of the step (trapezoid rule; steps lose
// at most 1% of the energy above Cherenkov threshold and 10% below, so the
// error on the interaction probability is second order in the step).
//
// Stepping: each step is limited by a maximum mean fractional energy loss,
// a maximum length, the low-energy cut, the next delta-ray candidate, the
// decay point, the interaction point and the volume boundary (found by
// bisection with phys.Volume.Contains). Mean energy after a step comes
// from the range table (exact for the mean, whatever the step). Below
// Cherenkov threshold (beta below 1/Config.ThresholdIndex) the particle
// keeps ranging out but reports no segments. Below Config.LowCut it stops
// and the rest is deposited where it stops (fate phys.Stopped).
//
// Units: cm, ns, MeV; mass stopping powers in MeV cm^2/g and ranges in
// g/cm^2. A *Physics is immutable and safe for concurrent use.
package heavy

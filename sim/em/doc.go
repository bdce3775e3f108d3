// Package em is a condensed-history Monte Carlo of electrons, positrons
// and photons in water, down to the Cherenkov threshold: the source of the
// charged-track segments that the Cherenkov emitter turns into light. The
// water here is the medium of sim/material.Water (density, electron
// density, mean excitation energy, radiation length), not its optics
// (optics.Water, which the Cherenkov emitter and photon tracing use).
//
// Units: cm, ns, MeV; stopping powers in MeV cm^2/g, ranges in g/cm^2,
// attenuation coefficients in cm^2/g. Particles by PDG code (11 e-, -11
// e+, 22 gamma).
//
// # Physics
//
// Electrons and positrons lose energy continuously below the cuts and
// discretely above them:
//
//   - Collision loss restricted to transfers below Config.DeltaCut: the
//     Berger-Seltzer formula of ICRU Report 37 (1984), for e- (Moller) and
//     e+ (Bhabha), with the Sternheimer density effect of the medium
//     (PDG tables for water) and I = 75 eV. The unrestricted ICRU 37
//     formula gives CollisionStoppingPower.
//   - Knock-on electrons above the cut from the exact Moller and Bhabha
//     cross-sections (closed-form totals; the transfer sampled from 1/eps^2
//     with rejection on the exact shape), two-body kinematics for both
//     directions.
//   - Bremsstrahlung from Tsai, Rev. Mod. Phys. 46 (1974) 815, eq. 3.9,
//     with his fits to the Thomas-Fermi screening functions phi1, phi2
//     (nucleus) and psi1, psi2 (atomic electrons), the Coulomb correction
//     f(Z), and Tsai's Lrad, L'rad (Hartree-Fock values for hydrogen).
//     Photons above Config.BremsCut are made (1/k with rejection); the loss
//     below it is continuous. RadiativeStoppingPower integrates the same
//     cross-section. The photon is emitted at the angle m/E. The formula
//     is a high-energy (Born) one: about 5% high at 1 MeV against NIST
//     ESTAR, within 2% from 10 MeV. Dielectric and LPM suppression are
//     negligible below 100 GeV for the default cuts and are left out.
//   - Positron annihilation in flight (Heitler's cross-section and photon
//     spectrum, exact two-body directions) and at rest (two back-to-back
//     0.511 MeV photons, isotropic; positronium and three-photon decay
//     neglected).
//   - Multiple scattering per step: the Highland width of package scatter
//     at the mid-step momentum, with the correlated lateral displacement.
//     Highland is a Gaussian fit to Moliere theory (11% for
//     1e-3 < x/X0 < 100); single large-angle scatters are not modelled, and
//     for the short low-energy steps its width is held at the x/X0 = 1e-3
//     value. The chord of a step is kept equal to its path length, so the
//     Cherenkov yield, which goes with path length, is preserved.
//
// Photons:
//
//   - Compton scattering from Klein-Nishina on free electrons, sampled
//     exactly (Butcher and Messel 1960); no binding correction (below 0.5%
//     of the attenuation above 0.5 MeV).
//   - Pair production from Tsai's screened Bethe-Heitler cross-section,
//     nuclear field plus triplet production in the field of the atomic
//     electrons through Tsai's psi terms, i.e. Z(Z + xi) in the
//     complete-screening limit. The energy split is sampled from the same
//     differential cross-section; leptons leave at m/E about the photon,
//     opposite in azimuth; a triplet's recoil electron is not made.
//   - Photoelectric absorption: a log-log table of the NIST XCOM
//     photoelectric cross-section of water; the photoelectron carries the
//     photon energy less the oxygen K binding energy (0.53 keV), which is
//     deposited.
//   - Coherent (Rayleigh) scattering is neglected: it deflects photons
//     without transferring energy, is 0.1-0.3% of the attenuation at
//     0.5-1 MeV and makes no light.
//
// Against NIST ESTAR and XCOM and the PDG shower rules the tests find:
// collision stopping power within 0.5% at 1-100 MeV, CSDA range within
// 0.3%, total photon attenuation within 0.7% from 0.5 to 100 MeV, X0 from
// the Tsai atoms 36.08 cm, critical energy 78.7 MeV (PDG 78.33, Rossi's
// definition), Moliere radius 9.72 cm (PDG 9.77).
//
// # Transport
//
// Each charged step is limited by Config.MaxEnergyLossFraction of
// continuous loss (or the rest of the way to the tracking cut),
// Config.MaxStep, the distance to the next discrete interaction and the
// volume boundary. The discrete distance is drawn with a majorant of the
// total cross-section over the step, and an interaction is real with
// probability sigma(E)/majorant at the point reached (the integral, or
// fictitious-interaction, method), so the energy dependence along the step
// is treated exactly. The energy lost is the mid-step stopping power times
// the step. Every step whose starting speed is above 1/n is reported as a
// phys.Segment; its time runs with the speed changing linearly along it.
// A particle whose step would end outside the volume is cut at the
// boundary (bisection) and stops; a photon whose next interaction point is
// outside has left.
//
// Cuts are tied to the Cherenkov threshold (DefaultConfig): charged
// particles are followed down to beta = 1/n (0.257 MeV for n = 1.34),
// knock-on electrons are made down to the same energy, photons are
// followed down to 0.415 MeV, below which no Compton electron can reach
// the threshold, and bremsstrahlung photons are made down to that energy.
// The visible track length is then independent of the step limits to
// 0.5% and changes by about 1% when both cuts are raised to 1 MeV.
//
// Physics.Track transports one particle and hands its secondaries to the
// sink; Physics.Shower transports a whole cascade with a stack. A Physics
// is immutable and safe for concurrent use; the stepping loop allocates
// nothing.
package em

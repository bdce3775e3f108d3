// Package hadron transports charged pions (211, -211) and protons (2212)
// through water and decays neutral pions (111).
//
// # Ionisation and light
//
// Charged pions and protons share the heavy-particle transport of
// sim/heavy with the muon: Bethe loss with the density effect, explicit
// delta rays above the cut, Gamma straggling of the restricted loss,
// Highland multiple scattering and Cherenkov segments above threshold
// (159 MeV/c for a pion, 1.07 GeV/c for a proton at n = 1.33). Because the
// Bethe formula depends only on beta gamma, the CSDA range of a pion is
// the muon's at the same beta gamma times m_pi/m_mu.
//
// # Decay
//
// Charged pions decay in flight or at rest with the PDG mean life
// (26.033 ns) to mu nu (99.988%) or e nu (1.230e-4), two-body and
// isotropic in the pion rest frame: the muon from a decay at rest has
// 4.12 MeV. A stopped pi- does not decay: it is captured by oxygen in
// picoseconds and absorbed by a nucleon pair (fate StoppedCaptured; two
// neutrons share the pion mass less the removal energies). Neutral pions
// decay where they are made (c tau = 25 nm): two photons (98.823%) or
// e+ e- gamma (Dalitz, 1.174%, Kroll-Wada pair mass, form factor
// neglected).
//
// # Hadronic interactions (a simplified model)
//
// Pions: the per-channel pi-16O cross-sections (elastic, quasi-elastic,
// single charge exchange, absorption) are tabulated against energy after
// Ashery et al., Phys. Rev. C 23 (1981) 2173 (values from memory, pi+ and
// pi- alike); on hydrogen the free pi p cross-sections are the Delta(1232)
// Breit-Wigner with isospin weights plus a flat background. The final
// states are simple: coherent elastic scattering off oxygen with the
// diffraction slope of its radius (energy kept); quasi-elastic and charge
// exchange as one pi N collision off a Fermi-gas nucleon (k_F = 225 MeV/c,
// removal energy 27 MeV), 1 + 3 cos^2 theta in the pi N centre of mass,
// Pauli-blocked below k_F, the nucleon emitted; absorption on a pn pair
// (quasi-deuteron) with both nucleons emitted isotropically in the pair
// frame. A knock-out leaves a p3/2 hole in half the cases, which emits
// the 6.32 MeV (15N) or 6.18 MeV (15O) gamma. Not modelled: pion
// production (counted as quasi-elastic), multiple collisions inside the
// nucleus, evaporation nucleons and the other de-excitation lines.
//
// Protons: the p-16O reaction cross-section (after Carlson, ADNDT 63
// (1996) 93, values from memory) ends in one quasi-elastic knock-out with
// its gamma; p-p elastic scattering on hydrogen above 50 MeV (isotropic in
// the centre of mass). The same nucleon model serves sim/neutron.
//
// Every product (pions, nucleons, muons, photons, electrons) is reported
// to the sink as a secondary for the transport stack; neutrinos are not.
//
// A *Physics is immutable and safe for concurrent use.
package hadron

// Package gen makes the primary particles of simulated events: a particle
// gun, charged-current quasi-elastic (CCQE) neutrino interactions on water,
// and events read from HepMC2 ASCII files. Units: MeV, MeV/c, cm, ns; Q2 in
// MeV^2; cross-sections in cm^2.
//
// Every generator satisfies Generator: Generate(number, rng, dst) appends
// the primaries of one event to dst[:0] and returns them with the generator
// truth (Info). All randomness comes from the rng passed in, which the
// simulator derives from (run seed, event number), so events do not depend
// on which worker makes them; generators are immutable and safe for
// concurrent use. String describes a generator with its settings, for the
// event files. The primaries are what the simulator tracks: e-, e+, mu-,
// mu+ and gamma (nucleons and neutrinos are not tracked; a CCQE event's
// final nucleon is kept in Info only).
//
// # Distributions
//
// Spectrum (FixedEnergy, UniformEnergy, PowerLaw, HistogramSpectrum, the
// last two by closed-form and tabulated inverse CDF), VertexDist (AtPoint,
// InTank, InFiducial: uniform in the cylinder at least a given distance
// inside the sensor surface of a geom.Tank, drawn in closed form) and
// DirDist (Along, Isotropic, InCone: uniform in solid angle) are small
// immutable values; their zero values mean "not set".
//
// # Particle gun
//
// NewGun: one or more primaries from one vertex per event, each with its
// own PDG code, kinetic-energy spectrum and direction distribution.
//
// # Quasi-elastic neutrino events
//
// NewQE: nu_e, nu_mu n -> l- p and their antineutrinos nubar p -> l+ n.
//
// Cross-section. Llewellyn Smith, Phys. Rep. 3 (1972) 261: d sigma/dQ2 =
// G_F^2 cos^2 theta_C/(32 pi (s - M_i^2)^2) [A -+ (s-u) B + (s-u)^2 C],
// lepton mass included, with the vector form factors from dipole Sachs form
// factors (M_V^2 = 0.71 GeV^2; G_M^V(0) = mu_p - mu_n = 4.706, so the
// isovector anomalous moment is xi = 3.706), a dipole axial form factor
// with g_A = -1.2754 (PDG 2024) and axial mass M_A (DefaultAxialMass,
// 1.026 GeV, Bernard et al. 2002), and the PCAC pseudoscalar form factor.
// A, B, C are taken in the form of Strumia and Vissani, Phys. Lett. B 564
// (2003) 42, which keeps the neutron-proton mass difference; with equal
// masses they are Llewellyn Smith's. Both forms are checked against an
// explicit Dirac-trace calculation in the tests. Kinematics use the exact
// PDG masses. FreeCrossSection and FreeDiffCrossSection give the
// free-nucleon values.
//
// Targets. Water (the default): antineutrinos hit the two free protons or
// the eight bound protons of each molecule in proportion to their rates;
// neutrinos hit the eight bound neutrons. Oxygen: bound nucleons only.
// FreeNucleon: a nucleon at rest (for neutrinos a free neutron, a study
// target that water lacks). Bound nucleons follow the relativistic Fermi
// gas of Smith and Moniz, Nucl. Phys. B43 (1972) 605, as an impulse
// approximation done by Monte Carlo: the struck nucleon's momentum p is
// uniform in the Fermi sphere (k_F = 225 MeV/c), its energy is
// sqrt(M^2 + p^2) - E_b (E_b = 27 MeV; OxygenFermiGas), the event rate is
// the free d sigma/dQ2 at the neutrino energy in the nucleon's rest frame,
// k.P/M, times the flux factor k.P/(E_nu E_N), and final nucleons with
// |p'| <= k_F are Pauli-blocked. The residual nucleus takes no recoil, the
// final nucleon does not reinteract, and there is no spectral function or
// long-range correlation: this is the textbook Fermi gas.
//
// Sampling. Each proposal draws the target nucleon (free or bound, with its
// Fermi momentum), the lepton's polar angle theta* uniform in cos theta* in
// the neutrino-nucleon centre-of-mass frame (Q2 is linear in cos theta*)
// and its azimuth; its weight is flux factor x d sigma/dQ2 x the width of
// the Q2 range. A proposal is kept with probability weight/bound, where the
// bound is the maximum of the weight over a grid of nucleon momenta and
// angles, with a safety margin; a weight above the bound is reported as an
// error, never turned into a biased event. The lepton and nucleon are built
// in the centre-of-mass frame and boosted to the lab, so energy and
// momentum are conserved to rounding. The neutrino energy is fixed or drawn
// from a Spectrum: as the interaction spectrum (the bound is then computed
// per event) or, with FluxWeighted, as the flux, so that interaction
// energies follow flux x cross-section (one bound over the whole range, the
// energy redrawn with every proposal).
//
// The standard reconstructed neutrino energy from the lepton's energy and
// angle is phys.QuasiElasticEnergy (and phys.QuasiElasticEnergyOf), in
// sim/phys so that the reconstruction can use it without this package.
//
// # HepMC2 event files
//
// OpenHepMC, ReadHepMC, NewHepMC read HepMC2 ASCII files (the IO_GenEvent
// listing, and IO_Ascii and IO_ExtendedAscii) through go-hep.org/x/hep/hepmc.
// A first pass records the byte range of each event; Generate(number, ...)
// decodes event number on demand, so memory stays bounded and any worker
// can make any event. Final-state (status 1) e-, e+, mu-, mu+ and photons
// become primaries; other final-state particles are counted in
// Info.Skipped. Units follow the event's U line, else GeV and mm. Malformed
// input gives an error naming the file and the event, never a panic: the
// decoder's panics are recovered, and its reading goroutine is drained.
// HepMCOptions.Vertex can move each event to a vertex drawn from a
// VertexDist.
package gen

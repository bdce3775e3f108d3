// Package gen makes the primary particles of simulated events: a particle
// gun, charged-current quasi-elastic (CCQE) neutrino interactions on water,
// and events read from HepMC3 and HepMC2 text files (with the NuHepMC
// conventions of neutrino generators). Units: MeV, MeV/c, cm, ns; Q2 in
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
// # HepMC event files
//
// OpenHepMC, ReadHepMC, NewHepMC read HepMC3's own text format (the Asciiv3
// listing) and the HepMC2 text format (IO_GenEvent), including HepMC2
// files written by the HepMC3 library (whose E line, for an event without
// weights, ends in a glued "N 0"). A first pass records the byte range and
// first line of each event and the run information (weight names) of each
// Asciiv3 listing; Generate(number, ...) parses event number on demand, so
// memory stays bounded and any worker can make any event. The parser is
// this package's own: every count written in the file (vertices,
// particles, weights, random states, flow entries, weight names) is only
// compared with what the event holds and never sizes an allocation.
// Particle ids or barcodes and vertex ids used twice are errors. Errors
// name the file, the line, the event (index and the number written in the
// file) and quote the bad token.
//
// Positions. A vertex's position is the one written for it; an Asciiv3
// vertex without one (and the vertex a particle of positive mother id
// comes from, which Asciiv3 does not write) takes that of the vertex its
// first incoming particle comes from, else the event's position (the E
// line's "@"), as the HepMC3 library does. Units follow the event's U line,
// else HepMC's defaults GeV and mm; times are c t in length units.
//
// Primaries. Final-state (status 1) e-, e+, mu-, mu+ and photons become
// primaries, in the order of the file; other final-state particles are
// counted in Info.Skipped (neutrinos also in Info.SkippedNeutrinos). The
// kinetic energy comes from |p| and the PDG mass.
//
// NuHepMC (Gardiner, Isaacson, Pickering, arXiv:2310.13211, versions 1.0,
// 0.9 and earlier). The incoming neutrino is the status-4 neutrino; the
// target the status-11 particle (1.0 and 0.9), else an incoming nucleus
// (earlier files mark it status 4 or with a generator's own code), else
// another status-4 particle; the outgoing nucleon the final-state proton
// or neutron of largest momentum; Q2 = -(k - k')^2 from the neutrino and
// the final-state charged lepton of its flavour (or the neutrino itself,
// for neutral current) of largest energy. The process ID is the event
// attribute "signal_process_id" (0.9, 1.0) or "ProcID" (earlier), or in a
// HepMC2 file the E line's signal process ID; the weight is the one named
// "CV" (run information W line in Asciiv3, N line in HepMC2), else the
// first. The lab position "lab_pos" (1.0) or "LabPos" (earlier), in the
// event's length unit with an optional fourth entry, the time in seconds,
// goes into Info.LabPos and Info.LabTime, and the event is moved so that
// its primary vertex (status 1; in HepMC2 the signal vertex, else the
// vertex of id 1, else the first) lands on it. HepMCOptions.Vertex, when
// set, moves the primary vertex to a point drawn from a VertexDist
// instead.
package gen

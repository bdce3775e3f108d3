// Package phys holds the physical constants, the particle table (by PDG
// Monte Carlo code) and the few value types that every part of the
// simulator and the reconstruction share: a particle state, a straight
// charged-track segment handed to the Cherenkov emitter, and the sink that
// transport code reports to.
//
// Units everywhere in conelight: cm, ns, MeV. Constants are from the PDG
// Review of Particle Physics (2024), "Physical constants" and the particle
// listings, unless a comment says otherwise.
package phys

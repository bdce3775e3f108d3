// Package transport follows the primaries of an event and all their
// descendants through the water: electrons, positrons and photons with the
// condensed-history shower code of sim/em, muons with sim/muon. Secondaries
// (delta rays, bremsstrahlung photons, pairs, annihilation photons, muon
// decay electrons) go on a stack and are followed in turn, last in first
// out, without recursion.
//
// Every charged step above the Cherenkov threshold reaches the caller's
// phys.Sink as a Segment whose Track number is unique in the event; the
// Tracker records for every track the primary it descends from, so that
// light can be attributed per primary. Particles that no transport code
// follows (neutrinos, nucleons, nuclei) are counted in the truth and
// dropped: their light in water is negligible or below threshold at the
// energies conelight serves.
//
// A *Physics is immutable and safe for concurrent use; a *Tracker holds
// the stack and is used by one goroutine at a time.
package transport

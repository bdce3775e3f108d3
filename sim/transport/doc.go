// Package transport follows the primaries of an event and all their
// descendants through the water: electrons, positrons and photons with the
// condensed-history shower code of sim/em, muons with sim/muon, charged
// pions and protons with sim/hadron (on the heavy-particle transport of
// sim/heavy), neutral pions by their decay (sim/hadron) and neutrons to
// their capture with sim/neutron. Secondaries (delta rays,
// bremsstrahlung photons, pairs, annihilation photons, decay products,
// hadronic-interaction products, capture gammas) go on a stack and are
// followed in turn, last in first out, without recursion.
//
// Every charged step above the Cherenkov threshold reaches the caller's
// phys.Sink as a Segment whose Track number is unique in the event; the
// Tracker records for every track the primary it descends from, so that
// light can be attributed per primary. Neutrinos, which no code follows,
// are counted (Tracker.Skipped) and a neutrino primary gets fate
// phys.NotFollowed; a PDG code the library does not know is an error.
//
// A *Physics is immutable and safe for concurrent use; a *Tracker holds
// the stack and is used by one goroutine at a time.
package transport

package phys

import "fmt"

// Fate says how a particle's track ended. It is the one record of a
// track's end across the transport codes, the event truth and the event
// files; the values are stored in files as the integer codes given below
// and must never be renumbered (new fates take new codes at the end).
type Fate int

const (
	// NoFate (0): not recorded.
	NoFate Fate = iota
	// Exited (1): the particle left the tracking volume.
	Exited
	// Stopped (2): the particle came to rest (or fell below the tracking
	// cut) and did not decay or get captured.
	Stopped
	// StoppedDecayed (3): it stopped and decayed at rest.
	StoppedDecayed
	// StoppedCaptured (4): it stopped and was captured by a nucleus.
	StoppedCaptured
	// DecayedInFlight (5): it decayed before stopping.
	DecayedInFlight
	// Interacted (6): it ended in an interaction that absorbed it (photon
	// conversion or photoabsorption, a hadronic interaction); what left
	// the interaction is new tracks.
	Interacted
	// Captured (7): a neutron captured by a nucleus (in flight or
	// thermal), its capture gammas new tracks.
	Captured
	// Absorbed (8): a pion absorbed in flight by a nucleus (no pion
	// leaves; the nucleons are new tracks).
	Absorbed
	// NotFollowed (9): no transport code follows this particle (or it
	// outlived the transport's time limit); it is counted in the truth
	// and its energy gives no light.
	NotFollowed

	numFates // one past the last known fate
)

var fateNames = [numFates]string{"none", "exited", "stopped", "stopped-decayed", "stopped-captured", "decayed-in-flight", "interacted", "captured", "absorbed", "not-followed"}

// String returns the fate's name.
func (f Fate) String() string {
	if f.Valid() {
		return fateNames[f]
	}
	return fmt.Sprintf("Fate(%d)", int(f))
}

// Valid reports whether f is one of the known fates.
func (f Fate) Valid() bool { return f >= 0 && f < numFates }

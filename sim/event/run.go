package event

import (
	"fmt"
	"math"

	"github.com/conelight/conelight/pmt"
)

// RunInfo describes how the events of a file were made, so that the file
// is self-describing and shards of one run can be checked before merging.
type RunInfo struct {
	// Seed is the run seed; with the event number it fixes each event's
	// random stream.
	Seed uint64
	// Generator describes the primary generator and its settings, in the
	// generator's own words (its String method).
	Generator string
	// Version is the conelight version that simulated the run.
	Version string
	// Water describes the water optics (temperature, absorption and
	// scattering scales, ...) in the simulator's words.
	Water string
	// Options lists any further simulator settings that change the
	// events (liner reflectivity, photon pre-scale factor, cuts, ...), in
	// the simulator's words. May be empty.
	Options string

	// ShardIndex and ShardCount say which part of a larger job the file
	// is: shard ShardIndex of ShardCount (0 <= ShardIndex < ShardCount).
	// A whole run, and the output of Merge, is shard 0 of 1.
	ShardIndex, ShardCount int
	// FirstEvent and Events give the event numbers assigned to the file,
	// FirstEvent .. FirstEvent+Events-1. Every stored event lies in this
	// range; the file may hold fewer (untriggered events are dropped
	// unless KeepUntriggered).
	FirstEvent, Events uint64

	// Trigger is the hit-multiplicity trigger; the zero Trigger means
	// none was applied.
	Trigger pmt.Trigger
	// KeepUntriggered says whether events whose trigger did not fire
	// were kept.
	KeepUntriggered bool
}

// Validate checks the shard numbering, the event range and the trigger.
// The error names the field and its value.
func (r *RunInfo) Validate() error {
	switch {
	case r.ShardCount < 1 || r.ShardCount > math.MaxInt32:
		return fmt.Errorf("event: RunInfo.ShardCount = %d must be in [1, %d]", r.ShardCount, math.MaxInt32)
	case r.ShardIndex < 0 || r.ShardIndex >= r.ShardCount:
		return fmt.Errorf("event: RunInfo.ShardIndex = %d outside [0, ShardCount = %d)", r.ShardIndex, r.ShardCount)
	case r.Events == 0:
		return fmt.Errorf("event: RunInfo.Events = 0 must be at least 1")
	case r.FirstEvent > math.MaxUint64-r.Events+1:
		return fmt.Errorf("event: RunInfo.FirstEvent = %d with Events = %d overflows the event number", r.FirstEvent, r.Events)
	}
	if r.Trigger.Threshold > math.MaxInt32 {
		return fmt.Errorf("event: RunInfo.Trigger.Threshold = %d does not fit the file's 32-bit column", r.Trigger.Threshold)
	}
	if r.Trigger != (pmt.Trigger{}) {
		if err := r.Trigger.Validate(); err != nil {
			return fmt.Errorf("event: RunInfo.Trigger: %w", err)
		}
	}
	return nil
}

// contains reports whether event number n lies in the run's range.
func (r *RunInfo) contains(n uint64) bool {
	return n >= r.FirstEvent && n-r.FirstEvent < r.Events
}

// lastEvent is the last event number of the range.
func (r *RunInfo) lastEvent() uint64 { return r.FirstEvent + r.Events - 1 }

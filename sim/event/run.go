package event

import (
	"fmt"
	"math"
	"strings"

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

	// Run is the event range of the whole run that the file is a part
	// of: every shard of a run records the same Run, so that a merge can
	// name a missing first or last shard. For a whole run it equals
	// [FirstEvent, FirstEvent+Events). Zero in files of format version 1,
	// which do not record it.
	Run Span

	// Interrupted says the run stopped before simulating its whole range
	// (Writer.Interrupt), or that a merged file contains such a shard.
	Interrupted bool
	// Missing lists the event numbers of [FirstEvent, FirstEvent+Events)
	// that were never simulated: the unfinished tail of an interrupted
	// run, the shards absent from a partial merge (MergeOptions.Partial).
	// Sorted, disjoint and non-empty spans; nil for a complete file.
	Missing []Span

	// Source accounts for the events read from a generator's file (zero
	// for a built-in generator).
	Source SourceStats

	// Trigger is the hit-multiplicity trigger; the zero Trigger means
	// none was applied.
	Trigger pmt.Trigger
	// KeepUntriggered says whether events whose trigger did not fire
	// were kept.
	KeepUntriggered bool
}

// Span is a range of event numbers: First .. First+N-1.
type Span struct {
	First, N uint64
}

// Last is the last event number of a non-empty span.
func (s Span) Last() uint64 { return s.First + s.N - 1 }

func (s Span) String() string {
	if s.N == 0 {
		return fmt.Sprintf("no events at %d", s.First)
	}
	return fmt.Sprintf("events %d to %d", s.First, s.Last())
}

// SourceStats counts the events a run read from a generator's file.
type SourceStats struct {
	// Read is the number of events read from the file; Skipped how many
	// of them were not simulated, each for the reason in the matching
	// line of Reasons ("event 17 (line 345): no particle the simulator
	// tracks"). Read counts the skipped events too.
	Read, Skipped uint64
	Reasons       []string
}

// Complete reports whether the file holds every event of its range
// (trigger permitting): not interrupted and nothing missing.
func (r RunInfo) Complete() bool { return !r.Interrupted && len(r.Missing) == 0 }

// Validate checks the shard numbering, the event ranges, the missing
// spans, the source accounting and the trigger. The error names the
// field and its value.
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
	if r.Run != (Span{}) && (r.Run.N == 0 || r.Run.First > r.FirstEvent || r.FirstEvent-r.Run.First > r.Run.N-r.Events) {
		return fmt.Errorf("event: RunInfo.Run = %v does not contain the file's range FirstEvent = %d, Events = %d", r.Run, r.FirstEvent, r.Events)
	}
	next := r.FirstEvent
	for i, m := range r.Missing {
		if m.N == 0 || m.First < next || !r.contains(m.First) || !r.contains(m.Last()) || m.Last() < m.First {
			return fmt.Errorf("event: RunInfo.Missing[%d] = %v: want non-empty, sorted, disjoint spans inside [%d, %d]",
				i, m, r.FirstEvent, r.lastEvent())
		}
		next = m.Last() + 1
		if next == 0 && i < len(r.Missing)-1 { // the span ended at the largest event number
			return fmt.Errorf("event: RunInfo.Missing[%d] = %v: spans after the last event number", i+1, r.Missing[i+1])
		}
	}
	if r.Source.Skipped > r.Source.Read {
		return fmt.Errorf("event: RunInfo.Source.Skipped = %d exceeds Source.Read = %d", r.Source.Skipped, r.Source.Read)
	}
	if uint64(len(r.Source.Reasons)) != r.Source.Skipped {
		return fmt.Errorf("event: RunInfo.Source.Reasons has %d lines for Skipped = %d events", len(r.Source.Reasons), r.Source.Skipped)
	}
	for i, s := range r.Source.Reasons {
		if strings.ContainsAny(s, "\n\r") {
			return fmt.Errorf("event: RunInfo.Source.Reasons[%d] = %q must be one line", i, s)
		}
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

// missingCount is the number of event numbers in Missing.
func (r *RunInfo) missingCount() uint64 {
	var n uint64
	for _, m := range r.Missing {
		n += m.N
	}
	return n
}

// missing returns the missing span holding event number n, if any.
func (r *RunInfo) missing(n uint64) (Span, bool) {
	for _, m := range r.Missing {
		if n >= m.First && n-m.First < m.N {
			return m, true
		}
	}
	return Span{}, false
}

package pmt

import (
	"fmt"
	"math"
)

// Trigger is a hit-multiplicity trigger: it fires when Threshold hits fall
// within a sliding time window of length Window (ns), and the event is
// read out over [t-PreTrigger, t+PostTrigger] around the trigger time t.
type Trigger struct {
	Threshold   int     // number of hits required inside Window (>= 1)
	Window      float64 // sliding window length (ns), > 0
	PreTrigger  float64 // readout before the trigger time (ns), >= 0
	PostTrigger float64 // readout after the trigger time (ns), >= 0
}

// Validate returns an error naming the first bad field, or nil.
func (tr Trigger) Validate() error {
	finite := func(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
	switch {
	case tr.Threshold < 1:
		return fmt.Errorf("pmt: Trigger.Threshold = %d must be at least 1 (hits)", tr.Threshold)
	case !(tr.Window > 0) || !finite(tr.Window):
		return fmt.Errorf("pmt: Trigger.Window = %v must be positive and finite (ns)", tr.Window)
	case !(tr.PreTrigger >= 0) || !finite(tr.PreTrigger):
		return fmt.Errorf("pmt: Trigger.PreTrigger = %v must be non-negative and finite (ns)", tr.PreTrigger)
	case !(tr.PostTrigger >= 0) || !finite(tr.PostTrigger):
		return fmt.Errorf("pmt: Trigger.PostTrigger = %v must be non-negative and finite (ns)", tr.PostTrigger)
	}
	return nil
}

// Find scans hits, which must be sorted by time (as Digitize returns
// them), for the first moment Threshold hits lie within Window: the first
// index j with hits[j].Time - hits[j-Threshold+1].Time < Window. It returns
// hits[j].Time, the time of the hit that completes the condition, and
// ok = true; ok = false if the trigger never fires. An invalid Trigger,
// unsorted hits or a non-finite hit time give an error.
func (tr Trigger) Find(hits []Hit) (t float64, ok bool, err error) {
	if err := tr.Validate(); err != nil {
		return 0, false, err
	}
	for i, h := range hits {
		if math.IsNaN(h.Time) || math.IsInf(h.Time, 0) {
			return 0, false, fmt.Errorf("pmt: Trigger.Find hits[%d].Time = %v must be finite", i, h.Time)
		}
		if i > 0 && h.Time < hits[i-1].Time {
			return 0, false, fmt.Errorf("pmt: Trigger.Find hits[%d].Time = %v is before hits[%d].Time = %v; hits must be sorted by time",
				i, h.Time, i-1, hits[i-1].Time)
		}
	}
	n := tr.Threshold
	for j := n - 1; j < len(hits); j++ {
		if hits[j].Time-hits[j-n+1].Time < tr.Window {
			return hits[j].Time, true, nil
		}
	}
	return 0, false, nil
}

// ReadoutWindow returns the readout interval [t-PreTrigger, t+PostTrigger]
// around trigger time t.
func (tr Trigger) ReadoutWindow(t float64) (lo, hi float64) {
	return t - tr.PreTrigger, t + tr.PostTrigger
}

// Readout appends to dst the hits whose time lies in the readout window
// around trigger time t (both ends included), in their input order, and
// returns the extended slice.
func (tr Trigger) Readout(hits []Hit, t float64, dst []Hit) []Hit {
	lo, hi := tr.ReadoutWindow(t)
	for _, h := range hits {
		if h.Time >= lo && h.Time <= hi {
			dst = append(dst, h)
		}
	}
	return dst
}

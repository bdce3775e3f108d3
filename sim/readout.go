package sim

import (
	"cmp"
	"fmt"
	"math"
	"slices"

	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/event"
)

// Readout of an event's triggers.
//
// The signal photoelectrons of an event are split into clusters in time:
// a gap longer than a whole readout (PreTrigger + Window + PostTrigger)
// plus the sensors' integration window starts a new cluster. Each cluster
// is read out over its own window [first - PreTrigger - Window, last +
// PostTrigger]: dark pulses are generated over that window only, and its
// photoelectrons are digitized together. The first trigger found, cluster
// by cluster, is the primary one (Event.Hits); every later trigger, in the
// rest of its cluster or in a later one, is a sub-event. With an extended
// window, the stretch from the end of the primary readout to
// ExtendedWindow after the primary trigger gets dark pulses too, in
// chunks of darkChunk, and every hit in it is kept (Event.Extended).
//
// So the memory of an event is its signal photoelectrons, one cluster's
// or one chunk's dark pulses at a time, and the hits it keeps: never the
// dark pulses of the whole time the event's particles live (a neutron
// capture hundreds of microseconds after the primary). An event whose
// light forms one cluster draws its random numbers exactly as a single
// readout of the whole event did (one dark-noise call over the window,
// one digitization), so such events are unchanged by the sub-event
// readout.

// darkChunk is the length (ns) of the pieces in which the dark-only part
// of the extended window is generated and digitized: it bounds the
// photoelectron buffer to nSensors * DarkRate * darkChunk (about 440 at
// the large tank's 11 000 sensors at 4 kHz).
const darkChunk = 10_000

// MaxExtendedWindow (ns) bounds Config.ExtendedWindow: 10 ms, fifty
// capture times of pure water.
const MaxExtendedWindow = 1e7

// span is a cluster of signal photoelectrons: their earliest and latest
// times (ns).
type span struct{ lo, hi float64 }

// clusters splits the times of the signal photoelectrons (and the start
// time t0 of the event) into spans separated by more than gap, in time
// order.
func (w *worker) clusters(t0 float64, pes []pmt.Photoelectron, gap float64) []span {
	w.times = append(w.times[:0], t0)
	for _, pe := range pes {
		w.times = append(w.times, pe.Time)
	}
	slices.Sort(w.times)
	w.spans = append(w.spans[:0], span{w.times[0], w.times[0]})
	for _, t := range w.times[1:] {
		last := &w.spans[len(w.spans)-1]
		if t-last.hi > gap {
			w.spans = append(w.spans, span{t, t})
		} else {
			last.hi = t
		}
	}
	return w.spans
}

// digitizeWindow digitizes the signal photoelectrons of cluster c (those
// with times in [c.lo, c.hi], in their input order) with dark pulses over
// [lo, hi), drops the dead sensors' hits and returns the hits sorted by
// time in w.hits. With one cluster the input order is the whole list's.
func (w *worker) digitizeWindow(c span, lo, hi float64) ([]pmt.Hit, error) {
	if len(w.spans) == 1 {
		w.piece = append(w.piece[:0], w.pes...)
	} else {
		w.piece = w.piece[:0]
		for _, pe := range w.pes {
			if pe.Time >= c.lo && pe.Time <= c.hi {
				w.piece = append(w.piece, pe)
			}
		}
	}
	return w.digitize(lo, hi)
}

// digitize adds dark pulses over [lo, hi) to w.piece and digitizes it.
func (w *worker) digitize(lo, hi float64) ([]pmt.Hit, error) {
	s := w.s
	n := s.cfg.Detector.NumSensors()
	if !s.cfg.NoDarkNoise {
		signal := len(w.piece)
		var err error
		w.piece, err = s.cfg.Sensor.AddDark(w.piece, n, lo, hi, w.rng)
		if err != nil {
			return nil, err
		}
		for _, pe := range w.piece[signal:] {
			if !s.isDead(pe.Sensor) {
				w.darkPE++
			}
		}
	}
	// Dead sensors are dropped after digitization rather than before, so
	// that the event's random stream is drawn the same with or without
	// them: the live sensors' hits do not depend on which sensors are dead.
	var err error
	w.hits, err = w.dig.Digitize(w.piece, n, w.rng, w.hits[:0])
	if err != nil {
		return nil, err
	}
	if s.dead != nil {
		w.hits = slices.DeleteFunc(w.hits, func(h pmt.Hit) bool { return s.dead[h.Sensor] })
	}
	return w.hits, nil
}

// readout finds the triggers of the event and fills ev.Hits, its
// sub-events and extended hits, and the trigger truth. w.pes holds the
// signal photoelectrons of the event, t0 is its start time.
func (w *worker) readout(ev *event.Event, t0 float64) error {
	s := w.s
	tg := s.cfg.Trigger
	ext := s.cfg.ExtendedWindow
	gap := tg.PreTrigger + tg.Window + tg.PostTrigger + s.cfg.Sensor.IntegrationWindow
	w.darkPE = 0
	w.later = w.later[:0]
	var untriggered []pmt.Hit
	triggered := false
	var trig, covered, extEnd float64
	for _, c := range w.clusters(t0, w.pes, gap) {
		lo, hi := c.lo-(tg.PreTrigger+tg.Window), c.hi+tg.PostTrigger
		if triggered && covered < extEnd {
			if err := w.darkOnly(covered, math.Min(lo, extEnd)); err != nil {
				return err
			}
		}
		hits, err := w.digitizeWindow(c, lo, hi)
		if err != nil {
			return err
		}
		covered = hi
		if triggered {
			w.later = append(w.later, hits...)
			continue
		}
		t, ok, err := tg.Find(hits)
		if err != nil {
			return err
		}
		if !ok {
			untriggered = append(untriggered, hits...)
			continue
		}
		triggered, trig = true, t
		ev.Truth.Triggered, ev.Truth.TriggerTime = true, t
		ev.Hits = tg.Readout(hits, t, nil)
		_, end := tg.ReadoutWindow(t)
		for _, h := range hits {
			if h.Time > end {
				w.later = append(w.later, h)
			}
		}
		extEnd = t + ext
	}
	if triggered && covered < extEnd {
		if err := w.darkOnly(covered, extEnd); err != nil {
			return err
		}
	}
	ev.Truth.DarkPE = w.darkPE
	if !triggered {
		// Every hit of an event whose trigger never fired; the clusters
		// are in time order, sorting only settles the transit-time jitter
		// at their edges.
		slices.SortFunc(untriggered, compareHits)
		ev.Hits = untriggered
		return nil
	}
	slices.SortFunc(w.later, compareHits)
	_, prev := tg.ReadoutWindow(trig)
	if ext > tg.PostTrigger {
		n, _ := slices.BinarySearchFunc(w.later, trig+ext, func(h pmt.Hit, t float64) int {
			return cmp.Compare(h.Time, math.Nextafter(t, math.Inf(1)))
		})
		ev.Extended = append([]pmt.Hit(nil), w.later[:n]...)
	}
	rest := w.later
	for {
		i, _ := slices.BinarySearchFunc(rest, prev, func(h pmt.Hit, t float64) int {
			if h.Time <= t {
				return -1
			}
			return 1
		})
		rest = rest[i:]
		t, ok, err := tg.Find(rest)
		if err != nil {
			return err
		}
		if !ok {
			return nil
		}
		lo, hi := tg.ReadoutWindow(t)
		lo = math.Max(lo, math.Nextafter(prev, math.Inf(1)))
		sub := event.SubEvent{Time: t - trig}
		for _, h := range rest {
			if h.Time > hi {
				break
			}
			if h.Time >= lo {
				sub.Hits = append(sub.Hits, h)
			}
		}
		ev.SubEvents = append(ev.SubEvents, sub)
		prev = hi
	}
}

// darkOnly digitizes the dark pulses of [lo, hi), a stretch of the
// extended window without signal, in chunks of darkChunk, appending the
// hits to w.later.
func (w *worker) darkOnly(lo, hi float64) error {
	for a := lo; a < hi; a += darkChunk {
		w.piece = w.piece[:0]
		hits, err := w.digitize(a, math.Min(a+darkChunk, hi))
		if err != nil {
			return err
		}
		w.later = append(w.later, hits...)
	}
	return nil
}

// compareHits orders hits by time, then sensor index (pmt.Digitize's
// order).
func compareHits(a, b pmt.Hit) int {
	if c := cmp.Compare(a.Time, b.Time); c != 0 {
		return c
	}
	return cmp.Compare(a.Sensor, b.Sensor)
}

// checkExtendedWindow checks Config.ExtendedWindow.
func checkExtendedWindow(v float64) error {
	if !(v >= 0 && v <= MaxExtendedWindow) {
		return fmt.Errorf("sim: Config.ExtendedWindow = %v ns must be in [0, %g] (ns)", v, MaxExtendedWindow)
	}
	return nil
}

package sim

import (
	"cmp"
	"math"
	"slices"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/neutron"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/transport"
)

// Vertex truth: the decays and captures of an event.
//
// For a primary the transport record (transport.Primary) says how it
// ended and when. For a secondary particle the transport reports only
// what passes through the sink, so its decay or capture is read from
// that: a charged heavy particle that stops deposits its remaining
// energy where it stopped (heavy.Physics.Track), so products made there
// later are a decay at rest, products made there at the same moment a
// capture at rest (a pi- absorbed), products elsewhere a decay in
// flight; a neutron's capture is its last act, gammas summing to a
// capture energy (neutron.DeuteronGamma, Oxygen17Gamma, Gd157Q, Gd155Q).
// Not recorded for secondaries: the capture of a stopped mu- (it makes
// nothing the simulator follows, and the time is not reported), the
// decay in flight of a mu- (its electron is not told apart from a delta
// ray) and the decay of a pi0.

// trackEnd is where and when a muon, pion or neutron track last gave
// energy to the water (ok when it did).
type trackEnd struct {
	pos  r3.Vector
	time float64
	ok   bool
}

// startVertices resets the vertex bookkeeping for an event.
func (w *worker) startVertices(primaries []phys.Particle) {
	w.nPrimaries, w.secs = len(primaries), w.secs[:0]
	w.trackPDG = append(w.trackPDG[:0], 0)
	w.ends = append(w.ends[:0], trackEnd{})
	for _, p := range primaries {
		w.trackPDG = append(w.trackPDG, int32(p.PDG))
		w.ends = append(w.ends, trackEnd{})
	}
}

// watched reports whether the decays or captures of particles of this
// kind are read from the sink.
func watched(pdg int32) bool {
	switch pdg {
	case phys.MuonMinus, phys.MuonPlus, phys.PionPlusCode, phys.PionMinusCode, phys.NeutronCode:
		return true
	}
	return false
}

// Secondary records the particle's kind by track number and keeps the
// secondaries of primaries and of watched particles, the candidate
// products of decays and captures.
func (w *worker) Secondary(p phys.Particle) {
	for len(w.trackPDG) <= p.Track {
		w.trackPDG = append(w.trackPDG, 0)
		w.ends = append(w.ends, trackEnd{})
	}
	w.trackPDG[p.Track] = int32(p.PDG)
	if p.Parent <= 0 || p.Parent >= len(w.trackPDG) {
		return
	}
	if p.Parent <= w.nPrimaries || watched(w.trackPDG[p.Parent]) {
		w.secs = append(w.secs, p)
	}
	if w.trackPDG[p.Parent] == phys.NeutronCode {
		w.ends[p.Parent].time = math.Max(w.ends[p.Parent].time, p.Time)
	}
}

// Deposit remembers the last deposit of a watched track.
func (w *worker) Deposit(pos r3.Vector, t, _ float64, track int) {
	if track > 0 && track < len(w.trackPDG) && watched(w.trackPDG[track]) {
		if w.trackPDG[track] == phys.NeutronCode {
			t = math.Max(t, w.ends[track].time)
		}
		w.ends[track] = trackEnd{pos: pos, time: t, ok: true}
	}
}

// vertices returns the decays and captures of the event in time order.
func (w *worker) vertices(tracks []transport.Primary) []event.Vertex {
	var vs []event.Vertex
	for i, pr := range tracks {
		switch pr.Fate {
		case phys.StoppedDecayed, phys.DecayedInFlight, phys.StoppedCaptured, phys.Captured:
		default:
			continue
		}
		v := event.Vertex{Track: i + 1, PDG: pr.Particle.PDG, Process: pr.Fate, Time: pr.DecayTime, Pos: pr.End}
		for _, p := range w.secs {
			if p.Parent == i+1 && p.Time == pr.DecayTime {
				v.Products = append(v.Products, p)
			}
		}
		vs = append(vs, v)
	}
	// A track is followed to its end before the next one starts, so the
	// secondaries of one parent are contiguous in w.secs.
	for a := 0; a < len(w.secs); {
		parent := w.secs[a].Parent
		b := a + 1
		for b < len(w.secs) && w.secs[b].Parent == parent {
			b++
		}
		if parent > w.nPrimaries {
			if v, ok := w.secondaryVertex(parent, w.secs[a:b]); ok {
				vs = append(vs, v)
			}
		}
		a = b
	}
	slices.SortStableFunc(vs, func(a, b event.Vertex) int { return cmp.Compare(a.Time, b.Time) })
	return vs
}

// secondaryVertex reads the decay or capture of secondary track parent
// from its secondaries (see the comment at the top of the file).
func (w *worker) secondaryVertex(parent int, secs []phys.Particle) (event.Vertex, bool) {
	pdg := int(w.trackPDG[parent])
	end := w.ends[parent]
	v := event.Vertex{Track: parent, PDG: pdg}
	// The products made at the point and time of p, but delta rays.
	at := func(p phys.Particle) []phys.Particle {
		var out []phys.Particle
		for _, q := range secs {
			if q.Time == p.Time && q.Pos == p.Pos && q.PDG != phys.Electron {
				out = append(out, q)
			}
		}
		return out
	}
	atRest := func(p phys.Particle) bool { return end.ok && p.Pos == end.pos }
	switch pdg {
	case phys.MuonMinus, phys.MuonPlus:
		for _, p := range secs {
			// The decay electron of a stopped muon comes after its stop;
			// a mu+'s positron is always its decay.
			switch {
			case atRest(p) && p.Time > end.time && (p.PDG == phys.Electron || p.PDG == phys.Positron):
				v.Process = phys.StoppedDecayed
			case pdg == phys.MuonPlus && p.PDG == phys.Positron:
				v.Process = phys.DecayedInFlight
			default:
				continue
			}
			v.Time, v.Pos, v.Products = p.Time, p.Pos, []phys.Particle{p}
			return v, true
		}
	case phys.PionPlusCode, phys.PionMinusCode:
		for _, p := range secs {
			decay := p.PDG == phys.MuonPlus || p.PDG == phys.MuonMinus || p.PDG == phys.Positron
			switch {
			case decay && atRest(p) && p.Time > end.time:
				v.Process = phys.StoppedDecayed
			case decay:
				v.Process = phys.DecayedInFlight
			case pdg == phys.PionMinusCode && p.PDG != phys.Electron && atRest(p) && p.Time == end.time:
				v.Process = phys.StoppedCaptured
			default:
				continue
			}
			v.Time, v.Pos, v.Products = p.Time, p.Pos, at(p)
			return v, true
		}
	case phys.NeutronCode:
		last := secs[len(secs)-1]
		if last.PDG != phys.Gamma || last.Time < end.time {
			return v, false
		}
		var sum float64
		for _, q := range at(last) {
			if q.PDG != phys.Gamma {
				return v, false
			}
			sum += q.Ekin
		}
		for _, e := range []float64{neutron.DeuteronGamma, neutron.Oxygen17Gamma, neutron.Gd157Q, neutron.Gd155Q} {
			if math.Abs(sum-e) < 1e-9*e {
				v.Process, v.Time, v.Pos, v.Products = phys.Captured, last.Time, last.Pos, at(last)
				return v, true
			}
		}
	}
	return v, false
}

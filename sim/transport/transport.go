package transport

import (
	"errors"
	"fmt"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/em"
	"github.com/conelight/conelight/sim/hadron"
	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/muon"
	"github.com/conelight/conelight/sim/neutron"
	"github.com/conelight/conelight/sim/phys"
)

// Physics holds the process tables of the transport codes for one medium.
type Physics struct {
	EM      *em.Physics
	Muon    *muon.Physics
	Hadron  *hadron.Physics
	Neutron *neutron.Physics
}

// New builds the tables for medium m with the given settings of the
// electromagnetic and muon codes; charged pions and protons take the muon
// settings (the heavy-particle transport they share), neutrons the
// defaults of neutron.Config (pure water at 20 C; see WithNeutron).
func New(m material.Medium, emCfg em.Config, muCfg muon.Config) (*Physics, error) {
	e, err := em.New(m, emCfg)
	if err != nil {
		return nil, err
	}
	mu, err := muon.New(m, muCfg)
	if err != nil {
		return nil, err
	}
	had, err := hadron.New(m, muCfg)
	if err != nil {
		return nil, err
	}
	n, err := neutron.New(m, had, neutron.Config{})
	if err != nil {
		return nil, err
	}
	return &Physics{EM: e, Muon: mu, Hadron: had, Neutron: n}, nil
}

// WithNeutron returns a copy of p whose neutrons follow cfg (water
// temperature, gadolinium loading) in medium m.
func (p *Physics) WithNeutron(m material.Medium, cfg neutron.Config) (*Physics, error) {
	n, err := neutron.New(m, p.Hadron, cfg)
	if err != nil {
		return nil, err
	}
	q := *p
	q.Neutron = n
	return &q, nil
}

// Primary is the truth about one primary particle and its descendants.
type Primary struct {
	// Particle is the primary as it started.
	Particle phys.Particle
	// TrackLength is the path length of the primary itself (cm): the sum
	// of its steps above Cherenkov threshold for e-, e+ (which are
	// stopped at threshold) and the full muon path for muons; 0 for
	// photons and for particles that are not transported.
	TrackLength float64
	// Range is the straight-line distance from the start to the end point
	// of the primary (cm), on the same footing as TrackLength.
	Range float64
	// End is the end point of the primary's own track on the same
	// footing (the start point for photons and skipped particles).
	End r3.Vector
	// Segments counts the Cherenkov segments of the primary and all its
	// descendants.
	Segments int
	// Descendants counts the secondaries of every generation.
	Descendants int
	// Fate is how a muon, pion, proton or neutron primary ended, or
	// NotFollowed for a particle no code follows (0 for electrons,
	// positrons and photons, whose fate the caller derives).
	Fate phys.Fate
	// DecayTime is the time (ns) at which a muon or pion primary decayed
	// or was captured, or a neutron primary was captured; 0 when it did
	// neither.
	DecayTime float64
	// Decay is a muon primary's decay electron or positron (PDG 0 when
	// there is none).
	Decay phys.Particle
	// Skipped is true when no transport code follows this particle kind
	// (neutrinos); it is counted (Tracker.Skipped) and has fate
	// NotFollowed.
	Skipped bool
}

// Tracker follows events. It reuses its stack between events and must
// not be used by two goroutines at once.
type Tracker struct {
	phys  *Physics
	stack []phys.Particle
	// primaryOf[t] is the index of the primary that track t descends
	// from; index 0 is unused (track numbers start at 1).
	primaryOf []int32
	end       []r3.Vector // last segment end of each primary's own track
	prims     []Primary
	relay     relay
	skipped   int
}

// NewTracker returns a tracker using p.
func NewTracker(p *Physics) (*Tracker, error) {
	if p == nil || p.EM == nil || p.Muon == nil || p.Hadron == nil || p.Neutron == nil {
		return nil, errors.New("transport: Physics is nil or incomplete")
	}
	t := &Tracker{phys: p}
	t.relay.t = t
	return t, nil
}

// PrimaryOf returns the index (in the primaries of the current event) of
// the primary that track number track descends from, or -1 if the track
// is unknown.
func (t *Tracker) PrimaryOf(track int) int {
	if track <= 0 || track >= len(t.primaryOf) {
		return -1
	}
	return int(t.primaryOf[track])
}

// Skipped returns how many particles of the last event were dropped
// because no transport code follows their kind.
func (t *Tracker) Skipped() int { return t.skipped }

// relay sits between the transport codes and the caller's sink: it pushes
// secondaries on the stack with fresh track numbers and forwards segments
// and deposits, accumulating per-primary truth.
type relay struct {
	t       *Tracker
	sink    phys.Sink
	current int // track number being transported
}

func (r *relay) Segment(s phys.Segment) {
	t := r.t
	p := int(t.primaryOf[s.Track])
	t.prims[p].Segments++
	if s.Track == p+1 { // the primary's own track (primaries are tracks 1..n)
		if s.PDG == phys.Electron || s.PDG == phys.Positron {
			t.prims[p].TrackLength += s.Length()
			t.end[p] = s.End
		}
	}
	r.sink.Segment(s)
}

func (r *relay) Secondary(p phys.Particle) {
	t := r.t
	p.Track = len(t.primaryOf)
	prim := t.primaryOf[p.Parent]
	t.primaryOf = append(t.primaryOf, prim)
	t.prims[prim].Descendants++
	t.stack = append(t.stack, p)
	r.sink.Secondary(p)
}

func (r *relay) Deposit(pos r3.Vector, time, energy float64, track int) {
	r.sink.Deposit(pos, time, energy, track)
}

// Run follows the primaries and every descendant inside vol, reporting
// to sink. Primaries get track numbers 1..len(primaries) in order;
// secondaries the following numbers in order of creation. Secondaries are
// also reported to sink.Secondary (for truth) before they are followed.
// It returns one Primary record per primary; the slice is reused by the
// next call.
func (t *Tracker) Run(primaries []phys.Particle, vol phys.Volume, rng *rand.Rand, sink phys.Sink) ([]Primary, error) {
	if vol == nil || rng == nil || sink == nil {
		return nil, errors.New("transport: nil volume, random stream or sink")
	}
	n := len(primaries)
	t.stack = t.stack[:0]
	t.primaryOf = append(t.primaryOf[:0], -1)
	t.prims = t.prims[:0]
	t.end = t.end[:0]
	t.skipped = 0
	t.relay.sink = sink
	for i, p := range primaries {
		p.Track, p.Parent = i+1, 0
		t.primaryOf = append(t.primaryOf, int32(i))
		t.prims = append(t.prims, Primary{Particle: p})
		t.end = append(t.end, p.Pos)
	}
	// Push primaries in reverse so the first is followed first.
	for i := n - 1; i >= 0; i-- {
		p := primaries[i]
		p.Track, p.Parent = i+1, 0
		t.stack = append(t.stack, p)
	}
	for len(t.stack) > 0 {
		p := t.stack[len(t.stack)-1]
		t.stack = t.stack[:len(t.stack)-1]
		if err := t.follow(p, p.Track <= n, vol, rng); err != nil {
			return nil, fmt.Errorf("transport: track %d (PDG %d, %g MeV): %w", p.Track, p.PDG, p.Ekin, err)
		}
	}
	for i := range t.prims {
		pr := &t.prims[i]
		if pr.Fate == 0 {
			pr.End = t.end[i]
			pr.Range = t.end[i].Sub(pr.Particle.Pos).Norm()
		}
	}
	return t.prims, nil
}

// follow transports one particle with the code for its kind.
func (t *Tracker) follow(p phys.Particle, primary bool, vol phys.Volume, rng *rand.Rand) error {
	var pr *Primary
	if primary {
		pr = &t.prims[p.Track-1]
	}
	switch p.PDG {
	case phys.Electron, phys.Positron, phys.Gamma:
		return t.phys.EM.Track(p, vol, rng, &t.relay)
	case phys.MuonMinus, phys.MuonPlus:
		tr, err := t.phys.Muon.Track(p, vol, rng, &t.relay)
		if err != nil {
			return err
		}
		if pr != nil {
			pr.TrackLength, pr.Range, pr.End = tr.TrackLength, tr.Range, tr.EndPos
			pr.Fate, pr.DecayTime, pr.Decay = tr.Fate, tr.DecayTime, tr.Decay
		}
		return nil
	case phys.PionPlusCode, phys.PionMinusCode, phys.ProtonCode:
		var tr hadron.Truth
		var err error
		if p.PDG == phys.ProtonCode {
			tr, err = t.phys.Hadron.TrackProton(p, vol, rng, &t.relay)
		} else {
			tr, err = t.phys.Hadron.TrackPion(p, vol, rng, &t.relay)
		}
		if err != nil {
			return err
		}
		if pr != nil {
			pr.TrackLength, pr.Range, pr.End = tr.TrackLength, tr.Range, tr.EndPos
			pr.Fate, pr.DecayTime = tr.Fate, tr.DecayTime
		}
		return nil
	case phys.NeutralPionCode:
		hadron.DecayPiZero(p, rng, &t.relay)
		if pr != nil {
			pr.End, pr.Fate, pr.DecayTime = p.Pos, phys.DecayedInFlight, p.Time
			if p.Ekin == 0 {
				pr.Fate = phys.StoppedDecayed
			}
		}
		return nil
	case phys.NeutronCode:
		tr, err := t.phys.Neutron.Track(p, vol, rng, &t.relay)
		if err != nil {
			return err
		}
		if pr != nil {
			pr.TrackLength, pr.End = tr.TrackLength, tr.EndPos
			pr.Range = tr.EndPos.Sub(p.Pos).Norm()
			pr.Fate = tr.Fate
			if tr.Fate == phys.Captured {
				pr.DecayTime = tr.EndTime
			}
		}
		return nil
	}
	if _, err := phys.Lookup(p.PDG); err != nil {
		return err
	}
	// Known but followed by no code: neutrinos. Counted, never silent.
	t.skipped++
	if pr != nil {
		pr.Skipped, pr.Fate, pr.End = true, phys.NotFollowed, p.Pos
	}
	return nil
}

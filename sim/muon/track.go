package muon

import (
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/heavy"
	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/phys"
)

// Config holds the transport settings (the heavy-particle transport's).
type Config = heavy.Config

// DefaultConfig returns the default settings.
func DefaultConfig() Config { return heavy.DefaultConfig() }

// Energy range of the tables and of the public functions, MeV.
const (
	MinTableEnergy = heavy.MinTableEnergy
	MaxEnergy      = heavy.MaxEnergy
)

// Physics holds the muon energy-loss tables of one medium (the stopping
// power, range and delta-ray methods of heavy.Physics) and adds the muon's
// decay and capture. It is immutable after New and safe for concurrent
// use.
type Physics struct {
	*heavy.Physics
}

// New builds the tables for medium m with settings cfg (zero fields take
// their defaults).
func New(m material.Medium, cfg Config) (*Physics, error) {
	h, err := heavy.New(m, heavy.Muon(), cfg)
	if err != nil {
		return nil, err
	}
	return &Physics{h}, nil
}

// Truth summarizes one transported muon.
type Truth struct {
	Fate phys.Fate
	// TrackLength is the path length travelled, cm.
	TrackLength float64
	// Range is the straight-line distance from the start to the end
	// point, cm.
	Range float64
	// EndPos, EndDir, EndTime (ns) and EndEkin (MeV) describe the muon
	// where it stopped, left the volume or decayed in flight. EndEkin is
	// 0 for a stopped muon (the rest below the low cut is deposited).
	EndPos, EndDir r3.Vector
	EndTime        float64
	EndEkin        float64
	// DecayTime is the time (ns) of the decay or capture, the stop time
	// plus the time at rest; 0 when the muon exited.
	DecayTime float64
	// Decay is the decay electron or positron as reported to the sink
	// (PDG 0 when there is none: captured or exited).
	Decay phys.Particle
	// Steps, Segments and DeltaRays count the transport steps, the
	// segments reported and the delta rays emitted.
	Steps, Segments, DeltaRays int
	// DeltaEnergy is the kinetic energy given to delta rays and Deposited
	// the energy reported through Sink.Deposit, MeV.
	DeltaEnergy, Deposited float64
}

// Track transports one mu- (PDG 13) or mu+ (PDG -13) through the medium
// inside vol with heavy.Physics.Track, reporting segments above Cherenkov
// threshold, delta rays, energy deposits and the decay electron to sink,
// and returns the track's truth. The muon starts at part.Pos (inside vol)
// with unit direction part.Dir, time part.Time and kinetic energy
// part.Ekin in [0, MaxEnergy]; part.Track labels its segments and is the
// Parent of its secondaries. A muon that decays in flight gives a boosted
// Michel electron; a stopped mu+ decays after the rest of its proper
// decay time; a stopped mu- is bound to oxygen and decays or is captured
// (see the package comment).
func (p *Physics) Track(part phys.Particle, vol phys.Volume, rng *rand.Rand, sink phys.Sink) (Truth, error) {
	h, err := p.Physics.Track(part, vol, rng, sink)
	if err != nil {
		return Truth{}, err
	}
	tr := Truth{
		Fate: h.Fate, TrackLength: h.TrackLength, Range: h.Range,
		EndPos: h.EndPos, EndDir: h.EndDir, EndTime: h.EndTime, EndEkin: h.EndEkin,
		Steps: h.Steps, Segments: h.Segments, DeltaRays: h.DeltaRays,
		DeltaEnergy: h.DeltaEnergy, Deposited: h.Deposited,
	}
	ePDG := phys.Electron
	if part.PDG == phys.MuonPlus {
		ePDG = phys.Positron
	}
	pos, dir, t := h.EndPos, h.EndDir, h.EndTime
	switch h.Fate {
	case phys.Exited:
		return tr, nil
	case phys.DecayedInFlight:
		tr.DecayTime = t
		tr.Decay = p.emitDecay(p.Kinematics(h.EndEkin), pos, dir, t, ePDG, part.Track, rng, sink)
		return tr, nil
	}
	rest := p.Kinematics(0)
	if part.PDG == phys.MuonPlus {
		// The proper time left before the free decay: exponential with the
		// free lifetime, whatever was spent in flight (no memory).
		tr.Fate = phys.StoppedDecayed
		tr.DecayTime = t + (h.DecayProperTime - h.ProperTime)
		tr.Decay = p.emitDecay(rest, pos, dir, tr.DecayTime, ePDG, part.Track, rng, sink)
		return tr, nil
	}
	// mu- at rest: bound in oxygen, it disappears with the total rate
	// 1/OxygenLifetime, by capture with probability CaptureFraction.
	tr.DecayTime = t + rng.ExpFloat64()*OxygenLifetime
	if rng.Float64() < CaptureFraction {
		tr.Fate = phys.StoppedCaptured
		return tr, nil
	}
	tr.Fate = phys.StoppedDecayed
	tr.Decay = p.emitDecay(rest, pos, dir, tr.DecayTime, ePDG, part.Track, rng, sink)
	return tr, nil
}

// emitDecay samples the decay electron of a muon with kinematics k and
// reports it to sink.
func (p *Physics) emitDecay(k heavy.Kinematics, pos, dir r3.Vector, t float64, pdg, parent int, rng *rand.Rand, sink phys.Sink) phys.Particle {
	ekin, eDir := MichelElectron(k, dir, rng)
	e := phys.Particle{PDG: pdg, Pos: pos, Dir: eDir, Time: t, Ekin: ekin, Parent: parent}
	sink.Secondary(e)
	return e
}

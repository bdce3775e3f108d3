package event

import (
	"fmt"
	"math"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/phys"
)

// Event is one simulated event: its number, the Monte Carlo truth and the
// digitized hits. It is a plain value; the reader returns fresh slices for
// every event, so an Event may be kept after the iteration moves on.
type Event struct {
	// Number is the event number. The simulator derives the event's random
	// stream from the run seed and this number, so (RunInfo.Seed, Number)
	// identifies the event.
	Number uint64
	// Truth is what happened in the event; the detector cannot see it.
	Truth Truth
	// Hits are the digitized sensor signals read out (sensor index, time ns,
	// charge pe), as pmt.Digitizer and pmt.Trigger.Readout produce them.
	Hits []pmt.Hit
}

// Truth is the Monte Carlo truth of one event.
//
// The photoelectron counts obey Photoelectrons = PEDirect + PEScattered +
// PEReflected (every signal photoelectron has exactly one pmt.Origin other
// than Dark); Validate checks it.
type Truth struct {
	// Primaries are the particles the generator started the event with
	// (positions cm, unit directions, times ns, kinetic energies MeV).
	Primaries []phys.Particle
	// Tracks summarizes the transport of each primary, normally one per
	// primary in the same order.
	Tracks []Track

	// Photons is the number of Cherenkov photons actually traced, after
	// the emission pre-scaling (compare Track.VisiblePhotons, which is
	// before it).
	Photons int
	// Photoelectrons is the number of signal (non-dark) photoelectrons made
	// at the photocathodes, before digitization.
	Photoelectrons int
	// DarkPE is the number of dark-pulse photoelectrons added.
	DarkPE int
	// PEDirect, PEScattered and PEReflected split Photoelectrons by the
	// origin of their light (pmt.Direct, pmt.Scattered, pmt.Reflected).
	PEDirect, PEScattered, PEReflected int

	// Triggered says whether the hit-multiplicity trigger fired;
	// TriggerTime (ns) is its time, 0 when it did not fire.
	Triggered   bool
	TriggerTime float64

	// Interaction is the generator's record of the interaction that made
	// the event; the zero value when the generator made none (a particle
	// gun).
	Interaction Interaction
}

// Interaction is the truth of the interaction that made an event, in the
// same words whatever the generator (the built-in quasi-elastic generator,
// a HepMC or NuHepMC file): the incoming neutrino, the target, the
// outgoing nucleon, the process and the event weight. Energies MeV, Q2
// MeV^2, cm, ns.
type Interaction struct {
	// PDG is the incoming neutrino's PDG code (12, -12, 14, -14, ...);
	// 0 when the event records no interaction.
	PDG int
	// Etot is the incoming neutrino's total energy, MeV.
	Etot float64
	// Dir is the incoming neutrino's unit direction of flight.
	Dir r3.Vector
	// Target is the PDG code of the struck target: a nucleus as
	// 100ZZZAAAI (oxygen-16 is 1000080160) or 2212 for a free proton;
	// 0 when unknown.
	Target int
	// Q2 is the four-momentum transfer squared, MeV^2 (positive); 0 when
	// the generator does not give it.
	Q2 float64
	// Process is the process ID in the NuHepMC numbering (Gardiner,
	// Isaacson, Pickering, arXiv:2310.13211): 200-299 quasi-elastic,
	// 400-499 resonant, 600-699 deep inelastic; charged current X00-X49,
	// neutral current X50-X99. 0 when unknown.
	Process int
	// Weight is the event weight the generator gives (NuHepMC "CV"); 1
	// for an unweighted generator, 0 in the zero Interaction.
	Weight float64
	// Nucleon is the outgoing nucleon (PDG 0 when there is none). The
	// simulator does not track nucleons; it is kept here only.
	Nucleon phys.Particle
	// SourceEvent is the event's own number in the generator's file;
	// FromFile says the event came from a file (else SourceEvent is 0).
	SourceEvent int64
	FromFile    bool
}

// Track is the transport summary of one primary particle.
type Track struct {
	// PDG is the particle's PDG code.
	PDG int
	// Length is the path length travelled, cm.
	Length float64
	// Range is the straight distance from the start to the end point, cm.
	Range float64
	// Fate says how the track ended.
	Fate phys.Fate
	// DecayTime is the time (ns, event clock) of the decay or capture;
	// 0 when the particle did neither.
	DecayTime float64
	// VisiblePhotons is the expected number of Cherenkov photons emitted
	// in the simulated band by this particle and all its descendants,
	// before pre-scaling (the physical number, as a float64 expectation:
	// the sum of the Frank-Tamm yields of the segments).
	VisiblePhotons float64
	// Secondaries is the number of secondary particles this primary and
	// its descendants produced.
	Secondaries int
}

// Validate checks e for storage with a detector of nSensors sensors: every
// hit sensor index in [0, nSensors), every float finite, every count
// non-negative, the photoelectron split summing to Photoelectrons, every
// Fate known and every integer small enough for the 32-bit file columns.
// The error names the first bad field and its value. Validate does not
// allocate unless it fails.
func (e *Event) Validate(nSensors int) error {
	if e == nil {
		return fmt.Errorf("event: nil *Event")
	}
	fail := func(field, msg string) error {
		return fmt.Errorf("event: event %d: %s = %s", e.Number, field, msg)
	}
	if msg := badLength(len(e.Hits)); msg != "" {
		return fail("len(Hits)", msg)
	}
	for i, h := range e.Hits {
		if h.Sensor < 0 || h.Sensor >= nSensors {
			return fail(fmt.Sprintf("Hits[%d].Sensor", i), fmt.Sprintf("%d outside [0, %d)", h.Sensor, nSensors))
		}
		if msg := badFloat(h.Time); msg != "" {
			return fail(fmt.Sprintf("Hits[%d].Time", i), msg)
		}
		if msg := badFloat(h.Charge); msg != "" {
			return fail(fmt.Sprintf("Hits[%d].Charge", i), msg)
		}
	}
	t := &e.Truth
	if msg := badLength(len(t.Primaries)); msg != "" {
		return fail("len(Truth.Primaries)", msg)
	}
	for i := range t.Primaries {
		if field, msg := badParticle(&t.Primaries[i]); msg != "" {
			return fail(fmt.Sprintf("Truth.Primaries[%d].%s", i, field), msg)
		}
	}
	if msg := badLength(len(t.Tracks)); msg != "" {
		return fail("len(Truth.Tracks)", msg)
	}
	for i := range t.Tracks {
		if field, msg := badTrack(&t.Tracks[i]); msg != "" {
			return fail(fmt.Sprintf("Truth.Tracks[%d].%s", i, field), msg)
		}
	}
	if f, msg := first(
		complaint{"Truth.Photons", badCount(t.Photons)}, complaint{"Truth.Photoelectrons", badCount(t.Photoelectrons)},
		complaint{"Truth.DarkPE", badCount(t.DarkPE)}, complaint{"Truth.PEDirect", badCount(t.PEDirect)},
		complaint{"Truth.PEScattered", badCount(t.PEScattered)}, complaint{"Truth.PEReflected", badCount(t.PEReflected)},
	); msg != "" {
		return fail(f, msg)
	}
	if sum := t.PEDirect + t.PEScattered + t.PEReflected; sum != t.Photoelectrons {
		return fail("Truth.Photoelectrons", fmt.Sprintf("%d differs from PEDirect+PEScattered+PEReflected = %d", t.Photoelectrons, sum))
	}
	if msg := badFloat(t.TriggerTime); msg != "" {
		return fail("Truth.TriggerTime", msg)
	}
	if !t.Triggered && t.TriggerTime != 0 {
		return fail("Truth.TriggerTime", fmt.Sprintf("%v must be 0 when Triggered is false", t.TriggerTime))
	}
	if field, msg := badInteraction(&t.Interaction); msg != "" {
		return fail("Truth.Interaction."+field, msg)
	}
	return nil
}

// The bad* helpers return "" for a good value, else the complaint (and
// the sub-field it concerns), so that names are formatted only on failure.

func badFloat(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return fmt.Sprintf("%v must be finite", v)
	}
	return ""
}

func badInt32(n int) string {
	if n < math.MinInt32 || n > math.MaxInt32 {
		return fmt.Sprintf("%d does not fit the file's 32-bit integer column", n)
	}
	return ""
}

func badLength(n int) string {
	if n > math.MaxInt32 {
		return fmt.Sprintf("%d does not fit the file's 32-bit count column", n)
	}
	return ""
}

func badCount(n int) string {
	if n < 0 {
		return fmt.Sprintf("%d must not be negative", n)
	}
	return ""
}

// complaint is a field name and what is wrong with it ("" if nothing).
type complaint struct{ field, msg string }

// first returns the first complaint with a message.
func first(cs ...complaint) (string, string) {
	for _, c := range cs {
		if c.msg != "" {
			return c.field, c.msg
		}
	}
	return "", ""
}

func badParticle(p *phys.Particle) (string, string) {
	return first(
		complaint{"PDG", badInt32(p.PDG)},
		complaint{"Pos.X", badFloat(p.Pos.X)}, complaint{"Pos.Y", badFloat(p.Pos.Y)}, complaint{"Pos.Z", badFloat(p.Pos.Z)},
		complaint{"Dir.X", badFloat(p.Dir.X)}, complaint{"Dir.Y", badFloat(p.Dir.Y)}, complaint{"Dir.Z", badFloat(p.Dir.Z)},
		complaint{"Time", badFloat(p.Time)}, complaint{"Ekin", badFloat(p.Ekin)},
		complaint{"Parent", badInt32(p.Parent)}, complaint{"Track", badInt32(p.Track)},
	)
}

func badTrack(tr *Track) (string, string) {
	fate := ""
	if !tr.Fate.Valid() {
		fate = fmt.Sprintf("%d is not a known fate", int(tr.Fate))
	}
	return first(
		complaint{"PDG", badInt32(tr.PDG)},
		complaint{"Length", badFloat(tr.Length)}, complaint{"Range", badFloat(tr.Range)},
		complaint{"Fate", fate},
		complaint{"DecayTime", badFloat(tr.DecayTime)}, complaint{"VisiblePhotons", badFloat(tr.VisiblePhotons)},
		complaint{"Secondaries", badCount(tr.Secondaries)}, complaint{"Secondaries", badInt32(tr.Secondaries)},
	)
}

func badInteraction(in *Interaction) (string, string) {
	source := ""
	if !in.FromFile && in.SourceEvent != 0 {
		source = fmt.Sprintf("%d must be 0 when FromFile is false", in.SourceEvent)
	}
	if f, msg := first(
		complaint{"PDG", badInt32(in.PDG)}, complaint{"Etot", badFloat(in.Etot)},
		complaint{"Dir.X", badFloat(in.Dir.X)}, complaint{"Dir.Y", badFloat(in.Dir.Y)}, complaint{"Dir.Z", badFloat(in.Dir.Z)},
		complaint{"Target", badInt32(in.Target)}, complaint{"Q2", badFloat(in.Q2)},
		complaint{"Process", badInt32(in.Process)}, complaint{"Weight", badFloat(in.Weight)},
		complaint{"SourceEvent", source},
	); msg != "" {
		return f, msg
	}
	f, msg := badParticle(&in.Nucleon)
	return "Nucleon." + f, msg
}

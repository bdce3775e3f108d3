package photon

import (
	"fmt"
	"math"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/cherenkov"
	"github.com/conelight/conelight/sim/optics"
	"github.com/conelight/conelight/sim/phys"
)

// Outcome says how a photon's life ended.
type Outcome uint8

const (
	// Detected: converted to a photoelectron on a photocathode.
	Detected Outcome = iota
	// AbsorbedInWater: absorbed by the water on its way.
	AbsorbedInWater
	// AbsorbedByLiner: absorbed by the liner between sensors.
	AbsorbedByLiner
	// NotConverted: met a photocathode but made no photoelectron.
	NotConverted
	// Lost: outside the sensor volume, outside the water band, or past
	// the interaction limit.
	Lost
	numOutcomes
)

var outcomeNames = [numOutcomes]string{"detected", "absorbed in water", "absorbed by liner", "not converted", "lost"}

// String returns the outcome's name.
func (f Outcome) String() string {
	if f < numOutcomes {
		return outcomeNames[f]
	}
	return fmt.Sprintf("Outcome(%d)", int(f))
}

// Config holds the tracer's settings.
type Config struct {
	// Liner is the wall between the sensors.
	Liner optics.Liner
	// Prescale is the fraction of photons the emitter generated
	// (cherenkov.Emitter's prescale), in (0, 1]. It must be at least the
	// sensor model's MaxEfficiency so that survival probabilities stay
	// at most 1.
	Prescale float64
	// Thinned says that the emitter has already kept each photon with
	// probability SpectralEfficiency(lambda)/Prescale (a
	// cherenkov.NewThinningEmitter), so that the photocathode applies
	// only the angular acceptance. Otherwise it applies
	// Efficiency(lambda, cos)/Prescale.
	Thinned bool
	// MaxInteractions bounds the scatterings plus reflections of one
	// photon; beyond it the photon is counted Lost. 0 means 1000.
	MaxInteractions int
}

// Tracer follows photons through one detector filled with one water.
type Tracer struct {
	det      *geom.Detector
	model    *pmt.Model
	water    *optics.Water
	liner    optics.Liner
	invScale float64
	thinned  bool
	maxInter int
	facing   []r3.Vector // inward facing of each sensor, flat for the hot loop
	radius   float64     // sensor-surface radius, for the barrel normal
	bandLo   float64
	bandHi   float64
}

// NewTracer checks its inputs and returns a tracer.
func NewTracer(det *geom.Detector, model *pmt.Model, water *optics.Water, cfg Config) (*Tracer, error) {
	if det == nil || det.NumSensors() == 0 {
		return nil, fmt.Errorf("photon: detector is nil or has no sensors")
	}
	if model == nil {
		return nil, fmt.Errorf("photon: sensor model is nil")
	}
	if err := model.Validate(); err != nil {
		return nil, fmt.Errorf("photon: %w", err)
	}
	if water == nil {
		return nil, fmt.Errorf("photon: water is nil")
	}
	if err := cfg.Liner.Validate(); err != nil {
		return nil, fmt.Errorf("photon: %w", err)
	}
	maxEff := model.MaxEfficiency()
	if !(cfg.Prescale > 0 && cfg.Prescale <= 1) {
		return nil, fmt.Errorf("photon: Config.Prescale = %g must lie in (0, 1]", cfg.Prescale)
	}
	if cfg.Prescale < maxEff*(1-1e-12) {
		return nil, fmt.Errorf("photon: Config.Prescale = %g is below the sensor's maximum efficiency %g: detection probabilities would exceed 1", cfg.Prescale, maxEff)
	}
	if cfg.MaxInteractions < 0 {
		return nil, fmt.Errorf("photon: Config.MaxInteractions = %d must not be negative", cfg.MaxInteractions)
	}
	if cfg.MaxInteractions == 0 {
		cfg.MaxInteractions = 1000
	}
	t := &Tracer{
		det:      det,
		model:    model,
		water:    water,
		liner:    cfg.Liner,
		invScale: 1 / cfg.Prescale,
		thinned:  cfg.Thinned,
		maxInter: cfg.MaxInteractions,
		facing:   make([]r3.Vector, det.NumSensors()),
		radius:   det.Tank().SensorRadius(),
	}
	t.bandLo, t.bandHi = water.Band()
	for i := range t.facing {
		t.facing[i] = det.Sensor(i).Dir
	}
	return t, nil
}

// Trace follows one photon to the end of its life. For a Detected photon
// the photoelectron carries the sensor, the arrival time (ns) and whether
// the photon arrived directly, after scattering, or after a liner
// reflection (Reflected wins over Scattered when both happened).
//
// Trace does not allocate.
func (t *Tracer) Trace(ph cherenkov.Photon, rng *rand.Rand) (pmt.Photoelectron, Outcome) {
	lambda := ph.Wavelength
	if !(lambda >= t.bandLo && lambda <= t.bandHi) || !t.det.Contains(ph.Pos) {
		return pmt.Photoelectron{}, Lost
	}
	pos, dir, time := ph.Pos, ph.Dir, ph.Time
	origin := pmt.Direct
	fl := t.flightConstants(lambda)
	for inter := 0; inter <= t.maxInter; inter++ {
		w := t.flight(pos, dir, time, &fl, rng)
		switch {
		case w.lost:
			return pmt.Photoelectron{}, Lost
		case w.absorbed:
			return pmt.Photoelectron{}, AbsorbedInWater
		}
		if w.scatters > 0 && origin == pmt.Direct {
			origin = pmt.Scattered
		}
		inter += w.scatters
		time = w.time
		if i := t.det.SensorAt(w.pos, w.surf); i >= 0 {
			cosInc := -w.dir.Dot(t.facing[i])
			var p float64
			if t.thinned {
				p = t.model.AngularAcceptance(cosInc)
			} else {
				p = t.model.Efficiency(lambda, cosInc) * t.invScale
			}
			if cosInc > 0 && rng.Float64() < p {
				return pmt.Photoelectron{Sensor: i, Time: time, Origin: origin}, Detected
			}
			return pmt.Photoelectron{}, NotConverted
		}
		out, ok := t.liner.Reflect(w.dir, t.inwardNormal(w.pos, w.surf), rng)
		if !ok {
			return pmt.Photoelectron{}, AbsorbedByLiner
		}
		// The next flight starts on the wall, heading inwards: the
		// detector's Intersect returns the far crossing for such a ray.
		pos, dir = w.pos, out
		origin = pmt.Reflected
	}
	return pmt.Photoelectron{}, Lost
}

// wallArrival is the end of the flight of a photon to the wall.
type wallArrival struct {
	pos, dir r3.Vector
	time     float64
	surf     geom.Surface
	scatters int
	absorbed bool // absorbed in the water before the wall
	lost     bool // no wall ahead (numerical corner) or too many scatters
}

// flight follows a photon through the water, scattering as it goes, until
// it meets the wall or is absorbed. Free paths are exponential in the
// total coefficient 1/L_abs + 1/L_scat; at each interaction the photon is
// absorbed with probability (1/L_abs)/(total), otherwise scattered.
func (t *Tracer) flight(pos, dir r3.Vector, time float64, fl *flightConstants, rng *rand.Rand) wallArrival {
	muAbs, muTot, invV := fl.muAbs, fl.muTot, fl.invV
	var w wallArrival
	for ; w.scatters <= t.maxInter; w.scatters++ {
		dWall, surf := t.det.Intersect(pos, dir)
		if surf == geom.NoSurface {
			w.lost = true
			return w
		}
		// A zero coefficient (no absorption, no scattering) gives +Inf.
		free := math.Inf(1)
		if muTot > 0 {
			free = rng.ExpFloat64() / muTot
		}
		if free >= dWall {
			w.pos, w.dir, w.time, w.surf = pos.Add(dir.Mul(dWall)), dir, time+dWall*invV, surf
			return w
		}
		pos = pos.Add(dir.Mul(free))
		time += free * invV
		if rng.Float64()*muTot < muAbs {
			w.absorbed = true
			return w
		}
		dir = phys.Deflect(dir, t.water.SampleScatterCosWith(fl.coef, rng), 2*math.Pi*rng.Float64())
	}
	w.lost = true
	return w
}

// flightConstants are the water's properties at one photon's wavelength,
// looked up once per photon rather than once per flight.
type flightConstants struct {
	coef               optics.Coefficients
	muAbs, muTot, invV float64
}

func (t *Tracer) flightConstants(lambda float64) flightConstants {
	c := t.water.CoefficientsAt(lambda)
	return flightConstants{coef: c, muAbs: c.Absorption, muTot: c.Absorption + c.Scattering, invV: 1 / c.GroupVelocity}
}

// inwardNormal returns the unit normal of the sensor surface at q,
// pointing into the water.
func (t *Tracer) inwardNormal(q r3.Vector, s geom.Surface) r3.Vector {
	switch s {
	case geom.Top:
		return r3.Vector{Z: -1}
	case geom.Bottom:
		return r3.Vector{Z: 1}
	}
	r := math.Hypot(q.X, q.Y)
	return r3.Vector{X: -q.X / r, Y: -q.Y / r}
}

// Tally counts photon outcomes.
type Tally [numOutcomes]int

// Count returns the number of photons with outcome f.
func (c *Tally) Count(f Outcome) int { return c[f] }

// TraceAll traces every photon, appends the photoelectrons to dst and
// adds the outcomes to tally (which may be nil).
func (t *Tracer) TraceAll(photons []cherenkov.Photon, rng *rand.Rand, dst []pmt.Photoelectron, tally *Tally) []pmt.Photoelectron {
	for _, ph := range photons {
		pe, f := t.Trace(ph, rng)
		if tally != nil {
			tally[f]++
		}
		if f == Detected {
			dst = append(dst, pe)
		}
	}
	return dst
}

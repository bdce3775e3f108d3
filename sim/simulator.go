package sim

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/pmt"
	"github.com/conelight/conelight/sim/cherenkov"
	"github.com/conelight/conelight/sim/em"
	"github.com/conelight/conelight/sim/event"
	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/muon"
	"github.com/conelight/conelight/sim/photon"
	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/transport"
)

// Simulator turns primaries into events. It is immutable after New and
// safe for concurrent use: Event takes per-call scratch from a pool, and
// Run gives each worker its own.
type Simulator struct {
	cfg      Config
	dead     []bool // by sensor; nil when no sensor is dead
	physics  *transport.Physics
	emitter  *cherenkov.Emitter
	tracer   *photon.Tracer
	prescale float64
	scratch  chan *worker // pool of scratch spaces for Event
}

// New checks cfg and builds the tables of the transport codes, the
// Cherenkov emitter and the photon tracer.
func New(cfg Config) (*Simulator, error) {
	if err := cfg.validate(); err != nil {
		return nil, err
	}
	// Emit only where the sensors can see: the QE band inside the water's.
	wlo, whi := cfg.Water.Band()
	qlo, qhi := cfg.Sensor.QE.Range()
	lo, hi := math.Max(wlo, qlo), math.Min(whi, qhi)
	if !(lo < hi) {
		return nil, fmt.Errorf("sim: the sensor's QE band %g-%g nm and the water band %g-%g nm do not overlap", qlo, qhi, wlo, whi)
	}
	prescale := cfg.Sensor.MaxEfficiency()
	if cfg.TraceAllPhotons {
		prescale = 1
	}
	if !(prescale > 0) {
		return nil, fmt.Errorf("sim: the sensor's maximum efficiency is %g: no photon can be detected", prescale)
	}
	emitter, err := cherenkov.NewEmitter(cfg.Water, lo, hi, prescale)
	if err != nil {
		return nil, fmt.Errorf("sim: %w", err)
	}
	// Charged tracks are followed and reported down to the lowest
	// Cherenkov threshold of the band.
	nmax := 1 / emitter.Threshold()
	emCfg, muCfg := cfg.EM, cfg.Muon
	if emCfg == (em.Config{}) {
		if emCfg, err = em.ConfigForIndex(nmax); err != nil {
			return nil, fmt.Errorf("sim: %w", err)
		}
	}
	if muCfg == (muon.Config{}) {
		muCfg = muon.DefaultConfig()
		muCfg.ThresholdIndex = nmax
	}
	// Charged particles move through water as a medium (material.Water:
	// stopping powers, radiation length), not through its optics.
	physics, err := transport.New(material.Water(), emCfg, muCfg)
	if err != nil {
		return nil, fmt.Errorf("sim: %w", err)
	}
	tracer, err := photon.NewTracer(cfg.Detector, &cfg.Sensor, cfg.Water, photon.Config{Liner: cfg.Liner, Prescale: prescale})
	if err != nil {
		return nil, fmt.Errorf("sim: %w", err)
	}
	s := &Simulator{cfg: cfg, physics: physics, emitter: emitter, tracer: tracer, prescale: prescale}
	s.cfg.Dead = append([]int(nil), cfg.Dead...)
	if len(cfg.Dead) > 0 {
		s.dead = make([]bool, cfg.Detector.NumSensors())
		for _, d := range cfg.Dead {
			s.dead[d] = true
		}
	}
	s.cfg.EM, s.cfg.Muon = emCfg, muCfg
	s.scratch = make(chan *worker, cfg.Workers)
	return s, nil
}

// Config returns the configuration in use, with defaults filled in.
func (s *Simulator) Config() Config { return s.cfg }

// Prescale returns the fraction of Cherenkov photons generated and traced.
func (s *Simulator) Prescale() float64 { return s.prescale }

// worker is the scratch space of one goroutine.
type worker struct {
	s       *Simulator
	rng     *rand.Rand
	tracker *transport.Tracker
	dig     *pmt.Digitizer
	photons []cherenkov.Photon
	pes     []pmt.Photoelectron
	hits    []pmt.Hit
	visible []float64
	traced  int
	err     error
}

func (s *Simulator) newWorker() (*worker, error) {
	tr, err := transport.NewTracker(s.physics)
	if err != nil {
		return nil, err
	}
	dig, err := pmt.NewDigitizer(&s.cfg.Sensor)
	if err != nil {
		return nil, err
	}
	return &worker{s: s, tracker: tr, dig: dig}, nil
}

// Segment emits the Cherenkov photons of a charged step and traces them at
// once, so no event ever holds all its photons.
func (w *worker) Segment(seg phys.Segment) {
	if w.err != nil {
		return
	}
	var err error
	w.photons, err = w.s.emitter.Emit(seg, w.rng, w.photons[:0])
	if err != nil {
		w.err = err
		return
	}
	if p := w.tracker.PrimaryOf(seg.Track); p >= 0 {
		// The expected physical count, not the pre-scaled draw.
		mean, err := w.s.emitter.MeanPhotons(seg)
		if err != nil {
			w.err = err
			return
		}
		w.visible[p] += mean / w.s.prescale
	}
	w.traced += len(w.photons)
	w.pes = w.s.tracer.TraceAll(w.photons, w.rng, w.pes, nil)
}

func (w *worker) Secondary(phys.Particle)                  {}
func (w *worker) Deposit(r3.Vector, float64, float64, int) {}

// Event simulates one event with the given primaries, using the event's
// own random stream EventStream(Seed, number). The primaries are copied.
func (s *Simulator) Event(number uint64, primaries []phys.Particle) (*event.Event, error) {
	w, err := s.getWorker()
	if err != nil {
		return nil, err
	}
	defer s.putWorker(w)
	return w.simulate(number, EventStream(s.cfg.Seed, number), primaries)
}

func (s *Simulator) getWorker() (*worker, error) {
	select {
	case w := <-s.scratch:
		return w, nil
	default:
		return s.newWorker()
	}
}

func (s *Simulator) putWorker(w *worker) {
	select {
	case s.scratch <- w:
	default:
	}
}

// simulate runs transport, light, sensors and trigger for one event.
func (w *worker) simulate(number uint64, rng *rand.Rand, primaries []phys.Particle) (*event.Event, error) {
	s := w.s
	if len(primaries) == 0 {
		return nil, errors.New("sim: event has no primaries")
	}
	w.rng, w.err, w.traced = rng, nil, 0
	w.pes = w.pes[:0]
	w.visible = append(w.visible[:0], make([]float64, len(primaries))...)
	tracks, err := w.tracker.Run(primaries, s.cfg.Detector, rng, w)
	if err != nil {
		return nil, fmt.Errorf("sim: event %d: %w", number, err)
	}
	if w.err != nil {
		return nil, fmt.Errorf("sim: event %d: %w", number, w.err)
	}
	ev := &event.Event{Number: number}
	tt := &ev.Truth
	tt.Primaries = append([]phys.Particle(nil), primaries...)
	tt.Tracks = make([]event.Track, len(tracks))
	for i, pr := range tracks {
		tt.Tracks[i] = event.Track{
			PDG:            pr.Particle.PDG,
			Length:         pr.TrackLength,
			Range:          pr.Range,
			Fate:           w.fate(pr),
			DecayTime:      pr.DecayTime,
			VisiblePhotons: w.visible[i],
			Secondaries:    pr.Descendants,
		}
	}
	tt.Photons = w.traced
	nLive := 0
	for _, pe := range w.pes {
		if s.isDead(pe.Sensor) {
			continue
		}
		nLive++
		switch pe.Origin {
		case pmt.Direct:
			tt.PEDirect++
		case pmt.Scattered:
			tt.PEScattered++
		case pmt.Reflected:
			tt.PEReflected++
		}
	}
	tt.Photoelectrons = nLive
	// Dark pulses over the span of the signal plus the readout margins,
	// so that any trigger found has dark noise over its whole window.
	t0, t1 := primaries[0].Time, primaries[0].Time
	for _, pe := range w.pes {
		t0, t1 = math.Min(t0, pe.Time), math.Max(t1, pe.Time)
	}
	tg := s.cfg.Trigger
	t0 -= tg.PreTrigger + tg.Window
	t1 += tg.PostTrigger
	if !s.cfg.NoDarkNoise {
		n := len(w.pes)
		w.pes, err = s.cfg.Sensor.AddDark(w.pes, s.cfg.Detector.NumSensors(), t0, t1, rng)
		if err != nil {
			return nil, fmt.Errorf("sim: event %d: %w", number, err)
		}
		for _, pe := range w.pes[n:] {
			if !s.isDead(pe.Sensor) {
				tt.DarkPE++
			}
		}
	}
	// Dead sensors are dropped after digitization rather than before, so
	// that the event's random stream is drawn the same with or without
	// them: the live sensors' hits do not depend on which sensors are dead.
	w.hits, err = w.dig.Digitize(w.pes, s.cfg.Detector.NumSensors(), rng, w.hits[:0])
	if err != nil {
		return nil, fmt.Errorf("sim: event %d: %w", number, err)
	}
	if s.dead != nil {
		w.hits = slices.DeleteFunc(w.hits, func(h pmt.Hit) bool { return s.dead[h.Sensor] })
	}
	t, ok, err := tg.Find(w.hits)
	if err != nil {
		return nil, fmt.Errorf("sim: event %d: %w", number, err)
	}
	if ok {
		tt.Triggered, tt.TriggerTime = true, t
		ev.Hits = tg.Readout(w.hits, t, nil)
	} else {
		ev.Hits = append([]pmt.Hit(nil), w.hits...)
	}
	// The transport codes check the primaries they follow; this also
	// catches an untracked primary (copied to the truth unfollowed) with a
	// non-finite field, so that no event leaves here that a file would
	// refuse.
	if err := ev.Validate(s.cfg.Detector.NumSensors()); err != nil {
		return nil, fmt.Errorf("sim: %w", err)
	}
	return ev, nil
}

// isDead reports whether sensor i is out of service.
func (s *Simulator) isDead(i int) bool { return s.dead != nil && s.dead[i] }

// exitTolerance (cm) is how close to the wall a track's last point must be
// to count as having left the tank.
const exitTolerance = 0.1

// fate returns a primary's fate from its transport record.
func (w *worker) fate(pr transport.Primary) phys.Fate {
	switch {
	case pr.Fate != phys.NoFate:
		return pr.Fate
	case pr.Particle.PDG == phys.Gamma:
		return phys.Interacted
	}
	// An electron or positron is followed down to the Cherenkov
	// threshold, unless it reaches the wall first.
	if w.s.cfg.Detector.DistanceToWall(pr.End) < exitTolerance {
		return phys.Exited
	}
	return phys.Stopped
}

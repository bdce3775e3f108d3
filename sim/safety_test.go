package sim

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/em"
	"github.com/conelight/conelight/sim/muon"
	"github.com/conelight/conelight/sim/phys"
)

// edgeEnergies are kinetic energies (MeV) at the edges of the models: zero,
// tiny, and just around the electron and muon Cherenkov thresholds for the
// largest refractive index of the band (about 0.24 and 50 MeV), from the
// condition beta > 1/n in closed form, T = m (1/sqrt(1-1/n^2) - 1) (PDG
// Review, Passage of particles through matter, Cherenkov radiation).
func edgeEnergies(s *Simulator) []float64 {
	n := 1 / s.emitter.Threshold()
	g := 1/math.Sqrt(1-1/(n*n)) - 1
	eTh, muTh := phys.ElectronMass*g, phys.MuonMass*g
	return []float64{0, 1e-300, 1e-6, eTh * (1 - 1e-9), eTh, eTh * (1 + 1e-9), 1, 10,
		muTh * (1 - 1e-9), muTh * (1 + 1e-9), 500}
}

// wallPoints are vertices on and just inside the sensor surface, at its
// rim, and the centre; the last one lies 5e-10 cm outside, and only
// events with a primary there may be refused.
func wallPoints(s *Simulator) []r3.Vector {
	t := s.cfg.Detector.Tank()
	r, h := t.SensorRadius(), t.SensorHalfHeight()
	return []r3.Vector{
		{}, {X: r}, {X: r * (1 - 1e-15)}, {Y: -r, Z: h}, {Z: -h}, {X: r / math.Sqrt2, Y: r / math.Sqrt2, Z: h * (1 - 1e-12)},
		{X: r - 1e-9, Z: -h + 1e-9}, {X: r * (1 + 1e-12)},
	}
}

// TestEventsAlwaysValid is a property test of numerical safety: primaries
// drawn from edge energies, wall-hugging vertices, axis and random
// directions and every species, singly and in pairs, give either an error
// or an event that event.Validate accepts (finite everywhere, consistent
// counts, valid sensors), never a panic.
func TestEventsAlwaysValid(t *testing.T) {
	s := demoSim(t, 1, nil)
	nSensors := s.cfg.Detector.NumSensors()
	energies := edgeEnergies(s)
	points := wallPoints(s)
	species := []int{phys.Electron, phys.Positron, phys.Gamma, phys.MuonMinus, phys.MuonPlus}
	dirs := []r3.Vector{{X: 1}, {X: -1}, {Z: 1}, {Z: -1}, {X: 0.6, Y: 0.8}}
	rng := rand.New(rand.NewPCG(9, 10))
	n := 60
	if testing.Short() {
		n = 20
	}
	errs := 0
	for i := range n {
		prims := make([]phys.Particle, 1+rng.IntN(2))
		for k := range prims {
			dir := dirs[rng.IntN(len(dirs))]
			if rng.IntN(2) == 0 {
				c, phi := 2*rng.Float64()-1, 2*math.Pi*rng.Float64()
				dir = r3.Vector{X: math.Sqrt(1-c*c) * math.Cos(phi), Y: math.Sqrt(1-c*c) * math.Sin(phi), Z: c}
			}
			prims[k] = phys.Particle{
				PDG:  species[rng.IntN(len(species))],
				Pos:  points[rng.IntN(len(points))],
				Dir:  dir,
				Time: []float64{0, -1e3, 1e6}[rng.IntN(3)],
				Ekin: energies[rng.IntN(len(energies))],
			}
		}
		ev, err := s.Event(uint64(i), prims)
		if err != nil {
			errs++
			outside := false
			for _, p := range prims {
				outside = outside || p.Pos == points[len(points)-1]
			}
			if !outside || !strings.HasPrefix(err.Error(), "sim: ") || !strings.Contains(err.Error(), "Pos") {
				t.Errorf("event %d %+v: error %q", i, prims, err)
			}
			continue
		}
		if err := ev.Validate(nSensors); err != nil {
			t.Errorf("event %d %+v: %v", i, prims, err)
		}
	}
	t.Logf("%d events, %d refused", n, errs)
}

// TestEventRefusesBadPrimaries: non-finite, out-of-range or unknown
// primaries give an error naming the problem, for tracked and untracked
// species alike, never an event that Validate would refuse.
func TestEventRefusesBadPrimaries(t *testing.T) {
	s := demoSim(t, 1, nil)
	nan, inf := math.NaN(), math.Inf(1)
	good := phys.Particle{PDG: phys.Electron, Dir: r3.Vector{Z: 1}, Ekin: 5}
	for _, tc := range []struct {
		name, want string
		edit       func(*phys.Particle)
	}{
		{"NaN energy", "Ekin = NaN", func(p *phys.Particle) { p.Ekin = nan }},
		{"Inf energy", "Ekin = +Inf", func(p *phys.Particle) { p.Ekin = inf }},
		{"negative energy", "Ekin = -1", func(p *phys.Particle) { p.Ekin = -1 }},
		{"energy above the tables", "Ekin", func(p *phys.Particle) { p.Ekin = 10 * em.MaxEkin }},
		{"muon above the tables", "Ekin", func(p *phys.Particle) { p.PDG, p.Ekin = phys.MuonMinus, 10*muon.MaxEnergy }},
		{"NaN position", "Pos", func(p *phys.Particle) { p.Pos.X = nan }},
		{"outside the tank", "outside", func(p *phys.Particle) { p.Pos.Z = 1e4 }},
		{"zero direction", "Dir", func(p *phys.Particle) { p.Dir = r3.Vector{} }},
		{"NaN time", "Time = NaN", func(p *phys.Particle) { p.Time = nan }},
		{"unknown PDG", "PDG", func(p *phys.Particle) { p.PDG = 999999 }},
		{"untracked proton with NaN position", "NaN", func(p *phys.Particle) { p.PDG, p.Pos.X = phys.ProtonCode, nan }},
		{"untracked proton with Inf energy", "+Inf", func(p *phys.Particle) { p.PDG, p.Ekin = phys.ProtonCode, inf }},
	} {
		p := good
		tc.edit(&p)
		ev, err := s.Event(1, []phys.Particle{p})
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: event %v, error %v, want one containing %q", tc.name, ev != nil, err, tc.want)
		}
	}
	if _, err := s.Event(1, nil); err == nil {
		t.Error("no primaries: no error")
	}
}

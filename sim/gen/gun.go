package gen

import (
	"fmt"
	"math/rand/v2"
	"strings"

	"github.com/conelight/conelight/sim/phys"
)

// GunParticle is one primary of a particle gun.
type GunParticle struct {
	PDG       int      // e-, e+, mu-, mu+ or gamma
	Ekin      Spectrum // kinetic energy, MeV
	Direction DirDist
}

// GunConfig configures a particle gun. All primaries of an event start at
// one vertex, drawn once per event, at the same time.
type GunConfig struct {
	Particles []GunParticle
	Vertex    VertexDist
	Time      float64 // ns
}

// Gun is a particle gun. It is immutable and safe for concurrent use.
type Gun struct {
	parts  []GunParticle
	vertex VertexDist
	time   float64
}

// NewGun validates cfg and returns the gun. Errors name the field and the
// value, e.g. `gen: GunConfig.Particles[1].PDG = 2212: the simulator does
// not track p`.
func NewGun(cfg GunConfig) (*Gun, error) {
	if len(cfg.Particles) == 0 {
		return nil, fmt.Errorf("gen: GunConfig.Particles is empty")
	}
	g := &Gun{parts: make([]GunParticle, len(cfg.Particles)), vertex: cfg.Vertex, time: cfg.Time}
	for i, p := range cfg.Particles {
		if err := checkTracked(p.PDG); err != nil {
			return nil, fmt.Errorf("gen: GunConfig.Particles[%d].PDG = %d: %w", i, p.PDG, err)
		}
		if err := p.Ekin.Validate(); err != nil {
			return nil, fmt.Errorf("gen: GunConfig.Particles[%d].Ekin: %w", i, err)
		}
		if err := p.Direction.Validate(); err != nil {
			return nil, fmt.Errorf("gen: GunConfig.Particles[%d].Direction: %w", i, err)
		}
		p.Direction = p.Direction.normalized()
		g.parts[i] = p
	}
	if err := cfg.Vertex.Validate(); err != nil {
		return nil, fmt.Errorf("gen: GunConfig.Vertex: %w", err)
	}
	if !isFinite(cfg.Time) {
		return nil, fmt.Errorf("gen: GunConfig.Time = %g must be finite", cfg.Time)
	}
	return g, nil
}

// checkTracked reports an error for codes phys does not know or the
// simulator does not transport.
func checkTracked(pdg int) error {
	sp, err := phys.Lookup(pdg)
	if err != nil {
		return err
	}
	if !tracked(pdg) {
		return fmt.Errorf("the simulator does not track %s (only e-, e+, mu-, mu+, gamma)", sp.Name)
	}
	return nil
}

// Generate draws the vertex, then for each primary in order its kinetic
// energy and direction. number is not used.
func (g *Gun) Generate(number uint64, rng *rand.Rand, dst []phys.Particle) ([]phys.Particle, Info, error) {
	dst = dst[:0]
	v := g.vertex.Sample(rng)
	for _, p := range g.parts {
		dst = append(dst, phys.Particle{
			PDG:  p.PDG,
			Pos:  v,
			Time: g.time,
			Ekin: p.Ekin.Sample(rng),
			Dir:  p.Direction.Sample(rng),
		})
	}
	return dst, Info{}, nil
}

// String describes the gun, e.g.
// "gun: mu- FixedEnergy(500) MeV Along(0, 0, 1); vertex AtPoint(0, 0, 0) cm; t = 0 ns".
func (g *Gun) String() string {
	var b strings.Builder
	b.WriteString("gun:")
	for i, p := range g.parts {
		if i > 0 {
			b.WriteString(" +")
		}
		sp, _ := phys.Lookup(p.PDG)
		fmt.Fprintf(&b, " %s %v %v", sp.Name, p.Ekin, p.Direction)
	}
	fmt.Fprintf(&b, "; vertex %v; t = %g ns", g.vertex, g.time)
	return b.String()
}

var _ Generator = (*Gun)(nil)

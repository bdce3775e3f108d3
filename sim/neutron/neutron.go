package neutron

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/hadron"
	"github.com/conelight/conelight/sim/heavy"
	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/phys"
)

// Config holds the neutron transport settings. The zero value of a field
// means its default.
type Config struct {
	// TemperatureC is the water temperature in Celsius, which sets the
	// free-gas target motion. Default 20 (the optics default); valid
	// [0, 100].
	TemperatureC float64
	// GdMassFraction is the mass fraction of gadolinium dissolved in the
	// water (0.001 for 0.1% Gd). Default 0 (pure water); valid [0, 0.01].
	GdMassFraction float64
	// ThermalCut is the energy (MeV) below which the target nuclei's
	// thermal motion is sampled (free gas); above it they are at rest.
	// Default 4e-6 (4 eV, common practice); valid [1e-7, 1e-3].
	ThermalCut float64
	// MaxTime is the longest time (ns) a neutron is followed after its
	// start; one still free then is stopped with fate NotFollowed. Default
	// 1e7 (10 ms, 50 capture times of pure water); valid [1e3, 1e9].
	MaxTime float64
}

// DefaultConfig returns the default settings.
func DefaultConfig() Config {
	return Config{TemperatureC: 20, ThermalCut: 4e-6, MaxTime: 1e7}
}

func (c Config) withDefaults() Config {
	d := DefaultConfig()
	if c.TemperatureC == 0 {
		c.TemperatureC = d.TemperatureC
	}
	if c.ThermalCut == 0 {
		c.ThermalCut = d.ThermalCut
	}
	if c.MaxTime == 0 {
		c.MaxTime = d.MaxTime
	}
	return c
}

// Validate reports the first field outside its range (zero fields take
// their defaults first).
func (c Config) Validate() error {
	c = c.withDefaults()
	for _, f := range []struct {
		name     string
		v, lo, h float64
	}{
		{"TemperatureC", c.TemperatureC, 0, 100},
		{"GdMassFraction", c.GdMassFraction, 0, 0.01},
		{"ThermalCut", c.ThermalCut, 1e-7, 1e-3},
		{"MaxTime", c.MaxTime, 1e3, 1e9},
	} {
		if !(f.v >= f.lo && f.v <= f.h) {
			return fmt.Errorf("neutron: Config.%s = %g must be in [%g, %g]", f.name, f.v, f.lo, f.h)
		}
	}
	return nil
}

// Atomic weights (g/mol): natural gadolinium 157.25 (IUPAC, from memory).
const gdAtomicWeight = 157.25

// boltzmann is k_B in MeV/K.
const boltzmann = 8.617333262e-11

// relativisticAbove is the kinetic energy (MeV) above which collisions use
// relativistic kinematics and the oxygen non-elastic channel is the
// nucleon knock-out of sim/hadron.
const relativisticAbove = 20.0

// recoilCut is the kinetic energy (MeV) below which a recoil proton is
// deposited where it is made rather than followed (it would range out in
// under 30 micrometres, far below Cherenkov threshold).
const recoilCut = 1.0

// Physics holds the neutron cross-sections of one medium. It is immutable
// after New and safe for concurrent use.
type Physics struct {
	cfg         Config
	nH, nO, nGd float64 // atoms per cm^3
	kT          float64 // MeV
	had         *hadron.Physics
}

// New builds the neutron physics for water medium m (hydrogen and oxygen;
// GdMassFraction of it replaced by gadolinium) and the hadron physics had,
// used for oxygen knock-out above 20 MeV.
func New(m material.Medium, had *hadron.Physics, cfg Config) (*Physics, error) {
	if err := cfg.Validate(); err != nil {
		return nil, err
	}
	if had == nil {
		return nil, errors.New("neutron: hadron physics is nil")
	}
	cfg = cfg.withDefaults()
	p := &Physics{cfg: cfg, had: had, kT: boltzmann * (cfg.TemperatureC + 273.15)}
	if e, ok := m.OtherThan(1, 8); ok {
		return nil, fmt.Errorf("neutron: Medium.Elements has %s (Z = %d): only hydrogen and oxygen are modelled", e.Symbol, e.Z)
	}
	w := 1 - cfg.GdMassFraction
	p.nH, p.nO = w*m.AtomDensity(1), w*m.AtomDensity(8)
	p.nGd = m.Density * cfg.GdMassFraction * phys.Avogadro / gdAtomicWeight
	return p, nil
}

// Config returns the settings in use.
func (p *Physics) Config() Config { return p.cfg }

// Target nuclei, by atomic number.
const (
	targetH  = 1
	targetO  = 8
	targetGd = 64
)

// Mass ratios target/neutron for the free gas and the elastic kinematics.
const (
	massRatioH = phys.ProtonMass / phys.NeutronMass
	massRatioO = 15.8575 // 16O: 15.99491 u / 1.008665 u
)

// rates holds the macroscopic cross-sections (1/cm) at one energy.
type rates struct {
	elH, elO, inelO, reacO, capH, capO, capGd float64
}

func (r rates) total() float64 {
	return r.elH + r.elO + r.inelO + r.reacO + r.capH + r.capO + r.capGd
}

// freeGasFactor returns <|v - V|>/v for a target of mass ratio a in a
// Maxwellian gas at kT, for a neutron of energy e: the factor by which
// target motion raises a constant cross-section's collision rate,
// (1 + 1/(2y^2)) erf(y) + exp(-y^2)/(y sqrt(pi)) with y^2 = a e / kT.
func freeGasFactor(e, a, kT float64) float64 {
	y := math.Sqrt(a * e / kT)
	return (1+1/(2*y*y))*math.Erf(y) + math.Exp(-y*y)/(y*math.Sqrt(math.Pi))
}

// ratesAt returns the macroscopic cross-sections at energy e (MeV).
func (p *Physics) ratesAt(e float64) rates {
	var r rates
	oneOverV := math.Sqrt(thermalEnergy / e)
	r.elH = p.nH * HydrogenElastic(e) * barn
	r.elO = p.nO * OxygenElastic(e) * barn
	if e < p.cfg.ThermalCut {
		r.elH *= freeGasFactor(e, massRatioH, p.kT)
		r.elO *= freeGasFactor(e, massRatioO, p.kT)
	}
	r.capH = p.nH * HydrogenCapture * barn * oneOverV
	r.capO = p.nO * OxygenCapture * barn * oneOverV
	r.capGd = p.nGd * GadoliniumCapture * barn * oneOverV
	if e > relativisticAbove {
		r.reacO = p.nO * hadron.ProtonOxygenReaction(e) * 1e-27
	} else {
		r.inelO = p.nO * OxygenInelastic(e) * barn
	}
	return r
}

// CrossSections returns the macroscopic cross-sections (1/cm) of elastic
// scattering on hydrogen and oxygen and of capture on hydrogen, oxygen
// and gadolinium at neutron energy e (MeV), with the free-gas factor
// below the thermal cut.
func (p *Physics) CrossSections(e float64) (elasticH, elasticO, captureH, captureO, captureGd float64) {
	r := p.ratesAt(e)
	return r.elH, r.elO, r.capH, r.capO, r.capGd
}

// Truth summarizes one transported neutron.
type Truth struct {
	// Fate is Captured, Exited, Interacted (a knock-out above 20 MeV; the
	// outgoing neutron is a new track) or NotFollowed (still free after
	// Config.MaxTime).
	Fate phys.Fate
	// EndPos and EndTime (ns) are where and when the neutron ended (the
	// capture point and time for a capture).
	EndPos  r3.Vector
	EndTime float64
	// EndEkin is the kinetic energy (MeV) at the end.
	EndEkin float64
	// Target is the capturing or interacting nucleus by atomic number
	// (1 H, 8 O, 64 Gd).
	Target int
	// Collisions counts the elastic and inelastic scatterings.
	Collisions int
	// TrackLength is the path length (cm).
	TrackLength float64
	// CaptureEnergy is the total gamma energy of a capture, MeV.
	CaptureEnergy float64
}

// Track follows a neutron (2112) from part until it is captured, leaves
// vol, has a knock-out reaction above 20 MeV, or outlives MaxTime. Recoil
// protons above 1 MeV, inelastic and capture gammas and knock-out
// products are reported to sink as secondaries; recoils below are
// reported as deposits.
func (p *Physics) Track(part phys.Particle, vol phys.Volume, rng *rand.Rand, sink phys.Sink) (Truth, error) {
	if err := validate(part, vol, rng, sink); err != nil {
		return Truth{}, err
	}
	const m = phys.NeutronMass
	const c = phys.SpeedOfLight
	pos, dir, t, e := part.Pos, part.Dir, part.Time, part.Ekin
	// A neutron at rest is given the thermal energy kT: the free-gas
	// model has no state of rest.
	if e <= 0 {
		e = p.kT
		dir = isotropic(rng)
	}
	var tr Truth
	tEnd := part.Time + p.cfg.MaxTime
	for {
		r := p.ratesAt(e)
		sig := r.total()
		d := rng.ExpFloat64() / sig
		beta := phys.Beta(e, m)
		if t+d/(beta*c) > tEnd {
			d = (tEnd - t) * beta * c
			if !vol.Contains(pos.Add(dir.Mul(d))) {
				d = heavy.Crossing(vol, pos, dir, d)
				tr.Fate = phys.Exited
			} else {
				tr.Fate = phys.NotFollowed
			}
			pos, t = pos.Add(dir.Mul(d)), t+d/(beta*c)
			tr.TrackLength += d
			break
		}
		if !vol.Contains(pos.Add(dir.Mul(d))) {
			d = heavy.Crossing(vol, pos, dir, d)
			pos, t = pos.Add(dir.Mul(d)), t+d/(beta*c)
			tr.TrackLength += d
			tr.Fate = phys.Exited
			break
		}
		pos, t = pos.Add(dir.Mul(d)), t+d/(beta*c)
		tr.TrackLength += d
		u := rng.Float64() * sig
		switch {
		case u < r.elH:
			tr.Collisions++
			e, dir = p.elastic(e, dir, massRatioH, pos, t, part.Track, true, rng, sink)
			continue
		case u < r.elH+r.elO:
			tr.Collisions++
			e, dir = p.elastic(e, dir, massRatioO, pos, t, part.Track, false, rng, sink)
			continue
		case u < r.elH+r.elO+r.inelO:
			// 16O(n, n') to the 6.13 MeV state: the gamma, and the neutron
			// isotropic with the energy less the excitation and the
			// centre-of-mass share A/(A+1) (simplified two-body).
			tr.Collisions++
			emitGamma(6.13, pos, t, part.Track, rng, sink)
			e = math.Max((e-6.13*(massRatioO+1)/massRatioO)*massRatioO*massRatioO/((massRatioO+1)*(massRatioO+1)), p.kT)
			dir = isotropic(rng)
			continue
		case u < r.elH+r.elO+r.inelO+r.reacO:
			tr.Fate, tr.Target = phys.Interacted, targetO
			var buf [4]hadron.Product
			out := hadron.KnockOutOxygen(phys.OnShell(m, e, dir), phys.NeutronCode, rng, buf[:0])
			hadron.Emit(out, pos, t, part.Track, sink)
		default:
			tr.Fate = phys.Captured
			switch {
			case u < sig-r.capO-r.capGd:
				tr.Target, tr.CaptureEnergy = targetH, DeuteronGamma
				emitGamma(DeuteronGamma, pos, t, part.Track, rng, sink)
			case u < sig-r.capGd:
				tr.Target, tr.CaptureEnergy = targetO, Oxygen17Gamma
				emitGamma(Oxygen17Gamma, pos, t, part.Track, rng, sink)
			default:
				tr.Target = targetGd
				tr.CaptureEnergy = gdCascade(pos, t, part.Track, rng, sink)
			}
		}
		break
	}
	tr.EndPos, tr.EndTime, tr.EndEkin = pos, t, e
	return tr, nil
}

// elastic scatters a neutron of energy e along dir off a nucleus of mass
// ratio a: isotropic in the centre of mass (s-wave: exact for hydrogen
// below ~10 MeV, a simplification for oxygen above ~1 MeV, where
// scattering is forward-peaked). Below the thermal cut the target moves
// (free gas), above 20 MeV the kinematics are relativistic. It reports the
// recoil (a proton above recoilCut as a secondary, else a deposit) and
// returns the neutron's new energy and direction.
func (p *Physics) elastic(e float64, dir r3.Vector, a float64, pos r3.Vector, t float64, parent int, hydrogen bool, rng *rand.Rand, sink phys.Sink) (float64, r3.Vector) {
	const m = phys.NeutronMass
	if e > relativisticAbove && hydrogen {
		n, pr, ok := hadron.ElasticOnProton(phys.OnShell(m, e, dir), m, rng)
		if !ok {
			return e, dir
		}
		if tp := pr.E - phys.ProtonMass; tp > recoilCut {
			sink.Secondary(phys.Particle{PDG: phys.ProtonCode, Pos: pos, Dir: pr.P.Normalize(), Time: t, Ekin: tp, Parent: parent})
		} else if tp > 0 {
			sink.Deposit(pos, t, tp, parent)
		}
		return math.Max(n.E-m, 0), n.P.Normalize()
	}
	// Velocities in units of sqrt(2 kT / m): v^2 = E / kT.
	v := dir.Mul(math.Sqrt(e / p.kT))
	var vt r3.Vector
	if e < p.cfg.ThermalCut {
		vt = sampleTarget(v, a, rng)
	}
	vcm := v.Add(vt.Mul(a)).Mul(1 / (1 + a))
	u := v.Sub(vcm).Norm()
	om := isotropic(rng)
	v2 := vcm.Add(om.Mul(u))
	vt2 := vcm.Sub(om.Mul(u / a))
	e2 := v2.Norm2() * p.kT
	// Energy given to the nucleus (negative when a moving target gives
	// energy to a slow neutron).
	if rec := a * p.kT * (vt2.Norm2() - vt.Norm2()); rec > 0 {
		if hydrogen && rec > recoilCut {
			sink.Secondary(phys.Particle{PDG: phys.ProtonCode, Pos: pos, Dir: vt2.Normalize(), Time: t, Ekin: rec, Parent: parent})
		} else {
			sink.Deposit(pos, t, rec, parent)
		}
	}
	return e2, v2.Normalize()
}

// sampleTarget draws the velocity of a free-gas target of mass ratio a
// struck by a neutron of velocity v (units sqrt(2kT/m)): the Maxwellian
// weighted by the relative speed, with the standard algorithm (target
// speed x in units of its thermal speed from x^3 e^-x^2 or x^2 e^-x^2
// with probabilities proportional to sqrt(pi) y / 2 and 1, the cosine mu
// uniform, accepted with |v - V|/(v + V); e.g. the OpenMC theory manual,
// "free gas scattering").
func sampleTarget(v r3.Vector, a float64, rng *rand.Rand) r3.Vector {
	vn := v.Norm()
	y := vn * math.Sqrt(a)
	dir := v.Mul(1 / vn)
	for {
		var x2 float64
		if rng.Float64()*(y*math.Sqrt(math.Pi)+2) < 2 {
			x2 = -math.Log(rng.Float64() * rng.Float64())
		} else {
			cs := math.Cos(math.Pi / 2 * rng.Float64())
			x2 = -math.Log(rng.Float64()) - math.Log(rng.Float64())*cs*cs
		}
		x := math.Sqrt(x2)
		mu := 2*rng.Float64() - 1
		if rng.Float64()*(x+y) < math.Sqrt(y*y+x2-2*x*y*mu) {
			return phys.Deflect(dir, mu, 2*math.Pi*rng.Float64()).Mul(x / math.Sqrt(a))
		}
	}
}

// gdCascade emits the gammas of a capture on natural gadolinium and
// returns their total energy: 157Gd (81%, Q = 7.937 MeV) or 155Gd (Q =
// 8.536 MeV), split into 3, 4 or 5 gammas (equal chances, mean 4) by
// uniformly placed cuts of Q, each isotropic. A documented simplification
// of the measured cascades (mean multiplicity near 4, from memory), not
// their spectrum.
func gdCascade(pos r3.Vector, t float64, parent int, rng *rand.Rand, sink phys.Sink) float64 {
	q := Gd155Q
	if rng.Float64() < Gd157Share {
		q = Gd157Q
	}
	n := 3 + rng.IntN(3)
	var cuts [6]float64
	cuts[0], cuts[n] = 0, 1
	for i := 1; i < n; i++ {
		cuts[i] = rng.Float64()
	}
	s := cuts[1:n]
	for i := 1; i < len(s); i++ { // insertion sort of at most 4 values
		for j := i; j > 0 && s[j] < s[j-1]; j-- {
			s[j], s[j-1] = s[j-1], s[j]
		}
	}
	for i := 0; i < n; i++ {
		emitGamma(q*(cuts[i+1]-cuts[i]), pos, t, parent, rng, sink)
	}
	return q
}

func emitGamma(e float64, pos r3.Vector, t float64, parent int, rng *rand.Rand, sink phys.Sink) {
	sink.Secondary(phys.Particle{PDG: phys.Gamma, Pos: pos, Dir: isotropic(rng), Time: t, Ekin: e, Parent: parent})
}

func isotropic(rng *rand.Rand) r3.Vector {
	return phys.Deflect(r3.Vector{Z: 1}, 2*rng.Float64()-1, 2*math.Pi*rng.Float64())
}

func validate(part phys.Particle, vol phys.Volume, rng *rand.Rand, sink phys.Sink) error {
	switch {
	case vol == nil:
		return errors.New("neutron: Track: vol is nil")
	case rng == nil:
		return errors.New("neutron: Track: rng is nil")
	case sink == nil:
		return errors.New("neutron: Track: sink is nil")
	case part.PDG != phys.NeutronCode:
		return fmt.Errorf("neutron: Particle.PDG = %d is not a neutron (2112)", part.PDG)
	case !(part.Ekin >= 0 && part.Ekin <= 1e5):
		return fmt.Errorf("neutron: Particle.Ekin = %g MeV must be in [0, 1e5]", part.Ekin)
	case math.IsNaN(part.Time) || math.IsInf(part.Time, 0):
		return fmt.Errorf("neutron: Particle.Time = %g must be finite", part.Time)
	}
	n := part.Dir.Norm()
	if math.IsNaN(n) || math.Abs(n-1) > 1e-6 {
		return fmt.Errorf("neutron: Particle.Dir = %v must be a unit vector", part.Dir)
	}
	if !vol.Contains(part.Pos) {
		return fmt.Errorf("neutron: Particle.Pos = %v is not inside the volume", part.Pos)
	}
	return nil
}

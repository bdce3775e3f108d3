package gen

import (
	"fmt"
	"math"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/phys"
)

// Target selects what the neutrinos of a QE generator hit.
type Target int

const (
	// Water is H2O: antineutrinos hit the 2 free protons and the 8
	// protons bound in oxygen of each molecule, chosen in proportion to
	// their rates; neutrinos hit the 8 neutrons bound in oxygen.
	Water Target = iota
	// Oxygen: nucleons bound in 16O only.
	Oxygen
	// FreeNucleon: a free nucleon at rest, the proton for antineutrinos;
	// for neutrinos a free neutron, which water does not have: a study
	// and check target (the Llewellyn Smith cross-section as published).
	FreeNucleon
)

// String returns "water", "oxygen" or "free nucleon".
func (t Target) String() string {
	switch t {
	case Water:
		return "water"
	case Oxygen:
		return "oxygen"
	case FreeNucleon:
		return "free nucleon"
	}
	return fmt.Sprintf("Target(%d)", int(t))
}

// FermiGas is the relativistic Fermi gas of a nucleus (Smith and Moniz,
// Nucl. Phys. B43 (1972) 605): nucleon momenta uniform in the sphere of
// radius FermiMomentum, a constant BindingEnergy taken off the struck
// nucleon's on-shell energy, and final nucleons below the Fermi momentum
// Pauli-blocked.
type FermiGas struct {
	FermiMomentum float64 // k_F, MeV/c
	BindingEnergy float64 // E_b, MeV
}

// OxygenFermiGas returns k_F = 225 MeV/c and E_b = 27 MeV
// (phys.OxygenBindingEnergy) for 16O: values commonly used for oxygen in
// neutrino work, close to the fits to quasi-elastic electron scattering of
// Moniz et al., Phys. Rev. Lett. 26 (1971) 445 for neighbouring nuclei
// (from memory; common practice).
func OxygenFermiGas() FermiGas {
	return FermiGas{FermiMomentum: 225, BindingEnergy: phys.OxygenBindingEnergy}
}

// QEConfig configures the charged-current quasi-elastic generator.
type QEConfig struct {
	Neutrino int      // PDG code: 12, 14 (nu_e, nu_mu), -12, -14
	Etot     Spectrum // neutrino total energy, MeV
	// FluxWeighted says that Etot is the neutrino flux, so that the
	// energies of the generated interactions follow flux x cross-section.
	// Otherwise Etot is the distribution of the interacting neutrinos'
	// energies, each of which must then be above threshold.
	FluxWeighted bool
	Beam         r3.Vector // neutrino direction (normalized; non-zero)
	Vertex       VertexDist
	Time         float64 // ns
	Target       Target
	AxialMass    float64  // M_A, MeV; 0 means DefaultAxialMass
	Nucleus      FermiGas // bound nucleons; the zero value means OxygenFermiGas()
}

// QE generates charged-current quasi-elastic events nu n -> l- p and
// nubar p -> l+ n on water; see the package documentation for the physics
// and the sampling. The primaries are the charged lepton alone; the final
// nucleon is in Info. QE is immutable and safe for concurrent use.
type QE struct {
	ch           channel
	neutrino     int
	energy       Spectrum
	fluxWeighted bool
	beam         r3.Vector
	vertex       VertexDist
	time         float64
	target       Target
	ma           float64
	gas          FermiGas
	freeShare    float64 // probability of proposing a free nucleon
	pauli        bool    // Pauli blocking (switched off only by tests)
	fixedBound   float64 // rejection bound when it does not depend on the event, else 0
}

// qeSafety multiplies the grid maximum of the proposal weight to make the
// rejection bound; the grid is fine enough that the true maximum lies well
// within it (tests check the ratio), and Generate reports an error, never a
// biased event, if a weight ever exceeds the bound.
const (
	qeSafetyFree  = 1.05
	qeSafetyBound = 1.15
	qeMaxTrials   = 1 << 20
)

// NewQE validates cfg and returns the generator. Errors name the field and
// the value.
func NewQE(cfg QEConfig) (*QE, error) {
	ma := cfg.AxialMass
	if ma == 0 {
		ma = DefaultAxialMass
	}
	ch, err := newChannel(cfg.Neutrino, ma)
	if err != nil {
		return nil, fmt.Errorf("gen: QEConfig.Neutrino = %d, AxialMass = %g: %w", cfg.Neutrino, cfg.AxialMass, err)
	}
	if err := cfg.Etot.Validate(); err != nil {
		return nil, fmt.Errorf("gen: QEConfig.Etot: %w", err)
	}
	if !finiteVector(cfg.Beam) || cfg.Beam.Norm() == 0 {
		return nil, fmt.Errorf("gen: QEConfig.Beam = %v must be finite and non-zero", cfg.Beam)
	}
	if err := cfg.Vertex.Validate(); err != nil {
		return nil, fmt.Errorf("gen: QEConfig.Vertex: %w", err)
	}
	if !isFinite(cfg.Time) {
		return nil, fmt.Errorf("gen: QEConfig.Time = %g must be finite", cfg.Time)
	}
	gas := cfg.Nucleus
	if gas == (FermiGas{}) {
		gas = OxygenFermiGas()
	}
	if !isFinite(gas.FermiMomentum) || !(gas.FermiMomentum > 0) || gas.FermiMomentum > ch.model.mi {
		return nil, fmt.Errorf("gen: QEConfig.Nucleus.FermiMomentum = %g MeV/c must be positive and below the nucleon mass", gas.FermiMomentum)
	}
	if !isFinite(gas.BindingEnergy) || gas.BindingEnergy < 0 || gas.BindingEnergy > 0.1*ch.model.mi {
		return nil, fmt.Errorf("gen: QEConfig.Nucleus.BindingEnergy = %g MeV must be in [0, %g]", gas.BindingEnergy, 0.1*ch.model.mi)
	}
	q := &QE{ch: ch, neutrino: cfg.Neutrino, energy: cfg.Etot, fluxWeighted: cfg.FluxWeighted,
		beam: cfg.Beam.Normalize(), vertex: cfg.Vertex, time: cfg.Time, target: cfg.Target,
		ma: ma, gas: gas, pauli: true}
	switch cfg.Target {
	case Water:
		if ch.model.anti {
			q.freeShare = 2.0 / 10 // 2 free protons, 8 bound ones per molecule
		}
	case Oxygen:
	case FreeNucleon:
		q.freeShare = 1
	default:
		return nil, fmt.Errorf("gen: QEConfig.Target = %d is not Water, Oxygen or FreeNucleon", int(cfg.Target))
	}
	if err := q.prepareBound(); err != nil {
		return nil, err
	}
	return q, nil
}

// prepareBound precomputes the rejection bound where it is event
// independent and checks that events are possible at all.
func (q *QE) prepareBound() error {
	lo, hi := q.energy.Range()
	if !q.fluxWeighted {
		if q.bound(lo) == 0 {
			return fmt.Errorf("gen: QEConfig.Etot: %v reaches %g MeV, below the threshold of %s on %v",
				q.energy, lo, q.ch.neutrinoName, q.target)
		}
		if lo == hi {
			q.fixedBound = q.bound(lo)
		}
		return nil
	}
	// Flux-weighted: one bound over the whole energy range, from a
	// logarithmic grid (the bound rises smoothly with energy).
	const n = 48
	a := math.Max(lo, hi*1e-4)
	for i := 0; i <= n; i++ {
		e := a * math.Pow(hi/a, float64(i)/n)
		q.fixedBound = math.Max(q.fixedBound, q.bound(e))
	}
	if q.fixedBound == 0 {
		return fmt.Errorf("gen: QEConfig.Etot: %v lies wholly below the threshold of %s on %v", q.energy, q.ch.neutrinoName, q.target)
	}
	return nil
}

// fourVec is an energy-momentum four-vector (MeV).
type fourVec struct {
	e float64
	p r3.Vector
}

func (a fourVec) add(b fourVec) fourVec { return fourVec{a.e + b.e, a.p.Add(b.p)} }
func (a fourVec) m2() float64           { return a.e*a.e - a.p.Norm2() }

// boost returns v, given in a frame that moves with velocity beta (units
// of c) and Lorentz factor gamma, in the frame where it moves.
func boost(v fourVec, beta r3.Vector, gamma float64) fourVec {
	bp := beta.Dot(v.p)
	return fourVec{
		e: gamma * (v.e + bp),
		p: v.p.Add(beta.Mul(gamma*gamma/(gamma+1)*bp + gamma*v.e)),
	}
}

// initial returns the four-momentum of the struck nucleon: at rest when
// free, else with Fermi momentum p and the binding energy taken off its
// on-shell energy.
func (q *QE) initial(free bool, p r3.Vector) fourVec {
	mi := q.ch.model.mi
	if free {
		return fourVec{e: mi}
	}
	return fourVec{e: math.Sqrt(mi*mi+p.Norm2()) - q.gas.BindingEnergy, p: p}
}

// rate returns the proposal weight of a neutrino of energy e on the
// nucleon nuc with lepton at cos theta* = cosCM in the centre-of-mass
// frame, Pauli blocking aside: the flux factor k.P/(E_nu E_N) times
// d sigma/dQ2 at the neutrino energy in the nucleon's rest frame, k.P/M_i,
// times the width of the Q2 range (Q2 is linear in cos theta*, which is
// proposed uniformly). It also returns Q2 and the CM kinematics.
func (q *QE) rate(e float64, nuc fourVec, cosCM float64) (w, q2, kcm, el, pl float64) {
	kp := e * (nuc.e - q.beam.Dot(nuc.p)) // k.P
	pi2 := nuc.m2()
	kcm, el, pl, ok := q.ch.cmKinematics(pi2+2*kp, pi2)
	if !ok {
		return 0, 0, 0, 0, 0
	}
	ml := q.ch.model.lepMass
	q2 = 2*kcm*(el-pl*cosCM) - ml*ml
	flux := kp / (e * nuc.e)
	w = flux * q.ch.model.dSigma(kp/q.ch.model.mi, q2) * 4 * kcm * pl
	return w, q2, kcm, el, pl
}

// bound returns the rejection bound for neutrino energy e: the maximum of
// rate over a grid of nucleon momenta (magnitude and angle to the beam)
// and cos theta*, times a safety factor. It is 0 below threshold.
func (q *QE) bound(e float64) float64 {
	const nCos = 48
	maxOver := func(nuc fourVec) float64 {
		m := 0.0
		for i := 0; i <= nCos; i++ {
			w, _, _, _, _ := q.rate(e, nuc, -1+2*float64(i)/nCos)
			m = math.Max(m, w)
		}
		return m
	}
	b := 0.0
	if q.freeShare > 0 {
		b = qeSafetyFree * maxOver(q.initial(true, r3.Vector{}))
	}
	if q.freeShare < 1 {
		const nP, nAngle = 5, 6
		m := 0.0
		for i := 0; i <= nP; i++ {
			p := q.gas.FermiMomentum * float64(i) / nP
			for j := 0; j <= nAngle; j++ {
				u := phys.Deflect(q.beam, -1+2*float64(j)/nAngle, 0)
				m = math.Max(m, maxOver(q.initial(false, u.Mul(p))))
			}
		}
		b = math.Max(b, qeSafetyBound*m)
	}
	return b
}

// Generate draws the vertex, then (unless flux-weighted) the neutrino
// energy, then proposals (energy if flux-weighted, free or bound nucleon,
// Fermi momentum, cos theta*, azimuth) until one is accepted. The primary
// is the charged lepton at the vertex; number is not used.
func (q *QE) Generate(number uint64, rng *rand.Rand, dst []phys.Particle) ([]phys.Particle, Info, error) {
	dst = dst[:0]
	vtx := q.vertex.Sample(rng)
	var e float64
	b := q.fixedBound
	if !q.fluxWeighted {
		e = q.energy.Sample(rng)
		if b == 0 {
			b = q.bound(e)
		}
		if b == 0 {
			return dst, Info{}, fmt.Errorf("gen: %s: no quasi-elastic interaction possible at %g MeV", q.ch.neutrinoName, e)
		}
	}
	for range qeMaxTrials {
		if q.fluxWeighted {
			e = q.energy.Sample(rng)
		}
		free := q.freeShare == 1 || (q.freeShare > 0 && rng.Float64() < q.freeShare)
		var pF r3.Vector
		if !free {
			pF = fermiSphere(q.gas.FermiMomentum, rng)
		}
		nuc := q.initial(free, pF)
		cosCM := 2*rng.Float64() - 1
		w, q2, kcm, el, pl := q.rate(e, nuc, cosCM)
		if w > b {
			return dst, Info{}, fmt.Errorf("gen: %s at %g MeV: proposal weight %g exceeds the rejection bound %g (ratio %g); please report",
				q.ch.neutrinoName, e, w, b, w/b)
		}
		if rng.Float64()*b >= w {
			continue
		}
		// Final state: in the centre-of-mass frame, then boosted to the lab.
		k := fourVec{e: e, p: q.beam.Mul(e)}
		tot := k.add(nuc)
		wInv := math.Sqrt(tot.m2())
		beta, gamma := tot.p.Mul(1/tot.e), tot.e/wInv
		kStar := boost(k, beta.Mul(-1), gamma)
		dir := phys.Deflect(kStar.p.Mul(1/kcm), cosCM, 2*math.Pi*rng.Float64())
		lep := boost(fourVec{e: el, p: dir.Mul(pl)}, beta, gamma)
		fin := boost(fourVec{e: wInv - el, p: dir.Mul(-pl)}, beta, gamma)
		pFinal := fin.p.Norm()
		if !free && q.pauli && pFinal <= q.gas.FermiMomentum {
			continue
		}
		info := Info{
			Reaction: CCQE, Neutrino: q.neutrino, NeutrinoEtot: e, NeutrinoDir: q.beam,
			Target: Oxygen16Code, StruckNucleon: q.ch.initial, FermiMomentum: pF,
			BindingEnergy: q.gas.BindingEnergy, Q2: q2,
			FinalNucleon: phys.Particle{PDG: q.ch.final, Pos: vtx, Time: q.time,
				Dir: fin.p.Mul(1 / pFinal), Ekin: phys.KineticFromMomentum(pFinal, q.ch.model.mf)},
		}
		if free {
			info.Target, info.BindingEnergy = q.ch.initial, 0
		}
		pLep := lep.p.Norm()
		dst = append(dst, phys.Particle{PDG: q.ch.lepton, Pos: vtx, Time: q.time,
			Dir: lep.p.Mul(1 / pLep), Ekin: phys.KineticFromMomentum(pLep, q.ch.model.lepMass)})
		return dst, info, nil
	}
	return dst, Info{}, fmt.Errorf("gen: %s at %g MeV on %v: no event accepted in %d proposals", q.ch.neutrinoName, e, q.target, qeMaxTrials)
}

// fermiSphere draws a momentum uniform in the sphere of radius kF.
func fermiSphere(kF float64, rng *rand.Rand) r3.Vector {
	p := kF * math.Cbrt(rng.Float64())
	return phys.Deflect(r3.Vector{Z: 1}, 2*rng.Float64()-1, 2*math.Pi*rng.Float64()).Mul(p)
}

// String describes the generator and its settings.
func (q *QE) String() string {
	tgt := q.target.String()
	if q.freeShare < 1 {
		tgt += fmt.Sprintf(" (Fermi gas k_F = %g MeV/c, E_b = %g MeV)", q.gas.FermiMomentum, q.gas.BindingEnergy)
	}
	fw := ""
	if q.fluxWeighted {
		fw = " flux-weighted"
	}
	return fmt.Sprintf("CCQE %s on %s, Llewellyn Smith dipole form factors M_A = %g MeV; energy %v%s; beam (%g, %g, %g); vertex %v; t = %g ns",
		q.ch.neutrinoName, tgt, q.ma, q.energy, fw, q.beam.X, q.beam.Y, q.beam.Z, q.vertex, q.time)
}

var _ Generator = (*QE)(nil)

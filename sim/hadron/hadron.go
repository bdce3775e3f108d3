package hadron

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/heavy"
	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/phys"
)

// Physics holds the pion and proton tables of one medium. It is immutable
// after New and safe for concurrent use.
type Physics struct {
	// pion[0] is the pi+, pion[1] the pi- (their cross-sections on
	// hydrogen differ).
	pion   [2]*heavy.Physics
	proton *heavy.Physics
	nH, nO float64 // hydrogen and oxygen atoms per cm^3
}

// New builds the tables for medium m (which must contain hydrogen and
// oxygen, as water does) with the heavy-particle settings cfg.
func New(m material.Medium, cfg heavy.Config) (*Physics, error) {
	if e, ok := m.OtherThan(1, 8); ok {
		return nil, fmt.Errorf("hadron: Medium.Elements has %s (Z = %d): only hydrogen and oxygen have hadronic cross-sections", e.Symbol, e.Z)
	}
	p := &Physics{nH: m.AtomDensity(1), nO: m.AtomDensity(8)}
	if !(p.nH > 0 || p.nO > 0) {
		return nil, errors.New("hadron: Medium.Elements holds neither hydrogen nor oxygen")
	}
	var err error
	for i, neg := range []bool{false, true} {
		pi := heavy.ChargedPion()
		if neg {
			pi.Interaction = func(t float64) float64 { return p.pionSigma(t, true) }
		} else {
			pi.Interaction = func(t float64) float64 { return p.pionSigma(t, false) }
		}
		if p.pion[i], err = heavy.New(m, pi, cfg); err != nil {
			return nil, err
		}
	}
	pr := heavy.Proton()
	pr.Interaction = p.protonSigma
	if p.proton, err = heavy.New(m, pr, cfg); err != nil {
		return nil, err
	}
	return p, nil
}

// Pion returns the transport tables of the pi+ (negative false) or pi-.
func (p *Physics) Pion(negative bool) *heavy.Physics {
	if negative {
		return p.pion[1]
	}
	return p.pion[0]
}

// Proton returns the proton transport tables.
func (p *Physics) Proton() *heavy.Physics { return p.proton }

// pionSigma is the macroscopic interaction cross-section (1/cm) of a pi+
// (negative false) or pi-: all channels on oxygen and hydrogen.
func (p *Physics) pionSigma(t float64, negative bool) float64 {
	var s float64
	for _, x := range p.PionCrossSections(t, negative) {
		s += x
	}
	return s
}

// protonSigma is the macroscopic proton interaction cross-section (1/cm):
// the reaction cross-section on oxygen and p-p elastic scattering on
// hydrogen above 50 MeV.
func (p *Physics) protonSigma(t float64) float64 {
	s := p.nO * ProtonOxygenReaction(t)
	if t >= 50 {
		s += p.nH * ProtonProtonElastic(t)
	}
	return s * millibarn
}

// PionCrossSections returns the macroscopic cross-sections (1/cm) of a pi+
// (negative false) or pi- in the medium at kinetic energy t, by channel,
// summed over oxygen and hydrogen: what the transport samples.
func (p *Physics) PionCrossSections(t float64, negative bool) [numChannels]float64 {
	o := PionOxygen(t)
	el, cx := piProton(t, negative)
	var out [numChannels]float64
	for c := range o {
		out[c] = p.nO * o[c] * millibarn
	}
	out[Elastic] += p.nH * el * millibarn
	out[ChargeExchange] += p.nH * cx * millibarn
	return out
}

// Truth summarizes one transported pion or proton.
type Truth struct {
	Fate phys.Fate
	// TrackLength and Range (cm), EndPos, EndTime (ns), EndEkin (MeV) as
	// in heavy.Truth.
	TrackLength, Range float64
	EndPos             r3.Vector
	EndTime, EndEkin   float64
	// DecayTime is the time (ns) of a decay (in flight or at rest) or of
	// the capture of a stopped pi-; 0 otherwise.
	DecayTime float64
	// Channel is the hadronic interaction that ended the track (fate
	// Interacted, or the absorption of a stopped pi-).
	Channel Channel
	// Target is the nucleus hit: 1 hydrogen, 8 oxygen (0 for none).
	Target int
	// Products counts the particles reported to the sink at the end of
	// the track (decay products and interaction products).
	Products int
	Segments int
}

func fromHeavy(h heavy.Truth) Truth {
	return Truth{Fate: h.Fate, TrackLength: h.TrackLength, Range: h.Range, EndPos: h.EndPos,
		EndTime: h.EndTime, EndEkin: h.EndEkin, Segments: h.Segments}
}

// emit reports the products as secondaries of track parent at pos, time
// t, with the kinetic energy E - m from the particle table's mass;
// products with no kinetic energy or momentum are dropped (a nucleon left
// bound, a photon of zero energy).
func emit(prods []product, pos r3.Vector, t float64, parent int, sink phys.Sink) int {
	n := 0
	for _, pr := range prods {
		m := pr.p.Mass()
		if sp, err := phys.Lookup(pr.pdg); err == nil {
			m = sp.Mass
		}
		ekin := pr.p.E - m
		pn := pr.p.P.Norm()
		if !(ekin > 0) || !(pn > 0) {
			continue
		}
		sink.Secondary(phys.Particle{PDG: pr.pdg, Pos: pos, Dir: pr.p.P.Mul(1 / pn), Time: t, Ekin: ekin, Parent: parent})
		n++
	}
	return n
}

// TrackPion transports a pi+ (211) or pi- (-211): ionisation, scattering
// and Cherenkov segments with heavy.Physics.Track, then the end of the
// track: decay in flight to mu nu; hadronic interaction on oxygen or
// hydrogen (products on the sink); a stopped pi+ decays at rest; a stopped
// pi- is captured by oxygen and absorbed by a nucleon pair.
func (p *Physics) TrackPion(part phys.Particle, vol phys.Volume, rng *rand.Rand, sink phys.Sink) (Truth, error) {
	negative := part.PDG == phys.PionMinusCode
	h, err := p.Pion(negative).Track(part, vol, rng, sink)
	if err != nil {
		return Truth{}, err
	}
	tr := fromHeavy(h)
	var prods [8]product
	out := prods[:0]
	pos, t := h.EndPos, h.EndTime
	switch h.Fate {
	case phys.Exited:
		return tr, nil
	case phys.DecayedInFlight:
		tr.DecayTime = t
		out = pionDecay(phys.OnShell(phys.PionMass, h.EndEkin, h.EndDir), negative, rng, out)
	case phys.Interacted:
		out = p.pionInteraction(phys.OnShell(phys.PionMass, h.EndEkin, h.EndDir), negative, &tr, rng, out)
		if tr.Channel == Absorption {
			tr.Fate = phys.Absorbed
		}
	case phys.Stopped:
		if negative {
			// Atomic capture and cascade take picoseconds; the pion is
			// absorbed by the oxygen nucleus (capture on hydrogen is
			// transferred to oxygen; pi- p -> pi0 n / n gamma on the
			// hydrogen of water is neglected).
			tr.Fate, tr.Channel, tr.Target, tr.DecayTime = phys.StoppedCaptured, Absorption, 8, t
			out = pairAbsorb(phys.FourMomentum{E: phys.PionMass}, phys.NeutronCode, phys.NeutronCode, rng, out)
		} else {
			tr.Fate = phys.StoppedDecayed
			t += h.DecayProperTime - h.ProperTime
			tr.DecayTime = t
			out = pionDecay(phys.FourMomentum{E: phys.PionMass}, false, rng, out)
		}
	}
	tr.Products = emit(out, pos, t, part.Track, sink)
	return tr, nil
}

// pionDecayElectronBranch is the pi -> e nu branching fraction, 1.230e-4
// (PDG Review 2024); the rest is pi -> mu nu (99.988%).
const pionDecayElectronBranch = 1.230e-4

// pionDecay returns the charged lepton of the decay of a pion of
// four-momentum pi: two-body, isotropic in the pion rest frame, so the
// muon from a decay at rest has p = (m_pi^2 - m_mu^2)/(2 m_pi) = 29.79
// MeV/c, kinetic energy 4.12 MeV (PDG kinematics). Neutrinos are not
// reported.
func pionDecay(pi phys.FourMomentum, negative bool, rng *rand.Rand, dst []product) []product {
	pdg, m := phys.MuonPlus, phys.MuonMass
	if rng.Float64() < pionDecayElectronBranch {
		pdg, m = phys.Positron, phys.ElectronMass
	}
	if negative {
		pdg = -pdg
	}
	a, _, _ := twoBody(pi, m, 0, r3.Vector{Z: 1}, uniformCos, rng)
	return append(dst, product{pdg, a})
}

// pionInteraction samples the channel and target of a pion interaction
// at four-momentum pi and returns the products.
func (p *Physics) pionInteraction(pi phys.FourMomentum, negative bool, tr *Truth, rng *rand.Rand, dst []product) []product {
	t := pi.E - phys.PionMass
	u := rng.Float64() * p.pionSigma(t, negative)
	el, cx := piProton(t, negative)
	hydrogen := p.nH * millibarn
	pdg, chargeSign := phys.PionPlusCode, 1
	if negative {
		pdg, chargeSign = phys.PionMinusCode, -1
	}
	// Hydrogen channels first.
	switch {
	case u < hydrogen*el:
		tr.Channel, tr.Target = Elastic, 1
		a, b, ok := twoBody(pi.Add(phys.FourMomentum{E: phys.ProtonMass}), phys.PionMass, phys.ProtonMass, pi.P.Normalize(), deltaCos, rng)
		if !ok {
			return dst
		}
		return append(dst, product{pdg, a}, product{phys.ProtonCode, b})
	case u < hydrogen*(el+cx):
		tr.Channel, tr.Target = ChargeExchange, 1
		a, b, ok := twoBody(pi.Add(phys.FourMomentum{E: phys.ProtonMass}), phys.PionZeroMass, phys.NeutronMass, pi.P.Normalize(), deltaCos, rng)
		if !ok {
			return dst
		}
		return append(dst, product{phys.NeutralPionCode, a}, product{phys.NeutronCode, b})
	}
	u -= hydrogen * (el + cx)
	tr.Target = 8
	// Like (pi+ p, pi- n) and unlike nucleons of the Delta: for a
	// quasi-free pi N collision the like-nucleon cross-section is 9 times
	// the unlike elastic one, and the unlike charge exchange twice that.
	like, unlike := phys.ProtonCode, phys.NeutronCode
	if negative {
		like, unlike = unlike, like
	}
	o := PionOxygen(t)
	switch {
	case u < o[Elastic]*p.nO*millibarn:
		tr.Channel = Elastic
		return append(dst, product{pdg, coherentElastic(pi, rng)})
	case u < (o[Elastic]+o[QuasiElastic])*p.nO*millibarn:
		tr.Channel = QuasiElastic
		target := like
		if rng.Float64() < 0.1 {
			target = unlike
		}
		if out, ok := knockOut(pi, target, pdg, target, phys.PionMass, deltaCos, rng, dst); ok {
			return out
		}
		tr.Channel = Elastic
		return append(dst, product{pdg, coherentElastic(pi, rng)})
	case u < (o[Elastic]+o[QuasiElastic]+o[ChargeExchange])*p.nO*millibarn:
		tr.Channel = ChargeExchange
		// pi+ n -> pi0 p, pi- p -> pi0 n.
		if out, ok := knockOut(pi, unlike, phys.NeutralPionCode, like, phys.PionZeroMass, deltaCos, rng, dst); ok {
			return out
		}
		tr.Channel = Elastic
		return append(dst, product{pdg, coherentElastic(pi, rng)})
	}
	tr.Channel = Absorption
	// pi+ (pn) -> p p, pi- (pn) -> n n.
	n := phys.ProtonCode
	if chargeSign < 0 {
		n = phys.NeutronCode
	}
	return pairAbsorb(pi, n, n, rng, dst)
}

// oxygenRadius is the radius (fm) of the 16O charge distribution, 2.70 fm
// rms (nuclear charge-radius compilations, from memory); the diffraction
// slope of coherent elastic scattering is d sigma/dt ~ exp(-b|t|) with
// b = <r^2>/3 (optical-limit small-angle form).
const oxygenRadius = 2.70

// coherentElastic returns the pion after coherent elastic scattering on
// 16O: |t| from the exponential diffraction peak, the oxygen recoil
// neglected (the pion keeps its energy).
func coherentElastic(pi phys.FourMomentum, rng *rand.Rand) phys.FourMomentum {
	pm := pi.P.Norm()
	b := oxygenRadius * oxygenRadius / 3 / (phys.HbarC * phys.HbarC) // MeV^-2
	var cos float64
	for {
		tt := rng.ExpFloat64() / b
		if cos = 1 - tt/(2*pm*pm); cos >= -1 {
			break
		}
	}
	d := phys.Deflect(pi.P.Mul(1/pm), cos, 2*math.Pi*rng.Float64())
	return phys.FourMomentum{E: pi.E, P: d.Mul(pm)}
}

// TrackProton transports a proton (2212): ionisation, scattering and
// Cherenkov segments (above ~1.07 GeV/c) with heavy.Physics.Track, then a
// hadronic interaction if one ends the track: elastic p-p on hydrogen, or
// a quasi-elastic knock-out on oxygen with its de-excitation gamma.
func (p *Physics) TrackProton(part phys.Particle, vol phys.Volume, rng *rand.Rand, sink phys.Sink) (Truth, error) {
	h, err := p.proton.Track(part, vol, rng, sink)
	if err != nil {
		return Truth{}, err
	}
	tr := fromHeavy(h)
	if h.Fate != phys.Interacted {
		return tr, nil
	}
	var prods [4]product
	pr := phys.OnShell(phys.ProtonMass, h.EndEkin, h.EndDir)
	out := p.NucleonInteraction(pr, phys.ProtonCode, &tr, rng, prods[:0])
	tr.Products = emit(out, h.EndPos, h.EndTime, part.Track, sink)
	return tr, nil
}

// NucleonInteraction returns the products of a nucleon (proton or
// neutron code pdg, four-momentum n) interacting in the medium: on
// hydrogen with probability n_H sigma_pp / Sigma (elastic, isotropic in
// the centre of mass: a simplification above ~100 MeV, where N-N
// scattering is forward-peaked), else a quasi-elastic knock-out of a
// proton or neutron (equal chances, Z = N) of 16O, isotropic in the N-N
// centre of mass, with the de-excitation gamma of the hole. Multiple
// knock-outs and evaporation are not modelled.
func (p *Physics) NucleonInteraction(n phys.FourMomentum, pdg int, tr *Truth, rng *rand.Rand, dst []product) []product {
	t := n.E - nucleonMass(pdg)
	sH := 0.0
	if t >= 50 {
		sH = p.nH * ProtonProtonElastic(t)
	}
	sO := p.nO * ProtonOxygenReaction(t)
	m := nucleonMass(pdg)
	if rng.Float64()*(sH+sO) < sH {
		tr.Channel, tr.Target = Elastic, 1
		a, b, ok := twoBody(n.Add(phys.FourMomentum{E: phys.ProtonMass}), m, phys.ProtonMass, n.P.Normalize(), uniformCos, rng)
		if !ok {
			return append(dst, product{pdg, n})
		}
		return append(dst, product{pdg, a}, product{phys.ProtonCode, b})
	}
	tr.Channel, tr.Target = QuasiElastic, 8
	return KnockOutOxygen(n, pdg, rng, dst)
}

// Products is the exported form of an interaction product for packages
// that share the nucleon model (sim/neutron).
type Product = product

// PDG returns the product's particle code.
func (p product) PDG() int { return p.pdg }

// Momentum returns the product's four-momentum.
func (p product) Momentum() phys.FourMomentum { return p.p }

// Emit reports products as secondaries of track parent at pos and time
// t, dropping those with no kinetic energy, and returns how many it
// reported.
func Emit(prods []Product, pos r3.Vector, t float64, parent int, sink phys.Sink) int {
	return emit(prods, pos, t, parent, sink)
}

// ElasticOnProton scatters a nucleon of four-momentum n and mass m off a
// free proton at rest, isotropically in the centre of mass (relativistic
// two-body kinematics), and returns both outgoing four-momenta.
func ElasticOnProton(n phys.FourMomentum, m float64, rng *rand.Rand) (a, b phys.FourMomentum, ok bool) {
	return twoBody(n.Add(phys.FourMomentum{E: phys.ProtonMass}), m, phys.ProtonMass, n.P.Normalize(), uniformCos, rng)
}

// KnockOutOxygen returns the products of a nucleon (code pdg,
// four-momentum n) knocking a proton or neutron (equal chances) out of
// 16O, with the de-excitation gamma of the hole (see NucleonInteraction).
func KnockOutOxygen(n phys.FourMomentum, pdg int, rng *rand.Rand, dst []Product) []Product {
	m := nucleonMass(pdg)
	target := phys.ProtonCode
	if rng.Float64() < 0.5 {
		target = phys.NeutronCode
	}
	if out, ok := knockOut(n, target, pdg, target, m, uniformCos, rng, dst); ok {
		return out
	}
	return append(dst, product{pdg, n})
}

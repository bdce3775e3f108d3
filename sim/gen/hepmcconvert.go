package gen

import (
	"fmt"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/phys"
)

// NuHepMC particle status codes (Gardiner, Isaacson, Pickering, NuHepMC,
// arXiv:2310.13211, P.R.1): 1 outgoing real particle, 4 incoming beam
// particle, 11 target particle (versions 0.9 and 1.0; earlier files mark
// the target nucleus as an incoming particle, status 4 or a
// generator-dependent code).
const (
	statusFinal  = 1
	statusBeam   = 4
	statusTarget = 11
	// vertexPrimary is the NuHepMC status of the primary vertex (V.R.1).
	vertexPrimary = 1
)

// hepPlace resolves the positions of an event's particles, each vertex
// and each particle's production once (memoized), so that resolving all
// of them costs time linear in the event's size.
type hepPlace struct {
	e       *hepEvent
	firstIn []int  // per vertex: its first incoming particle that has a production, or -1
	vstate  []int8 // per vertex: 0 unresolved, 1 being resolved, 2 resolved
	vpos    [][4]float64
	pstate  []int8 // per particle, as vstate
	pprod   []int  // per particle: production vertex (following mothers), or -1
}

func newHepPlace(e *hepEvent) *hepPlace {
	pl := &hepPlace{e: e, firstIn: make([]int, len(e.verts)), vstate: make([]int8, len(e.verts)),
		vpos: make([][4]float64, len(e.verts)), pstate: make([]int8, len(e.parts)), pprod: make([]int, len(e.parts))}
	for v := range pl.firstIn {
		pl.firstIn[v] = -1
	}
	for i := range e.parts {
		p := &e.parts[i]
		if p.end >= 0 && pl.firstIn[p.end] < 0 && (p.prod >= 0 || p.mother >= 0) {
			pl.firstIn[p.end] = i
		}
	}
	return pl
}

// production returns the vertex particle i comes from, following mother
// particles (Asciiv3 vertices not written) to the first written vertex,
// or -1.
func (pl *hepPlace) production(i int) (int, error) {
	var chain []int
	res := -1
	for {
		if pl.pstate[i] == 2 {
			res = pl.pprod[i]
			break
		}
		if pl.pstate[i] == 1 {
			return -1, &lineError{line: pl.e.parts[i].line, msg: "P line: its mother particles form a loop"}
		}
		pl.pstate[i] = 1
		chain = append(chain, i)
		p := &pl.e.parts[i]
		if p.prod >= 0 {
			res = p.prod
			break
		}
		if p.mother < 0 {
			break
		}
		i = p.mother
	}
	for _, k := range chain {
		pl.pstate[k], pl.pprod[k] = 2, res
	}
	return res, nil
}

// vertexPos returns the position (file units) of vertex v: its own, else
// that of the production of its first incoming particle that has one (as
// HepMC3 does for vertices without a position), else the event's.
func (pl *hepPlace) vertexPos(v int) ([4]float64, error) {
	var chain []int
	res := pl.e.eventPos
	for {
		if pl.vstate[v] == 2 {
			res = pl.vpos[v]
			break
		}
		if pl.vstate[v] == 1 {
			return res, &lineError{line: pl.e.verts[v].line, msg: "V line: its particles and vertices form a loop"}
		}
		pl.vstate[v] = 1
		chain = append(chain, v)
		vx := &pl.e.verts[v]
		if vx.placed {
			res = vx.pos
			break
		}
		in := pl.firstIn[v]
		if in < 0 {
			break
		}
		next, err := pl.production(in)
		if err != nil {
			return res, err
		}
		if next < 0 {
			break
		}
		v = next
	}
	for _, k := range chain {
		pl.vstate[k], pl.vpos[k] = 2, res
	}
	return res, nil
}

// particlePos returns where particle i starts (file units): its
// production vertex, else (an incoming particle) the vertex it enters,
// else the event position.
func (pl *hepPlace) particlePos(i int) ([4]float64, error) {
	v, err := pl.production(i)
	if err != nil {
		return [4]float64{}, err
	}
	if v < 0 {
		// An incoming particle starts where it enters; one that comes
		// from an incoming particle's unwritten end vertex (Asciiv3), at
		// the event position, as that vertex has no other.
		if end := pl.e.parts[i].end; pl.e.parts[i].mother < 0 && end >= 0 && pl.e.verts[end].placed {
			return pl.e.verts[end].pos, nil
		}
		return pl.e.eventPos, nil
	}
	return pl.vertexPos(v)
}

// primaryVertex returns the index of the event's primary vertex, or -1:
// the NuHepMC primary vertex (status 1) of an Asciiv3 event; the signal
// vertex of a HepMC2 event, else its vertex of id 1 (the status written
// by HepMC3's HepMC2 writer); else the vertex of id or barcode closest to
// 0 (the first one written).
func primaryVertex(e *hepEvent) int {
	if e.format == hepmc2 && e.signalVertex != 0 {
		for i := range e.verts {
			if e.verts[i].id == e.signalVertex {
				return i
			}
		}
	}
	for i := range e.verts {
		if e.verts[i].status == vertexPrimary {
			return i
		}
	}
	best := -1
	for i := range e.verts {
		if best < 0 || abs(e.verts[i].id) < abs(e.verts[best].id) ||
			abs(e.verts[i].id) == abs(e.verts[best].id) && e.verts[i].id < e.verts[best].id {
			best = i
		}
	}
	return best
}

// convert turns the parsed event into primaries and truth.
func (h *HepMC) convert(e *hepEvent, listing *hepmcListing, rng *rand.Rand, dst []phys.Particle) ([]phys.Particle, Info, error) {
	info := Info{SourceEvent: e.number, Process: e.process}
	pl := newHepPlace(e)
	toCm := func(x [4]float64) (r3.Vector, float64) {
		s := e.lenScale
		return r3.Vector{X: x[0] * s, Y: x[1] * s, Z: x[2] * s}, x[3] * s / phys.SpeedOfLight
	}
	// Weight: NuHepMC's "CV", else the first.
	names := listing.weightNames
	if e.format == hepmc2 {
		names = e.weightNames
	}
	if len(e.weights) > 0 {
		info.Weight, info.HasWeight = e.weights[0], true
		for k, n := range names {
			if n == "CV" && k < len(e.weights) {
				info.Weight = e.weights[k]
			}
		}
	}
	if len(e.lab) > 0 {
		info.HasLabPos = true
		info.LabPos = r3.Vector{X: e.lab[0] * e.lenScale, Y: e.lab[1] * e.lenScale, Z: e.lab[2] * e.lenScale}
		if len(e.lab) == 4 {
			info.LabTime = e.lab[3] * 1e9 // NuHepMC lab time is in seconds
		}
	}

	// Where the event goes: the primary vertex onto the drawn vertex, else
	// onto the lab position.
	var shift r3.Vector
	tShift := h.opts.Time
	if h.opts.Vertex.set() || info.HasLabPos {
		ref := e.eventPos
		if pv := primaryVertex(e); pv >= 0 {
			var err error
			if ref, err = pl.vertexPos(pv); err != nil {
				return dst, info, err
			}
		}
		refPos, refT := toCm(ref)
		if h.opts.Vertex.set() {
			shift = h.opts.Vertex.Sample(rng).Sub(refPos)
			tShift -= refT
		} else {
			shift = info.LabPos.Sub(refPos)
		}
	}

	if err := h.neutrinoTruth(e, pl, &info, shift, tShift); err != nil {
		return dst, info, err
	}
	for i := range e.parts {
		p := &e.parts[i]
		if p.status != statusFinal {
			continue
		}
		if !tracked(p.pdg) {
			info.Skipped++
			if isNeutrino(p.pdg) {
				info.SkippedNeutrinos++
			}
			continue
		}
		out, err := h.particle(e, pl, i, rng, shift, tShift)
		if err != nil {
			return dst, info, err
		}
		dst = append(dst, out)
	}
	return dst, info, nil
}

// particle converts particle i into a phys.Particle (MeV, cm, ns), with
// the PDG mass (for the kinetic energy) and the file's momentum.
func (h *HepMC) particle(e *hepEvent, pl *hepPlace, i int, rng *rand.Rand, shift r3.Vector, tShift float64) (phys.Particle, error) {
	p := &e.parts[i]
	fail := func(format string, args ...any) (phys.Particle, error) {
		return phys.Particle{}, &lineError{line: p.line, msg: "P line: " + fmt.Sprintf(format, args...)}
	}
	sp, err := phys.Lookup(p.pdg)
	if err != nil {
		return fail("%v", err)
	}
	s := e.momScale
	mom := r3.Vector{X: p.p[0] * s, Y: p.p[1] * s, Z: p.p[2] * s}
	x, err := pl.particlePos(i)
	if err != nil {
		return phys.Particle{}, err
	}
	pos := r3.Vector{X: x[0] * e.lenScale, Y: x[1] * e.lenScale, Z: x[2] * e.lenScale}.Add(shift)
	t := x[3]*e.lenScale/phys.SpeedOfLight + tShift
	if !finiteVector(pos) || !isFinite(t) {
		return fail("%s at %v cm, t = %g ns is not finite", sp.Name, pos, t)
	}
	pm := mom.Norm()
	ekin := phys.KineticFromMomentum(pm, sp.Mass)
	if !isFinite(ekin) {
		// |p| or E overflows: components beyond about 1e154 MeV.
		return fail("momentum %v MeV/c gives kinetic energy %g MeV", mom, ekin)
	}
	var dir r3.Vector
	switch {
	case pm > 0:
		dir = mom.Mul(1 / pm)
	case sp.Mass > 0 && rng == nil:
		return fail("%s at rest needs a random direction, and rng is nil", sp.Name)
	case sp.Mass > 0: // at rest: any direction
		dir = Isotropic().Sample(rng)
	default:
		return fail("%s with zero momentum", sp.Name)
	}
	return phys.Particle{PDG: p.pdg, Pos: pos, Time: t, Dir: dir, Ekin: ekin}, nil
}

// neutrinoTruth fills the neutrino fields of info from the NuHepMC
// conventions: the incoming neutrino (status 4), the target (status 11,
// else an incoming nucleus, else another incoming non-neutrino), the
// final-state nucleon of largest momentum and Q2 from the neutrino and the
// final-state lepton of its flavour (charged for CC, the neutrino for NC).
// Events without an incoming neutrino leave them zero.
func (h *HepMC) neutrinoTruth(e *hepEvent, pl *hepPlace, info *Info, shift r3.Vector, tShift float64) error {
	incoming := func(p *hepPart) bool { return p.prod < 0 && p.mother < 0 }
	nu := -1
	for i := range e.parts {
		p := &e.parts[i]
		if isNeutrino(p.pdg) && (p.status == statusBeam || nu < 0 && incoming(p) && p.status != statusFinal) {
			if nu < 0 || e.parts[nu].status != statusBeam {
				nu = i
			}
		}
	}
	if nu < 0 {
		return nil
	}
	target, rank := -1, 0
	for i := range e.parts {
		p := &e.parts[i]
		r := 0
		switch {
		case p.status == statusTarget:
			r = 3
		case incoming(p) && p.pdg >= 1000000000 && p.status != statusFinal:
			r = 2
		case p.status == statusBeam && !isNeutrino(p.pdg):
			r = 1
		}
		if r > rank {
			target, rank = i, r
		}
	}
	s := e.momScale
	p4 := func(p *hepPart) (r3.Vector, float64) {
		return r3.Vector{X: p.p[0] * s, Y: p.p[1] * s, Z: p.p[2] * s}, p.p[3] * s
	}
	k, ek := p4(&e.parts[nu])
	info.Neutrino = e.parts[nu].pdg
	info.NeutrinoEtot = ek
	if n := k.Norm(); n > 0 {
		info.NeutrinoDir = k.Mul(1 / n)
	}
	if target >= 0 {
		info.Target = e.parts[target].pdg
	}
	// The outgoing lepton: charged partner (CC) or the neutrino itself
	// (NC), largest energy.
	sign := 1
	if info.Neutrino < 0 {
		sign = -1
	}
	charged := info.Neutrino - sign
	lepton := -1
	for i := range e.parts {
		p := &e.parts[i]
		if p.status == statusFinal && (p.pdg == charged || p.pdg == info.Neutrino) &&
			(lepton < 0 || p.p[3] > e.parts[lepton].p[3]) {
			lepton = i
		}
	}
	if lepton >= 0 {
		kl, el := p4(&e.parts[lepton])
		q := k.Sub(kl)
		info.Q2 = q.Norm2() - (ek-el)*(ek-el)
	}
	nucleon := -1
	for i := range e.parts {
		p := &e.parts[i]
		if p.status == statusFinal && (p.pdg == phys.ProtonCode || p.pdg == phys.NeutronCode) {
			if nucleon < 0 || p3norm2(p) > p3norm2(&e.parts[nucleon]) {
				nucleon = i
			}
		}
	}
	if nucleon >= 0 {
		p := &e.parts[nucleon]
		x, err := pl.particlePos(nucleon)
		if err != nil {
			return err
		}
		sp, _ := phys.Lookup(p.pdg)
		mom, _ := p4(p)
		out := phys.Particle{PDG: p.pdg,
			Pos:  r3.Vector{X: x[0] * e.lenScale, Y: x[1] * e.lenScale, Z: x[2] * e.lenScale}.Add(shift),
			Time: x[3]*e.lenScale/phys.SpeedOfLight + tShift,
			Ekin: phys.KineticFromMomentum(mom.Norm(), sp.Mass)}
		if n := mom.Norm(); n > 0 {
			out.Dir = mom.Mul(1 / n)
		}
		if !finiteVector(out.Pos) || !isFinite(out.Time) || !isFinite(out.Ekin) {
			return &lineError{line: p.line, msg: fmt.Sprintf("P line: nucleon %+v not finite", out)}
		}
		info.FinalNucleon = out
	}
	if !isFinite(info.Q2) || !isFinite(info.NeutrinoEtot) {
		return &lineError{line: e.parts[nu].line, msg: fmt.Sprintf("P line: neutrino energy %g MeV, Q2 %g MeV^2 not finite", info.NeutrinoEtot, info.Q2)}
	}
	return nil
}

func p3norm2(p *hepPart) float64 { return p.p[0]*p.p[0] + p.p[1]*p.p[1] + p.p[2]*p.p[2] }

func isNeutrino(pdg int) bool {
	switch abs(pdg) {
	case phys.ElectronNeu, phys.MuonNeu, 16: // 16: nu_tau
		return true
	}
	return false
}

func abs(i int) int {
	if i < 0 {
		return -i
	}
	return i
}

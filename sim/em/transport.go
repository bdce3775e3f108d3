package em

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/scatter"
)

// majorantMargin inflates the larger end-of-step total cross-section into
// the majorant of the integral (fictitious-interaction) method: it covers
// the small overshoot of the mid-step energy loss beyond the estimate and
// the maximum of the Moller cross-section (near T = 4 DeltaCut), where the
// cross-section is not monotonic along a step.
const majorantMargin = 1.05

// check validates one particle handed to Track or Shower.
func (p *Physics) check(part phys.Particle, vol phys.Volume, rng *rand.Rand, sink phys.Sink) error {
	switch {
	case vol == nil:
		return errors.New("em: nil Volume")
	case rng == nil:
		return errors.New("em: nil *rand.Rand")
	case sink == nil:
		return errors.New("em: nil Sink")
	}
	switch part.PDG {
	case phys.Electron, phys.Positron, phys.Gamma:
	default:
		return fmt.Errorf("em: Particle.PDG = %d: only e- (11), e+ (-11) and gamma (22) are transported", part.PDG)
	}
	if !(part.Ekin >= 0 && part.Ekin <= MaxEkin) {
		return fmt.Errorf("em: Particle.Ekin = %g MeV must lie in [0, %g] MeV", part.Ekin, MaxEkin)
	}
	if !finite(part.Pos) {
		return fmt.Errorf("em: Particle.Pos = %v must be finite", part.Pos)
	}
	if n := part.Dir.Norm(); !(math.Abs(n-1) < 1e-6) {
		return fmt.Errorf("em: Particle.Dir = %v must be a unit vector (norm %g)", part.Dir, n)
	}
	if math.IsNaN(part.Time) || math.IsInf(part.Time, 0) {
		return fmt.Errorf("em: Particle.Time = %g ns must be finite", part.Time)
	}
	if !vol.Contains(part.Pos) {
		return fmt.Errorf("em: Particle.Pos = %v is outside the volume", part.Pos)
	}
	return nil
}

func finite(v r3.Vector) bool {
	return !math.IsNaN(v.X+v.Y+v.Z) && !math.IsInf(v.X+v.Y+v.Z, 0)
}

// Track transports one e-, e+ or gamma until it stops, is absorbed or
// leaves vol, and reports to sink: every charged step above the
// Cherenkov threshold as a Segment, continuous and sub-cut energy as
// Deposits, and secondaries above their cuts as Secondary, with Parent set
// to part.Track and Track left 0 for the caller to number. Secondaries are
// not transported. A positron that stops annihilates at rest; its two
// photons are secondaries.
func (p *Physics) Track(part phys.Particle, vol phys.Volume, rng *rand.Rand, sink phys.Sink) error {
	if err := p.check(part, vol, rng, sink); err != nil {
		return err
	}
	p.track(part, vol, rng, sink)
	return nil
}

func (p *Physics) track(part phys.Particle, vol phys.Volume, rng *rand.Rand, sink phys.Sink) {
	if part.PDG == phys.Gamma {
		p.trackPhoton(part, vol, rng, sink)
	} else {
		p.trackCharged(part, vol, rng, sink)
	}
}

// showerSink forwards segments and deposits and keeps secondaries on the
// shower's stack, numbering them.
type showerSink struct {
	out   phys.Sink
	stack []phys.Particle
	next  int
}

func (s *showerSink) Segment(seg phys.Segment) { s.out.Segment(seg) }
func (s *showerSink) Deposit(pos r3.Vector, t, e float64, track int) {
	s.out.Deposit(pos, t, e, track)
}
func (s *showerSink) Secondary(q phys.Particle) {
	s.next++
	q.Track = s.next
	s.stack = append(s.stack, q)
}

// Shower transports primary and all its electron, positron and photon
// descendants, last in first out without recursion. Segments and deposits
// go to sink; sink.Secondary is never called, the shower keeps its
// secondaries. Tracks are numbered from primary.Track (1 if it is 0)
// upwards in order of creation.
func (p *Physics) Shower(primary phys.Particle, vol phys.Volume, rng *rand.Rand, sink phys.Sink) error {
	if err := p.check(primary, vol, rng, sink); err != nil {
		return err
	}
	if primary.Track == 0 {
		primary.Track = 1
	}
	s := &showerSink{out: sink, stack: make([]phys.Particle, 1, 64), next: primary.Track}
	s.stack[0] = primary
	for len(s.stack) > 0 {
		q := s.stack[len(s.stack)-1]
		s.stack = s.stack[:len(s.stack)-1]
		p.track(q, vol, rng, s)
	}
	return nil
}

// emit hands a new particle to the sink, or deposits it when it is below
// its cut (a sub-cut positron annihilates at rest on the spot).
func (p *Physics) emit(sink phys.Sink, pdg int, pos, dir r3.Vector, t, ekin float64, parent int, rng *rand.Rand) {
	cut := p.cfg.ChargedCut
	if pdg == phys.Gamma {
		cut = p.cfg.PhotonCut
	}
	if ekin < cut {
		sink.Deposit(pos, t, ekin, parent)
		if pdg == phys.Positron {
			p.annihilateAtRest(sink, pos, t, parent, rng)
		}
		return
	}
	sink.Secondary(phys.Particle{PDG: pdg, Pos: pos, Dir: dir, Time: t, Ekin: ekin, Parent: parent})
}

// annihilateAtRest emits two back-to-back photons of m each, isotropic.
// Positronium formation and its lifetimes (0.125 ns para, ns-scale
// pick-off of ortho in water) and the three-photon decay (0.3%) are
// neglected.
func (p *Physics) annihilateAtRest(sink phys.Sink, pos r3.Vector, t float64, parent int, rng *rand.Rand) {
	const m = phys.ElectronMass
	cosT := 2*rng.Float64() - 1
	sinT := math.Sqrt(math.Max(0, 1-cosT*cosT))
	sp, cp := math.Sincos(2 * math.Pi * rng.Float64())
	d := r3.Vector{X: sinT * cp, Y: sinT * sp, Z: cosT}
	p.emit(sink, phys.Gamma, pos, d, t, m, parent, rng)
	p.emit(sink, phys.Gamma, pos, d.Mul(-1), t, m, parent, rng)
}

// flightTime is the time (ns) to cover path s (cm) with the speed
// changing linearly in path length from b0 to b1 (units of c).
func flightTime(s, b0, b1 float64) float64 {
	if math.Abs(b1-b0) < 1e-9*b0 {
		return s / (phys.SpeedOfLight * b0)
	}
	return s * math.Log(b1/b0) / ((b1 - b0) * phys.SpeedOfLight)
}

// exitFraction bisects the chord a -> b (a inside, b outside vol) for the
// last inside point, as a fraction of the chord (to 1e-6).
func exitFraction(vol phys.Volume, a, b r3.Vector) float64 {
	lo, hi := 0.0, 1.0
	d := b.Sub(a)
	for range 20 {
		mid := (lo + hi) / 2
		if vol.Contains(a.Add(d.Mul(mid))) {
			lo = mid
		} else {
			hi = mid
		}
	}
	return lo
}

// trackCharged is the condensed-history loop of one electron or positron.
// Each step is the shortest of: MaxEnergyLossFraction of the kinetic
// energy at the continuous loss (or the rest of the way to ChargedCut),
// MaxStep, and the distance to the next discrete interaction drawn with a
// majorant of the total cross-section over the step (integral method: the
// interaction is real with probability sigma(E_end)/majorant, else the
// particle just goes on). The energy loss along the step uses the
// mid-step stopping power; multiple scattering the Highland width at the
// mid-step momentum with the correlated lateral displacement.
func (p *Physics) trackCharged(part phys.Particle, vol phys.Volume, rng *rand.Rand, sink phys.Sink) {
	const m = phys.ElectronMass
	positron := part.PDG == phys.Positron
	tab, charge := &p.eminus, -1
	if positron {
		tab, charge = &p.eplus, 1
	}
	cut, frac, maxStep := p.cfg.ChargedCut, p.cfg.MaxEnergyLossFraction, p.cfg.MaxStep
	pos, dir, t, e, track := part.Pos, part.Dir, part.Time, part.Ekin, part.Track
	for e > cut {
		i, f := p.locate(e)
		dedx := lerp(tab.dedx, i, f)
		sigma0 := lerp(tab.total, i, f)
		eEnd := e * (1 - frac)
		var sLoss float64
		toCut := eEnd <= cut
		if toCut {
			eEnd = cut
			sLoss = lerp(tab.rangeCont, i, f) - p.at(tab.rangeCont, cut)
		} else {
			sLoss = frac * e / dedx
		}
		s, limitedByLoss := sLoss, true
		if maxStep < s {
			s, limitedByLoss = maxStep, false
		}
		sigmaHat := majorantMargin * math.Max(sigma0, p.at(tab.total, eEnd))
		interact := false
		if sigmaHat > 0 {
			if sInt := rng.ExpFloat64() / sigmaHat; sInt < s {
				s, interact, limitedByLoss = sInt, true, false
			}
		}
		var e1 float64
		if toCut && limitedByLoss {
			e1 = cut
		} else {
			eMid := e - dedx*s/2
			e1 = math.Max(cut, e-p.at(tab.dedx, eMid)*s)
		}

		eMid := (e + e1) / 2
		pMid := phys.Momentum(eMid, m)
		theta0 := scatter.Theta0(s, p.x0, pMid, pMid/(eMid+m), charge)
		newDir, disp := scatter.Sample(dir, s, theta0, rng)
		// Keep the chord length equal to the path length: the Cherenkov
		// yield goes with path length, and the steps are short enough
		// (theta0 of order 0.1) that chord and path differ by under 1%.
		along := math.Sqrt(math.Max(0, s*s-disp.Norm2()))
		end := pos.Add(dir.Mul(along)).Add(disp)
		left := !vol.Contains(end)
		if left {
			lam := exitFraction(vol, pos, end)
			end = pos.Add(end.Sub(pos).Mul(lam))
			s *= lam
			e1 = e - (e-e1)*lam
		}
		b0, b1 := phys.Beta(e, m), phys.Beta(e1, m)
		dt := flightTime(s, b0, b1)
		if b0 > p.betaTh {
			sink.Segment(phys.Segment{Start: pos, End: end, T0: t, T1: t + dt, Beta0: b0, Beta1: b1,
				Charge: charge, PDG: part.PDG, Track: track})
		}
		sink.Deposit(pos.Add(end).Mul(0.5), t+dt/2, e-e1, track)
		pos, dir, t, e = end, newDir, t+dt, e1
		if left {
			return
		}
		if !interact {
			continue
		}
		j, g := p.locate(e)
		r := rng.Float64() * sigmaHat
		if r >= lerp(tab.total, j, g) {
			continue // fictitious interaction
		}
		switch sd := lerp(tab.delta, j, g); {
		case r < sd:
			e, dir = p.knockOn(positron, e, pos, dir, t, track, rng, sink)
		case r < sd+lerp(p.brem.sigma, j, g):
			e = p.bremsstrahlung(e, pos, dir, t, track, rng, sink)
		default:
			p.annihilateInFlight(e, pos, dir, t, track, rng, sink)
			return
		}
	}
	sink.Deposit(pos, t, e, track)
	if positron {
		p.annihilateAtRest(sink, pos, t, track, rng)
	}
}

// knockOn makes a Moller or Bhabha delta ray above DeltaCut and returns
// the primary's new kinetic energy and direction (momentum conservation
// on an electron at rest).
func (p *Physics) knockOn(positron bool, e float64, pos, dir r3.Vector, t float64, track int, rng *rand.Rand, sink phys.Sink) (float64, r3.Vector) {
	const m = phys.ElectronMass
	if p.cfg.DeltaCut >= e*maxTransfer(positron) {
		return e, dir // interpolation tail just below the production threshold
	}
	w := e * sampleDeltaFraction(positron, e/m, p.cfg.DeltaCut/e, rng)
	dDir := phys.Deflect(dir, deltaCosTheta(e, w), 2*math.Pi*rng.Float64())
	p.emit(sink, phys.Electron, pos, dDir, t, w, track, rng)
	pd := phys.Momentum(w, m)
	newP := dir.Mul(phys.Momentum(e, m)).Sub(dDir.Mul(pd))
	return e - w, newP.Normalize()
}

// bremsstrahlung makes a photon above BremsCut from the Tsai spectrum and
// returns the electron's new kinetic energy. k is drawn from 1/k on
// [BremsCut, T] and accepted with bremsShape/bremsMax. The photon goes at
// the characteristic angle m/E about the electron, uniform in azimuth
// (common practice); the electron keeps its direction (the nucleus takes
// the recoil).
func (p *Physics) bremsstrahlung(e float64, pos, dir r3.Vector, t float64, track int, rng *rand.Rand, sink phys.Sink) float64 {
	const m = phys.ElectronMass
	kc := p.cfg.BremsCut
	if kc >= e {
		return e // interpolation tail just below the production threshold
	}
	etot := e + m
	lr := math.Log(e / kc)
	var k float64
	for {
		k = kc * math.Exp(lr*rng.Float64())
		if rng.Float64()*p.bremsMax <= bremsShape(p.atoms, etot, k) {
			break
		}
	}
	gDir := phys.Deflect(dir, math.Cos(m/etot), 2*math.Pi*rng.Float64())
	p.emit(sink, phys.Gamma, pos, gDir, t, k, track, rng)
	return e - k
}

// annihilateInFlight turns a positron of kinetic energy e and an atomic
// electron into two photons (Heitler).
func (p *Physics) annihilateInFlight(e float64, pos, dir r3.Vector, t float64, track int, rng *rand.Rand, sink phys.Sink) {
	const m = phys.ElectronMass
	gamma := e/m + 1
	eps := sampleAnnihilation(gamma, rng)
	avail := e + 2*m
	k1 := eps * avail
	cos1 := (eps*(gamma+1) - 1) / (eps * math.Sqrt(gamma*gamma-1))
	d1 := phys.Deflect(dir, math.Max(-1, math.Min(1, cos1)), 2*math.Pi*rng.Float64())
	d2 := dir.Mul(phys.Momentum(e, m)).Sub(d1.Mul(k1)).Normalize()
	p.emit(sink, phys.Gamma, pos, d1, t, k1, track, rng)
	p.emit(sink, phys.Gamma, pos, d2, t, avail-k1, track, rng)
}

// trackPhoton follows a photon from interaction to interaction until it
// falls below PhotonCut, is absorbed, or its next interaction point lies
// outside the volume (it has left).
func (p *Physics) trackPhoton(part phys.Particle, vol phys.Volume, rng *rand.Rand, sink phys.Sink) {
	const m = phys.ElectronMass
	pos, dir, t, k, track := part.Pos, part.Dir, part.Time, part.Ekin, part.Track
	g := &p.gamma
	for k >= p.cfg.PhotonCut {
		i, f := p.locate(k)
		sc := lerp(g.compton, i, f)
		sp := lerp(g.pairNuc, i, f) + lerp(g.pairEl, i, f)
		tot := sc + sp + lerp(g.photo, i, f)
		s := rng.ExpFloat64() / tot
		end := pos.Add(dir.Mul(s))
		if !vol.Contains(end) {
			return
		}
		pos, t = end, t+s/phys.SpeedOfLight
		switch r := rng.Float64() * tot; {
		case r < sc:
			eps, cosT := sampleCompton(k, rng)
			nd := phys.Deflect(dir, cosT, 2*math.Pi*rng.Float64())
			eDir := dir.Sub(nd.Mul(eps)).Normalize()
			p.emit(sink, phys.Electron, pos, eDir, t, k*(1-eps), track, rng)
			k, dir = k*eps, nd
		case r < sc+sp:
			if k <= 2*m {
				continue // interpolation tail just below the threshold
			}
			x := p.samplePairFraction(k, rng)
			ePlus := x * k
			if rng.Float64() < 0.5 {
				ePlus = k - ePlus
			}
			eMinus := k - ePlus
			phi := 2 * math.Pi * rng.Float64()
			p.emit(sink, phys.Positron, pos, phys.Deflect(dir, math.Cos(m/ePlus), phi), t, ePlus-m, track, rng)
			p.emit(sink, phys.Electron, pos, phys.Deflect(dir, math.Cos(m/eMinus), phi+math.Pi), t, eMinus-m, track, rng)
			return
		default:
			// Photoabsorption, mostly on the oxygen K shell: the
			// photoelectron goes along the photon (forward-peaked at these
			// energies; common practice), the binding energy stays here.
			te := k - oxygenKBinding
			if te <= 0 {
				sink.Deposit(pos, t, k, track)
				return
			}
			sink.Deposit(pos, t, oxygenKBinding, track)
			p.emit(sink, phys.Electron, pos, dir, t, te, track, rng)
			return
		}
	}
	sink.Deposit(pos, t, k, track)
}

// samplePairFraction draws the total-energy fraction x in [m/k, 1/2] of
// the softer lepton: uniform, accepted with the Tsai dsigma/dx (nuclear
// plus triplet) over its bound at full weight 1 and the screening of
// x = 1/2. Triplet events are given pair kinematics (the recoil electron,
// with a small share of the energy, is not made).
func (p *Physics) samplePairFraction(k float64, rng *rand.Rand) float64 {
	const m = phys.ElectronMass
	lo := m / k
	nh, eh := pairShape(p.atoms, k, 0.5, true)
	bound := pairBound(nh + eh)
	for {
		x := lo + (0.5-lo)*rng.Float64()
		n, e := pairShape(p.atoms, k, x, true)
		if rng.Float64()*bound <= n+e {
			return x
		}
	}
}

// pairBound bounds pairShape over x: the weights x^2 + (1-x)^2 <= 1 and
// (2/3) x (1-x) <= 1/6 times the brackets at x = 1/2, where the screening
// variable is least and the brackets largest. At x = 1/2 the shape is
// A/2 + A2/6 (A2 = A - D/4 >= 0), so A + A2/6 <= 2 (A/2 + A2/6).
func pairBound(half float64) float64 { return 2 * half }

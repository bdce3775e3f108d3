package heavy

import (
	"fmt"
	"math"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/phys"
	"github.com/conelight/conelight/sim/scatter"
)

// Truth summarizes one transported particle.
type Truth struct {
	// Fate is Exited, DecayedInFlight, Interacted (hadronic interaction
	// in flight) or Stopped (below the low cut; the caller decides what
	// happens at rest).
	Fate phys.Fate
	// TrackLength is the path length travelled, cm.
	TrackLength float64
	// Range is the straight-line distance from the start to the end
	// point, cm.
	Range float64
	// EndPos, EndDir, EndTime (ns) and EndEkin (MeV) describe the particle
	// where it stopped, left the volume, decayed or interacted. EndEkin is
	// 0 for a stopped particle (the rest below the low cut is deposited).
	EndPos, EndDir r3.Vector
	EndTime        float64
	EndEkin        float64
	// ProperTime is the proper time (ns) elapsed along the track and
	// DecayProperTime the proper time at which the particle decays (drawn
	// at the start from the mean life; +Inf for a stable species). A
	// stopped particle decays after DecayProperTime - ProperTime more.
	ProperTime, DecayProperTime float64
	// Steps, Segments and DeltaRays count the transport steps, the
	// segments reported and the delta rays emitted.
	Steps, Segments, DeltaRays int
	// DeltaEnergy is the kinetic energy given to delta rays and Deposited
	// the energy reported through Sink.Deposit, MeV.
	DeltaEnergy, Deposited float64
}

// Track transports one particle of the species (part.PDG its Positive or
// Negative code) through the medium inside vol, reporting segments above
// Cherenkov threshold, delta rays and energy deposits to sink, and returns
// the track's truth. The particle starts at part.Pos (inside vol) with
// unit direction part.Dir, time part.Time and kinetic energy part.Ekin in
// [0, MaxEnergy]; part.Track labels its segments and is the Parent of its
// secondaries. Decay products and interaction products are the caller's:
// Track ends the track and reports where and how.
//
// Each step is the shortest of: the length with a mean fractional loss of
// MaxFracLoss (MaxFracLossBelowThreshold below threshold), MaxStep, the
// distance to the low cut, the distance to the next delta-ray candidate,
// the distance to the decay point in flight, the distance to the hadronic
// interaction point and the distance to the volume boundary along the
// line. Along the step the restricted mean loss (from the range table) is
// applied with Gamma-distributed straggling, then multiple scattering
// changes direction and displaces the end point; a delta-ray candidate at
// the step end is kept with probability sigma(E_end)/sigma_max (exact
// thinning of the Poisson process).
//
// Random numbers are drawn in a fixed order: the decay proper time (for
// unstable species), the interaction optical depth (for species with
// interactions), then per step the delta-ray distance, the straggling,
// the scattering and the delta-ray acceptance.
func (p *Physics) Track(part phys.Particle, vol phys.Volume, rng *rand.Rand, sink phys.Sink) (Truth, error) {
	if err := p.validateStart(part, vol, rng, sink); err != nil {
		return Truth{}, err
	}
	charge := p.sp.charge(part.PDG)
	cfg := &p.cfg
	lnR := p.lnRangeCut
	tcut := cfg.DeltaCut
	if cfg.NoDeltaRays {
		lnR, tcut = p.lnRangeAll, math.Inf(1)
	}
	rCutoff := p.rangeOf(lnR, cfg.LowCut)
	const c = phys.SpeedOfLight
	mass := p.sp.Mass

	pos, dir, t, ek := part.Pos, part.Dir, part.Time, part.Ekin
	var tr Truth
	// Proper time at which the particle would decay if free; compared
	// with the proper time elapsed along the track.
	tauDecay := math.Inf(1)
	if p.sp.Lifetime > 0 {
		tauDecay = rng.ExpFloat64() * p.sp.Lifetime
	}
	// Optical depth at which the hadronic interaction happens, compared
	// with the accumulated integral of the cross-section along the path.
	depth, depthAcc := math.Inf(1), 0.0
	if p.hadronic != nil {
		depth = rng.ExpFloat64()
	}
	var tauAcc, path float64
	stopped := true
	for ek >= cfg.LowCut {
		k0 := p.kin(ek)
		beta0 := math.Sqrt(k0.beta2)
		above := beta0 > p.thrBeta
		frac, span := cfg.MaxFracLoss, p.lnSpan[0]
		if !above {
			frac, span = cfg.MaxFracLossBelowThreshold, p.lnSpan[1]
		}
		r0 := p.rangeOf(lnR, ek)

		// Step limits.
		reachCut := false
		var s float64
		if tlo := ek * (1 - frac); tlo <= cfg.LowCut {
			s, reachCut = (r0-rCutoff)/p.rho, true
		} else {
			s = (r0 - p.rangeOf(lnR, tlo)) / p.rho
		}
		if s > cfg.MaxStep || p.frozen {
			s, reachCut = cfg.MaxStep, false
		}
		delta := false
		var sigMax float64
		if !cfg.NoDeltaRays && !p.frozen && k0.tmax > tcut {
			// Bound over the energies the step can end at, with room for
			// fluctuations (twice the largest mean loss).
			sigMax = p.sigmaBound(ek, span)
			if d := rng.ExpFloat64() / sigMax; d < s {
				s, delta, reachCut = d, true, false
			}
		}
		decay := false
		if dtau := s * mass / (c * k0.p); tauAcc+dtau >= tauDecay {
			// The accumulator adds the step's mean rate while this limit
			// uses the rate at its start, so it can pass the target by a
			// hair without the limit firing; the step is then empty, never
			// negative.
			s *= math.Max(tauDecay-tauAcc, 0) / dtau
			decay, delta, reachCut = true, false, false
		}
		interact := false
		var sigHad float64
		if p.hadronic != nil {
			if sigHad = p.hadronicAt(ek); sigHad > 0 && depthAcc+sigHad*s >= depth {
				s = math.Max(depth-depthAcc, 0) / sigHad // never negative (see the decay limit)
				interact, decay, delta, reachCut = true, false, false, false
			}
		}
		exit := false
		if !vol.Contains(pos.Add(dir.Mul(s))) {
			s = crossing(vol, pos, dir, s)
			exit, decay, delta, reachCut, interact = true, false, false, false, false
		}

		// Continuous loss.
		var loss float64
		if !p.frozen {
			r1 := math.Max(r0-s*p.rho, rCutoff)
			if reachCut {
				r1 = rCutoff
			}
			loss = ek - p.energyOf(lnR, r1)
			if !cfg.NoStraggling {
				loss = sampleLoss(loss, p.bohrVariance(p.kin(ek-loss/2), tcut, s), rng)
			}
			loss = math.Min(math.Max(loss, 0), ek)
		}
		ek1 := ek - loss

		// Multiple scattering: the Highland variance accumulated over the
		// whole path so far, theta0^2(L+s) - theta0^2(L), at this step's
		// mean p and beta. Summing Highland widths of the individual steps
		// would lose the log term's growth with path length and make the
		// result depend on the step size; this way the width after any
		// path is the Highland width of that path (PDG Review, "Passage of
		// particles through matter").
		newDir, end := dir, pos.Add(dir.Mul(s))
		if !cfg.NoScattering {
			km := p.kin(ek - loss/2)
			bm := math.Sqrt(km.beta2)
			thA := scatter.Theta0(path, p.x0, km.p, bm, charge)
			thB := scatter.Theta0(path+s, p.x0, km.p, bm, charge)
			var disp r3.Vector
			newDir, disp = scatter.Sample(dir, s, math.Sqrt(math.Max(0, thB*thB-thA*thA)), rng)
			if !exit {
				end = end.Add(disp)
			}
		}
		if !exit && !vol.Contains(end) {
			// Pushed out by the lateral displacement: cut the step where
			// the chord leaves the volume.
			chord := end.Sub(pos)
			cl := chord.Norm()
			f := crossing(vol, pos, chord.Mul(1/cl), cl) / cl
			end = pos.Add(chord.Mul(f))
			s *= f
			loss *= f
			ek1 = ek - loss
			exit, decay, delta, reachCut, interact = true, false, false, false, false
		}

		// Time: beta linear in path length along the step.
		k1 := p.kin(ek1)
		beta1 := math.Max(math.Sqrt(k1.beta2), 0.5*phys.Beta(cfg.LowCut, mass))
		t1 := t + s/c*invMeanBeta(beta0, beta1)
		tauAcc += s * mass / c * 0.5 * (1/k0.p + 1/math.Max(k1.p, 1e-3))
		if decay {
			tauAcc = tauDecay
		}
		if p.hadronic != nil {
			// The cross-section at the step's start and end (the step
			// loses at most MaxFracLoss of the energy on average).
			depthAcc += 0.5 * (sigHad + p.hadronicAt(ek1)) * s
			if interact {
				depthAcc = depth
			}
		}
		if above {
			sink.Segment(phys.Segment{
				Start: pos, End: end, T0: t, T1: t1, Beta0: beta0, Beta1: beta1,
				Charge: charge, PDG: part.PDG, Track: part.Track,
			})
			tr.Segments++
		}
		if loss > 0 {
			sink.Deposit(pos.Add(end).Mul(0.5), (t+t1)/2, loss, part.Track)
			tr.Deposited += loss
		}
		tr.Steps++
		path += s
		pos, dir, t, ek = end, newDir, t1, ek1

		if exit || decay || interact {
			stopped = false
			switch {
			case exit:
				tr.Fate = phys.Exited
			case decay:
				tr.Fate = phys.DecayedInFlight
			default:
				tr.Fate = phys.Interacted
			}
			break
		}
		if delta && ek >= cfg.LowCut {
			k1 = p.kin(ek)
			if rng.Float64()*sigMax < p.deltaSigmaOf(k1, tcut) {
				te, eDir, newDir := emitDelta(k1, dir, tcut, rng)
				sink.Secondary(phys.Particle{PDG: phys.Electron, Pos: pos, Dir: eDir, Time: t, Ekin: te, Parent: part.Track})
				tr.DeltaRays++
				tr.DeltaEnergy += te
				ek -= te
				dir = newDir
			}
		}
		if reachCut {
			break
		}
	}
	tr.TrackLength = path
	tr.Range = pos.Sub(part.Pos).Norm()
	tr.EndPos, tr.EndDir, tr.EndTime = pos, dir, t
	tr.ProperTime, tr.DecayProperTime = tauAcc, tauDecay
	if !stopped {
		tr.EndEkin = ek
		return tr, nil
	}
	tr.Fate = phys.Stopped
	if ek > 0 {
		sink.Deposit(pos, t, ek, part.Track)
		tr.Deposited += ek
	}
	return tr, nil
}

// invMeanBeta returns the mean of 1/beta along a step over which beta
// changes linearly from b0 to b1: ln(b0/b1)/(b0-b1).
func invMeanBeta(b0, b1 float64) float64 {
	// With u = (b0-b1)/(b0+b1), ln(b0/b1) = 2 atanh(u): for the small u of
	// a step the series to u^6 is exact to u^8/9 < 5e-12 and saves a log.
	sum := b0 + b1
	u := (b0 - b1) / sum
	if u2 := u * u; u2 < 0.05*0.05 {
		return 2 / sum * (1 + u2*(1./3+u2*(1./5+u2/7)))
	}
	return math.Log(b0/b1) / (b0 - b1)
}

// Crossing returns the distance along the unit vector u from pos (inside
// vol) at which the straight line leaves vol, knowing the point at
// distance s is outside: bisection to s*2^-40, returning the outer side.
// It is how every transport code here finds the volume boundary.
func Crossing(vol phys.Volume, pos, u r3.Vector, s float64) float64 { return crossing(vol, pos, u, s) }

func crossing(vol phys.Volume, pos, u r3.Vector, s float64) float64 {
	lo, hi := 0.0, s
	for i := 0; i < 40; i++ {
		mid := 0.5 * (lo + hi)
		if vol.Contains(pos.Add(u.Mul(mid))) {
			lo = mid
		} else {
			hi = mid
		}
	}
	return hi
}

func finiteVec(v r3.Vector) bool {
	for _, x := range [3]float64{v.X, v.Y, v.Z} {
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return false
		}
	}
	return true
}

// validateStart checks the arguments of Track.
func (p *Physics) validateStart(part phys.Particle, vol phys.Volume, rng *rand.Rand, sink phys.Sink) error {
	name := p.sp.Name
	switch {
	case vol == nil:
		return fmt.Errorf("%s: Track: vol is nil", name)
	case rng == nil:
		return fmt.Errorf("%s: Track: rng is nil", name)
	case sink == nil:
		return fmt.Errorf("%s: Track: sink is nil", name)
	}
	if p.sp.charge(part.PDG) == 0 {
		return fmt.Errorf("%s: Particle.PDG = %d is not a %s (want %d or %d)", name, part.PDG, name, p.sp.Negative, p.sp.Positive)
	}
	if err := checkRangeIn(name, "Particle.Ekin", part.Ekin, 0, MaxEnergy, false); err != nil {
		return err
	}
	if math.IsNaN(part.Time) || math.IsInf(part.Time, 0) {
		return fmt.Errorf("%s: Particle.Time = %g must be finite", name, part.Time)
	}
	if !finiteVec(part.Dir) || math.Abs(part.Dir.Norm()-1) > 1e-6 {
		return fmt.Errorf("%s: Particle.Dir = %v must be a unit vector", name, part.Dir)
	}
	if !finiteVec(part.Pos) || !vol.Contains(part.Pos) {
		return fmt.Errorf("%s: Particle.Pos = %v is not inside the volume", name, part.Pos)
	}
	return nil
}

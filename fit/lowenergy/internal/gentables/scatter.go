package main

import (
	"math"

	"github.com/conelight/conelight/sim/em"
	"github.com/conelight/conelight/sim/material"
	"github.com/conelight/conelight/sim/phys"
)

// scatterSpread returns the spread (rad, per projected plane) of the
// light-weighted mean direction of an electron of kinetic energy ekin
// (MeV) about its initial direction, from multiple scattering along its
// slowing down in water:
//
//	Var = int_0^L k(s) (W(s)/W(0))^2 ds
//
// with k(s) = (13.6 MeV / (beta c p))^2 / X0 the growth rate of the
// projected angle variance (PDG Review, "Passage of particles through
// matter", Highland formula, without its logarithmic term, which has no
// differential form), W(s) the Cherenkov light emitted after path s
// (yield per cm proportional to 1 - 1/(beta^2 n^2), Frank-Tamm), and the
// path from the continuous slowing down with the collision and radiative
// stopping powers of sim/em (ICRU Report 37 and the Tsai
// bremsstrahlung cross-section). The projected angle is a random walk in
// s, so the covariance of the angles at s and s' is the variance at
// min(s, s'), which gives the formula. It is the part of the direction
// error shared by all hits of an event, which the per-hit direction
// likelihood cannot see.
func scatterSpread(ekin float64) (float64, error) {
	water := material.Water()
	cfg := em.DefaultConfig()
	p, err := em.New(water, cfg)
	if err != nil {
		return 0, err
	}
	n := cfg.RefractiveIndex
	x0 := water.RadiationLength
	// Step along the path in small energy steps down to the Cherenkov
	// threshold; collect k(s) ds and the light yield of each step.
	type step struct{ k, light float64 }
	var steps []step
	t := ekin
	for {
		etot := t + phys.ElectronMass
		pc := math.Sqrt(etot*etot - phys.ElectronMass*phys.ElectronMass)
		beta := pc / etot
		yield := 1 - 1/(beta*beta*n*n)
		if yield <= 0 || t < 0.02 {
			break
		}
		col, err := p.CollisionStoppingPower(phys.Electron, t)
		if err != nil {
			return 0, err
		}
		rad, err := p.RadiativeStoppingPower(t)
		if err != nil {
			return 0, err
		}
		dedx := (col + rad) * water.Density // MeV/cm
		dt := math.Min(0.01*t, 0.05)
		ds := dt / dedx
		a := 13.6 / (beta * pc)
		steps = append(steps, step{k: a * a / x0 * ds, light: yield * ds})
		t -= dt
	}
	total := 0.0
	for _, s := range steps {
		total += s.light
	}
	if total == 0 {
		return 0, nil
	}
	// W(s)/W(0) at the start of each step, summed from the end.
	v, tail := 0.0, 0.0
	for i := len(steps) - 1; i >= 0; i-- {
		tail += steps[i].light
		f := tail / total
		v += steps[i].k * f * f
	}
	return math.Sqrt(v), nil
}

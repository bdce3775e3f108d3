package phys

import (
	"math"

	"github.com/golang/geo/r3"
)

// FourMomentum is an energy-momentum four-vector, MeV and MeV/c.
type FourMomentum struct {
	E float64
	P r3.Vector
}

// Add returns a + b.
func (a FourMomentum) Add(b FourMomentum) FourMomentum {
	return FourMomentum{a.E + b.E, a.P.Add(b.P)}
}

// Mass returns the invariant mass sqrt(E^2 - p^2) (0 if negative by
// rounding).
func (a FourMomentum) Mass() float64 { return math.Sqrt(math.Max(0, a.E*a.E-a.P.Norm2())) }

// Velocity returns the velocity p/E (units of c) of the frame in which a
// is at rest.
func (a FourMomentum) Velocity() r3.Vector { return a.P.Mul(1 / a.E) }

// Boost returns a, given in a frame that moves with velocity beta (units
// of c, |beta| < 1), in the frame where that frame moves.
func (a FourMomentum) Boost(beta r3.Vector) FourMomentum {
	b2 := beta.Norm2()
	if b2 == 0 {
		return a
	}
	gamma := 1 / math.Sqrt(1-b2)
	bp := beta.Dot(a.P)
	return FourMomentum{
		E: gamma * (a.E + bp),
		P: a.P.Add(beta.Mul(gamma*gamma/(gamma+1)*bp + gamma*a.E)),
	}
}

// OnShell returns the four-momentum of a particle of the given mass with
// kinetic energy ekin along the unit vector dir.
func OnShell(mass, ekin float64, dir r3.Vector) FourMomentum {
	return FourMomentum{E: mass + ekin, P: dir.Mul(Momentum(ekin, mass))}
}

// TwoBodyMomentum returns the momentum of either product in the rest
// frame of a system of mass m decaying to masses m1 and m2 (0 if below
// threshold).
func TwoBodyMomentum(m, m1, m2 float64) float64 {
	s := (m*m - (m1+m2)*(m1+m2)) * (m*m - (m1-m2)*(m1-m2))
	if s <= 0 {
		return 0
	}
	return math.Sqrt(s) / (2 * m)
}

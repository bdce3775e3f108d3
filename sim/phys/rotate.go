package phys

import (
	"math"

	"github.com/golang/geo/r3"
)

// Basis returns two unit vectors e1, e2 that with the unit vector u form a
// right-handed orthonormal basis (e1 x e2 = u). It is continuous except
// near u = -z and allocates nothing.
func Basis(u r3.Vector) (e1, e2 r3.Vector) {
	// Duff et al., "Building an orthonormal basis, revisited", JCGT 6 (2017):
	// branchless except for the sign of u.Z.
	sign := math.Copysign(1, u.Z)
	a := -1 / (sign + u.Z)
	b := u.X * u.Y * a
	e1 = r3.Vector{X: 1 + sign*u.X*u.X*a, Y: sign * b, Z: -sign * u.X}
	e2 = r3.Vector{X: b, Y: sign + u.Y*u.Y*a, Z: -u.Y}
	return e1, e2
}

// Deflect returns the unit vector at polar angle theta (given by its
// cosine) and azimuth phi about the unit vector u. It is the one rotation
// used by Cherenkov emission, light scattering, multiple scattering and
// two-body kinematics.
func Deflect(u r3.Vector, cosTheta, phi float64) r3.Vector {
	return NewFrame(u).Deflect(cosTheta, phi)
}

// Frame is a unit vector U with the basis E1, E2 of Basis(U): a loop that
// deflects many times about one axis (the photons of one Cherenkov step)
// builds it once. Frame.Deflect gives bit for bit what Deflect gives.
type Frame struct {
	U, E1, E2 r3.Vector
}

// NewFrame returns the frame of the unit vector u.
func NewFrame(u r3.Vector) Frame {
	e1, e2 := Basis(u)
	return Frame{U: u, E1: e1, E2: e2}
}

// Deflect returns the unit vector at polar angle theta (given by its
// cosine) and azimuth phi about f.U.
func (f Frame) Deflect(cosTheta, phi float64) r3.Vector {
	sinTheta := math.Sqrt(math.Max(0, 1-cosTheta*cosTheta))
	sp, cp := math.Sincos(phi)
	u, e1, e2 := f.U, f.E1, f.E2
	return r3.Vector{
		X: cosTheta*u.X + sinTheta*(cp*e1.X+sp*e2.X),
		Y: cosTheta*u.Y + sinTheta*(cp*e1.Y+sp*e2.Y),
		Z: cosTheta*u.Z + sinTheta*(cp*e1.Z+sp*e2.Z),
	}
}

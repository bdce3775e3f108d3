package scatter

import (
	"math"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/phys"
)

// Theta0 returns the Highland width (radians) of the projected scattering
// angle after a path of length x (cm) in a medium of radiation length x0
// (cm) for a particle of momentum p (MeV/c), speed beta and charge number z:
//
//	theta0 = 13.6 MeV / (beta c p) |z| sqrt(x/X0) [1 + 0.038 ln(x z^2 / (X0 beta^2))]
//
// (PDG Review, "Passage of particles through matter", eq. for theta_0;
// accurate to 11% for 1e-3 < x/X0 < 100). The log term is applied to the
// whole step, as the PDG Review recommends, not summed per sub-step.
// Below x/X0 = 1e-3 the bracket would fall towards zero; it is held at
// its value there so that very short steps do not under-scatter.
func Theta0(x, x0, p, beta float64, z int) float64 {
	if x <= 0 || p <= 0 || beta <= 0 {
		return 0
	}
	zz := float64(z * z)
	t := x * zz / (x0 * beta * beta)
	corr := 1 + 0.038*math.Log(math.Max(t, 1e-3))
	return 13.6 / (beta * p) * math.Sqrt(zz) * math.Sqrt(x/x0) * corr
}

// Sample returns the new direction and the lateral displacement after a
// step of length x along unit direction u with Highland width theta0.
// In each of two orthogonal planes it draws the PDG joint Gaussian of
// deflection and displacement,
//
//	theta_plane = z2 theta0,  y_plane = z1 x theta0/sqrt(12) + z2 x theta0/2,
//
// with z1, z2 independent standard normals (PDG Review, "Passage of
// particles through matter", correlated displacement). The displacement is
// perpendicular to u; callers add it to the straight end point.
func Sample(u r3.Vector, x, theta0 float64, rng *rand.Rand) (dir, disp r3.Vector) {
	if theta0 <= 0 {
		return u, r3.Vector{}
	}
	e1, e2 := phys.Basis(u)
	const invSqrt12 = 0.28867513459481287
	z1a, z2a := rng.NormFloat64(), rng.NormFloat64()
	z1b, z2b := rng.NormFloat64(), rng.NormFloat64()
	tx, ty := z2a*theta0, z2b*theta0
	yx := x * theta0 * (z1a*invSqrt12 + z2a/2)
	yy := x * theta0 * (z1b*invSqrt12 + z2b/2)
	// Compose the two projected angles into a space direction: the
	// projected angles are the angles of the direction's projection onto
	// the (u, e1) and (u, e2) planes, so the direction is proportional to
	// u + tan(tx) e1 + tan(ty) e2. Clamp to below 90 degrees per plane.
	const lim = 1.5
	tx = math.Max(-lim, math.Min(lim, tx))
	ty = math.Max(-lim, math.Min(lim, ty))
	ax, ay := math.Tan(tx), math.Tan(ty)
	d := r3.Vector{
		X: u.X + ax*e1.X + ay*e2.X,
		Y: u.Y + ax*e1.Y + ay*e2.Y,
		Z: u.Z + ax*e1.Z + ay*e2.Z,
	}
	dir = d.Mul(1 / d.Norm())
	disp = r3.Vector{
		X: yx*e1.X + yy*e2.X,
		Y: yx*e1.Y + yy*e2.Y,
		Z: yx*e1.Z + yy*e2.Z,
	}
	return dir, disp
}

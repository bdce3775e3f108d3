package optics

import (
	"fmt"
	"math"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/sim/phys"
)

// Liner is the wall between the sensors. A photon reaching it is reflected
// with probability Reflectivity, otherwise absorbed; of the reflected
// photons a fraction DiffuseFraction leave Lambertian (cosine-weighted
// about the inward normal), the rest specularly.
type Liner struct {
	Reflectivity    float64 // probability of reflection, in [0, 1]
	DiffuseFraction float64 // fraction of reflections that are diffuse, in [0, 1]
}

// DefaultLiner returns a black plastic liner: 3% reflectivity, half of it
// diffuse (common practice for a black liner, not a measured sheet).
func DefaultLiner() Liner { return Liner{Reflectivity: 0.03, DiffuseFraction: 0.5} }

// Validate reports a field outside [0, 1] or NaN.
func (l Liner) Validate() error {
	if !(l.Reflectivity >= 0 && l.Reflectivity <= 1) {
		return fmt.Errorf("optics: Liner.Reflectivity = %g must lie in [0, 1]", l.Reflectivity)
	}
	if !(l.DiffuseFraction >= 0 && l.DiffuseFraction <= 1) {
		return fmt.Errorf("optics: Liner.DiffuseFraction = %g must lie in [0, 1]", l.DiffuseFraction)
	}
	return nil
}

// Reflect decides the fate of a photon with unit direction dir hitting the
// liner, whose unit normal points into the water (dir . normal < 0). It
// returns reflected = false when the photon is absorbed, otherwise the new
// direction (pointing into the water). The liner must be valid.
func (l Liner) Reflect(dir, normal r3.Vector, rng *rand.Rand) (out r3.Vector, reflected bool) {
	u := rng.Float64()
	if u >= l.Reflectivity {
		return r3.Vector{}, false
	}
	// Reuse the same uniform for the diffuse/specular choice: given
	// u < R, u/R is uniform on [0, 1).
	if u < l.Reflectivity*l.DiffuseFraction {
		return LambertianReflect(normal, rng), true
	}
	return SpecularReflect(dir, normal), true
}

// SpecularReflect mirrors dir in the plane with unit normal n:
// dir - 2 (dir . n) n.
func SpecularReflect(dir, n r3.Vector) r3.Vector {
	return dir.Sub(n.Mul(2 * dir.Dot(n)))
}

// LambertianReflect draws a direction from the cosine-weighted hemisphere
// about the unit normal n (density cos(theta)/pi per solid angle).
func LambertianReflect(n r3.Vector, rng *rand.Rand) r3.Vector {
	c := sampleLambertCos(rng)
	return phys.Deflect(n, c, 2*math.Pi*rng.Float64())
}

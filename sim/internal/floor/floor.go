// Package floor holds the least work any photon life can cost, so that the
// photon and whole-event benchmarks can report their cost per photon as a
// ratio to it measured in the same run: the random draws of an isotropic
// direction and of one exponential free path, and a bare ray-cylinder
// intersection from a fixed point, with no wall classification, sensor
// lookup, optics tables or detection decision.
package floor

import (
	"math"
	"math/rand/v2"

	"github.com/golang/geo/r3"
)

// Photons runs n floor photon lives from p inside a cylinder of radius r
// and half height h (cm) and returns the sum of their path lengths, which
// the caller keeps so that the work is not optimized away.
func Photons(n int, rng *rand.Rand, p r3.Vector, r, h float64) float64 {
	sum := 0.0
	for range n {
		c := 2*rng.Float64() - 1
		s := math.Sqrt(1 - c*c)
		sp, cp := math.Sincos(2 * math.Pi * rng.Float64())
		ux, uy, uz := s*cp, s*sp, c
		free := rng.ExpFloat64() * 5000
		// Barrel: |p_xy + d u_xy| = r.
		a := ux*ux + uy*uy
		bb := p.X*ux + p.Y*uy
		cc := p.X*p.X + p.Y*p.Y - r*r
		d := math.Inf(1)
		if a > 0 {
			d = (-bb + math.Sqrt(bb*bb-a*cc)) / a
		}
		if uz > 0 {
			d = math.Min(d, (h-p.Z)/uz)
		} else if uz < 0 {
			d = math.Min(d, (-h-p.Z)/uz)
		}
		sum += math.Min(d, free)
	}
	return sum
}

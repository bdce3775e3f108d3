package gen

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"

	"github.com/golang/geo/r3"

	"github.com/conelight/conelight/geom"
	"github.com/conelight/conelight/sim/phys"
)

type vertexKind int

const (
	vertexUnset vertexKind = iota
	vertexPoint
	vertexFiducial
)

// VertexDist is a distribution of interaction points (cm): a fixed point,
// or uniform in the volume of a tank at least a given distance inside its
// sensor surface. Build one with AtPoint, InTank or InFiducial; the zero
// value is "not set". A VertexDist is immutable and safe for concurrent use.
type VertexDist struct {
	kind  vertexKind
	point r3.Vector
	tank  geom.Tank
	wall  float64 // minimum distance to the sensor surface, cm
}

// AtPoint is the fixed vertex p (cm).
func AtPoint(p r3.Vector) VertexDist { return VertexDist{kind: vertexPoint, point: p} }

// InTank is uniform in the volume enclosed by the tank's sensor surface.
func InTank(t geom.Tank) VertexDist { return InFiducial(t, 0) }

// InFiducial is uniform in the fiducial volume of t: the points at least
// minWall cm inside the sensor surface (t.DistanceToWall(p) >= minWall),
// which is the cylinder of radius SensorRadius-minWall and half height
// SensorHalfHeight-minWall. It is sampled in closed form (r = R sqrt(u),
// phi and z uniform), not by rejection.
func InFiducial(t geom.Tank, minWall float64) VertexDist {
	return VertexDist{kind: vertexFiducial, tank: t, wall: minWall}
}

// Validate reports whether v is usable; the error names the parameter.
func (v VertexDist) Validate() error {
	switch v.kind {
	case vertexUnset:
		return errors.New("not set")
	case vertexPoint:
		if !finiteVector(v.point) {
			return fmt.Errorf("AtPoint(%v): coordinates must be finite", v.point)
		}
	case vertexFiducial:
		if err := v.tank.Validate(); err != nil {
			return err
		}
		if !isFinite(v.wall) || v.wall < 0 {
			return fmt.Errorf("InFiducial: minWall = %g must be finite and >= 0", v.wall)
		}
		r, h := v.cylinder()
		if !(r > 0) || !(h > 0) {
			return fmt.Errorf("InFiducial: minWall = %g leaves no fiducial volume in %v", v.wall, v.tank)
		}
	}
	return nil
}

// set reports whether v was given a value.
func (v VertexDist) set() bool { return v.kind != vertexUnset }

// cylinder returns the radius and half height of the fiducial cylinder.
func (v VertexDist) cylinder() (r, h float64) {
	return v.tank.SensorRadius() - v.wall, v.tank.SensorHalfHeight() - v.wall
}

// Sample draws one vertex (cm).
func (v VertexDist) Sample(rng *rand.Rand) r3.Vector {
	if v.kind == vertexPoint {
		return v.point
	}
	R, H := v.cylinder()
	r := R * math.Sqrt(rng.Float64())
	s, c := math.Sincos(2 * math.Pi * rng.Float64())
	return r3.Vector{X: r * c, Y: r * s, Z: H * (2*rng.Float64() - 1)}
}

// String describes the distribution.
func (v VertexDist) String() string {
	switch v.kind {
	case vertexPoint:
		return fmt.Sprintf("AtPoint(%g, %g, %g) cm", v.point.X, v.point.Y, v.point.Z)
	case vertexFiducial:
		return fmt.Sprintf("InFiducial(%v, %g cm)", v.tank, v.wall)
	}
	return "unset vertex"
}

type dirKind int

const (
	dirUnset dirKind = iota
	dirFixed
	dirCone // isotropic is the cone of half angle pi
)

// DirDist is a distribution of unit directions: fixed, isotropic, or
// uniform in solid angle within a cone. Build one with Along, Isotropic or
// InCone; the zero value is "not set". Immutable and safe for concurrent use.
type DirDist struct {
	kind   dirKind
	axis   r3.Vector // unit after validation by normalizedAxis
	cosMax float64   // cosine of the cone's half angle
	half   float64   // half angle, rad (for messages)
}

// Along is the fixed direction u (normalized; must be non-zero).
func Along(u r3.Vector) DirDist { return DirDist{kind: dirFixed, axis: u} }

// Isotropic is uniform over the whole sphere.
func Isotropic() DirDist {
	return DirDist{kind: dirCone, axis: r3.Vector{Z: 1}, cosMax: -1, half: math.Pi}
}

// InCone is uniform in solid angle within halfAngle (rad, in (0, pi]) of
// the axis (normalized; must be non-zero).
func InCone(axis r3.Vector, halfAngle float64) DirDist {
	return DirDist{kind: dirCone, axis: axis, cosMax: math.Cos(halfAngle), half: halfAngle}
}

// Validate reports whether d is usable; the error names the parameter.
func (d DirDist) Validate() error {
	switch d.kind {
	case dirUnset:
		return errors.New("not set")
	case dirCone:
		if math.IsNaN(d.half) || !(d.half > 0) || d.half > math.Pi {
			return fmt.Errorf("InCone: halfAngle = %g must be in (0, pi]", d.half)
		}
	}
	if !finiteVector(d.axis) || d.axis.Norm() == 0 {
		return fmt.Errorf("direction %v must be finite and non-zero", d.axis)
	}
	return nil
}

// normalized returns d with a unit axis; d must be valid.
func (d DirDist) normalized() DirDist {
	d.axis = d.axis.Normalize()
	return d
}

// Sample draws one unit direction; d must be normalized.
func (d DirDist) Sample(rng *rand.Rand) r3.Vector {
	if d.kind == dirFixed {
		return d.axis
	}
	c := d.cosMax + (1-d.cosMax)*rng.Float64()
	return phys.Deflect(d.axis, c, 2*math.Pi*rng.Float64())
}

// String describes the distribution.
func (d DirDist) String() string {
	switch d.kind {
	case dirFixed:
		return fmt.Sprintf("Along(%g, %g, %g)", d.axis.X, d.axis.Y, d.axis.Z)
	case dirCone:
		if d.cosMax == -1 {
			return "Isotropic"
		}
		return fmt.Sprintf("InCone((%g, %g, %g), %g rad)", d.axis.X, d.axis.Y, d.axis.Z, d.half)
	}
	return "unset direction"
}

func finiteVector(v r3.Vector) bool { return isFinite(v.X) && isFinite(v.Y) && isFinite(v.Z) }

func isFinite(x float64) bool { return !math.IsNaN(x) && !math.IsInf(x, 0) }
